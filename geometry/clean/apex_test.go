package clean

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// A clamp's jaw face measured with the section: a few points on a straight
// face square to the chord, a few per cent of the chord beyond a sharp
// trailing edge (NACA 2412, closed-edge coefficient, NACA Report 824
// equations; the fixture's size and place are common practice, not from a
// table). The outlier tests drop most of the face, but the loop used to
// reach out to the point of it on the chord line (the aftmost contour
// point 0.03–0.05 c beyond the edge, the chord that much long). No point
// of the face may stay in the contour, and each must be listed as dropped
// with its line; no point of the section may go with them.
func TestFixtureFaceBeyondEdge(t *testing.T) {
	foil := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}
	const chord, n = 100.0, 90
	for _, tc := range []struct {
		name    string
		face    int     // points on the face
		off     float64 // the face beyond the edge, chord units
		length  float64 // chord units
		ordered bool
	}{
		{"three points, in order", 3, 0.05, 0.02, true},
		{"three points, shuffled", 3, 0.05, 0.02, false},
		{"five points, shuffled", 5, 0.03, 0.06, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(7, 23))
			var pts []geometry.Point
			for k := range n {
				pts = append(pts, foil.Upper(1-float64(k)/n))
			}
			for k := range n {
				pts = append(pts, foil.Lower(float64(k)/n))
			}
			for i := range pts {
				nz := geometry.Point{X: rng.NormFloat64(), Y: rng.NormFloat64()}.Scale(0.00005)
				pts[i] = pts[i].Add(nz).Scale(chord)
			}
			good := len(pts)
			for k := range tc.face {
				y := tc.length * (float64(k)/float64(tc.face-1) - 0.5)
				pts = append(pts, geometry.Point{X: 1 + tc.off, Y: y}.Scale(chord))
			}
			c := edgeTestCloud(pts)
			c.Ordered = tc.ordered
			if !tc.ordered {
				rng.Shuffle(len(c.Points), func(i, j int) {
					c.Points[i], c.Points[j] = c.Points[j], c.Points[i]
					c.Origins[i], c.Origins[j] = c.Origins[j], c.Origins[i]
				})
			}
			ct, rep, err := Clean(c, Options{})
			if err != nil {
				t.Fatal(err)
			}
			for k, o := range ct.Origins {
				if o.Line > good {
					t.Errorf("face point %s kept in the contour at %v (position %d)", o, ct.Points[k], k)
				}
			}
			listed := 0
			for _, d := range rep.Dropped {
				if d.Origin.Line > good {
					listed++
				}
			}
			if listed != tc.face {
				t.Errorf("%d of the %d face points listed as dropped", listed, tc.face)
			}
			if kept := len(ct.Points); kept < good-2 {
				t.Errorf("contour keeps %d of the %d section points", kept, good)
			}
		})
	}
}

// A rounded trailing edge sampled coarsely, whose tip points the end model
// took for outliers but the apex, with a probe slip lined up with the apex
// and one of the tip's points (campaign 1455: the chord came out 1.3 %
// short when the apex went too). The outline is a stadium of unit length
// and thickness 0.1 (a straight-sided section with semicircular ends,
// exact by construction); the tip's points lie on its arc at 30° steps.
// The apex must stay: the tip's other points lie behind the line the slip
// and the apex make, between it and the loop. The same loop with a
// straight face across the spike through the apex instead of the tip's
// points (a fixture's jaw square to the chord) must lose it.
func TestApexOfRoundedTipKept(t *testing.T) {
	const r, step = 0.05, 0.01
	// The loop: the upper side from the tip's base forward, round the
	// nose, the lower side aft, then the apex.
	var pts []geometry.Point
	for x := 1 - r; x > r+step/2; x -= step {
		pts = append(pts, geometry.Point{X: x, Y: r})
	}
	for k := 0; k <= 12; k++ {
		th := math.Pi/2 + math.Pi*float64(k)/12
		pts = append(pts, geometry.Point{X: r + r*math.Cos(th), Y: r * math.Sin(th)})
	}
	for x := r + step; x < 1-r+step/2; x += step {
		pts = append(pts, geometry.Point{X: x, Y: -r})
	}
	apex := int32(len(pts))
	pts = append(pts, geometry.Point{X: 1, Y: 0})
	seq := make([]int32, len(pts))
	for k := range seq {
		seq[k] = int32(k)
	}
	tip := func(deg float64) geometry.Point {
		th := deg * math.Pi / 180
		return geometry.Point{X: 1 - r + r*math.Cos(th), Y: r * math.Sin(th)}
	}
	// The slip: on the line from the tip's point at 30° through the apex,
	// as far beyond the apex again as twice that point.
	q30 := tip(30)
	slip := pts[apex].Add(pts[apex].Sub(q30).Scale(2))
	for _, tc := range []struct {
		name    string
		dropped []geometry.Point
		want    bool // the apex dropped
	}{
		{"rounded tip", []geometry.Point{tip(60), q30, tip(-30), tip(-60), slip}, false},
		{"fixture face", []geometry.Point{{X: 1, Y: 0.02}, {X: 1, Y: 0.04}, {X: 1, Y: -0.02}, {X: 1, Y: -0.04}}, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			all := slices.Clone(pts)
			var hits []hit
			for _, q := range tc.dropped {
				hits = append(hits, hit{idx: int32(len(all)), reason: "outlier"})
				all = append(all, q)
			}
			_, got := apexes(all, seq, hits, 1e-5, true)
			dropped := len(got) == 1 && got[0].idx == apex
			if dropped != tc.want || len(got) > 1 {
				t.Errorf("apex dropped %v (hits %v), want %v", dropped, got, tc.want)
			}
		})
	}
}
