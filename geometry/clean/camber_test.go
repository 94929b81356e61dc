package clean

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// A thin, cambered section (NACA 2405 with its closed trailing edge, NACA
// Report 824 equations) at m cosine-spaced stations a surface with a
// little noise, and a burst of two slips 0.009 c below the lower surface
// at 96 % of the chord, where the tail is 0.0015 c thick (campaign 5463).
// The section order's camber line is tabulated on bins whose number
// follows the count of points; in a bin that held the burst its largest
// gap lay between the burst and both surfaces, the camber line ran
// outside the body, and the points of the last few per cent of the chord
// were sided "upper": the outlier test then kept the burst and dropped
// good points. Which bins did so turned on one point more or less
// anywhere on the loop (a nose point kept or dropped). At every count,
// every good point from 80 % of the chord to the tail cap must be sided
// on its own surface.
func TestTailBurstSidedAtEveryCount(t *testing.T) {
	foil := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.05, SharpTE: true}
	rng := rand.New(rand.NewPCG(5463, 1))
	bad := 0
	for m := 100; m <= 180; m++ {
		pts := nacaDense(foil, m)
		upper := make([]bool, len(pts))
		for i := range pts {
			upper[i] = i <= m
			pts[i] = pts[i].Add(geometry.Point{X: rng.NormFloat64(), Y: rng.NormFloat64()}.Scale(0.0002))
		}
		good := len(pts)
		for _, x := range []float64{0.957, 0.963} {
			p := foil.Lower(x)
			pts = append(pts, geometry.Point{X: p.X, Y: p.Y - 0.009})
		}
		sel := make([]int32, len(pts))
		for i := range sel {
			sel[i] = int32(i)
		}
		f := newChordFrame(foil.Upper(0), foil.Upper(1))
		_, sc := sectionOrder(pts, sel, f, nil)
		wrong := 0
		for i := range good {
			if x := pts[i].X; x < 0.8 || x > 1-tailCap {
				continue
			}
			if (sc.region[i] == regionUpper) != upper[i] {
				wrong++
			}
		}
		if wrong > 0 {
			t.Errorf("%d stations a surface (%d points): %d good points aft of 80 %% sided on the other surface", m, len(pts), wrong)
			bad++
		}
	}
	if bad > 0 {
		t.Logf("%d of 81 counts wrong", bad)
	}
}

// A cambered section (NACA 4412, NACA Report 824 equations) whose upper
// surface is probed five times as densely as its lower, as by passes of
// unequal density (campaign 6795), the points standing alike (no
// weights). In every bin the lower surface holds about a sixth of the
// points, under sideShare, yet runs across the bin: each bin must count,
// and the camber line must lie between the surfaces from 10 to 90 % of
// the chord, within a tenth of the local thickness of the true middle.
func TestCamberSparseSideAcrossBin(t *testing.T) {
	foil := shape.NACA4{Camber: 0.04, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}
	var xs, ys []float64
	const m = 400
	for i := 1; i < m; i++ {
		x := float64(i) / m
		p := foil.Upper(x)
		xs, ys = append(xs, p.X), append(ys, p.Y)
		if i%5 == 0 {
			q := foil.Lower(x)
			xs, ys = append(xs, q.X), append(ys, q.Y)
		}
	}
	cl := camber(xs, ys, nil)
	if len(cl.x) < 20 {
		t.Fatalf("camber line on %d bins, want most of the %d", len(cl.x), min(max(len(xs)/12, 8), 64))
	}
	for x := 0.1; x <= 0.9; x += 0.01 {
		up, lo := foil.Upper(x), foil.Lower(x)
		mid, th := (up.Y+lo.Y)/2, up.Y-lo.Y
		if d := math.Abs(cl.at(x) - mid); d > th/10 {
			t.Errorf("x %.2f: camber line %.5f, middle %.5f (thickness %.5f)", x, cl.at(x), mid, th)
		}
	}
}

// A thin section with a steep tail (NACA 6604 with its open trailing
// edge, NACA Report 824 equations: 6 % camber at 60 % of the chord, 4 %
// thick), 600 stations a surface evenly along the chord with 0.0002 c of
// noise, as campaign 2800. Aft of about 90 % of the chord the camber line
// falls across a bin (1/64 of the chord) by more than the section is
// thick, so the values of y of both surfaces overlap in each bin and no
// bin there counts; the line was held level at its last middle, 0.013 c
// above the true middle at 95 %, and every point of the last 8 % of the
// chord was sided "lower". Carried on along its slope over the bins that
// show both surfaces about it, the line must lie within a quarter of the
// local thickness of the true middle out to 98 % of the chord, and every
// point from 80 % of the chord to the tail cap must be sided on its own
// surface.
func TestCamberSteepThinTail(t *testing.T) {
	foil := shape.NACA4{Camber: 0.06, CamberPos: 0.6, Thickness: 0.04}
	rng := rand.New(rand.NewPCG(2800, 1))
	var pts []geometry.Point
	var upper []bool
	const m = 600
	for i := 1; i <= m; i++ {
		x := float64(i) / m
		for _, up := range []bool{true, false} {
			p := foil.Lower(x)
			if up {
				p = foil.Upper(x)
			}
			pts = append(pts, p.Add(geometry.Point{X: rng.NormFloat64(), Y: rng.NormFloat64()}.Scale(0.0002)))
			upper = append(upper, up)
		}
	}
	xs, ys := make([]float64, len(pts)), make([]float64, len(pts))
	for i, p := range pts {
		xs[i], ys[i] = p.X, p.Y
	}
	cl := camber(xs, ys, nil)
	for x := 0.80; x <= 0.98; x += 0.01 {
		up, lo := foil.Upper(x), foil.Lower(x)
		mid, th := (up.Y+lo.Y)/2, up.Y-lo.Y
		if d := math.Abs(cl.at(x) - mid); d > th/4 {
			t.Errorf("x %.2f: camber line %.5f, middle %.5f (thickness %.5f)", x, cl.at(x), mid, th)
		}
	}
	sel := make([]int32, len(pts))
	for i := range sel {
		sel[i] = int32(i)
	}
	f := newChordFrame(geometry.Point{}, geometry.Point{X: 1, Y: (foil.Upper(1).Y + foil.Lower(1).Y) / 2})
	_, sc := sectionOrder(pts, sel, f, nil)
	wrong := 0
	for i, p := range pts {
		if p.X < 0.8 || p.X > 1-tailCap {
			continue
		}
		if (sc.region[i] == regionUpper) != upper[i] {
			wrong++
		}
	}
	if wrong > 0 {
		t.Errorf("%d good points aft of 80 %% sided on the other surface", wrong)
	}
}
