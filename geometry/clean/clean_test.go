package clean

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// cleanTestSample returns count points spaced evenly by arc length around
// the closed NACA 4-digit loop n (NACA Report 824 equations, via NACA4),
// scaled to chord, rotated by rot (radians) and shifted by off. The samples
// start at the upper trailing edge and run counter-clockwise; for an open
// trailing edge the loop is closed by the straight trailing-edge base.
// Arc-length spacing is chosen over cosine spacing because it is the hard
// case for ordering: near the trailing edge the upper and lower surfaces
// are closer to each other than neighbouring points along a surface.
func cleanTestSample(n shape.NACA4, chord, rot float64, off geometry.Point, count int) []geometry.Point {
	dense := n.Loop(4000)
	if dense[0].Dist(dense[len(dense)-1]) < 1e-15 {
		dense = dense[:len(dense)-1]
	}
	m := len(dense)
	cum := make([]float64, m+1)
	for i := range m {
		cum[i+1] = cum[i] + dense[i].Dist(dense[(i+1)%m])
	}
	total := cum[m]
	out := make([]geometry.Point, count)
	seg := 0
	for k := range count {
		s := total * float64(k) / float64(count)
		for cum[seg+1] < s {
			seg++
		}
		f := (s - cum[seg]) / (cum[seg+1] - cum[seg])
		a, b := dense[seg], dense[(seg+1)%m]
		p := a.Add(b.Sub(a).Scale(f))
		out[k] = p.Scale(chord).Rotate(rot).Add(off)
	}
	return out
}

// cleanTestEntry is one point of a generated cloud and what it truly is.
type cleanTestEntry struct {
	p       geometry.Point
	loop    int // which sampled loop it belongs to
	pos     int // position in the loop; −1 for a planted outlier
	outlier bool
}

// cleanTestCloud builds a scan-like cloud from the loops: Gaussian noise of
// standard deviation noise on every sample, outFrac·count planted gross
// outliers displaced 2 to 5 units normal to the surface at random places
// (re-drawn when that lands within 1 unit of a sample, as it can through a
// thin trailing edge; not checked for loops above 5000 points, which only
// benchmarks use),
// dupFrac·count duplicates (half exact, half displaced by 1e-5 units), all
// shuffled. The set-up is this test's own. It returns the cloud and, for
// each point of it, the truth.
func cleanTestCloud(rng *rand.Rand, loops [][]geometry.Point, noise, outFrac, dupFrac float64) (*geometry.Cloud, []cleanTestEntry) {
	var es []cleanTestEntry
	for l, loop := range loops {
		n := len(loop)
		for k, p := range loop {
			es = append(es, cleanTestEntry{p: p.Add(geometry.Point{X: rng.NormFloat64() * noise, Y: rng.NormFloat64() * noise}), loop: l, pos: k})
		}
		for range int(math.Round(outFrac * float64(n))) {
			for {
				k := rng.IntN(n)
				t := loop[(k+1)%n].Sub(loop[(k+n-1)%n])
				nrm := geometry.Point{X: -t.Y, Y: t.X}.Scale(1 / t.Norm())
				d := 2 + 3*rng.Float64()
				if rng.IntN(2) == 0 {
					d = -d
				}
				p := loop[k].Add(nrm.Scale(d))
				if n <= 5000 && cleanTestNear(loops, p, 1) {
					// Pushed through a thin section onto (or next to) another
					// surface: no longer an outlier of any kind; draw again.
					continue
				}
				es = append(es, cleanTestEntry{p: p, loop: l, pos: -1, outlier: true})
				break
			}
		}
	}
	good := len(es)
	for j := range int(math.Round(dupFrac * float64(good))) {
		e := es[rng.IntN(good)]
		if e.outlier {
			continue
		}
		if j%2 == 1 {
			a := rng.Float64() * 2 * math.Pi
			e.p = e.p.Add(geometry.Point{X: 1e-5 * math.Cos(a), Y: 1e-5 * math.Sin(a)})
		}
		es = append(es, e)
	}
	rng.Shuffle(len(es), func(i, j int) { es[i], es[j] = es[j], es[i] })
	c := &geometry.Cloud{Dim: 2, Units: geometry.Millimetre, Format: "test"}
	for i, e := range es {
		c.Points = append(c.Points, geometry.Vec3{X: e.p.X, Y: e.p.Y, Z: 0})
		c.Origins = append(c.Origins, geometry.Origin{File: "scan.csv", Line: i + 1})
	}
	return c, es
}

