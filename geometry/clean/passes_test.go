package clean

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// passSample is one probed point with its true arc position round the
// section loop (chord units, from the upper trailing edge over the nose).
type passSample struct {
	p   geometry.Point
	arc float64
}

// passLoop tabulates the closed NACA 4-digit loop n (NACA Report 824
// equations, via NACA4) finely, with the cumulative arc length: the
// probe paths below are drawn on it.
type passLoop struct {
	pts []geometry.Point
	cum []float64
	le  float64 // arc position of the leading edge
}

func newPassLoop(n shape.NACA4) passLoop {
	dense := n.Loop(6000)
	cum := make([]float64, len(dense))
	for i := 1; i < len(dense); i++ {
		cum[i] = cum[i-1] + dense[i].Dist(dense[i-1])
	}
	return passLoop{pts: dense, cum: cum, le: cum[len(dense)/2]}
}

func (l passLoop) length() float64 { return l.cum[len(l.cum)-1] }

// at returns the loop's point at arc position s and the unit normal there
// (outward for the counter-clockwise loop).
func (l passLoop) at(s float64) (geometry.Point, geometry.Point) {
	k := 1
	for k < len(l.cum)-1 && l.cum[k] < s {
		k++
	}
	a, b := l.pts[k-1], l.pts[k]
	f := (s - l.cum[k-1]) / (l.cum[k] - l.cum[k-1])
	d := b.Sub(a).Scale(1 / b.Dist(a))
	return a.Add(b.Sub(a).Scale(f)), geometry.Point{X: d.Y, Y: -d.X}
}

// probe samples the stretch [from, to] of arc in count steps whose lengths
// vary at random by a factor of up to three (an operator's uneven pace),
// with Gaussian noise sd normal to the surface, the whole pass moved by
// shift; chord, rot and off place the section on the machine table.
func (l passLoop) probe(rng *rand.Rand, from, to float64, count int, sd float64, shift geometry.Point, chord, rot float64, off geometry.Point) []passSample {
	steps := make([]float64, count)
	var sum float64
	for i := range steps {
		steps[i] = 1 + 2*rng.Float64()
		sum += steps[i]
	}
	out := make([]passSample, 0, count)
	s := from
	for _, st := range steps {
		q, nrm := l.at(s)
		q = q.Add(nrm.Scale(sd / chord * rng.NormFloat64())).Add(shift.Scale(1 / chord))
		out = append(out, passSample{p: q.Scale(chord).Rotate(rot).Add(off), arc: s})
		s += st / sum * (to - from)
	}
	return out
}

// checkPassOrder cleans the samples (in the order given, as a file lists
// them) and checks that no point is dropped, that the contour holds them
// all, and that it runs round the section by true arc position: each step
// forward along the loop but for swaps of points whose true positions lie
// closer than tol (chord units), where two passes measure the same stretch
// and the order between their points is decided by noise.
func checkPassOrder(t *testing.T, smp []passSample, chord, tol float64) *Report {
	t.Helper()
	c := &geometry.Cloud{Dim: 2}
	for i, s := range smp {
		c.Points = append(c.Points, geometry.Vec3{X: s.p.X, Y: s.p.Y})
		c.Origins = append(c.Origins, geometry.Origin{File: "passes.csv", Line: i + 1})
	}
	ct, rep, err := Clean(c, Options{})
	if err != nil {
		t.Fatalf("Clean: %v", err)
	}
	if len(rep.Dropped) > 0 {
		d := rep.Dropped[0]
		t.Fatalf("%d good point(s) dropped, first %s: %s, %.3g off (%.1f robust sigmas)", len(rep.Dropped), d.Origin, d.Reason, d.Distance, d.Sigmas)
	}
	if len(ct.Points) != len(smp) {
		t.Fatalf("contour holds %d of %d points", len(ct.Points), len(smp))
	}
	// The arc positions along the contour, starting anywhere, must rise
	// once round the loop (counter-clockwise, as Clean orients it).
	arcs := make([]float64, len(ct.Points))
	for k, o := range ct.Origins {
		arcs[k] = smp[o.Line-1].arc
	}
	start := 0
	for k := range arcs {
		if arcs[k] < arcs[start] {
			start = k
		}
	}
	back := 0
	for k := 1; k < len(arcs); k++ {
		a, b := arcs[(start+k-1)%len(arcs)], arcs[(start+k)%len(arcs)]
		if b < a-tol {
			t.Errorf("contour steps back along the section from arc %.5f c to %.5f c (position %d of %d)", a, b, (start+k)%len(arcs), len(arcs))
			if back++; back > 5 {
				t.FailNow()
			}
		}
	}
	return rep
}

// A CMM program probes the upper surface of a NACA 2412 (NACA Report 824)
// with a step ten times finer than the lower, in two passes from the nose
// to the tail, on a part twisted on the table: every point is good, none
// may be dropped (the coarse surface's points lie ten fine steps apart and
// are no outliers), and the loop must visit them in order round the
// section.
func TestPassesOneSurfaceDenser(t *testing.T) {
	n, err := shape.ParseNACA4("2412")
	if err != nil {
		t.Fatal(err)
	}
	l := newPassLoop(n)
	const chord, sd = 150.0, 0.005 // mm: a 150 mm model probed on a CMM
	rot, off := 0.3, geometry.Point{X: 412, Y: -88}
	for seed := range uint64(3) {
		rng := rand.New(rand.NewPCG(seed, 19))
		// Both passes leave out the last 0.2 % of the chord at the
		// tail: a probe cannot touch a sharp edge.
		end := 0.002
		upper := l.probe(rng, l.le, end, 400, sd, geometry.Point{}, chord, rot, off)
		lower := l.probe(rng, l.le, l.length()-end, 40, sd, geometry.Point{}, chord, rot, off)
		// The upper pass runs from the nose to the tail, as probed.
		var smp []passSample
		for i := len(upper) - 1; i >= 0; i-- {
			smp = append(smp, upper[i])
		}
		smp = append(smp, lower[1:]...) // the nose once
		checkPassOrder(t, smp, chord, 0)
	}
}

