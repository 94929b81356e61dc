package scangen

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// A fixture's face is what WithFixture says: its points lie on a straight
// face off the section by about its offset (the nearest outline point at
// least half of it away; the noise here is far below), at its place; and
// adding it leaves the case's other lines as the plain case has them, so
// the plain cases of a seed stay comparable.
func TestFixtureFace(t *testing.T) {
	places := map[string]int{}
	for seed := range uint64(40) {
		spec := WithFixture(hazardSpec(), seed)
		f := spec.Defects.Fixture
		places[f.Place]++
		if f.Points < 3 || f.Points > 12 || f.Length < 0.02 || f.Length > 0.1 || f.Offset < 0.01 || f.Offset > 0.15 {
			t.Fatalf("seed %d: fixture %+v outside its ranges", seed, *f)
		}
		sec, err := spec.Shape.Build()
		if err != nil {
			t.Fatal(err)
		}
		sh := sec.Shape
		pts := fixturePoints(f, sh, 0, rand.New(rand.NewPCG(seed, 1)))
		if len(pts) != f.Points {
			t.Fatalf("seed %d: %d points, want %d", seed, len(pts), f.Points)
		}
		a, b := pts[0].q, pts[len(pts)-1].q
		if d := a.Dist(b); math.Abs(d-f.Length) > 1e-12 {
			t.Errorf("seed %d: face %.4g long, want %.4g", seed, d, f.Length)
		}
		for _, p := range pts {
			if d, _ := sh.Nearest(p.q); d < f.Offset/2 {
				t.Errorf("seed %d (%s): fixture point %v only %.4g from the outline, offset %.4g", seed, f.Place, p.q, d, f.Offset)
			}
			if d := lineDistance(p.q, a, b); d > 1e-12 {
				t.Errorf("seed %d: fixture point %v off its face by %.3g", seed, p.q, d)
			}
			switch f.Place {
			case "beyond-aft":
				if p.q.X <= 1 {
					t.Errorf("seed %d: face beyond the trailing edge at x = %.4g", seed, p.q.X)
				}
			case "beyond-fore":
				if p.q.X >= 0 {
					t.Errorf("seed %d: face beyond the leading edge at x = %.4g", seed, p.q.X)
				}
			}
		}
		plain, err := Generate(hazardSpec(), seed)
		if err != nil {
			t.Fatal(err)
		}
		with, err := Generate(spec, seed)
		if err != nil {
			t.Fatal(err)
		}
		var good, fixture []Line
		for _, l := range with.Truth.Lines {
			switch l.Kind {
			case LineFixture:
				fixture = append(fixture, l)
			default:
				good = append(good, l)
			}
		}
		if len(fixture) != f.Points {
			t.Errorf("seed %d: %d fixture lines, want %d", seed, len(fixture), f.Points)
		}
		if !slices.Equal(good, plain.Truth.Lines) {
			t.Errorf("seed %d: the fixture changed the case's other lines", seed)
		}
	}
	for _, p := range []string{"below-aft", "below-fore", "beyond-aft", "beyond-fore"} {
		if places[p] == 0 {
			t.Errorf("place %s never drawn in 40 seeds", p)
		}
	}
}

// lineDistance is the distance of p from the line through a and b.
func lineDistance(p, a, b geometry.Point) float64 {
	d := b.Sub(a)
	u := p.Sub(a)
	return math.Abs(d.X*u.Y-d.Y*u.X) / math.Hypot(d.X, d.Y)
}
