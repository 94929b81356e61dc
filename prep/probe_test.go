package prep

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// ballPath returns the path of the centre of a ball of radius r rolled
// round the closed counter-clockwise polygon pts on its outside (exact
// geometry: every point of the path lies r from the polygon, Minkowski
// sum with a disc): each edge moved r along its outward normal, an arc of
// radius r round every convex vertex, and the offset edges' meeting point
// at a concave one.
func ballPath(pts []geometry.Point, r float64) []geometry.Point {
	n := len(pts)
	out := func(a, b geometry.Point) geometry.Point {
		d := b.Sub(a)
		d = d.Scale(1 / d.Norm())
		return geometry.Point{X: d.Y, Y: -d.X}
	}
	var path []geometry.Point
	for i := range n {
		p := pts[i]
		nIn, nOut := out(pts[(i+n-1)%n], p), out(p, pts[(i+1)%n])
		turn := math.Atan2(nIn.X*nOut.Y-nIn.Y*nOut.X, nIn.Dot(nOut))
		if turn < 0 { // concave: the offset edges meet
			m := nIn.Add(nOut)
			m = m.Scale(1 / m.Norm())
			path = append(path, p.Add(m.Scale(r/math.Cos(turn/2))))
			continue
		}
		a0 := math.Atan2(nIn.Y, nIn.X)
		steps := int(math.Ceil(turn / 0.02))
		for k := 0; k <= steps; k++ {
			a := a0 + turn*float64(k)/float64(max(steps, 1))
			path = append(path, p.Add(geometry.Point{X: math.Cos(a), Y: math.Sin(a)}.Scale(r)))
		}
	}
	return path
}

// sampleIrregular draws m points along the closed polyline path at gaps
// drawn log-normal (σ 0.5) about even spacing, each moved along the
// path's normal by noise of standard deviation sd: a probe program's
// uneven step.
func sampleIrregular(path []geometry.Point, m int, sd float64, rng *rand.Rand) []geometry.Point {
	n := len(path)
	cum := make([]float64, n+1)
	for i := range n {
		cum[i+1] = cum[i] + path[(i+1)%n].Dist(path[i])
	}
	gaps := make([]float64, m)
	var sum float64
	for i := range gaps {
		gaps[i] = math.Exp(0.5 * rng.NormFloat64())
		sum += gaps[i]
	}
	var out []geometry.Point
	s, j := rng.Float64()*cum[n]/float64(m), 0
	for _, g := range gaps {
		for j < n-1 && cum[j+1] < s {
			j++
		}
		a, b := path[j], path[(j+1)%n]
		u := (s - cum[j]) / (cum[j+1] - cum[j])
		d := b.Sub(a)
		nrm := geometry.Point{X: d.Y, Y: -d.X}.Scale(1 / d.Norm())
		out = append(out, a.Add(d.Scale(u)).Add(nrm.Scale(sd*rng.NormFloat64())))
		s += g / sum * cum[n]
		if s >= cum[n] {
			break
		}
	}
	return out
}