// Two passes overlap at the nose: the first runs from the tail over the
// nose and on for 3 % of the perimeter along the lower surface, which the
// second, probed after the part was re-seated 0.02 mm away (four times the
// noise), measures again on its way to the tail. The overlap's points are
// good points of both passes: none may be dropped, and the loop takes them
// by their place along the surface, not hopping between the passes (points
// of the two passes closer along it than their offset may come in either
// order). The passes' disagreement is measured: the move's component
// normal to the overlapped stretch (most of the move), averaged over it,
// within a quarter of the move; passes that did not move are not said to
// disagree.
func TestPassesOverlapAtNose(t *testing.T) {
	n, err := shape.ParseNACA4("2412")
	if err != nil {
		t.Fatal(err)
	}
	l := newPassLoop(n)
	const chord, sd = 150.0, 0.005 // mm
	rot, off := -0.2, geometry.Point{X: -30, Y: 250}
	L := l.length()
	for seed := range uint64(6) {
		moved := 0.02
		if seed%2 == 1 {
			moved = 0
		}
		rng := rand.New(rand.NewPCG(seed, 29))
		// Moved within 45° of the normal to the overlapped stretch, out or
		// in: most of the move lies across it.
		_, mid := l.at(l.le + 0.015*L)
		if rng.IntN(2) == 0 {
			mid = mid.Scale(-1)
		}
		shift := mid.Rotate((rng.Float64() - 0.5) * math.Pi / 2).Scale(moved)
		end := 0.002
		first := l.probe(rng, end, l.le+0.03*L, 300, sd, geometry.Point{}, chord, rot, off)
		second := l.probe(rng, l.le, L-end, 260, sd, shift, chord, rot, off)
		smp := append(first, second...)
		rep := checkPassOrder(t, smp, chord, max(moved, sd)/chord)
		if moved == 0 {
			if len(rep.Passes) > 0 {
				t.Errorf("seed %d: passes that did not move said to lie %.3g mm apart (± %.2g)", seed, rep.Passes[0].Offset, rep.Passes[0].Spread)
			}
			continue
		}
		// The move's outward component where the passes overlap, in the
		// table's frame (the section is turned by rot on it).
		var want float64
		var k int
		for _, s := range second {
			if s.arc <= l.le+0.03*L {
				_, nrm := l.at(s.arc)
				want += shift.Dot(nrm)
				k++
			}
		}
		want /= float64(k)
		if len(rep.Passes) != 1 {
			t.Errorf("seed %d: %d pass offsets reported, want 1 (the second pass moved %.3g mm outward)", seed, len(rep.Passes), want)
			continue
		}
		got := rep.Passes[0]
		if math.Abs(got.Offset-want) > moved/4 || got.First.Line != 1 || got.Second.Line != len(first)+1 {
			t.Errorf("seed %d: passes from lines %d and %d lie %.4f mm apart (± %.2g), want lines 1 and %d, %.4f mm", seed, got.First.Line, got.Second.Line, got.Offset, got.Spread, len(first)+1, want)
		}
	}
}

// A CMM program probes a thin section, NACA 0005 (NACA Report 824),
// with a step sixteen times finer on the upper surface than on the lower:
// over most of the chord the section is thinner than the coarse step, so
// every coarse point's nearest neighbours lie on the other surface. The
// coarse points are still good points of their own surface: none may be
// dropped, the loop must visit them in order, and the trailing edge must
// be found at the tail, not at the nose (whose widths, counted by points,
// are the fine surface's alone).
func TestPassesThinSurfaceCoarser(t *testing.T) {
	n, err := shape.ParseNACA4("0005")
	if err != nil {
		t.Fatal(err)
	}
	l := newPassLoop(n)
	const chord, sd = 40.0, 0.004 // mm: a 40 mm blade section on a CMM
	rot, off := -0.25, geometry.Point{X: -30, Y: 21}
	tail, _ := l.at(0)
	tail = tail.Scale(chord).Rotate(rot).Add(off)
	for seed := range uint64(3) {
		rng := rand.New(rand.NewPCG(seed, 20))
		end := 0.002
		upper := l.probe(rng, l.le, end, 640, sd, geometry.Point{}, chord, rot, off)
		lower := l.probe(rng, l.le, l.length()-end, 40, sd, geometry.Point{}, chord, rot, off)
		var smp []passSample
		for i := len(upper) - 1; i >= 0; i-- {
			smp = append(smp, upper[i])
		}
		smp = append(smp, lower[1:]...)
		rep := checkPassOrder(t, smp, chord, 0)
		if rep.Edge == nil {
			t.Fatalf("seed %d: no trailing edge found", seed)
		}
		// Within 2 % of the chord of the true tail: the nose lies a
		// chord away.
		if d := rep.Edge.Upper.Dist(tail); d > 0.02*chord {
			t.Errorf("seed %d: trailing edge found at %v, %.3g mm from the tail %v", seed, rep.Edge.Upper, d, tail)
		}
	}
}