// cleanTestNear reports whether p is within d of a point of loops.
func cleanTestNear(loops [][]geometry.Point, p geometry.Point, d float64) bool {
	for _, l := range loops {
		for _, q := range l {
			if p.Dist(q) < d {
				return true
			}
		}
	}
	return false
}

// cleanTestScore measures a contour against the truth: the fraction of
// consecutive pairs of good points that are true neighbours (points
// between them that are missing from the contour are skipped), the
// fraction of planted outliers dropped, and the fraction of good sample
// positions of loop that are missing.
func cleanTestScore(ct *geometry.Contour, es []cleanTestEntry, loop, count int) (nbrFrac, outDropped, goodLost float64) {
	present := make([]bool, count)
	var poss []int
	outliers, outIn := 0, 0
	for _, e := range es {
		if e.outlier && e.loop == loop {
			outliers++
		}
	}
	seenOut := map[int]bool{}
	for _, o := range ct.Origins {
		e := es[o.Line-1]
		if e.outlier {
			if !seenOut[o.Line] {
				outIn++
				seenOut[o.Line] = true
			}
			poss = append(poss, -1)
			continue
		}
		if e.loop != loop {
			poss = append(poss, -2)
			continue
		}
		present[e.pos] = true
		poss = append(poss, e.pos)
	}
	pairs, good := 0, 0
	n := len(poss)
	for k := range n {
		a, b := poss[k], poss[(k+1)%n]
		pairs++
		if a < 0 || b < 0 {
			continue
		}
		ok := true
		fw := (b - a + count) % count
		bw := (a - b + count) % count
		step := min(fw, bw)
		dir := 1
		if bw < fw {
			dir = -1
		}
		for s := 1; s < step; s++ {
			if present[((a+dir*s)%count+count)%count] {
				ok = false
			}
		}
		if ok && step >= 1 {
			good++
		}
	}
	lost := 0
	for _, p := range present {
		if !p {
			lost++
		}
	}
	if outliers > 0 {
		outDropped = 1 - float64(outIn)/float64(outliers)
	} else {
		outDropped = 1
	}
	return float64(good) / float64(pairs), outDropped, float64(lost) / float64(count)
}

// cleanTestOriented checks that ct starts within tol of te and runs
// counter-clockwise.
func cleanTestOriented(t *testing.T, ct *geometry.Contour, te geometry.Point, tol float64) {
	t.Helper()
	if a := geometry.SignedArea(ct.Points); a <= 0 {
		t.Errorf("signed area %g: want counter-clockwise (> 0)", a)
	}
	if d := ct.Points[0].Dist(te); d > tol {
		t.Errorf("contour starts at %v, %.3g from the trailing edge %v (tolerance %.3g)", ct.Points[0], d, te, tol)
	}
}

const (
	cleanChord = 152.4 // mm, 6 in
	cleanRot   = 7 * math.Pi / 180
	cleanCount = 400
	cleanNoise = 0.02 // mm
)

var cleanOff = geometry.Point{X: 250, Y: -40}

// cleanTE returns the trailing-edge midpoint of n in the test frame.
func cleanTE(n shape.NACA4) geometry.Point {
	m := n.Upper(1).Add(n.Lower(1)).Scale(0.5)
	return m.Scale(cleanChord).Rotate(cleanRot).Add(cleanOff)
}

