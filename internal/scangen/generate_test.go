package scangen

import (
	"bytes"
	"encoding/json"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// readBack returns the point of every line of a generated file by its line
// number, with a reader of its own (the formats scangen writes only), so
// that the recorded line numbers are checked independently of the tool.
func readBack(t *testing.T, data []byte, f FileSpec) map[int]geometry.Vec3 {
	t.Helper()
	text := strings.TrimPrefix(string(data), "\ufeff")
	if f.CRLF != strings.Contains(text, "\r\n") {
		t.Errorf("CR LF line ends %v, asked for %v", !f.CRLF, f.CRLF)
	}
	lines := strings.Split(strings.ReplaceAll(text, "\r\n", "\n"), "\n")
	out := map[int]geometry.Vec3{}
	if strings.HasPrefix(f.Format, "dxf") {
		for i := 0; i+1 < len(lines); i += 2 {
			if strings.TrimSpace(lines[i]) != "10" {
				continue
			}
			var v geometry.Vec3
			v.X = mustFloat(t, lines[i+1])
			v.Y = mustFloat(t, lines[i+3])
			if i+5 < len(lines) && strings.TrimSpace(lines[i+4]) == "30" {
				v.Z = mustFloat(t, lines[i+5])
			}
			out[i+2] = v
		}
		return out
	}
	sep := map[string]string{"csv": ",", "blank": " ", "tab": "\t", "semicolon": ";"}[f.Format]
	skip := 0
	if f.Header == "idx" || f.Header == "point" {
		skip = 1
	}
	for i, l := range lines {
		// Point lines start with a digit or a sign; the rest are titles,
		// headers, comments and blank lines.
		if l == "" || !strings.ContainsRune("0123456789-+.", rune(l[0])) {
			continue
		}
		if f.TrailingSep {
			if !strings.HasSuffix(l, sep) {
				t.Errorf("line %d %q does not end with its separator", i+1, l)
			}
			l = strings.TrimSuffix(l, sep)
		}
		fs := strings.Split(l, sep)[skip:]
		var v [3]float64
		for j, s := range fs {
			v[j] = mustFloat(t, strings.Replace(s, ",", ".", 1))
		}
		out[i+1] = geometry.Vec3{X: v[0], Y: v[1], Z: v[2]}
	}
	return out
}

func mustFloat(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
	if err != nil {
		t.Fatalf("number %q: %v", s, err)
	}
	return v
}

// toChord maps file coordinates back into the normalised frame with the
// truth's frame, q = R(τ)·M·(p − LE)/c in the plane of the points, and
// returns the distance from that plane too (chord units).
func toChord(tr *Truth, p geometry.Vec3) (geometry.Point, float64) {
	d := p.Sub(geometry.Vec3{X: tr.LE[0], Y: tr.LE[1], Z: tr.LE[2]})
	u, v, n := geometry.Vec3{X: 1}, geometry.Vec3{Y: 1}, geometry.Vec3{Z: 1}
	if tr.Plane != nil {
		vec := func(a [3]float64) geometry.Vec3 { return geometry.Vec3{X: a[0], Y: a[1], Z: a[2]} }
		u, v, n = vec(tr.Plane.U), vec(tr.Plane.V), vec(tr.Plane.Normal)
	}
	q := geometry.Point{X: d.Dot(u), Y: d.Dot(v)}.Scale(1 / tr.Chord)
	if tr.Mirrored {
		q.X = -q.X
	}
	off := d.Dot(n) / tr.Chord
	if tr.Plane == nil {
		off = 0
	}
	return q.Rotate(tr.TwistDeg * math.Pi / 180), off
}

// Every good point lies on the true outline within the noise, and the
// scatter has the requested size; outliers lie off it by their offset;
// duplicates repeat their original within a hair; line numbers point at
// the right lines; the files say they are invented.
func TestPointsOnTheOutline(t *testing.T) {
	n := uint64(60)
	if raceEnabled || testing.Short() {
		n = 15
	}
	for seed := uint64(1); seed <= n; seed++ {
		spec := Draw(seed)
		if spec.Category == "dense" {
			continue
		}
		sc, err := Generate(spec, seed)
		if err != nil {
			t.Fatalf("seed %d: %v", seed, err)
		}
		tr := sc.Truth
		if !bytes.Contains(sc.Data, []byte("not measured")) {
			t.Errorf("seed %d: the file does not say it is invented", seed)
		}
		pts := readBack(t, sc.Data, spec.File)
		if len(pts) != len(tr.Lines) {
			t.Fatalf("seed %d: %d point lines read back, %d in the truth", seed, len(pts), len(tr.Lines))
		}
		sh := tr.Section.Shape
		// A good point is off the outline by its noise (5σ bounds every one
		// of a few thousand Gaussian draws but once in a few hundred cases)
		// and the rounding of the written numbers.
		limit := 5*tr.NoiseMax + tr.Resolution + math.Abs(tr.Offset) + tr.Shift + 1e-9
		var sum2 float64
		var good int
		for _, l := range tr.Lines {
			p, ok := pts[l.No]
			if !ok {
				t.Fatalf("seed %d: line %d holds no point", seed, l.No)
			}
			q, off := toChord(tr, p)
			d, _ := sh.Nearest(q)
			switch l.Kind {
			case LineRepeat:
				if d > limit || math.Abs(off) > limit {
					t.Errorf("seed %d line %d: repeated point %.3g off the outline, %.3g off the plane", seed, l.No, d, off)
				}
			case LineGood:
				good++
				sum2 += d * d
				if d > limit || math.Abs(off) > limit {
					t.Errorf("seed %d line %d: good point %.3g off the outline, %.3g off the plane (noise %.3g)", seed, l.No, d, off, tr.Noise)
				}
				if at := sh.At(l.T); at.Dist(q) > limit {
					t.Errorf("seed %d line %d: %.3g from its outline point", seed, l.No, at.Dist(q))
				}
			case LineOutlier:
				if d < 0.004 || d > math.Abs(l.Offset)+limit {
					t.Errorf("seed %d line %d: outlier %.4f off the outline, offset %.4f", seed, l.No, d, l.Offset)
				}
			case LineDuplicate:
				o, ok := pts[l.Of]
				if !ok {
					t.Fatalf("seed %d line %d: duplicate of line %d, which holds no point", seed, l.No, l.Of)
				}
				if dd := o.Sub(p).Norm() / tr.Chord; dd > 3.2e-5+2*tr.Resolution {
					t.Errorf("seed %d line %d: duplicate %.3g from its original", seed, l.No, dd)
				}
			}
		}
		if good != tr.GoodPoints {
			t.Errorf("seed %d: %d good lines, truth says %d", seed, good, tr.GoodPoints)
		}
		// The RMS distance matches the noise (distance is |noise| where the
		// outline is flat; tolerance for a few hundred samples, and the
		// rounding of the numbers).
		if tr.Noise > 0 && good >= 300 && tr.Offset == 0 && tr.Shift == 0 {
			rms := math.Sqrt(sum2 / float64(good))
			want := math.Sqrt(tr.Noise*tr.Noise + tr.Resolution*tr.Resolution/12)
			if math.Abs(rms/want-1) > 0.15 {
				t.Errorf("seed %d: RMS distance %.4g, noise %.4g", seed, rms, want)
			}
		}
	}
}

// The gaps between neighbouring points are log-normal with the requested
// σ: log(gᵢ₊₁/gᵢ) has standard deviation σ√2 whatever the slow density
// wave, which cancels between neighbours.
func TestGapSigma(t *testing.T) {
	sec, err := shapeCases[1].spec.Build()
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		sigma, wave float64
	}{{0, 0}, {0.3, 0}, {0.5, 0.8}, {0.8, 0.8}} {
		rng := rand.New(rand.NewPCG(7, 7))
		s := &sampler{sh: sec.Shape, sm: Sampling{Points: 3000, Sigma: tc.sigma, Wave: tc.wave}, rng: rng}
		ts := s.params()
		var logs []float64
		for i := 1; i+1 < len(ts); i++ {
			g0 := sec.Shape.ArcAt(ts[i]) - sec.Shape.ArcAt(ts[i-1])
			g1 := sec.Shape.ArcAt(ts[i+1]) - sec.Shape.ArcAt(ts[i])
			if g0 <= 0 || g1 <= 0 {
				continue // across the start of the loop
			}
			logs = append(logs, math.Log(g1/g0))
		}
		var m, v float64
		for _, l := range logs {
			m += l
		}
		m /= float64(len(logs))
		for _, l := range logs {
			v += (l - m) * (l - m)
		}
		sd := math.Sqrt(v / float64(len(logs)-1))
		want := tc.sigma * math.Sqrt2
		// 3000 samples: the standard deviation is known to about 2.6 %; the
		// wave adds a little (its slope between neighbours).
		if math.Abs(sd-want) > 0.06*want+0.01 {
			t.Errorf("σ %.1f wave %.1f: log gap ratios have sd %.4f, want %.4f", tc.sigma, tc.wave, sd, want)
		}
	}
}

