package clean

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// yt is the half-thickness of the NACA 4-digit sections with the closed
// trailing edge's coefficient (NACA Report 824; a₄ = −0.1036, common
// practice for a closed edge).
func yt(x, t float64) float64 {
	return 5 * t * (0.2969*math.Sqrt(x) - 0.1260*x - 0.3516*x*x + 0.2843*x*x*x - 0.1036*x*x*x*x)
}

// rowCloud returns the loop pts with noise, then the extra points, as a
// cloud in file order or shuffled; good is the number of loop points.
func rowCloud(pts, extra []geometry.Point, noise float64, ordered bool, seed uint64) *geometry.Cloud {
	rng := rand.New(rand.NewPCG(seed, 25))
	var all []geometry.Point
	for _, p := range append(append([]geometry.Point{}, pts...), extra...) {
		nz := geometry.Point{X: rng.NormFloat64(), Y: rng.NormFloat64()}.Scale(noise)
		all = append(all, p.Add(nz).Scale(100))
	}
	c := edgeTestCloud(all)
	c.Ordered = ordered
	if !ordered {
		rng.Shuffle(len(c.Points), func(i, j int) {
			c.Points[i], c.Points[j] = c.Points[j], c.Points[i]
			c.Origins[i], c.Origins[j] = c.Origins[j], c.Origins[i]
		})
	}
	return c
}

// A laser slice of a part lying on a table: the table's edge is a straight
// row of points 0.05–0.12 c below the section (NACA 2412, Report 824
// equations), along more than its chord and as dense as the outline (the
// scene is common practice, not from a table). The orderings used to weave
// the row into the lower surface (the repanelled section then crossed
// itself, or had no leading edge). Every point of the row must be dropped
// and listed with its line, and the section's points kept.
func TestTableRowLeftOut(t *testing.T) {
	foil := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}
	const n = 150
	var pts []geometry.Point
	for k := range n {
		pts = append(pts, foil.Upper(1-float64(k)/n))
	}
	for k := range n {
		pts = append(pts, foil.Lower(float64(k)/n))
	}
	for _, tc := range []struct {
		name     string
		off      float64 // below the lowest point, chord units
		from, to float64 // the row's extent along x
		rows     int
		ordered  bool
	}{
		{"long row, in order", 0.05, -0.1, 1.05, 160, true},
		{"long row, shuffled", 0.05, -0.1, 1.05, 160, false},
		{"row under the aft part, shuffled", 0.12, 0.3, 0.9, 90, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			low := foil.Lower(0.3).Y
			var row []geometry.Point
			for k := range tc.rows {
				x := tc.from + (tc.to-tc.from)*float64(k)/float64(tc.rows-1)
				row = append(row, geometry.Point{X: x, Y: low - tc.off + 0.01*(x-0.5)})
			}
			c := rowCloud(pts, row, 0.0001, tc.ordered, 3)
			ct, rep, err := Clean(c, Options{})
			if err != nil {
				t.Fatal(err)
			}
			good := len(pts)
			for k, o := range ct.Origins {
				if o.Line > good {
					t.Fatalf("row point %s kept in the contour at %v (position %d)", o, ct.Points[k], k)
				}
			}
			listed := 0
			for _, d := range rep.Dropped {
				if d.Origin.Line > good {
					listed++
				}
			}
			if listed != tc.rows {
				t.Errorf("%d of the %d row points listed as dropped", listed, tc.rows)
			}
			if kept := len(ct.Points); kept < good-3 {
				t.Errorf("contour keeps %d of the %d section points", kept, good)
			}
		})
	}
}

// A straight stretch of the outline is no stray row: a flat-bottomed
// section (the upper surface of an 18 % NACA 4-digit thickness, Report 824,
// laid over a lower surface straight from 30 % chord to the trailing
// edge; constructed here), the same with holes in the sampling at both
// ends of its flat (which leave the flat standing apart from the rest, but
// pointing at it along its line), and a thick flatback whose base is 8 %
// of the chord, each densely sampled, shuffled, must lose no point as a
// stray.
func TestStraightSurfacesNotRows(t *testing.T) {
	const n = 200
	flat := func(holes bool) []geometry.Point {
		var pts []geometry.Point
		for k := range n {
			x := 1 - float64(k)/n
			pts = append(pts, geometry.Point{X: x, Y: 2 * yt(x, 0.18)})
		}
		for k := range n {
			x := float64(k) / n
			if holes && (x > 0.22 && x < 0.3 || x > 0.9 && x < 0.97) {
				continue // a scanner's holes at both ends of the flat
			}
			y := 0.0
			if x < 0.3 {
				s := x / 0.3
				y = -2 * yt(x, 0.18) * (1 - s*s*(3-2*s)) * 0.5
			}
			pts = append(pts, geometry.Point{X: x, Y: y})
		}
		return pts
	}
	flatback := func() []geometry.Point {
		// half-thickness yt(x, 0.30) + 0.04·x², a base of 0.08 c at x = 1
		h := func(x float64) float64 { return yt(x, 0.30) + 0.04*x*x }
		var pts []geometry.Point
		for k := range n {
			x := 1 - float64(k)/n
			pts = append(pts, geometry.Point{X: x, Y: h(x)})
		}
		for k := range n {
			x := float64(k) / n
			pts = append(pts, geometry.Point{X: x, Y: -h(x)})
		}
		top, bot := h(1), -h(1)
		for k := range 20 {
			pts = append(pts, geometry.Point{X: 1, Y: bot + (top-bot)*float64(k)/20})
		}
		return pts
	}
	for _, tc := range []struct {
		name string
		pts  []geometry.Point
	}{{"flat bottom", flat(false)}, {"flat bottom cut off by holes", flat(true)}, {"flatback base", flatback()}} {
		t.Run(tc.name, func(t *testing.T) {
			c := rowCloud(tc.pts, nil, 0.00005, false, 5)
			_, rep, err := Clean(c, Options{})
			if err != nil {
				t.Fatal(err)
			}
			for _, d := range rep.Dropped {
				if d.Reason == "stray" {
					t.Errorf("%s dropped as a stray", d.Origin)
				}
			}
		})
	}
}