// The sections come from the NACA 4-digit equations of NACA Report 824
// (Abbott, von Doenhoff and Stivers 1945) via NACA4; the noise, outlier and
// duplicate set-up is this test's own. Limits are the brief's: ≥ 99% of
// consecutive pairs are true neighbours, ≥ 95% of the planted outliers and
// ≤ 0.5% of the good points dropped.
func TestCleanScan(t *testing.T) {
	for _, tc := range []struct {
		code  string
		sharp bool
		seed  uint64
	}{
		{"0012", false, 1}, {"0012", true, 2}, {"2412", false, 3}, {"2412", true, 4},
		{"0012", false, 5}, {"2412", true, 6},
	} {
		name := fmt.Sprintf("%s/sharp=%v/seed=%d", tc.code, tc.sharp, tc.seed)
		t.Run(name, func(t *testing.T) {
			n, err := shape.ParseNACA4(tc.code)
			if err != nil {
				t.Fatal(err)
			}
			n.SharpTE = tc.sharp
			rng := rand.New(rand.NewPCG(tc.seed, 2026))
			loop := cleanTestSample(n, cleanChord, cleanRot, cleanOff, cleanCount)
			c, es := cleanTestCloud(rng, [][]geometry.Point{loop}, cleanNoise, 0.01, 0.02)
			ct, rep, err := Clean(c, Options{})
			if err != nil {
				t.Fatal(err)
			}
			nf, od, gl := cleanTestScore(ct, es, 0, cleanCount)
			t.Logf("read %d, merged %d, dropped %d, loops %d: neighbours %.4f, outliers dropped %.3f, good lost %.4f, σ %.4f",
				rep.Read, len(rep.Merged), len(rep.Dropped), len(rep.Loops), nf, od, gl, rep.Sigma)
			if nf < 0.99 {
				t.Errorf("true neighbour pairs %.4f, want ≥ 0.99", nf)
			}
			if od < 0.95 {
				t.Errorf("planted outliers dropped %.3f, want ≥ 0.95", od)
			}
			if gl > 0.005 {
				t.Errorf("good points lost %.4f, want ≤ 0.005", gl)
			}
			cleanTestOriented(t, ct, cleanTE(n), 2.5*cleanChord*0.0105*n.Thickness+1)
			if rep.OrderKept {
				t.Error("OrderKept set for an unordered cloud")
			}
			// KeepOutliers reports the same outliers and keeps them all.
			kt, krep, err := Clean(c, Options{KeepOutliers: true})
			if err != nil {
				t.Fatal(err)
			}
			if _, kod, _ := cleanTestScore(kt, es, 0, cleanCount); kod != 0 || len(krep.Dropped) != len(rep.Dropped) || kt.Len() != ct.Len()+len(rep.Dropped) {
				t.Errorf("KeepOutliers: %d reported (want %d), %d points (want %d), outliers dropped %.3f (want 0)",
					len(krep.Dropped), len(rep.Dropped), kt.Len(), ct.Len()+len(rep.Dropped), kod)
			}
		})
	}
}

// Clean input loses no point: noise-free and noisy samples of NACA 4-digit
// sections (NACA Report 824 equations), shuffled, with neither outliers
// nor duplicates; and cosine-spaced loops straight from NACA4.Loop.
func TestCleanKeepsCleanInput(t *testing.T) {
	for _, tc := range []struct {
		code   string
		sharp  bool
		noise  float64
		cosine bool
	}{
		{"0012", false, 0, false}, {"0012", true, 0, false}, {"2412", false, 0, false}, {"2412", true, 0, false},
		{"0012", false, cleanNoise, false}, {"2412", true, cleanNoise, false},
		{"0012", false, 0, true}, {"2412", true, 0, true}, {"4415", false, 0, true},
		// Cosine spacing puts points 0.013 mm apart at the trailing edge, 0.004
		// mm across it, so the noise must stay below that for the true order to
		// be defined: 0.0005 mm is the rounding of a file written to 3 decimals.
		{"0012", true, 0.0005, true},
	} {
		t.Run(fmt.Sprintf("%s/sharp=%v/noise=%g/cosine=%v", tc.code, tc.sharp, tc.noise, tc.cosine), func(t *testing.T) {
			n, err := shape.ParseNACA4(tc.code)
			if err != nil {
				t.Fatal(err)
			}
			n.SharpTE = tc.sharp
			var loop []geometry.Point
			if tc.cosine {
				for _, p := range n.Loop(120) {
					loop = append(loop, p.Scale(cleanChord).Rotate(cleanRot).Add(cleanOff))
				}
				if tc.sharp {
					loop = loop[:len(loop)-1]
				}
			} else {
				loop = cleanTestSample(n, cleanChord, cleanRot, cleanOff, cleanCount)
			}
			rng := rand.New(rand.NewPCG(7, 7))
			c, es := cleanTestCloud(rng, [][]geometry.Point{loop}, tc.noise, 0, 0)
			ct, rep, err := Clean(c, Options{})
			if err != nil {
				t.Fatal(err)
			}
			if len(rep.Dropped) != 0 || len(rep.Merged) != 0 {
				t.Errorf("dropped %d, merged %d point(s) of clean input; first drop %+v", len(rep.Dropped), len(rep.Merged), rep.Dropped)
			}
			nf, _, gl := cleanTestScore(ct, es, 0, len(loop))
			if nf < 1 || gl > 0 {
				t.Errorf("neighbours %.4f (want 1), lost %.4f (want 0)", nf, gl)
			}
			// The walk starts at the trailing edge: the apex of a sharp one, the
			// upper corner of a blunt one (within one point spacing).
			upperTE := n.Upper(1).Scale(cleanChord).Rotate(cleanRot).Add(cleanOff)
			cleanTestOriented(t, ct, upperTE, loop[0].Dist(loop[1])+1e-9)
		})
	}
}