// The same spec and seed give the same bytes and truth.
func TestDeterministic(t *testing.T) {
	for _, seed := range []uint64{3, 17, 42} {
		a, err := Generate(Draw(seed), seed)
		if err != nil {
			t.Fatal(err)
		}
		b, err := Generate(Draw(seed), seed)
		if err != nil {
			t.Fatal(err)
		}
		ja, _ := json.Marshal(a.Truth)
		jb, _ := json.Marshal(b.Truth)
		if !bytes.Equal(a.Data, b.Data) || !bytes.Equal(ja, jb) {
			t.Errorf("seed %d: two runs differ", seed)
		}
	}
}

// A two-pass probe file runs over the upper surface from the nose to the
// tail, then over the lower surface from the nose to the tail.
func TestTwoPassOrder(t *testing.T) {
	spec := Draw(1)
	spec.Order = Order{Mode: "two-pass"}
	spec.Defects = Defects{}
	sc, err := Generate(spec, 1)
	if err != nil {
		t.Fatal(err)
	}
	sh := sc.Truth.Section.Shape
	var xs []float64
	var upper []bool
	for _, l := range sc.Truth.Lines {
		p := sh.At(l.T)
		xs = append(xs, p.X)
		upper = append(upper, sh.Kind(l.T) == Upper)
	}
	pass2 := 0
	for i := 1; i < len(xs); i++ {
		if xs[i] < xs[i-1]-1e-12 {
			if pass2 != 0 {
				t.Fatalf("x falls at lines %d and %d: more than two passes", pass2, i)
			}
			pass2 = i
		}
	}
	if pass2 == 0 || !upper[0] || upper[len(upper)-1] {
		t.Errorf("second pass starts at %d of %d; first point upper %v, last upper %v", pass2, len(xs), upper[0], upper[len(upper)-1])
	}
	if !bytes.Contains(sc.Data, []byte("# pass 2")) {
		t.Error("no comment marks the second pass")
	}
}

