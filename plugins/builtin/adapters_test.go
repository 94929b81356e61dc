package builtin_test

import (
	"bytes"
	"context"
	"errors"
	"math"
	"reflect"
	"slices"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/plugins/builtin"
	"github.com/foilwright/foilwright/plugins/builtin/sourcepanel"
	"github.com/foilwright/foilwright/plugins/builtin/vortexpanel"
	"github.com/foilwright/foilwright/plugins/stage"
)

// naca returns the section document and nodes of a NACA 4-digit section
// (NACA Report 824 equations) with 2·perSurface cosine-spaced panels.
func naca(t *testing.T, code string, perSurface int, sharp bool) ([]byte, []geometry.Point) {
	t.Helper()
	n, err := shape.ParseNACA4(code)
	if err != nil {
		t.Fatal(err)
	}
	n.SharpTE = sharp
	nodes := n.Loop(perSurface)
	var b bytes.Buffer
	if err := section.Write(&b, &section.Section{Format: section.Format, Nodes: nodes}); err != nil {
		t.Fatal(err)
	}
	return b.Bytes(), nodes
}

func runStage(t *testing.T, name string, section []byte, params string) (*stage.ResultDoc, stage.Result, error) {
	t.Helper()
	s, ok := builtin.Lookup(name)
	if !ok {
		t.Fatalf("no stage %q", name)
	}
	res, err := s.Run(context.Background(), stage.Request{Section: section, Params: []byte(params), SectionName: "test.json"})
	if err != nil {
		return nil, res, err
	}
	// The document as the run folder holds it, read back: the same
	// numbers, bit for bit, as the stage gave.
	text, err := res.Document()
	if err != nil {
		t.Fatal(err)
	}
	doc, err := stage.DecodeResult(text)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(doc, res.Doc) {
		t.Errorf("%s: the written result document reads back different", name)
	}
	return doc, res, nil
}

func TestNames(t *testing.T) {
	if got := builtin.Names(); !slices.Equal(got, []string{"plots", "source-panel", "thin-aerofoil", "vortex-panel"}) {
		t.Errorf("Names = %v", got)
	}
	if _, ok := builtin.Lookup("nope"); ok {
		t.Error("Lookup of an unknown name succeeded")
	}
}

// TestVortexPanelAdapter checks that the stage passes the nodes untouched
// and the angles converted from degrees to the solver, by comparing with a
// direct call of package vortexpanel.
func TestVortexPanelAdapter(t *testing.T) {
	sec, nodes := naca(t, "2412", 40, true)
	doc, res, err := runStage(t, "vortex-panel", sec, `{"alpha_deg": [-3, 5]}`)
	if err != nil {
		t.Fatal(err)
	}
	sv, err := vortexpanel.New(nodes)
	if err != nil {
		t.Fatal(err)
	}
	alphas := []float64{-3, 5} // degrees, converted as the stage does: α·π/180
	for i := range alphas {
		alphas[i] = alphas[i] * math.Pi / 180
	}
	want, err := sv.Solve(alphas)
	if err != nil {
		t.Fatal(err)
	}
	for i, c := range doc.Cases {
		if c.CL != want[i].Cl || c.CMc4 != want[i].Cm || c.Checks["cl_diff"] != want[i].ClDiff || len(c.Cp) != len(nodes) || c.Cp[7].Cp != want[i].Cp[7] {
			t.Errorf("case %d: stage cl %g cm %g, solver cl %g cm %g", i, c.CL, c.CMc4, want[i].Cl, want[i].Cm)
		}
	}
	if doc.Scalars["panels"] != 80 || doc.Scalars["blunt"] != 0 {
		t.Errorf("scalars %v", doc.Scalars)
	}
	for _, k := range []string{"build", "factor", "solve", "total"} {
		if res.Timings[k] <= 0 {
			t.Errorf("timing %s = %v", k, res.Timings[k])
		}
	}
	if _, _, err := runStage(t, "vortex-panel", sec, `{"alpha_deg": [1], "cp": false}`); err != nil {
		t.Fatal(err)
	}
}

func TestSourcePanelClosesOpenTrailingEdge(t *testing.T) {
	sec, nodes := naca(t, "0012", 40, false) // open trailing edge, 0.00126 chord
	doc, _, err := runStage(t, "source-panel", sec, `{"alpha_deg": [0, 4]}`)
	if err != nil {
		t.Fatal(err)
	}
	if len(doc.Warnings) == 0 || !strings.Contains(doc.Warnings[0], "closed by a straight base panel") {
		t.Errorf("warnings %q", doc.Warnings)
	}
	if doc.Scalars["panels"] != float64(len(nodes)) {
		t.Errorf("panels %g, want %d (with the base panel)", doc.Scalars["panels"], len(nodes))
	}
	// The closed-body source sum is the method's self-check (Hess & Smith
	// 1967); the solver documents about 1e-3 at this panel count.
	if c := doc.Scalars["closure_max"]; !(c < sourcepanel.ClosureTolerance) {
		t.Errorf("closure_max %g", c)
	}
	if _, _, err := runStage(t, "source-panel", sec, `{"close_te": false}`); !errors.Is(err, stage.ErrBadInput) || !errors.Is(err, sourcepanel.ErrOpenContour) {
		t.Errorf("close_te false on an open section: %v", err)
	}
}

// TestThinAerofoilNACA2412 compares with thin-aerofoil theory for the NACA
// 2412 mean line, whose integrals have closed forms: α_L0 = −2.077° and
// cm_c/4 = −0.0531 (Abbott & von Doenhoff, Theory of Wing Sections, 1959,
// ch. 4; values from memory). The camber line is taken from the sampled
// section, so the tolerance allows for sampling.
func TestThinAerofoilNACA2412(t *testing.T) {
	sec, _ := naca(t, "2412", 80, true)
	doc, _, err := runStage(t, "thin-aerofoil", sec, `{"alpha_deg": [0, 4]}`)
	if err != nil {
		t.Fatal(err)
	}
	if a := doc.Scalars["alpha_l0_deg"]; math.Abs(a+2.077) > 0.05 {
		t.Errorf("alpha_l0_deg %g, want -2.077", a)
	}
	if cm := doc.Scalars["cm_c4"]; math.Abs(cm+0.0531) > 0.001 {
		t.Errorf("cm_c4 %g, want -0.0531", cm)
	}
	// cl = 2π(α − α_L0), exactly as the theory states.
	for _, c := range doc.Cases {
		want := 2 * math.Pi * (c.AlphaDeg - doc.Scalars["alpha_l0_deg"]) * math.Pi / 180
		if math.Abs(c.CL-want) > 1e-12 {
			t.Errorf("alpha %g: cl %g, want %g", c.AlphaDeg, c.CL, want)
		}
		if len(c.Load) == 0 || c.Load[0].X <= 0 {
			t.Errorf("alpha %g: load %v", c.AlphaDeg, c.Load[:min(2, len(c.Load))])
		}
	}
}

func TestAdaptersMarkBadSections(t *testing.T) {
	_, nodes := naca(t, "0012", 10, true)
	slices.Reverse(nodes) // clockwise
	var b bytes.Buffer
	section.Write(&b, &section.Section{Format: section.Format, Nodes: nodes})
	for _, name := range []string{"vortex-panel", "source-panel"} {
		if _, _, err := runStage(t, name, b.Bytes(), ""); !errors.Is(err, stage.ErrBadInput) || !strings.Contains(err.Error(), "clockwise") {
			t.Errorf("%s: clockwise nodes: %v", name, err)
		}
	}
}
