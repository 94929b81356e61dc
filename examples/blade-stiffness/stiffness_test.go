package main

import (
	"context"
	"errors"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
	"github.com/foilwright/foilwright/plugins/stagetest"
)

// relTol is the relative tolerance of every comparison with a closed-form
// value: the stage only multiplies and takes one square root, so a few
// ulps of float64 round-off are all it may lose (chosen with a wide margin).
const relTol = 1e-12

// angleTol is the tolerance on angles, degrees.
const angleTol = 1e-9

// The built binary, for the process test; set by TestMain.
var (
	binPath  string
	binError error
)

func TestMain(m *testing.M) {
	os.Exit(runMain(m))
}

func runMain(m *testing.M) int {
	dir, err := os.MkdirTemp("", "blade-stiffness-test-")
	if err != nil {
		binError = err
		return m.Run()
	}
	defer os.RemoveAll(dir)
	binPath = filepath.Join(dir, "blade-stiffness")
	if goBin, err := exec.LookPath("go"); err != nil {
		binError = fmt.Errorf("no go tool in PATH: %w", err)
	} else if out, err := exec.Command(goBin, "build", "-o", binPath, ".").CombinedOutput(); err != nil {
		binError = fmt.Errorf("go build: %v\n%s", err, out)
	}
	return m.Run()
}

// doc is a section document under construction.
type doc struct {
	units    geometry.Unit
	chord    float64 // input units; 0 means no frame
	twistDeg float64
	mirrored bool
	nodes    []geometry.Point
	props    *section.Properties
}

