package compare

import (
	"bytes"
	"context"
	"math"
	"sort"
	"testing"

	"github.com/foilwright/foilwright/compare/align"
	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/props"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/plugins/builtin"
	"github.com/foilwright/foilwright/plugins/stage"
	"github.com/foilwright/foilwright/repanel"
)

// The planted-defect tests use the NACA 2412 of NACA Report 824 (Abbott,
// von Doenhoff and Stivers, 1945), 200 mm chord, placed 4° nose-up with
// its nose at (412, 118) mm as on a measuring machine, probed at 301
// points with 2 µm of invented noise along the normal.
var (
	naca2412 = shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12}
	tunnelLE = geometry.Point{X: 412, Y: 118}
)

const (
	chord200 = 200.0
	sigma    = 0.002 // mm
)

func tunnel(defect func(x float64, upper bool) float64) part {
	return part{foil: naca2412, chord: chord200, twist: 4, le: tunnelLE, per: 150, defect: defect, noise: sigma, seed: 7}
}

// placed returns the NACA 2412 design at its nominal placement.
func placed(t *testing.T, m *Measurement) *Design {
	return design(t, "naca4:2412", m, ptr(chord200), ptr(4.0), ptr(tunnelLE))
}

func run(t *testing.T, m *Measurement, d *Design, opts Options) *Comparison {
	t.Helper()
	c, err := Compare(m, d, opts)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// extreme returns the point of largest |deviation|.
func extreme(c *Comparison) PointDeviation {
	best := c.Points[0]
	for _, p := range c.Points {
		if math.Abs(p.Deviation) > math.Abs(best.Deviation) {
			best = p
		}
	}
	return best
}

// flipsAt checks that the verdict is pass for a band a hair wider than the
// largest |deviation| the report gives and fail for one a hair narrower:
// the verdict flips exactly at the tolerance.
func flipsAt(t *testing.T, m *Measurement, d *Design, opts Options) {
	t.Helper()
	c := run(t, m, d, opts)
	D := math.Max(c.Report.Deviation.Max, -c.Report.Deviation.Min)
	for _, tc := range []struct {
		f    float64
		want string
	}{{1 + 1e-9, VerdictPass}, {1 - 1e-9, VerdictFail}} {
		b := Band{Plus: D * tc.f, Minus: D * tc.f}
		o := opts
		o.Tolerance = Tolerance{Default: &b}
		if got := run(t, m, d, o).Report.Verdict; got != tc.want {
			t.Errorf("band ±%.12g around a largest |deviation| of %.12g: verdict %s, want %s", b.Plus, D, got, tc.want)
		}
	}
}

// TestDesignAgainstItself: points on the design (its own defining nodes)
// deviate by nothing but rounding, whatever the alignment, and pass any
// tolerance however tight (an exact statement).
func TestDesignAgainstItself(t *testing.T) {
	foil := naca2412
	var pts []geometry.Point
	for _, q := range foil.Nodes(ShapeNodes) {
		pts = append(pts, q.Rotate(-4*math.Pi/180).Scale(chord200).Add(tunnelLE))
	}
	m := measure(t, pts[:len(pts)-1])
	d := placed(t, m)
	tight := Band{Plus: 1e-9, Minus: 1e-9}
	for _, mode := range []string{AlignAsIs, AlignBestFit, AlignMinZone} {
		c := run(t, m, d, Options{Align: mode, Tolerance: Tolerance{Default: &tight}})
		r := c.Report
		if D := math.Max(r.Deviation.Max, -r.Deviation.Min); D > 1e-10 {
			t.Errorf("%s: largest |deviation| %.3g mm, want 0 to rounding", mode, D)
		}
		if r.Verdict != VerdictPass || r.PointsOut != 0 {
			t.Errorf("%s: verdict %s with %d out, want pass", mode, r.Verdict, r.PointsOut)
		}
	}
	// A section document compared with itself.
	sec := d.Section
	ms, err := FromSection(sec, "design.json")
	if err != nil {
		t.Fatal(err)
	}
	data, _ := section.Encode(sec)
	d2, err := NewDesign(DesignSpec{Source: "design.json", Data: data}, ms, repanel.Options{Panels: len(sec.Nodes) - 1}, props.Options{})
	if err != nil {
		t.Fatal(err)
	}
	c := run(t, ms, d2, Options{Align: AlignAsIs, Tolerance: Tolerance{Default: &tight}})
	if D := math.Max(c.Report.Deviation.Max, -c.Report.Deviation.Min); D > 1e-10 || c.Report.Verdict != VerdictPass {
		t.Errorf("section document against itself: largest |deviation| %.3g, verdict %s", D, c.Report.Verdict)
	}
}

// TestShapeSplineAccuracy measures how far the spline of a reference shape
// lies from the exact NACA 4-digit equations (NACA Report 824) between its
// nodes: the figure ShapeNodes documents.
func TestShapeSplineAccuracy(t *testing.T) {
	m := &Measurement{Units: geometry.ChordUnit, Section: &section.Section{}}
	d := design(t, "naca4:2412", m, ptr(1.0), ptr(0.0), ptr(geometry.Point{}))
	worst := 0.0
	for k := 1; k < 4000; k++ {
		x := shape.CosineStation(k, 4000)
		for _, q := range []geometry.Point{naca2412.Upper(x), naca2412.Lower(x)} {
			worst = math.Max(worst, math.Abs(d.Outline.Nearest(q).Distance))
		}
	}
	t.Logf("spline of naca4:2412 within %.3g chord of the exact shape", worst)
	if worst > 2e-7 {
		t.Errorf("spline departs %.3g chord from the exact shape, want ≤ 2e-7", worst)
	}
}

// TestRigidMotionRecovered: the design's own points, moved by a known
// rotation and translation, are brought back by the best fit to 1e-9
// chord and 1e-7° (an exact statement: the sum of squares is zero at the
// inverse motion).
func TestRigidMotionRecovered(t *testing.T) {
	rot, shift := 3.7*math.Pi/180, geometry.Point{X: 12.3, Y: -4.56}
	var pts []geometry.Point
	for _, q := range naca2412.Nodes(ShapeNodes)[:ShapeNodes] {
		p := q.Rotate(-4 * math.Pi / 180).Scale(chord200).Add(tunnelLE)
		pts = append(pts, p.Rotate(rot).Add(shift))
	}
	m := measure(t, pts)
	d := placed(t, m)
	for _, mode := range []string{AlignBestFit, AlignMinZone} {
		c := run(t, m, d, Options{Align: mode})
		// The fit must undo the motion: rotate by −rot, and take every
		// moved point back where it was.
		if e := math.Abs(c.Motion.Angle+rot) * 180 / math.Pi; e > 1e-7 {
			t.Errorf("%s: rotation off by %.3g°", mode, e)
		}
		var worst float64
		for _, q := range naca2412.Nodes(ShapeNodes)[:ShapeNodes] {
			p := q.Rotate(-4 * math.Pi / 180).Scale(chord200).Add(tunnelLE)
			worst = math.Max(worst, c.Motion.Apply(p.Rotate(rot).Add(shift)).Dist(p))
		}
		if worst/chord200 > 1e-9 {
			t.Errorf("%s: points land %.3g chord from where they were", mode, worst/chord200)
		}
		t.Logf("%s: rotation error %.2g°, largest displacement error %.2g chord", mode, math.Abs(c.Motion.Angle+rot)*180/math.Pi, worst/chord200)
	}
}

// TestPlantedDefects plants defects on probed NACA 2412 sections (NACA
// Report 824) and checks each is found where it is, with its size within
// the noise (4σ plus what the named alignment must take up), and that the
// verdict flips exactly at the tolerance.
func TestPlantedDefects(t *testing.T) {
	nominal := func(m *Measurement) *Design { return placed(t, m) }
	t.Run("coat", func(t *testing.T) {
		// A coat of paint 20 µm thick over the whole surface.
		const coat = 0.02
		m := measure(t, mustPoints(tunnel(func(float64, bool) float64 { return coat })))
		d := nominal(m)
		// In the nominal placement the coat shows in full. (A best fit
		// shifts the part a little towards the densely probed nose and
		// tail: least squares weighs each point alike.)
		for _, mode := range []string{AlignAsIs, AlignDatum} {
			c := run(t, m, d, Options{Align: mode, Datum: DatumNominal})
			if e := math.Abs(c.Report.Deviation.Mean - coat); e > 4*sigma/math.Sqrt(301)+1e-4 {
				t.Errorf("%s: mean deviation %.5f mm, want %.3f", mode, c.Report.Deviation.Mean, coat)
			}
			if c.Report.Deviation.Min < coat-4*sigma-1e-4 {
				t.Errorf("%s: smallest deviation %.5f mm, want about %.3f everywhere", mode, c.Report.Deviation.Min, coat)
			}
		}
		// With the scale free, the coat is partly read as scale, and the
		// report says so.
		c := run(t, m, d, Options{Scale: ScaleFree})
		if c.Report.Deviation.Mean > coat/2 || len(c.Report.Alignment.Notes) == 0 {
			t.Errorf("free scale: mean %.5f mm, notes %q", c.Report.Deviation.Mean, c.Report.Alignment.Notes)
		}
		flipsAt(t, m, d, Options{Align: AlignAsIs})
	})
	t.Run("bump", func(t *testing.T) {
		// A bump 50 µm high, a cosine-squared 8 mm wide, on the upper
		// surface at 30 % chord.
		const h, x0, half = 0.05, 0.30, 0.02
		m := measure(t, mustPoints(tunnel(func(x float64, upper bool) float64 {
			if !upper || math.Abs(x-x0) > half {
				return 0
			}
			c := math.Cos(math.Pi / 2 * (x - x0) / half)
			return h * c * c
		})))
		d := nominal(m)
		c := run(t, m, d, Options{})
		w := extreme(c)
		if w.Surface != SurfaceUpper || math.Abs(w.XC-x0) > 0.006 || math.Abs(w.Deviation-h) > 4*sigma+0.002 {
			t.Errorf("worst point %+.4f mm at x/c %.4f on the %s surface, want %.3f at %.2f upper", w.Deviation, w.XC, w.Surface, h, x0)
		}
		flipsAt(t, m, d, Options{})
	})
	t.Run("flat nose", func(t *testing.T) {
		// The nose milled flat 0.1 mm behind the leading edge: every
		// point ahead of x/c = 0.0005 sits on the flat.
		const xf = 0.0005
		p := tunnel(nil)
		p.per = 400 // enough points on the nose
		pts, xs, _ := p.points()
		tw := -p.twist * math.Pi / 180
		for i, x := range xs {
			if x < xf {
				q := pts[i].Sub(p.le).Rotate(-tw)
				q.X = xf * p.chord
				pts[i] = q.Rotate(tw).Add(p.le)
			}
		}
		m := measure(t, pts)
		d := nominal(m)
		c := run(t, m, d, Options{Align: AlignDatum, Datum: DatumNominal})
		w := extreme(c)
		// The flat lies deepest under the foremost point of the nose,
		// which the camber puts a little ahead of x = 0.
		xmin := 0.0
		for k := 0; k <= 2000; k++ {
			x := 0.002 * float64(k) / 2000
			xmin = math.Min(xmin, math.Min(naca2412.Upper(x).X, naca2412.Lower(x).X))
		}
		depth := (xf - xmin) * chord200
		if w.XC > xf || math.Abs(w.Deviation+depth) > 4*sigma {
			t.Errorf("worst point %+.4f mm at x/c %.5f, want %.4f at the nose", w.Deviation, w.XC, -depth)
		}
		flipsAt(t, m, d, Options{Align: AlignDatum, Datum: DatumNominal})
	})
	t.Run("thick trailing edge", func(t *testing.T) {
		// The trailing edge left 0.1 mm thicker, blended in over the aft
		// fifth of the chord on both surfaces.
		const dt = 0.1
		m := measure(t, mustPoints(tunnel(func(x float64, _ bool) float64 {
			if x < 0.8 {
				return 0
			}
			f := (x - 0.8) / 0.2
			return dt / 2 * f * f
		})))
		d := nominal(m)
		c := run(t, m, d, Options{})
		w := extreme(c)
		if w.XC < 0.99 || math.Abs(w.Deviation-dt/2) > 4*sigma+0.002 {
			t.Errorf("worst point %+.4f mm at x/c %.4f, want %.3f at the trailing edge", w.Deviation, w.XC, dt/2)
		}
		if e := c.Report.Derived.TEThickness.Difference*chord200 - dt; math.Abs(e) > 0.01 {
			t.Errorf("trailing edge %.4f mm thicker than designed, want %.2f", c.Report.Derived.TEThickness.Difference*chord200, dt)
		}
		flipsAt(t, m, d, Options{})
	})
	t.Run("twist", func(t *testing.T) {
		// The model sits 0.2° more nose-up in its fixture than drawn.
		const dtw = 0.2
		p := tunnel(nil)
		p.twist += dtw
		m := measure(t, mustPoints(p))
		d := nominal(m)
		c := run(t, m, d, Options{Align: AlignDatum, Datum: DatumNominal})
		if e := c.Report.Derived.TwistDeg.Difference - dtw; math.Abs(e) > 0.005 {
			t.Errorf("twist error %.4f°, want %.2f", c.Report.Derived.TwistDeg.Difference, dtw)
		}
		// Nose-up turns the tail down: the lower surface near the tail
		// stands out by about the twist times the chord.
		w := extreme(c)
		want := dtw * math.Pi / 180 * chord200
		if w.XC < 0.98 || w.Surface != SurfaceLower || math.Abs(w.Deviation-want) > 0.02*want+4*sigma {
			t.Errorf("worst point %+.4f mm at x/c %.3f on the %s surface, want +%.3f at the tail, lower", w.Deviation, w.XC, w.Surface, want)
		}
		// The best fit takes the twist out.
		if b := run(t, m, d, Options{}); math.Max(b.Report.Deviation.Max, -b.Report.Deviation.Min) > 5*sigma {
			t.Errorf("best fit leaves %.4f mm", math.Max(b.Report.Deviation.Max, -b.Report.Deviation.Min))
		}
		flipsAt(t, m, d, Options{Align: AlignDatum, Datum: DatumNominal})
	})
	t.Run("scale", func(t *testing.T) {
		// The model came out 0.5 % too large.
		const f = 1.005
		p := tunnel(nil)
		p.chord *= f
		m := measure(t, mustPoints(p))
		d := nominal(m)
		c := run(t, m, d, Options{})
		if e := c.Report.Derived.Chord.Difference - (f-1)*chord200; math.Abs(e) > 0.03 {
			t.Errorf("chord %.4f mm longer than designed, want %.2f", c.Report.Derived.Chord.Difference, (f-1)*chord200)
		}
		free := run(t, m, d, Options{Scale: ScaleFree})
		if e := free.Motion.Scale*f - 1; math.Abs(e) > 1e-5 {
			t.Errorf("free scale %.7f, want %.7f", free.Motion.Scale, 1/f)
		}
		if D := math.Max(free.Report.Deviation.Max, -free.Report.Deviation.Min); D > 5*sigma {
			t.Errorf("free scale leaves %.4f mm", D)
		}
		flipsAt(t, m, d, Options{})
	})
}

func mustPoints(p part) []geometry.Point {
	pts, _, _ := p.points()
	return pts
}

// TestZones: a tighter band at the nose takes the nose points, the default
// band the rest, and asymmetric bands judge each side by its own limit.
func TestZones(t *testing.T) {
	const h = 0.03
	// 30 µm too fat over the first 4 % of the chord.
	m := measure(t, mustPoints(tunnel(func(x float64, _ bool) float64 {
		if x <= 0.04 {
			return h
		}
		return 0
	})))
	d := placed(t, m)
	nose, err := ParseZone("name=nose,x=0:0.05,tol=0.02")
	if err != nil {
		t.Fatal(err)
	}
	rest := Band{Plus: 0.05, Minus: 0.05}
	c := run(t, m, d, Options{Align: AlignDatum, Datum: DatumNominal, Tolerance: Tolerance{Default: &rest, Zones: []Zone{nose}}})
	r := c.Report
	if len(r.Zones) != 2 || r.Zones[0].Name != "nose" || r.Zones[1].Name != "elsewhere" {
		t.Fatalf("zones %+v", r.Zones)
	}
	if r.Zones[0].Verdict != VerdictFail || r.Zones[1].Verdict != VerdictPass || r.Verdict != VerdictFail {
		t.Errorf("verdicts: nose %s, elsewhere %s, overall %s; want fail, pass, fail", r.Zones[0].Verdict, r.Zones[1].Verdict, r.Verdict)
	}
	for _, p := range c.Points {
		if (p.XC <= 0.05) != (p.Zone == 0) {
			t.Fatalf("point at x/c %.4f in zone %d", p.XC, p.Zone)
		}
	}
	// +0.04/-0.01 holds the fat nose.
	asym, _ := ParseZone("name=nose,x=0:0.05,tol=+0.04/-0.01")
	c = run(t, m, d, Options{Align: AlignDatum, Datum: DatumNominal, Tolerance: Tolerance{Default: &rest, Zones: []Zone{asym}}})
	if c.Report.Verdict != VerdictPass {
		t.Errorf("asymmetric nose band: verdict %s, want pass", c.Report.Verdict)
	}
	// The zone fit uses the slack the bands leave: the tight nose band
	// makes it shift the part back against the fat nose.
	mz := run(t, m, d, Options{Align: AlignMinZone, Tolerance: Tolerance{Default: &rest, Zones: []Zone{nose}}})
	if mz.Report.Verdict != VerdictPass || !(mz.Report.Alignment.Objective <= 1) {
		t.Errorf("zone fit: verdict %s, largest use %.3f; want pass", mz.Report.Verdict, mz.Report.Alignment.Objective)
	}
}

// TestMinimumZoneNACA checks the zone fit on the design outline against a
// brute-force search over rigid motions, on a small case: the search,
// started from the least-squares fit, must not find a smaller largest
// |deviation|, and comes within 1 % of the fit's.
func TestMinimumZoneNACA(t *testing.T) {
	p := tunnel(func(x float64, upper bool) float64 { return 0.01 * math.Sin(17*x+0.3) })
	p.noise = 0
	m := measure(t, mustPoints(p))
	// A small case: every 25th point.
	var pts []geometry.Point
	var origins []geometry.Origin
	for i := 0; i < len(m.Points); i += 25 {
		pts, origins = append(pts, m.Points[i]), append(origins, m.Origins[i])
	}
	m.Points, m.Origins = pts, origins
	d := placed(t, m)
	c := run(t, m, d, Options{Align: AlignMinZone})
	ls := run(t, m, d, Options{})
	brute := bruteZone(d.Outline, m.Points, ls.Motion, [3]float64{0.002, 0.1, 0.1})
	got := c.Report.Alignment.Objective
	t.Logf("least squares %.6f mm, zone fit %.6f mm, brute force %.6f mm", math.Max(ls.Report.Deviation.Max, -ls.Report.Deviation.Min), got, brute)
	if brute < got-1e-9 || brute > got*1.01 {
		t.Errorf("zone fit %.9f mm, brute force %.9f mm", got, brute)
	}
}

// bruteZone returns the smallest largest |distance| over rigid motions in
// a box about m (half-widths: angle, shift x, shift y): a grid over the
// box, then grids about each of the best few nodes, six times over at
// finer spacing.
func bruteZone(o align.Outline, pts []geometry.Point, m align.Motion, half [3]float64) float64 {
	type node struct {
		m align.Motion
		f float64
	}
	use := func(c align.Motion, cut float64) float64 {
		f := 0.0
		for _, q := range pts {
			f = math.Max(f, math.Abs(o.Nearest(c.Apply(q)).Distance))
			if f >= cut {
				break
			}
		}
		return f
	}
	cands := []node{{m, use(m, math.Inf(1))}}
	steps := 12
	for range 7 {
		var next []node
		for _, cand := range cands {
			for a := -steps; a <= steps; a++ {
				for x := -steps; x <= steps; x++ {
					for y := -steps; y <= steps; y++ {
						c := cand.m
						c.Angle += half[0] * float64(a) / float64(steps)
						c.Shift.X += half[1] * float64(x) / float64(steps)
						c.Shift.Y += half[2] * float64(y) / float64(steps)
						cut := math.Inf(1)
						if len(next) == 4 {
							cut = next[3].f
						}
						if f := use(c, cut); f < cut {
							next = append(next, node{c, f})
							sort.Slice(next, func(i, j int) bool { return next[i].f < next[j].f })
							if len(next) > 4 {
								next = next[:4]
							}
						}
					}
				}
			}
		}
		cands = next
		for k := range half {
			half[k] *= 2.0 / float64(steps)
		}
		steps = 5
	}
	return cands[0].f
}

// inProcess runs a built-in stage in this process: the arithmetic of the
// aerodynamic comparison, without the child processes (those are tested
// end to end by the compare command's tests).
func inProcess(ctx context.Context, name string, sec, params []byte) ([]byte, error) {
	st, _ := builtin.Lookup(name)
	res, err := st.Run(ctx, stage.Request{Section: sec, Params: params, SectionName: name})
	if err != nil {
		return nil, err
	}
	return res.DocumentV1() // the built-in stages answer packed documents
}

// TestAeroTwist: a twist error δ in the datum frame shows in the
// thin-aerofoil stage as ΔCl = 2πδ (thin-aerofoil theory: Cl = 2π(α −
// α_L0), the shape unchanged), and the vortex-panel stage gives about the
// same; a pure offset of the part gives no ΔCl beyond discretisation.
func TestAeroTwist(t *testing.T) {
	alphas := []float64{-4, 0, 4, 8}
	for _, tc := range []struct {
		name  string
		twist float64
		shift geometry.Point
	}{
		{"twist", 0.5, geometry.Point{}},
		{"offset", 0, geometry.Point{X: 0.8, Y: -0.5}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			p := tunnel(nil)
			p.noise = 0
			p.twist += tc.twist
			p.move = func(q geometry.Point) geometry.Point { return q.Add(tc.shift) }
			m := measure(t, mustPoints(p))
			d := placed(t, m)
			c := run(t, m, d, Options{Align: AlignDatum, Datum: DatumNominal})
			if err := c.Aero(context.Background(), inProcess, AeroOptions{AlphaDeg: alphas, CpAlphaDeg: 4}); err != nil {
				t.Fatal(err)
			}
			want := 2 * math.Pi * tc.twist * math.Pi / 180
			for _, meth := range c.Report.Aero.Methods {
				for i, dcl := range meth.DeltaCl {
					tol := 1e-3
					if meth.Stage == StageVortexPanel {
						tol = 0.1*math.Abs(want) + 1e-3 // the panel lift slope exceeds 2π with thickness
					}
					if math.Abs(dcl-want) > tol {
						t.Errorf("%s at %g°: ΔCl %.5f, want %.5f ± %.4f", meth.Stage, meth.AlphaDeg[i], dcl, want, tol)
					}
				}
				t.Logf("%s: ΔCl %.5f (2πδ = %.5f), ΔCm %.5f, Δα_L0 %.4f°", meth.Stage, meth.DeltaCl, want, meth.DeltaCm, meth.AlphaL0Deg.Difference)
				if math.Abs(meth.AlphaL0Deg.Difference+tc.twist) > 0.01 {
					t.Errorf("%s: Δα_L0 %.4f°, want %.2f", meth.Stage, meth.AlphaL0Deg.Difference, -tc.twist)
				}
			}
			if c.Cp == nil || c.Cp.AlphaDeg != 4 || len(c.Cp.Delta.Upper) == 0 {
				t.Errorf("no ΔCp at 4°: %+v", c.Cp)
			}
			var b bytes.Buffer
			if err := c.Report.WriteJSON(&b); err != nil {
				t.Fatal(err)
			}
		})
	}
}