// An ordered listing (a coordinate file in node order, cosine-spaced from
// the NACA Report 824 equations via NACA4.Loop) keeps its own order; the
// same points flagged ordered but shuffled are reordered, and say why.
func TestCleanOrderedInput(t *testing.T) {
	n, err := shape.ParseNACA4("2412")
	if err != nil {
		t.Fatal(err)
	}
	var loop []geometry.Point
	for _, p := range n.Loop(80) {
		loop = append(loop, p.Scale(cleanChord).Rotate(cleanRot).Add(cleanOff))
	}
	mk := func(pts []geometry.Point) *geometry.Cloud {
		c := &geometry.Cloud{Dim: 2, Ordered: true}
		for i, p := range pts {
			c.Points = append(c.Points, geometry.Vec3{X: p.X, Y: p.Y, Z: 0})
			c.Origins = append(c.Origins, geometry.Origin{File: "list.dat", Line: i + 2})
		}
		return c
	}
	t.Run("kept", func(t *testing.T) {
		// Start the listing at the leading edge, run clockwise, and repeat the
		// first point at the end, as some exports do.
		var pts []geometry.Point
		for k := range loop {
			pts = append(pts, loop[(80-k+len(loop))%len(loop)])
		}
		pts = append(pts, pts[0])
		ct, rep, err := Clean(mk(pts), Options{})
		if err != nil {
			t.Fatal(err)
		}
		if !rep.OrderKept || rep.Reordered != "" {
			t.Errorf("OrderKept %v, Reordered %q: want the order kept", rep.OrderKept, rep.Reordered)
		}
		if len(rep.Merged) != 1 || rep.Merged[0].Kept.Line != 2 || rep.Merged[0].Dropped.Line != len(pts)+1 {
			t.Errorf("merged %+v: want the repeated last point merged into the first", rep.Merged)
		}
		// The contour is the listing, rotated and reversed: consecutive
		// lines differ by one (cyclically over the len(loop) kept lines).
		for k := range ct.Len() {
			a, b := ct.Origins[k].Line, ct.Origins[(k+1)%ct.Len()].Line
			if d := (a - b + len(loop)) % len(loop); d != 1 {
				t.Fatalf("contour step %d: line %d → %d: not the listing's order", k, a, b)
			}
		}
		cleanTestOriented(t, ct, cleanTE(n), 0.01*cleanChord)
	})
	t.Run("two runs", func(t *testing.T) {
		// Upper and lower surface as two polylines (as a DXF file may hold
		// them), both through the leading edge, the lower one listed first.
		pts := append(slices.Clone(loop[80:]), loop[:81]...)
		c := mk(pts)
		c.Segments = []int{0, len(loop) - 80}
		ct, rep, err := Clean(c, Options{})
		if err != nil {
			t.Fatal(err)
		}
		if !rep.OrderKept || len(rep.Merged) != 1 || ct.Len() != len(loop) {
			t.Errorf("OrderKept %v (%s), merged %d (want the shared LE), %d points (want %d)", rep.OrderKept, rep.Reordered, len(rep.Merged), ct.Len(), len(loop))
		}
		cleanTestOriented(t, ct, n.Upper(1).Scale(cleanChord).Rotate(cleanRot).Add(cleanOff), 1e-9)
	})
	t.Run("shuffled", func(t *testing.T) {
		pts := slices.Clone(loop)
		rand.New(rand.NewPCG(3, 3)).Shuffle(len(pts), func(i, j int) { pts[i], pts[j] = pts[j], pts[i] })
		ct, rep, err := Clean(mk(pts), Options{})
		if err != nil {
			t.Fatal(err)
		}
		if rep.OrderKept || rep.Reordered == "" {
			t.Errorf("OrderKept %v, Reordered %q: want a reorder with a reason", rep.OrderKept, rep.Reordered)
		}
		if ct.Len() != len(loop) {
			t.Errorf("contour has %d points, want %d", ct.Len(), len(loop))
		}
		cleanTestOriented(t, ct, cleanTE(n), 0.01*cleanChord)
	})
	t.Run("slipped probe", func(t *testing.T) {
		// An ordered CMM listing in which two probe hits slipped 1 mm off the
		// surface (the set-up is this test's own).
		pts := slices.Clone(loop)
		for _, k := range []int{30, 120} {
			d := pts[k+1].Sub(pts[k-1])
			pts[k] = pts[k].Add(geometry.Point{X: -d.Y, Y: d.X}.Scale(1 / d.Norm()))
		}
		ct, rep, err := Clean(mk(pts), Options{})
		if err != nil {
			t.Fatal(err)
		}
		if !rep.OrderKept {
			t.Errorf("order not kept: %s", rep.Reordered)
		}
		var lines []int
		for _, d := range rep.Dropped {
			lines = append(lines, d.Origin.Line)
			if d.Reason != "outlier" || d.Sigmas < DefaultOutlierSigma || math.Abs(d.Distance-1) > 0.1 {
				t.Errorf("drop %+v: want an outlier about 1 mm off", d)
			}
		}
		if !slices.Equal(lines, []int{32, 122}) {
			t.Errorf("dropped lines %v, want [32 122]", lines)
		}
		if ct.Len() != len(loop)-2 {
			t.Errorf("contour has %d points, want %d", ct.Len(), len(loop)-2)
		}
		// Kept at the user's request: reported, still in the contour.
		ct, rep, err = Clean(mk(pts), Options{KeepOutliers: true})
		if err != nil {
			t.Fatal(err)
		}
		if len(rep.Dropped) != 2 || !rep.Dropped[0].Kept || ct.Len() != len(loop) {
			t.Errorf("KeepOutliers: %d reported (kept %v), contour %d points; want 2 reported, %d points", len(rep.Dropped), len(rep.Dropped) > 0 && rep.Dropped[0].Kept, ct.Len(), len(loop))
		}
	})
}