func (d doc) encode(t testing.TB) []byte {
	t.Helper()
	s := &section.Section{Format: section.Format, Name: "test", Units: d.units, Nodes: d.nodes, Properties: d.props}
	if d.chord != 0 {
		s.Frame = &section.Frame{Chord: d.chord, TwistDeg: d.twistDeg, LE: [2]float64{12, -3}, Mirrored: d.mirrored}
	}
	b, err := section.Encode(s)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// rectangle returns the nodes of the rectangle 0 ≤ x ≤ 1, |y| ≤ t/2 in the
// package node order (a blunt trailing edge, left open) and its properties
// in chord units: A = t, Ixx = 1·t³/12, Iyy = t·1³/12, Ixy = 0 (b h³/12 for
// a rectangle of width b and depth h about its centroidal axis; exact, any
// strength-of-materials handbook, e.g. Roark's Formulas for Stress and
// Strain, table of properties of sections).
func rectangle(t float64) ([]geometry.Point, *section.Properties) {
	nodes := []geometry.Point{{X: 1, Y: t / 2}, {X: 0, Y: t / 2}, {X: 0, Y: 0}, {X: 0, Y: -t / 2}, {X: 1, Y: -t / 2}}
	return nodes, &section.Properties{Thickness: t, Area: t, Centroid: [2]float64{0.5, 0}, Ixx: t * t * t / 12, Iyy: t / 12}
}

// ellipse returns n+1 nodes of the ellipse with semi-axes 1/2 (along the
// chord) and t/2, from the trailing edge over the upper side, and its
// properties in chord units: A = π a b, Ixx = π a b³/4, Iyy = π a³ b/4
// (exact, e.g. Roark's Formulas for Stress and Strain, properties of
// sections).
func ellipse(t float64, n int) ([]geometry.Point, *section.Properties) {
	a, b := 0.5, t/2
	nodes := make([]geometry.Point, n+1)
	for i := range nodes {
		phi := 2 * math.Pi * float64(i) / float64(n)
		nodes[i] = geometry.Point{X: 0.5 + a*math.Cos(phi), Y: b * math.Sin(phi)}
	}
	nodes[n] = nodes[0]
	return nodes, &section.Properties{Thickness: t, Area: math.Pi * a * b, Centroid: [2]float64{0.5, 0},
		Ixx: math.Pi * a * b * b * b / 4, Iyy: math.Pi * a * a * a * b / 4}
}

// run runs the stage directly and returns the scalars and warnings.
func run(t *testing.T, section []byte, params string) (map[string]float64, []string) {
	t.Helper()
	res, err := BladeStiffness{}.Run(t.Context(), stage.Request{Section: section, Params: []byte(params), SectionName: "test.json"})
	if err != nil {
		t.Fatalf("Run: %v", err)
	}
	d, err := stage.DecodeResult(res.JSON)
	if err != nil {
		t.Fatal(err)
	}
	return d.Scalars, d.Warnings
}

func near(got, want, tol float64) bool {
	return math.Abs(got-want) <= tol*math.Max(math.Abs(want), math.SmallestNonzeroFloat64)
}

func checkScalars(t *testing.T, got, want map[string]float64) {
	t.Helper()
	for k, w := range want {
		g, ok := got[k]
		switch {
		case !ok:
			t.Errorf("%s: missing", k)
		case strings.HasSuffix(k, "_deg") || w == 0:
			if math.Abs(g-w) > angleTol {
				t.Errorf("%s = %.15g, want %.15g", k, g, w)
			}
		case !near(g, w, relTol):
			t.Errorf("%s = %.15g, want %.15g (rel diff %.2g)", k, g, w, (g-w)/w)
		}
	}
}

// TestRectangle checks a 250 mm × 30 mm solid rectangle against the hand
// calculation in metres: b = 0.25 m, h = 0.03 m, A = b h, I = b h³/12 about
// the axis along the chord and h b³/12 about the axis across it (exact,
// Roark's Formulas for Stress and Strain, properties of sections), at the
// default PLA/PETG-like material (1240 kg/m³, 3.5 GPa).
func TestRectangle(t *testing.T) {
	nodes, props := rectangle(0.12)
	got, warnings := run(t, doc{units: geometry.Millimetre, chord: 250, nodes: nodes, props: props}.encode(t), "")
	b, h := 0.25, 0.03
	iFlap, iEdge := b*h*h*h/12, h*b*b*b/12
	checkScalars(t, got, map[string]float64{
		"chord_m":            0.25,
		"area_m2":            b * h,
		"mass_per_m_kg":      1240 * b * h, // 9.3 kg/m
		"centroid_x":         0.5,
		"centroid_y":         0,
		"ixx_m4":             iFlap,
		"iyy_m4":             iEdge,
		"ixy_m4":             0,
		"i_flap_m4":          iFlap,
		"i_edge_m4":          iEdge,
		"principal_deg":      0,
		"principal_part_deg": 0,
		"ei_flap_nm2":        3.5e9 * iFlap,
		"ei_edge_nm2":        3.5e9 * iEdge,
	})
	if len(warnings) != 0 {
		t.Errorf("warnings %q, want none", warnings)
	}
}

// TestEllipse checks a 10 in × 1.5 in ellipse against the hand calculation
// in metres, a = 0.127 m, b = 0.01905 m (the inch is 0.0254 m exactly):
// A = π a b, I = π a b³/4 and π a³ b/4 (exact, Roark's Formulas for Stress
// and Strain, properties of sections), half filled, with other material
// values.
func TestEllipse(t *testing.T) {
	nodes, props := ellipse(0.15, 200)
	got, warnings := run(t, doc{units: geometry.Inch, chord: 10, nodes: nodes, props: props}.encode(t),
		`{"density_kg_m3": 1050, "modulus_gpa": 2.2, "fill_fraction": 0.5}`)
	a, b := 0.127, 0.01905
	iFlap, iEdge := math.Pi*a*b*b*b/4, math.Pi*a*a*a*b/4
	checkScalars(t, got, map[string]float64{
		"chord_m":       0.254,
		"area_m2":       math.Pi * a * b,
		"mass_per_m_kg": 0.5 * 1050 * math.Pi * a * b,
		"i_flap_m4":     iFlap,
		"i_edge_m4":     iEdge,
		"ei_flap_nm2":   0.5 * 2.2e9 * iFlap,
		"ei_edge_nm2":   0.5 * 2.2e9 * iEdge,
		"principal_deg": 0,
	})
	// The 200-gon's area is within 0.02 % of the ellipse's, so the only
	// warning is the one about the fill.
	if len(warnings) != 1 || !strings.Contains(warnings[0], "fill_fraction 0.5") {
		t.Errorf("warnings %q, want one about fill_fraction", warnings)
	}
}

// rotated returns the centroidal properties of a b × h rectangle (chord
// units) whose side b is turned phi radians counter-clockwise from the x
// axis, integrating over the rotated coordinates x = u cosφ − v sinφ,
// y = u sinφ + v cosφ with ∫u² dA = h b³/12, ∫v² dA = b h³/12, ∫uv dA = 0
// (calculated by hand).
func rotated(b, h, phi float64) *section.Properties {
	uu, vv := h*b*b*b/12, b*h*h*h/12
	s, c := math.Sincos(phi)
	return &section.Properties{
		Area:     b * h,
		Centroid: [2]float64{0.5, 0},
		Ixx:      s*s*uu + c*c*vv,
		Iyy:      c*c*uu + s*s*vv,
		Ixy:      s * c * (uu - vv),
	}
}

// TestPrincipal checks that the principal moments and the flapwise angle of
// a turned rectangle are the rectangle's own, b h³/12 about the side b and
// h b³/12 across it, at the turn angle; and that the axis nearer the chord
// is the flapwise one even when it carries the larger moment.
func TestPrincipal(t *testing.T) {
	const b, h = 0.8, 0.1
	for _, tc := range []struct {
		name             string
		b, h, phiDeg     float64
		wantDeg          float64
		wantFlap, wantEd float64
	}{
		{"turned up 7°", b, h, 7, 7, b * h * h * h / 12, h * b * b * b / 12},
		{"turned down 30°", b, h, -30, -30, b * h * h * h / 12, h * b * b * b / 12},
		{"turned 44°", b, h, 44, 44, b * h * h * h / 12, h * b * b * b / 12},
		// Side b at 60°: the axis nearer the chord is the short side's, at
		// −30°, about which the moment is the larger one.
		{"turned 60°", b, h, 60, -30, h * b * b * b / 12, b * h * h * h / 12},
		{"deeper than long", h, b, 0, 0, h * b * b * b / 12, b * h * h * h / 12},
	} {
		t.Run(tc.name, func(t *testing.T) {
			props := rotated(tc.b, tc.h, tc.phiDeg*math.Pi/180)
			flap, edge, deg, iso := Principal(props.Ixx, props.Iyy, props.Ixy)
			if iso {
				t.Fatal("reported isotropic")
			}
			if !near(flap, tc.wantFlap, relTol) || !near(edge, tc.wantEd, relTol) || math.Abs(deg-tc.wantDeg) > angleTol {
				t.Errorf("flap %.15g, edge %.15g, angle %.12g°; want %.15g, %.15g, %g°", flap, edge, deg, tc.wantFlap, tc.wantEd, tc.wantDeg)
			}
		})
	}
}

// TestTurnedSectionDocument runs a turned rectangle through Run, in metres
// with a 1 m chord, so that ixy and the angle reach the result document.
func TestTurnedSectionDocument(t *testing.T) {
	const b, h, phi = 0.8, 0.1, 12.0
	props := rotated(b, h, phi*math.Pi/180)
	nodes, _ := rectangle(0.1) // a stand-in outline; its area (0.1) is far from b·h = 0.08
	got, warnings := run(t, doc{units: geometry.Metre, chord: 1, nodes: nodes, props: props}.encode(t), `{"modulus_gpa": 1}`)
	checkScalars(t, got, map[string]float64{
		"ixy_m4":        props.Ixy,
		"i_flap_m4":     b * h * h * h / 12,
		"i_edge_m4":     h * b * b * b / 12,
		"principal_deg": phi,
		"ei_flap_nm2":   1e9 * b * h * h * h / 12,
	})
	if len(warnings) != 1 || !strings.Contains(warnings[0], "may not belong to these nodes") {
		t.Errorf("warnings %q, want one saying the properties do not match the nodes", warnings)
	}
}

// TestTwistAndMirror checks that the frame's twist and mirroring leave every
// principal value unchanged and only turn the flapwise axis in the part's
// coordinates: by −twist, and reflected (θ → −θ) when mirrored, following
// the frame p = LE + c·M·R(−τ)·q of package geometry.
func TestTwistAndMirror(t *testing.T) {
	const phi = 9.0
	props := rotated(0.8, 0.1, phi*math.Pi/180)
	nodes, _ := ellipse(0.1, 100)
	base, _ := run(t, doc{units: geometry.Millimetre, chord: 400, nodes: nodes, props: props}.encode(t), "")
	for _, tc := range []struct {
		twistDeg float64
		mirrored bool
		wantPart float64
	}{
		{0, false, 9},
		{12.5, false, -3.5},
		{-40, false, 49},
		{100, false, 89}, // −91° is the same axis as 89°
		{12.5, true, 3.5},
		{0, true, -9},
	} {
		t.Run(fmt.Sprintf("twist %g mirrored %v", tc.twistDeg, tc.mirrored), func(t *testing.T) {
			got, _ := run(t, doc{units: geometry.Millimetre, chord: 400, twistDeg: tc.twistDeg, mirrored: tc.mirrored, nodes: nodes, props: props}.encode(t), "")
			for k, v := range base {
				if k == "principal_part_deg" {
					continue
				}
				if got[k] != v {
					t.Errorf("%s = %.17g, untwisted %.17g: the frame must not change it", k, got[k], v)
				}
			}
			if g := got["principal_part_deg"]; math.Abs(g-tc.wantPart) > angleTol {
				t.Errorf("principal_part_deg = %.12g, want %g", g, tc.wantPart)
			}
		})
	}
}

// TestChordScaling checks that area scales with chord² and second moments
// and stiffnesses with chord⁴ (dimensional analysis; exact for powers of two
// in floating point), and that the unit of the frame is honoured.
func TestChordScaling(t *testing.T) {
	nodes, props := ellipse(0.12, 160)
	one, _ := run(t, doc{units: geometry.Metre, chord: 0.5, nodes: nodes, props: props}.encode(t), "")
	two, _ := run(t, doc{units: geometry.Metre, chord: 1, nodes: nodes, props: props}.encode(t), "")
	mm, _ := run(t, doc{units: geometry.Millimetre, chord: 500, nodes: nodes, props: props}.encode(t), "")
	for k, pow := range map[string]float64{"area_m2": 2, "mass_per_m_kg": 2, "i_flap_m4": 4, "i_edge_m4": 4, "ei_flap_nm2": 4, "ei_edge_nm2": 4, "centroid_x": 0} {
		if r := two[k] / one[k]; r != math.Pow(2, pow) {
			t.Errorf("%s: doubling the chord multiplied it by %.17g, want %g", k, r, math.Pow(2, pow))
		}
		if !near(mm[k], one[k], relTol) {
			t.Errorf("%s: 500 mm gave %.17g, 0.5 m gave %.17g", k, mm[k], one[k])
		}
	}
}

// TestChordUnits checks sections in chord units, without units or without
// a frame: chord_m gives the size, and without it the error says to give it.
func TestChordUnits(t *testing.T) {
	nodes, props := rectangle(0.1)
	for _, tc := range []struct {
		name string
		d    doc
		want string
	}{
		{"chord units", doc{units: geometry.ChordUnit, chord: 1, nodes: nodes, props: props}, `units "chord"`},
		{"no units", doc{chord: 120, nodes: nodes, props: props}, "does not say its units"},
		{"no frame", doc{units: geometry.Millimetre, nodes: nodes, props: props}, "no frame"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			sec := tc.d.encode(t)
			_, err := BladeStiffness{}.Run(t.Context(), stage.Request{Section: sec, SectionName: "r.json"})
			if !errors.Is(err, stage.ErrBadInput) || !strings.Contains(err.Error(), "chord_m") || !strings.Contains(err.Error(), tc.want) || !strings.Contains(err.Error(), "r.json") {
				t.Errorf("error %v, want stage.ErrBadInput naming r.json, saying %q and asking for chord_m", err, tc.want)
			}
			got, warnings := run(t, sec, `{"chord_m": 0.3}`)
			checkScalars(t, got, map[string]float64{"chord_m": 0.3, "area_m2": 0.3 * 0.03, "i_flap_m4": 0.3 * 0.03 * 0.03 * 0.03 / 12})
			if len(warnings) != 0 {
				t.Errorf("warnings %q, want none", warnings)
			}
		})
	}
	// A section in millimetres ignores chord_m, and says so.
	got, warnings := run(t, doc{units: geometry.Millimetre, chord: 200, nodes: nodes, props: props}.encode(t), `{"chord_m": 0.3}`)
	if got["chord_m"] != 0.2 || len(warnings) != 1 || !strings.Contains(warnings[0], "chord_m 0.3 ignored") {
		t.Errorf("chord_m %g, warnings %q; want 0.2 and a warning that chord_m is ignored", got["chord_m"], warnings)
	}
}

