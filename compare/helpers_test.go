package compare

import (
	"bytes"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/props"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/prep"
	"github.com/foilwright/foilwright/repanel"
)

// part describes invented measured points of a NACA 4-digit section (NACA
// Report 824) placed on a part: chord (mm), twist (degrees nose-up), the
// leading edge, with a defect (a normal offset in mm as a function of the
// chord station and surface) and probing noise.
type part struct {
	foil   shape.NACA4
	chord  float64
	twist  float64
	le     geometry.Point
	per    int                                 // points per surface
	defect func(x float64, upper bool) float64 // mm, > 0 adds material
	move   func(geometry.Point) geometry.Point // a motion of the whole part after placing, or nil
	noise  float64                             // mm, standard deviation along the normal
	seed   uint64
}

// points returns the part's points in node order (upper trailing edge to
// lower trailing edge), with the chord stations and surfaces they stand
// for.
func (p part) points() ([]geometry.Point, []float64, []bool) {
	rng := rand.New(rand.NewPCG(p.seed, 15))
	var pts []geometry.Point
	var xs []float64
	var ups []bool
	tw := -p.twist * math.Pi / 180
	add := func(x float64, upper bool) {
		var q geometry.Point
		if upper {
			q = p.foil.Upper(x)
		} else {
			q = p.foil.Lower(x)
		}
		// Outward normal of the surface at x, from a small chord step.
		h := 1e-6
		var a, b geometry.Point
		x0, x1 := math.Max(x-h, 0), math.Min(x+h, 1)
		if upper {
			a, b = p.foil.Upper(x1), p.foil.Upper(x0)
		} else {
			a, b = p.foil.Lower(x0), p.foil.Lower(x1)
		}
		t := b.Sub(a)
		n := geometry.Point{X: t.Y, Y: -t.X}.Scale(1 / t.Norm())
		if x == 0 {
			n = geometry.Point{X: -1}
		}
		off := 0.0
		if p.defect != nil {
			off = p.defect(x, upper)
		}
		off += p.noise * rng.NormFloat64()
		v := q.Scale(p.chord).Add(n.Scale(off)).Rotate(tw).Add(p.le)
		if p.move != nil {
			v = p.move(v)
		}
		pts, xs, ups = append(pts, v), append(xs, x), append(ups, upper)
	}
	for i := p.per; i >= 1; i-- {
		add(shape.CosineStation(i, p.per), true)
	}
	add(0, true)
	for i := 1; i <= p.per; i++ {
		add(shape.CosineStation(i, p.per), false)
	}
	return pts, xs, ups
}

// csv returns the points as a probe file in millimetres.
func csvOf(pts []geometry.Point) []byte {
	var b bytes.Buffer
	b.WriteString("# invented test data\n# units: mm\nx,y\n")
	for _, q := range pts {
		fmt.Fprintf(&b, "%.17g,%.17g\n", q.X, q.Y)
	}
	return b.Bytes()
}

// measure runs the geometry chain on pts as prep would and returns the
// measurement, with every point kept.
func measure(t testing.TB, pts []geometry.Point) *Measurement {
	t.Helper()
	p, err := prep.Prepare("probe", []prep.File{prep.NewFile("probe.csv", csvOf(pts))}, prep.Settings{KeepOutliers: ptr(true)})
	if err != nil {
		t.Fatal(err)
	}
	return FromPreparation(p)
}

// design places a reference shape at chord, twist and LE.
func design(t testing.TB, src string, m *Measurement, chord, twist *float64, le *geometry.Point) *Design {
	t.Helper()
	d, err := NewDesign(DesignSpec{Source: src, Chord: chord, TwistDeg: twist, Offset: le}, m, repanel.Options{}, props.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return d
}