// A hollow blade: outer wall NACA 0012 and inner wall NACA 0008 at 60% of
// the chord (NACA Report 824 equations via NACA4), as one shuffled cloud.
// The outer loop is picked by default, the inner one with Loop: 1.
func TestCleanTwoLoops(t *testing.T) {
	outer := cleanTestSample(shape.NACA4{Thickness: 0.12}, cleanChord, cleanRot, cleanOff, cleanCount)
	inOff := geometry.Point{X: 0.1 * cleanChord, Y: 0}.Rotate(cleanRot).Add(cleanOff)
	inner := cleanTestSample(shape.NACA4{Thickness: 0.08, SharpTE: true}, 0.6*cleanChord, cleanRot, inOff, 250)
	rng := rand.New(rand.NewPCG(11, 11))
	c, es := cleanTestCloud(rng, [][]geometry.Point{outer, inner}, cleanNoise, 0.01, 0.02)
	for _, tc := range []struct {
		loop, count int
	}{{0, cleanCount}, {1, 250}} {
		ct, rep, err := Clean(c, Options{Loop: tc.loop})
		if err != nil {
			t.Fatal(err)
		}
		if len(rep.Loops) != 2 || !rep.Loops[tc.loop].Picked || rep.Loops[0].Area <= rep.Loops[1].Area {
			t.Fatalf("loops %+v: want 2, largest first, number %d picked", rep.Loops, tc.loop)
		}
		for _, o := range ct.Origins {
			if e := es[o.Line-1]; e.loop != tc.loop {
				t.Fatalf("loop %d: contour holds a point of loop %d (%s)", tc.loop, e.loop, o)
			}
		}
		nf, od, gl := cleanTestScore(ct, es, tc.loop, tc.count)
		t.Logf("loop %d: neighbours %.4f, outliers dropped %.3f, good lost %.4f", tc.loop, nf, od, gl)
		if nf < 0.99 || od < 0.95 || gl > 0.005 {
			t.Errorf("loop %d: neighbours %.4f (≥ 0.99), outliers dropped %.3f (≥ 0.95), good lost %.4f (≤ 0.005)", tc.loop, nf, od, gl)
		}
	}
	if _, _, err := Clean(c, Options{Loop: 2}); !errors.Is(err, geometry.ErrNoLoop) {
		t.Errorf("Loop 2 of 2: got %v, want ErrNoLoop", err)
	}
}