// TestBadSections checks the errors for sections the stage cannot use.
func TestBadSections(t *testing.T) {
	nodes, props := rectangle(0.1)
	bad := func(f func(p *section.Properties)) *section.Properties {
		q := *props
		f(&q)
		return &q
	}
	for _, tc := range []struct {
		name string
		d    doc
		want string
	}{
		{"no properties", doc{units: geometry.Millimetre, chord: 100, nodes: nodes}, "run the points through prep"},
		{"zero area", doc{units: geometry.Millimetre, chord: 100, nodes: nodes, props: bad(func(p *section.Properties) { p.Area = 0 })}, "must be positive"},
		{"negative ixx", doc{units: geometry.Millimetre, chord: 100, nodes: nodes, props: bad(func(p *section.Properties) { p.Ixx = -1e-4 })}, "must be positive"},
		{"ixy too large", doc{units: geometry.Millimetre, chord: 100, nodes: nodes, props: bad(func(p *section.Properties) { p.Ixy = 0.01 })}, "no real section"},
		{"unknown units", doc{units: "furlong", chord: 100, nodes: nodes, props: props}, "furlong"},
		{"negative chord", doc{units: geometry.Millimetre, chord: -5, nodes: nodes, props: props}, "frame chord -5"},
		{"two nodes", doc{units: geometry.Millimetre, chord: 100, nodes: nodes[:2], props: props}, "at least 3"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := BladeStiffness{}.Run(t.Context(), stage.Request{Section: tc.d.encode(t), SectionName: "bad.json"})
			if !errors.Is(err, stage.ErrBadInput) || !strings.Contains(err.Error(), tc.want) || !strings.Contains(err.Error(), "bad.json") {
				t.Errorf("error %v, want stage.ErrBadInput naming bad.json and saying %q", err, tc.want)
			}
		})
	}
}