// Every category draws valid cases.
func TestDrawCategories(t *testing.T) {
	seen := map[string]int{}
	n := uint64(400)
	if raceEnabled || testing.Short() {
		n = 100
	}
	for seed := uint64(1000); seed < 1000+n; seed++ {
		spec := Draw(seed)
		seen[spec.Category]++
		if spec.Category == "dense" {
			continue
		}
		if _, err := Generate(spec, seed); err != nil {
			t.Errorf("seed %d (%s): %v", seed, spec.Category, err)
		}
	}
	for _, c := range Categories() {
		if seen[c] == 0 {
			t.Errorf("category %s never drawn in %d seeds", c, n)
		}
	}
}

// hazardSpec is a plain loop of a NACA 2412 at 200 mm for the tests of
// single hazards.
func hazardSpec() Spec {
	return Spec{
		Category:  "general",
		Shape:     ShapeSpec{Family: FamilyNACA, NACA: &NACASpec{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, ClosedTE: true}},
		Sampling:  Sampling{Points: 1200, Sigma: 0.3},
		Noise:     Noise{MM: 0.01},
		Order:     Order{Mode: "loop"},
		Placement: Placement{ChordMM: 200, TwistDeg: 7, Orientation: "standard"},
		File:      FileSpec{Format: "csv", Units: "mm", Header: "names", Decimals: 5},
	}
}