// Exact and near duplicates merge into the first (lowest) input line, and
// points just beyond the tolerance stay.
func TestCleanMerge(t *testing.T) {
	loop := cleanTestSample(shape.NACA4{Thickness: 0.12}, 100, 0, geometry.Point{}, 100)
	var pts []geometry.Point
	pts = append(pts, loop...)
	pts = append(pts, loop[10], loop[20].Add(geometry.Point{X: 0.0005, Y: 0}), loop[30].Add(geometry.Point{X: 0, Y: 0.002}))
	c := &geometry.Cloud{Dim: 2}
	for i, p := range pts {
		c.Points = append(c.Points, geometry.Vec3{X: p.X, Y: p.Y, Z: 0})
		c.Origins = append(c.Origins, geometry.Origin{File: "m.csv", Line: i + 1})
	}
	_, rep, err := Clean(c, Options{MergeTol: 0.001})
	if err != nil {
		t.Fatal(err)
	}
	want := []Merged{{geometry.Origin{File: "m.csv", Line: 11, Entity: 0}, geometry.Origin{File: "m.csv", Line: 101, Entity: 0}, 0}, {geometry.Origin{File: "m.csv", Line: 21, Entity: 0}, geometry.Origin{File: "m.csv", Line: 102, Entity: 0}, 0.0005}}
	if len(rep.Merged) != len(want) {
		t.Fatalf("merged %+v, want %+v", rep.Merged, want)
	}
	for i, m := range rep.Merged {
		if m.Kept != want[i].Kept || m.Dropped != want[i].Dropped || math.Abs(m.Distance-want[i].Distance) > 1e-12 {
			t.Errorf("merge %d: %+v, want %+v", i, m, want[i])
		}
	}
	if rep.MergeTol != 0.001 {
		t.Errorf("MergeTol %g, want 0.001", rep.MergeTol)
	}
}

func TestCleanErrors(t *testing.T) {
	mk := func(pts []geometry.Point) *geometry.Cloud {
		c := &geometry.Cloud{Dim: 2}
		for i, p := range pts {
			c.Points = append(c.Points, geometry.Vec3{X: p.X, Y: p.Y, Z: 0})
			c.Origins = append(c.Origins, geometry.Origin{File: "e.csv", Line: i + 1})
		}
		return c
	}
	var line, arc, dup []geometry.Point
	for i := range 30 {
		line = append(line, geometry.Point{X: float64(i), Y: 2*float64(i) + 1})
		a := float64(i) / 29 * math.Pi / 2
		arc = append(arc, geometry.Point{X: 10 * math.Cos(a), Y: 10 * math.Sin(a)})
	}
	for i := range 20 {
		dup = append(dup, geometry.Point{X: float64(i % 5), Y: float64(i%5) * float64(i%5)})
	}
	nan := slices.Clone(arc)
	nan[3].Y = math.NaN()
	for _, tc := range []struct {
		name string
		pts  []geometry.Point
		opts Options
		want error
		text string
	}{
		{"five points", arc[:5], Options{}, geometry.ErrTooFewPoints, "5 point(s)"},
		{"five distinct", dup, Options{}, geometry.ErrTooFewPoints, "5 distinct"},
		{"collinear", line, Options{}, geometry.ErrCollinear, "30 points lie within"},
		{"open arc", arc, Options{}, geometry.ErrNoLoop, "open chain"},
		{"loop beyond", cleanTestSample(shape.NACA4{Thickness: 0.12}, 1, 0, geometry.Point{}, 50), Options{Loop: 1}, geometry.ErrNoLoop, "loop 1 asked for, 1 loop(s) found"},
		{"NaN", nan, Options{}, geometry.ErrNonFinite, "e.csv:4"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, _, err := Clean(mk(tc.pts), tc.opts)
			if !errors.Is(err, tc.want) || !strings.Contains(err.Error(), tc.text) {
				t.Errorf("got %v, want %v mentioning %q", err, tc.want, tc.text)
			}
		})
	}
	for _, opts := range []Options{{MergeTol: -1}, {OutlierSigma: -2}, {Loop: -1}} {
		if _, _, err := Clean(mk(arc), opts); err == nil {
			t.Errorf("%+v: no error", opts)
		}
	}
}