// TestIsotropic checks a circle, whose every axis is principal (I = π r⁴/4,
// exact, Roark's Formulas for Stress and Strain): equal moments, angle 0
// and a warning.
func TestIsotropic(t *testing.T) {
	nodes, props := ellipse(1, 400)
	got, warnings := run(t, doc{units: geometry.Metre, chord: 2, nodes: nodes, props: props}.encode(t), "")
	checkScalars(t, got, map[string]float64{"i_flap_m4": math.Pi / 4, "i_edge_m4": math.Pi / 4, "principal_deg": 0})
	if len(warnings) != 1 || !strings.Contains(warnings[0], "every axis is principal") {
		t.Errorf("warnings %q, want one saying every axis is principal", warnings)
	}
}

// conformanceSection is a section the stage accepts without parameters.
func conformanceSection(t testing.TB) []byte {
	nodes, props := ellipse(0.12, 160)
	return doc{units: geometry.Millimetre, chord: 180, twistDeg: 4, nodes: nodes, props: props}.encode(t)
}

// TestConformance runs the SDK's conformance suite, directly and through
// in-process gRPC. Its default NACA 0012 section has no properties block,
// which this stage refuses, so the suite gets one that has.
func TestConformance(t *testing.T) {
	stagetest.RunOptions(t, BladeStiffness{}, stagetest.Options{Section: conformanceSection(t)})
	t.Run("with parameters", func(t *testing.T) {
		stagetest.RunOptions(t, BladeStiffness{}, stagetest.Options{
			Section: conformanceSection(t),
			Params:  []byte(`{"density_kg_m3": 2700, "modulus_gpa": 69, "fill_fraction": 0.8}`),
		})
	})
}

