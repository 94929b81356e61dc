package clean

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// flatbackOutline returns the outline of a symmetric flatback section,
// ordered from the upper corner of its base over the nose to the lower
// corner and up the base back towards the start: the thickness form of
// NACA Report 824 (the 4-digit half-thickness with its open-edge
// coefficient 0.1015) plus a linear term (h/2)·x, which opens the end
// into a flat base 0.021·t + h thick at x = 1 square to the chord
// (thickening a section linearly to a flat base is common practice for
// thick wind-turbine root sections). The points are spaced evenly along
// the outline, about k of them round the surfaces, as a scan takes them;
// both corners are among them.
func flatbackOutline(t, h float64, k int) (pts []geometry.Point, base float64) {
	yt := func(x float64) float64 {
		return 5*t*(0.2969*math.Sqrt(x)-0.1260*x-0.3516*x*x+0.2843*x*x*x-0.1015*x*x*x*x) + h/2*x
	}
	const m = 20000
	var dense []geometry.Point
	for i := m; i >= 0; i-- {
		x := 0.5 * (1 - math.Cos(math.Pi*float64(i)/m))
		dense = append(dense, geometry.Point{X: x, Y: yt(x)})
	}
	for i := 1; i <= m; i++ {
		x := 0.5 * (1 - math.Cos(math.Pi*float64(i)/m))
		dense = append(dense, geometry.Point{X: x, Y: -yt(x)})
	}
	s := make([]float64, len(dense))
	for i := 1; i < len(dense); i++ {
		s[i] = s[i-1] + dense[i].Dist(dense[i-1])
	}
	j := 0
	for i := range k + 1 {
		want := s[len(s)-1] * float64(i) / float64(k)
		for j+1 < len(s)-1 && s[j+1] < want {
			j++
		}
		f := (want - s[j]) / (s[j+1] - s[j])
		pts = append(pts, dense[j].Add(dense[j+1].Sub(dense[j]).Scale(f)))
	}
	base = 2 * yt(1)
	nb := int(math.Ceil(base / (s[len(s)-1] / float64(k))))
	for i := 1; i < nb; i++ {
		pts = append(pts, geometry.Point{X: 1, Y: -base/2 + base*float64(i)/float64(nb)})
	}
	return pts, base
}

// A flatback section 30 % thick with a base 3–10 % of the chord across
// (exact outline, see flatbackOutline), turned and scaled as a drawing
// places it. The farthest pair of points ends at a corner of the base, so
// in that frame the base leans; the end must still be read as one straight
// base between the true corners, with no point of it dropped.
func TestEdgeWideFlatBase(t *testing.T) {
	const chord = 240.0
	for _, h := range []float64{0.03, 0.06, 0.10} {
		pts, base := flatbackOutline(0.30, h, 600)
		place := func(p geometry.Point) geometry.Point {
			return p.Scale(chord).Rotate(0.21).Add(geometry.Point{X: -38, Y: 512})
		}
		for i := range pts {
			pts[i] = place(pts[i])
		}
		_, rep, err := Clean(edgeTestCloud(pts), Options{})
		if err != nil {
			t.Fatalf("base %.2f c: %v", h, err)
		}
		e := rep.Edge
		if e == nil {
			t.Fatalf("base %.2f c: no trailing edge found", h)
		}
		hiC, loC := place(geometry.Point{X: 1, Y: base / 2}), place(geometry.Point{X: 1, Y: -base / 2})
		if e.Kind != EdgeBlunt || math.Abs(e.Thickness-base*chord) > 0.01*base*chord ||
			e.Upper.Dist(hiC) > 0.002*chord || e.Lower.Dist(loC) > 0.002*chord {
			t.Errorf("base %.2f c: edge %s %.4g mm thick, corners %.3g and %.3g mm off (%s), want blunt %.4g mm between the corners",
				h, e.Kind, e.Thickness, e.Upper.Dist(hiC), e.Lower.Dist(loC), e.Why, base*chord)
		}
		if len(rep.Dropped) > 0 {
			t.Errorf("base %.2f c: %d exact points dropped, first at %v (%s)", h, len(rep.Dropped), rep.Dropped[0].Point, rep.Dropped[0].Reason)
		}
	}
}
