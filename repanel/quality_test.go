package repanel

import (
	"math"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"gonum.org/v1/gonum/floats/scalar"
)

func TestMeasure(t *testing.T) {
	const tol = 1e-12
	pt := func(x, y float64) geometry.Point { return geometry.Point{X: x, Y: y} }
	// A regular 36-gon of radius 1 (closed): every panel is 2·sin(5°) long and
	// the surface turns 10° at every node (calculated by hand).
	var gon []geometry.Point
	for i := 0; i <= 36; i++ {
		s, c := math.Sincos(2 * math.Pi * float64(i%36) / 36)
		gon = append(gon, pt(c, s))
	}
	side := 2 * math.Sin(5*math.Pi/180)
	for _, tc := range []struct {
		name                 string
		nodes                []geometry.Point
		min, max, ratio, deg float64
		warn                 []string // substrings, one per expected warning
	}{
		{
			// Lengths 1, 2, 1, 5; ratios 2, 2, 5; turns 90°, 90° and
			// 180° − atan(4/3) = 126.87° (calculated by hand).
			name:  "polygon",
			nodes: []geometry.Point{pt(0, 0), pt(1, 0), pt(1, 2), pt(0, 2), pt(3, -2)},
			min:   1, max: 5, ratio: 5, deg: 180 - math.Atan2(4, 3)*180/math.Pi,
			warn: []string{"factor 5.00", "turns 126.9° at node 3"},
		},
		{
			name:  "36-gon",
			nodes: gon,
			min:   side, max: side, ratio: 1, deg: 10,
		},
		{
			// A straight line of panels 1, 1, 4: ratio 4 > RatioLimit, no turn.
			name:  "line",
			nodes: []geometry.Point{pt(0, 0), pt(1, 0), pt(2, 0), pt(6, 0)},
			min:   1, max: 4, ratio: 4, deg: 0,
			warn: []string{"panels 1 and 2 differ in length by a factor 4.00"},
		},
		{
			// A repeated node: one zero-length panel, left out of ratio and
			// turn.
			name:  "duplicate",
			nodes: []geometry.Point{pt(0, 0), pt(1, 0), pt(1, 0), pt(2, 0), pt(3, 0)},
			min:   0, max: 1, ratio: 1, deg: 0,
			warn: []string{"panel 1 (nodes 1-2) has zero length"},
		},
		{
			// Panels 1 and 1e-8 of a 1-long perimeter: too short.
			name:  "short",
			nodes: []geometry.Point{pt(0, 0), pt(1, 0), pt(1, 1e-8)},
			min:   1e-8, max: 1, ratio: 1e8, deg: 90,
			warn: []string{"panel 1 is", "factor", "turns 90.0°"},
		},
		{
			name:  "one node",
			nodes: []geometry.Point{pt(0, 0)},
			warn:  []string{"1 node(s)"},
		},
		{
			name:  "NaN node",
			nodes: []geometry.Point{pt(0, 0), pt(math.NaN(), 0), pt(1, 1)},
			warn:  []string{"node 1 (NaN, 0) is not finite"},
		},
		{
			name:  "one panel",
			nodes: []geometry.Point{pt(0, 0), pt(3, 4)},
			min:   5, max: 5,
		},
	} {
		q := Measure(tc.nodes)
		for _, f := range []struct {
			what      string
			got, want float64
		}{
			{"min", q.MinLength, tc.min},
			{"max", q.MaxLength, tc.max},
			{"ratio", q.MaxRatio, tc.ratio},
			{"turn", q.MaxTurnDeg, tc.deg},
		} {
			if !scalar.EqualWithinAbsOrRel(f.got, f.want, tol, tol) {
				t.Errorf("%s: %s = %v, want %v", tc.name, f.what, f.got, f.want)
			}
		}
		if len(q.Warnings) != len(tc.warn) {
			t.Errorf("%s: warnings %q, want %d", tc.name, q.Warnings, len(tc.warn))
			continue
		}
		for i, w := range tc.warn {
			if !strings.Contains(q.Warnings[i], w) {
				t.Errorf("%s: warning %q, want it to contain %q", tc.name, q.Warnings[i], w)
			}
		}
	}
}

// The plain cosine law has a neighbour ratio just under 3 at its clustered
// ends, which RatioLimit is set above; at 160 panels on a NACA 0012 (NACA
// Report 824 equations) it draws no warning, while uniform spacing, too
// coarse at the nose, does; with the count chosen for the default
// tolerance, uniform spacing gets enough panels to draw none.
func TestMeasureLimits(t *testing.T) {
	p, sle := naca0012()
	cos, err := Distribute(p, sle, Options{Panels: 160})
	if err != nil {
		t.Fatal(err)
	}
	q := Measure(cos)
	if len(q.Warnings) != 0 || q.MaxRatio > 3 || q.MaxRatio < 2.9 {
		t.Errorf("cosine, 160 panels: ratio %v, warnings %q; want a ratio just under 3 and no warning", q.MaxRatio, q.Warnings)
	}
	uni, err := Distribute(p, sle, Options{Spacing: LawUniform, Panels: 160})
	if err != nil {
		t.Fatal(err)
	}
	if q := Measure(uni); len(q.Warnings) != 1 || !strings.Contains(q.Warnings[0], "turns") {
		t.Errorf("uniform, 160 panels: warnings %q; want one about the turn at the nose", q.Warnings)
	}
	auto, err := Distribute(p, sle, Options{Spacing: LawUniform})
	if err != nil {
		t.Fatal(err)
	}
	if q := Measure(auto); len(q.Warnings) != 0 {
		t.Errorf("uniform, %d panels chosen for the default tolerance: warnings %q", len(auto)-1, q.Warnings)
	}
}