// TestProcess starts the built binary as a real child process through the
// host, pinned by its sha256, and compares its reply with a direct call; a
// wrong pin must be refused before the stage starts.
func TestProcess(t *testing.T) {
	if binError != nil {
		t.Fatalf("building the stage: %v", binError)
	}
	sum, err := host.FileSHA256(binPath)
	if err != nil {
		t.Fatal(err)
	}
	// Starts under -race take about a second; leave room.
	h, err := host.New(host.Options{StartTimeout: 30 * time.Second, CallTimeout: 30 * time.Second})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { h.Close() })
	ctx, cancel := context.WithTimeout(t.Context(), time.Minute)
	defer cancel()

	r := h.Runner(host.Spec{Path: binPath, SHA256: sum})
	defer r.Close()
	described, err := r.Describe(ctx)
	if err != nil {
		t.Fatal(err)
	}
	if described.Name != info.Name || described.Version != Version || len(described.Params) != len(info.Params) || len(described.Scalars) != len(info.Scalars) {
		t.Errorf("Describe over the process: %+v", described)
	}
	req := stage.Request{Section: conformanceSection(t), Params: []byte(`{"fill_fraction": 0.6}`), SectionName: "blade.json"}
	reply, err := r.Run(ctx, req)
	if err != nil {
		t.Fatal(err)
	}
	direct, err := BladeStiffness{}.Run(ctx, req)
	if err != nil {
		t.Fatal(err)
	}
	if string(reply.JSON) != string(direct.JSON) {
		t.Errorf("the process replied\n%s\nthe direct call gave\n%s", reply.JSON, direct.JSON)
	}
	if reply.Doc.Scalars["mass_per_m_kg"] <= 0 {
		t.Errorf("mass_per_m_kg %g in the process reply", reply.Doc.Scalars["mass_per_m_kg"])
	}

	// Errors cross the process boundary with their sentinel and message.
	_, err = r.Run(ctx, stage.Request{Section: stagetest.Section(40), SectionName: "bare.json"})
	if !errors.Is(err, stage.ErrBadInput) || !strings.Contains(err.Error(), "prep") {
		t.Errorf("section without properties over the process: %v, want stage.ErrBadInput asking for prep", err)
	}

	wrong := strings.Repeat("0", 64)
	bad := h.Runner(host.Spec{Path: binPath, SHA256: wrong})
	defer bad.Close()
	if _, err := bad.Describe(ctx); !errors.Is(err, host.ErrChecksum) {
		t.Errorf("wrong pin: %v, want host.ErrChecksum", err)
	}
}

// BenchmarkRun measures one direct Run call, decoding the section document
// of a 160-panel section and encoding the result.
func BenchmarkRun(b *testing.B) {
	req := stage.Request{Section: conformanceSection(b), SectionName: "bench.json"}
	for b.Loop() {
		if _, err := (BladeStiffness{}).Run(context.Background(), req); err != nil {
			b.Fatal(err)
		}
	}
}