// Points far from the section, near only each other (a stray scan of the
// fixture), are dropped as "stray"; the section is unaffected.
func TestCleanStray(t *testing.T) {
	n := shape.NACA4{Thickness: 0.12}
	loop := cleanTestSample(n, cleanChord, cleanRot, cleanOff, cleanCount)
	rng := rand.New(rand.NewPCG(21, 21))
	c, _ := cleanTestCloud(rng, [][]geometry.Point{loop}, cleanNoise, 0, 0)
	for k := range 3 {
		c.Points = append(c.Points, geometry.Vec3{X: 2000 + float64(k), Y: 1500})
		c.Origins = append(c.Origins, geometry.Origin{File: "scan.csv", Line: c.Len() + 1})
	}
	ct, rep, err := Clean(c, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(rep.Dropped) != 3 {
		t.Fatalf("dropped %+v, want the 3 far points", rep.Dropped)
	}
	for _, d := range rep.Dropped {
		if d.Reason != "stray" || d.Origin.Line <= cleanCount || d.Point.X < 1999 {
			t.Errorf("drop %+v: want a stray far point", d)
		}
	}
	if ct.Len() != cleanCount {
		t.Errorf("contour has %d points, want %d", ct.Len(), cleanCount)
	}
}

// FuzzClean feeds Clean small clouds of arbitrary points: it must never
// panic, and a contour it returns has at least 8 points, each from a distinct
// input line, with positive signed area.
func FuzzClean(f *testing.F) {
	f.Add(uint64(1), uint8(40), uint8(0))
	f.Add(uint64(2), uint8(200), uint8(1))
	f.Add(uint64(3), uint8(9), uint8(2))
	f.Fuzz(func(t *testing.T, seed uint64, count, kind uint8) {
		rng := rand.New(rand.NewPCG(seed, 99))
		var pts []geometry.Point
		switch kind % 3 {
		case 0: // uniform in a square
			for range count {
				pts = append(pts, geometry.Point{X: rng.Float64(), Y: rng.Float64()})
			}
		case 1: // a noisy NACA loop with random extras
			loop := cleanTestSample(shape.NACA4{Camber: 0.04 * rng.Float64(), CamberPos: 0.4, Thickness: 0.02 + 0.2*rng.Float64(), SharpTE: rng.IntN(2) == 0}, 1, rng.Float64()*6, geometry.Point{}, max(int(count), 8))
			noise := 0.01 * rng.Float64()
			for _, p := range loop {
				pts = append(pts, p.Add(geometry.Point{X: noise * rng.NormFloat64(), Y: noise * rng.NormFloat64()}))
				if rng.IntN(10) == 0 {
					pts = append(pts, geometry.Point{X: rng.Float64(), Y: rng.Float64() - 0.5})
				}
			}
		default: // a few points on a small integer lattice (duplicates, lines)
			for range count {
				pts = append(pts, geometry.Point{X: float64(rng.IntN(4)), Y: float64(rng.IntN(3))})
			}
		}
		c := &geometry.Cloud{Dim: 2}
		for i, p := range pts {
			c.Points = append(c.Points, geometry.Vec3{X: p.X, Y: p.Y, Z: 0})
			c.Origins = append(c.Origins, geometry.Origin{File: "f", Line: i + 1})
		}
		ct, _, err := Clean(c, Options{KeepOutliers: rng.IntN(2) == 0})
		if err != nil {
			return
		}
		if ct.Len() < minPoints || geometry.SignedArea(ct.Points) <= 0 {
			t.Fatalf("contour of %d points, area %g", ct.Len(), geometry.SignedArea(ct.Points))
		}
		seen := map[int]bool{}
		for _, o := range ct.Origins {
			if seen[o.Line] {
				t.Fatalf("line %d twice in the contour", o.Line)
			}
			seen[o.Line] = true
		}
	})
}

// A dense scan: 20000 points per loop, so that the 0.02 mm noise exceeds
// the 0.015 mm spacing and no point-to-point order exists across the band.
// The order along the curve must hold: consecutive contour points are at
// most 4·noise/spacing + 2 sample positions apart (a band of ±2σ holds that
// many), for ≥ 99% of pairs. Sections from the NACA Report 824 equations
// via NACA4; the noise, outlier and duplicate set-up is this test's own.
func TestCleanBand(t *testing.T) {
	const count = 20000
	for _, tc := range []struct {
		n    shape.NACA4
		seed uint64
	}{{shape.NACA4{Thickness: 0.12, SharpTE: true}, 1}, {shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12}, 2}} {
		t.Run(tc.n.String(), func(t *testing.T) {
			loop := cleanTestSample(tc.n, cleanChord, cleanRot, cleanOff, count)
			spacing := loop[0].Dist(loop[1])
			c, es := cleanTestCloud(rand.New(rand.NewPCG(tc.seed, 31)), [][]geometry.Point{loop}, cleanNoise, 0.01, 0.02)
			ct, rep, err := Clean(c, Options{})
			if err != nil {
				t.Fatal(err)
			}
			if !rep.Band {
				t.Error("Band not set for a cloud whose noise exceeds its spacing")
			}
			_, od, gl := cleanTestScore(ct, es, 0, count)
			w := int(4*cleanNoise/spacing) + 2
			good, pairs := 0, 0
			for k := range ct.Len() {
				a, b := es[ct.Origins[k].Line-1], es[ct.Origins[(k+1)%ct.Len()].Line-1]
				if a.pos < 0 || b.pos < 0 {
					continue
				}
				pairs++
				d := (a.pos - b.pos + count) % count
				if min(d, count-d) <= w {
					good++
				}
			}
			frac := float64(good) / float64(pairs)
			t.Logf("within %d positions: %.4f, outliers dropped %.3f, good lost %.4f", w, frac, od, gl)
			if frac < 0.99 || od < 0.95 || gl > 0.005 {
				t.Errorf("within %d: %.4f (≥ 0.99), outliers dropped %.3f (≥ 0.95), good lost %.4f (≤ 0.005)", w, frac, od, gl)
			}
			cleanTestOriented(t, ct, cleanTE(tc.n), 1)
		})
	}
}

