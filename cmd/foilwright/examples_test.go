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
)

// The examples are invented demo data (internal/demogen): NACA 4-digit
// sections (NACA Report 824) with planted noise, slips and offsets. These
// tests run them as a user would and check the planted facts come back.

func TestExampleProbe(t *testing.T) {
	out := filepath.Join(t.TempDir(), "probe.json")
	stdout, stderr, code := runCLI(t, "prep", "../../examples/tunnel-model/probe.csv", "-o", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	s := loadSection(t, out)
	// Planted: NACA 2412, 200 mm chord, tilted 4° nose-up (the farthest-
	// point chord of a 2412 sits 0.09° off its nominal one), two probe
	// slips on lines 66 and 217.
	if math.Abs(s.Frame.Chord-200) > 0.2 || math.Abs(s.Frame.TwistDeg-4.09) > 0.05 {
		t.Errorf("chord %.3f mm, twist %.3f°; want 200 ± 0.2, 4.09 ± 0.05", s.Frame.Chord, s.Frame.TwistDeg)
	}
	if math.Abs(s.Properties.Thickness-0.12) > 0.001 || math.Abs(s.Properties.ThicknessAt-0.30) > 0.01 {
		t.Errorf("thickness %.4f at %.3f, want 0.120 at 0.30", s.Properties.Thickness, s.Properties.ThicknessAt)
	}
	var lines []int
	for _, d := range s.Source.Dropped {
		lines = append(lines, d.Line)
	}
	if len(lines) != 2 || lines[0] != 66 || lines[1] != 217 {
		t.Errorf("dropped lines %v, want [66 217]", lines)
	}
	if !strings.Contains(stdout, "dropped ../../examples/tunnel-model/probe.csv:66: outlier: 1.81 mm off") {
		t.Errorf("summary does not list the slip on line 66:\n%s", stdout)
	}
}

func loadSection(t *testing.T, path string) *section.Section {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	s, err := section.Read(f, path)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// copyExample copies the example folders the pipelines use into dir and
// builds the custom stage there.
func copyExample(t *testing.T, dir string) {
	t.Helper()
	for _, rel := range []string{"tunnel-model/probe.csv", "tunnel-model/pipeline.json", "rotor/blade-scan.stl", "rotor/pipeline.json"} {
		data, err := os.ReadFile(filepath.Join("../../examples", rel))
		if err != nil {
			t.Fatal(err)
		}
		dst := filepath.Join(dir, "examples", rel)
		os.MkdirAll(filepath.Dir(dst), 0o755)
		if err := os.WriteFile(dst, data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	bin := filepath.Join(dir, "examples", "blade-stiffness", "blade-stiffness")
	build := exec.Command("go", "build", "-o", bin, "../../examples/blade-stiffness")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("build the custom stage: %v\n%s", err, out)
	}
}

func TestExamplePipelines(t *testing.T) {
	if testing.Short() {
		t.Skip("runs every example pipeline")
	}
	dir := t.TempDir()
	copyExample(t, dir)
	for _, ex := range []struct {
		name     string
		sections int
		files    []string // some outputs that must exist
	}{
		{"tunnel-model", 1, []string{"midspan/section.json", "midspan/results/vortex.json", "midspan/plots/polar.svg", "midspan/plots/streamlines-vortex.svg",
			"midspan/export/section.geo", "midspan/export/template.svg", "midspan/export/cp.csv"}},
		{"rotor", 5, []string{"r700/results/stiffness.json", "r300/plots/prep.svg", "stations.svg"}},
	} {
		t.Run(ex.name, func(t *testing.T) {
			pipe := filepath.Join(dir, "examples", ex.name, "pipeline.json")
			first, second := filepath.Join(dir, "run1-"+ex.name), filepath.Join(dir, "run2-"+ex.name)
			for i, out := range []string{first, second} {
				stdout, stderr, code := runCLI(t, "run", pipe, "-o", out, "--jobs", []string{"1", "2"}[i])
				if code != 0 {
					t.Fatalf("run %d: exit %d\n%s\n%s", i+1, code, stdout, stderr)
				}
				if !strings.Contains(stdout, "section(s): ") || strings.Count(stdout, "\nok ")+boolInt(strings.HasPrefix(stdout, "ok ")) != ex.sections {
					t.Errorf("run %d summary:\n%s", i+1, stdout)
				}
			}
			for _, f := range ex.files {
				if _, err := os.Stat(filepath.Join(first, f)); err != nil {
					t.Errorf("missing output %s", f)
				}
			}
			if ex.name == "rotor" {
				checkRunExports(t, first)
			}
			// Two runs (1 and 2 workers) give identical bytes everywhere but
			// in the manifest, whose timings differ.
			var m struct{ Outputs map[string]string }
			data, err := os.ReadFile(filepath.Join(first, "manifest.json"))
			if err != nil || json.Unmarshal(data, &m) != nil || len(m.Outputs) == 0 {
				t.Fatalf("manifest: %v", err)
			}
			for rel := range m.Outputs {
				a, _ := os.ReadFile(filepath.Join(first, rel))
				b, _ := os.ReadFile(filepath.Join(second, rel))
				if !bytes.Equal(a, b) {
					t.Errorf("%s differs between two runs", rel)
				}
			}
			stdout, stderr, code := runCLI(t, "run", "--verify", filepath.Join(first, "manifest.json"))
			if code != 0 || !strings.Contains(stdout, "reproduced:") {
				t.Errorf("verify: exit %d\n%s\n%s", code, stdout, stderr)
			}
		})
	}
}

func boolInt(b bool) int {
	if b {
		return 1
	}
	return 0
}