// The measurement hazards do what they say: a probe-radius compensation
// error moves the points by its offset along the normal on average; a
// grazing beam makes the scatter vary along the outline; a loop starts
// exactly at the trailing edge; one surface is sampled denser; the stair
// steps put every coordinate on the grid; overlapping passes write a
// stretch twice and move the second pass.
func TestMeasurementHazards(t *testing.T) {
	gen := func(spec Spec) (*Scan, map[int]geometry.Vec3) {
		t.Helper()
		sc, err := Generate(spec, 99)
		if err != nil {
			t.Fatal(err)
		}
		return sc, readBack(t, sc.Data, spec.File)
	}
	signed := func(sc *Scan, pts map[int]geometry.Vec3, l Line) float64 {
		q, _ := toChord(sc.Truth, pts[l.No])
		sh := sc.Truth.Section.Shape
		return q.Sub(sh.At(l.T)).Dot(sh.Normal(l.T))
	}

	spec := hazardSpec()
	spec.Noise.OffsetMM = 0.04
	sc, pts := gen(spec)
	var mean float64
	var n int
	for _, l := range sc.Truth.Lines {
		if l.Kind == LineGood {
			mean += signed(sc, pts, l)
			n++
		}
	}
	mean /= float64(n)
	if want, tol := 0.04/200, 4*sc.Truth.Noise/math.Sqrt(float64(n)); math.Abs(mean-want) > tol || sc.Truth.Offset != want {
		t.Errorf("compensation error: mean offset %.3g c, truth %.3g, want %.3g ± %.2g", mean, sc.Truth.Offset, want, tol)
	}

	spec = hazardSpec()
	spec.Noise.Grazing, spec.Noise.BeamDeg = 3, 90
	sc, _ = gen(spec)
	if tr := sc.Truth; !(tr.NoiseMax > 3*0.01/200) || !(tr.Noise > 0.01/200 && tr.Noise < tr.NoiseMax) {
		t.Errorf("grazing: noise %.3g RMS, %.3g at most; base %.3g", tr.Noise, tr.NoiseMax, 0.01/200)
	}

	spec = hazardSpec()
	spec.Order.Start = "te"
	sc, _ = gen(spec)
	if l := sc.Truth.Lines[0]; l.T != sc.Truth.Section.Shape.TE() {
		t.Errorf("loop starts at t = %g, want the trailing edge %g", l.T, sc.Truth.Section.Shape.TE())
	}

	spec = hazardSpec()
	spec.Sampling.Surface, spec.Sampling.SurfaceFactor = "lower", 10
	sc, _ = gen(spec)
	var up, lo int
	for _, l := range sc.Truth.Lines {
		switch sc.Truth.Section.Shape.Kind(l.T) {
		case Upper:
			up++
		case Lower:
			lo++
		}
	}
	if lo < 5*up {
		t.Errorf("lower surface 10 times denser: %d points on it, %d on the upper", lo, up)
	}

	spec = hazardSpec()
	spec.Noise.StepMM = 0.1
	sc, pts = gen(spec)
	for no, p := range pts {
		for _, v := range []float64{p.X, p.Y} {
			if r := math.Abs(v/0.1 - math.Round(v/0.1)); r > 1e-6 {
				t.Fatalf("line %d: %g is off the 0.1 mm grid", no, v)
			}
		}
	}

	spec = hazardSpec()
	spec.Order = Order{Mode: "two-pass", Overlap: 0.02, Meet: "te", PassShiftMM: 0.02}
	sc, pts = gen(spec)
	var repeats, pass2 int
	var shift geometry.Point
	second := false
	for _, l := range sc.Truth.Lines {
		if l.Kind == LineRepeat {
			repeats++
		}
		if !second && sc.Truth.Section.Shape.Kind(l.T) == Lower && l.Kind == LineGood && repeats > 0 {
			second = true
		}
		if second && l.Kind == LineGood {
			q, _ := toChord(sc.Truth, pts[l.No])
			shift = shift.Add(q.Sub(sc.Truth.Section.Shape.At(l.T)))
			pass2++
		}
	}
	if repeats == 0 || pass2 == 0 {
		t.Fatalf("two passes overlapping at the trailing edge: %d repeated points, %d in the second pass", repeats, pass2)
	}
	if d := shift.Scale(1 / float64(pass2)).Norm(); math.Abs(d-0.02/200) > 2e-5 || sc.Truth.Shift != 0.02/200 {
		t.Errorf("second pass moved by %.3g c (truth %.3g), want %.3g", d, sc.Truth.Shift, 0.02/200)
	}
}

// The habits of the file's writer: a byte order mark, CR LF line ends,
// a title line first, scientific notation, breaks between the points and
// a separator ending every point line; readBack checks the line numbers
// and the points against the truth's.
func TestFileHabits(t *testing.T) {
	for _, format := range []string{"csv", "semicolon", "tab", "blank"} {
		spec := hazardSpec()
		spec.File = FileSpec{Format: format, Units: "mm", Header: "idx", Decimals: 4, Title: "Section B-B, blade 2",
			CRLF: true, BOM: true, Sci: true, Breaks: 0.05, TrailingSep: format != "blank"}
		sc, err := Generate(spec, 5)
		if err != nil {
			t.Fatal(err)
		}
		text := string(sc.Data)
		if !strings.HasPrefix(text, "\ufeffSection B-B, blade 2\r\n") {
			t.Errorf("%s: starts %q", format, text[:min(40, len(text))])
		}
		if !strings.Contains(text, "e+02") && !strings.Contains(text, "e+01") {
			t.Errorf("%s: no number in scientific notation", format)
		}
		if !strings.Contains(text, "\r\n\r\n") || !strings.Contains(text, "# probe re-seated") {
			t.Errorf("%s: no blank or comment line between the points", format)
		}
		pts := readBack(t, sc.Data, spec.File)
		tr := sc.Truth
		for _, l := range tr.Lines {
			q, _ := toChord(tr, pts[l.No])
			if d, _ := tr.Section.Shape.Nearest(q); l.Kind == LineGood && d > 5*tr.NoiseMax+tr.Resolution {
				t.Fatalf("%s line %d: good point %.3g off the outline", format, l.No, d)
			}
		}
	}
}