// A delimited file declares no order, but one written along the outline
// walks a path of a few diagonals while a shuffled one walks hundreds
// (looksOrdered), and its own order can be asked for. A probe program
// round a NACA 2412 (Report 824) at a fine step over the upper surface
// and 15 times coarser over the lower, listed from the trailing edge,
// keeps every one of its points in its own order; the same file in two
// passes (upper then lower, nose to tail) looks ordered too.
func TestCleanWalkedFile(t *testing.T) {
	n, err := shape.ParseNACA4("2412")
	if err != nil {
		t.Fatal(err)
	}
	station := func(i, m int) float64 { return (1 - math.Cos(math.Pi*float64(i)/float64(m))) / 2 }
	var loop, passes []geometry.Point
	for i := 300; i >= 0; i-- { // upper, tail to nose
		loop = append(loop, n.Upper(station(i, 300)))
	}
	for i := 1; i <= 20; i++ { // lower, nose to tail, coarse
		loop = append(loop, n.Lower(station(i, 20)))
	}
	for i := 0; i <= 300; i++ {
		passes = append(passes, n.Upper(station(i, 300)))
	}
	passes = append(passes, loop[301:]...)
	cloud := func(ps []geometry.Point) (*geometry.Cloud, []geometry.Point, []int32) {
		c := &geometry.Cloud{Dim: 2}
		var all []geometry.Point
		var src []int32
		for i, p := range ps {
			q := p.Scale(cleanChord).Rotate(cleanRot).Add(cleanOff)
			c.Points = append(c.Points, geometry.Vec3{X: q.X, Y: q.Y})
			c.Origins = append(c.Origins, geometry.Origin{File: "probe.csv", Line: i + 2})
			all, src = append(all, q), append(src, int32(i))
		}
		return c, all, src
	}
	c, all, src := cloud(loop)
	_, allPasses, srcPasses := cloud(passes)
	if !looksOrdered(all, src) || !looksOrdered(allPasses, srcPasses) {
		t.Error("a file along the outline, in one loop or two passes, does not look ordered")
	}
	shuffled := slices.Clone(src)
	rand.New(rand.NewPCG(1, 2)).Shuffle(len(shuffled), func(i, j int) { shuffled[i], shuffled[j] = shuffled[j], shuffled[i] })
	if looksOrdered(all, shuffled) {
		t.Error("a shuffled file looks ordered")
	}
	ct, rep, err := Clean(c, Options{Order: OrderFile})
	if err != nil {
		t.Fatal(err)
	}
	if ct.Len() != len(loop) || len(rep.Dropped) > 0 || rep.Strategy != OrderFile {
		t.Errorf("%s order: %d of %d points kept, dropped %+v", rep.Strategy, ct.Len(), len(loop), rep.Dropped)
	}
}
