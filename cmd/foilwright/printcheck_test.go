package main

import (
	"bytes"
	"encoding/json"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/plugins/stagetest"
)

// The Node.js example stage, examples/print-check, run as a user runs it:
// through the conformance suite as an executable and in its pipeline. It
// needs node and the example's node_modules ("npm ci" in its folder, which
// .ci/run does). Without them the test is skipped, saying so, unless
// FOILWRIGHT_REQUIRE_NODE is set (as .ci/run sets it where node and npm
// are installed): then it fails.
func needNodeStage(t *testing.T) string {
	t.Helper()
	dir, err := filepath.Abs("../../examples/print-check")
	if err != nil {
		t.Fatal(err)
	}
	missing := ""
	if _, err := exec.LookPath("node"); err != nil {
		missing = "node is not installed"
	} else if _, err := os.Stat(filepath.Join(dir, "node_modules", "@grpc", "grpc-js")); err != nil {
		missing = "its node_modules are missing: run \"npm ci\" in examples/print-check"
	}
	if missing != "" {
		if os.Getenv("FOILWRIGHT_REQUIRE_NODE") != "" {
			t.Fatalf("the Node.js example stage cannot run: %s (FOILWRIGHT_REQUIRE_NODE is set)", missing)
		}
		t.Skipf("the Node.js example stage is not run: %s", missing)
	}
	return filepath.Join(dir, "stage.js")
}

func TestPrintCheckConforms(t *testing.T) {
	exe := needNodeStage(t)
	// Its good calls give the chord: the suite's section is in chord units.
	stagetest.RunExecutableOptions(t, exe, stagetest.Options{Params: []byte(`{"chord_mm": 120}`)})

	// Without a chord it refuses the suite's section, as bad input.
	stdout, stderr, code := runCLI(t, "stages", "check", exe)
	if code != exitFailed || !strings.Contains(stdout, "give chord_mm") {
		t.Errorf("stages check without chord_mm: exit %d\n%s\n%s", code, stdout, stderr)
	}
}

// The example's copy of the stage protocol must be the protocol.
func TestPrintCheckProtoCurrent(t *testing.T) {
	want, err := os.ReadFile("../../plugins/proto/stage/v1/stage.proto")
	if err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile("../../examples/print-check/proto/stage.proto")
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(got, want) {
		t.Error("examples/print-check/proto/stage.proto differs from plugins/proto/stage/v1/stage.proto: copy it over")
	}
}

func TestPrintCheckPipeline(t *testing.T) {
	if testing.Short() {
		t.Skip("runs the Node.js example's pipeline")
	}
	needNodeStage(t)
	out := filepath.Join(t.TempDir(), "run")
	stdout, stderr, code := runCLI(t, "run", "../../examples/print-check/pipeline.json", "-o", out, "--jobs", "2")
	if code != 0 || !strings.Contains(stdout, "5 section(s): 5 ok") {
		t.Fatalf("run: exit %d\n%s\n%s", code, stdout, stderr)
	}
	for _, st := range []string{"r300", "r500", "r700", "r900", "r1100"} {
		data, err := os.ReadFile(filepath.Join(out, st, "results", "print.json"))
		if err != nil {
			t.Fatal(err)
		}
		var res struct {
			Format   string
			Stage    string
			Scalars  map[string]float64
			Warnings []string
		}
		if err := json.Unmarshal(data, &res); err != nil {
			t.Fatalf("%s: %v", st, err)
		}
		f, err := os.Open(filepath.Join(out, st, "section.json"))
		if err != nil {
			t.Fatal(err)
		}
		sec, err := section.Read(f, st)
		f.Close()
		if err != nil || sec.Frame == nil || sec.Properties == nil {
			t.Fatalf("%s: section %v", st, err)
		}
		s := res.Scalars
		if res.Format != "foilwright.result/2" || res.Stage != "print-check" {
			t.Errorf("%s: format %q stage %q", st, res.Format, res.Stage)
		}
		// The chord comes from the section's frame (mm); the area, from the
		// nodes, agrees with prep's area of the fitted curve (geometry/props)
		// within what 300-odd panels cut off the curve.
		c := sec.Frame.Chord
		if math.Abs(s["chord_mm"]-c) > 1e-9*c {
			t.Errorf("%s: chord %g, frame %g", st, s["chord_mm"], c)
		}
		if a := sec.Properties.Area * c * c; math.Abs(s["area_mm2"]/a-1) > 5e-4 {
			t.Errorf("%s: area %g mm², prep says %g", st, s["area_mm2"], a)
		}
		if math.Abs(s["walls_mm2"]+s["infill_mm2"]-s["area_mm2"]) > 1e-9*s["area_mm2"] {
			t.Errorf("%s: walls %g + infill %g ≠ area %g", st, s["walls_mm2"], s["infill_mm2"], s["area_mm2"])
		}
		// 3 walls of 0.4 mm, 15 % infill, 1.24 g/cm³ (the pipeline file).
		if m := 1.24 * (s["walls_mm2"] + 0.15*s["infill_mm2"]); math.Abs(s["mass_g_per_m"]-m) > 1e-9*m {
			t.Errorf("%s: mass %g g/m, want %g", st, s["mass_g_per_m"], m)
		}
		if t0 := sec.Properties.Thickness * c; math.Abs(s["thickness_mm"]/t0-1) > 2e-3 {
			t.Errorf("%s: thickness %g mm, prep says %g", st, s["thickness_mm"], t0)
		}
		// The printer rounded the scanned blade's trailing edge (the demo
		// data's planted fact): what is left is thinner than a line only at
		// the very tip, and the walls meet well ahead of it.
		if !(s["thin_te_mm"] >= 0 && s["thin_te_mm"] < 0.5 && s["solid_te_mm"] > 1 && s["solid_te_mm"] < 0.2*c) {
			t.Errorf("%s: thin %g mm, solid %g mm of chord %g", st, s["thin_te_mm"], s["solid_te_mm"], c)
		}
	}

	// The manifest records what the script runs from: node itself and the
	// files the stage declares, node_modules among them.
	var m struct {
		Stages []struct {
			ID       string
			RunsFrom []struct{ Path, SHA256 string } `json:"runs_from"`
		}
	}
	data, err := os.ReadFile(filepath.Join(out, "manifest.json"))
	if err != nil || json.Unmarshal(data, &m) != nil || len(m.Stages) != 1 {
		t.Fatalf("manifest: %v", err)
	}
	var paths []string
	for _, f := range m.Stages[0].RunsFrom {
		if len(f.SHA256) != 64 {
			t.Errorf("runs from %s: sha256 %q", f.Path, f.SHA256)
		}
		paths = append(paths, filepath.Base(f.Path))
	}
	if got := strings.Join(paths, " "); !strings.HasPrefix(got, "node") || !strings.Contains(got, "node_modules") || !strings.Contains(got, "printcheck.js") {
		t.Errorf("runs from %s", got)
	}
	stdout, stderr, code = runCLI(t, "run", "--verify", filepath.Join(out, "manifest.json"))
	if code != 0 || !strings.Contains(stdout, "reproduced:") {
		t.Errorf("verify: exit %d\n%s\n%s", code, stdout, stderr)
	}
}