// A measuring machine's points taken without probe-radius compensation lie
// on the path of the ball's centre: the outline offset outward by the
// ball's radius, with a sharp trailing edge rounded to that radius. With
// --probe-radius, prep must give the part itself: the NACA 4-digit outline
// (NACA Report 824 equations, geometry/shape) with its true chord (the
// frame's convention: trailing-edge midpoint to the farthest point),
// its sharp corner back, and nodes on the true outline; the exact ball
// path is the disc's Minkowski sum with the polygon (ballPath). Without
// it, the chord comes out two radii long: the test also shows the
// compensation is what closes that.
func TestPrepareProbeRadius(t *testing.T) {
	const (
		chordMM  = 150.0
		noiseMM  = 0.005
		twistDeg = -14.0
		offX     = 812.0
		offY     = -233.0
	)
	for _, tc := range []struct {
		code     string
		sharp    bool
		ball     float64 // radius, mm
		points   int
		wantKind string
	}{
		{"0012", true, 1.5, 500, "sharp"},
		{"2412", true, 1.0, 400, "sharp"},
		{"4415", true, 2.5, 600, "sharp"},
		{"2412", false, 0.5, 500, ""},
	} {
		name := fmt.Sprintf("%s/sharp=%v/r=%gmm", tc.code, tc.sharp, tc.ball)
		t.Run(name, func(t *testing.T) {
			n, err := shape.ParseNACA4(tc.code)
			if err != nil {
				t.Fatal(err)
			}
			n.SharpTE = tc.sharp
			dense := n.Loop(3000)
			if tc.sharp {
				dense = dense[:len(dense)-1] // the corner once
			}
			s, c := math.Sincos(twistDeg * math.Pi / 180)
			toPart := func(q geometry.Point) geometry.Point {
				return geometry.Point{X: offX + chordMM*(c*q.X+s*q.Y), Y: offY + chordMM*(-s*q.X+c*q.Y)}
			}
			part := make([]geometry.Point, len(dense))
			for i, q := range dense {
				part[i] = toPart(q)
			}
			rng := rand.New(rand.NewPCG(uint64(len(name)), 7))
			pts := sampleIrregular(ballPath(part, tc.ball), tc.points, noiseMM, rng)
			var buf bytes.Buffer
			buf.WriteString("x,y\n")
			for _, p := range pts {
				fmt.Fprintf(&buf, "%.4f,%.4f\n", p.X, p.Y)
			}
			// The frame's convention (DESIGN.md): the chord runs from the
			// point farthest from the trailing-edge midpoint to that
			// midpoint, and the twist is that line's angle in the part.
			teMid := dense[0].Add(dense[len(dense)-1]).Scale(0.5)
			var far float64
			var le geometry.Point
			for _, q := range dense {
				if d := q.Dist(teMid); d > far {
					far, le = d, q
				}
			}
			wantChord := chordMM * far
			dir := toPart(teMid).Sub(toPart(le))
			wantTwist := -math.Atan2(dir.Y, dir.X) * 180 / math.Pi

			bare, err := Prepare("ball", []File{NewFile("ball.csv", buf.Bytes())}, Settings{Units: "mm"})
			if err != nil {
				t.Fatal(err)
			}
			p, err := Prepare("ball", []File{NewFile("ball.csv", buf.Bytes())}, Settings{Units: "mm", ProbeRadius: fmt.Sprintf("%gmm", tc.ball)})
			if err != nil {
				t.Fatal(err)
			}
			if got := p.Section.Source.ProbeRadius; got != tc.ball {
				t.Errorf("document's probe radius %g, want %g", got, tc.ball)
			}
			bareErr := math.Abs(bare.Shape.Frame.Chord - wantChord)
			chordErr := math.Abs(p.Shape.Frame.Chord - wantChord)
			if bareErr < 1.5*tc.ball {
				t.Errorf("uncompensated chord %.3f mm is %.3f mm off the part's %.3f: want about two radii (%g mm)", bare.Shape.Frame.Chord, bareErr, wantChord, 2*tc.ball)
			}
			if bound := math.Max(p.Uncertainty.Chord, 0.001*wantChord); chordErr > bound {
				t.Errorf("chord %.4f mm, true %.4f mm: %.4f off, beyond %.4f", p.Shape.Frame.Chord, wantChord, chordErr, bound)
			}
			if d := math.Abs(p.Shape.Frame.TwistDeg - wantTwist); d > math.Max(p.Uncertainty.TwistDeg, 0.05) {
				t.Errorf("twist %.4f°, true %.4f°", p.Shape.Frame.TwistDeg, wantTwist)
			}
			if tc.wantKind != "" && p.Section.TrailingEdge.Kind != tc.wantKind {
				t.Errorf("trailing edge %s, want %s (uncompensated: %s)", p.Section.TrailingEdge.Kind, tc.wantKind, bare.Section.TrailingEdge.Kind)
			}
			for _, w := range p.Section.Warnings {
				if strings.Contains(w, "probe ball") {
					t.Errorf("warning on true ball centres: %s", w)
				}
			}
			// The nodes, placed back in the part, against the true outline.
			var worst, sum float64
			for _, q := range p.Section.Nodes {
				d := distToPolyline(p.Shape.Frame.ToPart(q), part, func(q geometry.Point) geometry.Point { return q }) / chordMM
				worst = math.Max(worst, d)
				sum += d
			}
			mean := sum / float64(len(p.Section.Nodes))
			t.Logf("chord off %.4f mm (bare %.3f, TE %s), bound %.4f; nodes off mean %.2g c, worst %.2g c, surface bound %.2g c; TE %s; warnings %q",
				chordErr, bareErr, bare.Section.TrailingEdge.Kind, p.Uncertainty.Chord, mean, worst, p.Uncertainty.Surface, p.Section.TrailingEdge.Kind, p.Section.Warnings)
			if worst > math.Max(p.Uncertainty.Surface, 0.002) {
				t.Errorf("nodes up to %.3g c off the true outline, beyond the stated %.3g c", worst, p.Uncertainty.Surface)
			}
			if mean > 2e-4 {
				t.Errorf("nodes %.3g c off the true outline on average, want at most 2e-4 c (noise %.1g c)", mean, noiseMM/chordMM)
			}
		})
	}
}

// Points already on the part (compensated by the machine), given a probe
// radius all the same, turn round their trailing edge tighter than a
// ball's centre can (it rounds every corner, and the end, at its own
// radius or more): prep says so. The NACA 2412's Report 824 edge is
// 0.0105 t = 0.19 mm thick on a 150 mm chord, its corners far tighter
// than half a 1 mm ball's radius.
func TestProbeRadiusOnCompensatedPoints(t *testing.T) {
	n := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12}
	var part []geometry.Point
	for _, q := range n.Loop(3000) {
		part = append(part, q.Scale(150))
	}
	pts := sampleIrregular(part, 500, 0.005, rand.New(rand.NewPCG(3, 4)))
	var buf bytes.Buffer
	for _, p := range pts {
		fmt.Fprintf(&buf, "%.4f %.4f\n", p.X, p.Y)
	}
	p, err := Prepare("on-part", []File{NewFile("on-part.txt", buf.Bytes())}, Settings{Units: "mm", ProbeRadius: "1"})
	if err != nil {
		t.Fatal(err)
	}
	for _, w := range p.Section.Warnings {
		if strings.Contains(w, "under a quarter of the probe ball's 1 mm") {
			return
		}
	}
	t.Errorf("no warning that the points end thinner than the ball; warnings %q", p.Section.Warnings)
}

// A probe radius given as a share of the chord, or negative, is refused
// with the setting named.
func TestProbeRadiusRefused(t *testing.T) {
	data := []byte("x,y\n0,0\n1,1\n")
	for _, r := range []string{"0.01c", "-1mm", "wide"} {
		_, err := Prepare("p", []File{NewFile("p.csv", data)}, Settings{Units: "mm", ProbeRadius: r})
		if !errors.Is(err, ErrProbeRadius) {
			t.Errorf("probe radius %q: error %v, want ErrProbeRadius", r, err)
		}
	}
}
