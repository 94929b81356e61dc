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
	if !strings.Contains(stdout, "dropped ../../examples/tunnel-model/probe.csv:66: outlier: 1.8") {
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
	for _, rel := range []string{"tunnel-model/probe.csv", "tunnel-model/pipeline.json", "rotor/blade-scan.stl", "rotor/pipeline.json",
		"rotor/design/r300.dat", "rotor/design/r500.dat", "rotor/design/r700.dat", "rotor/design/r900.dat", "rotor/design/r1100.dat"} {
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
		code     int      // the rotor's printed blade is out of tolerance at its trailing edge
		files    []string // some outputs that must exist
	}{
		{"tunnel-model", 1, exitOK, []string{"midspan/section.json", "midspan/results/vortex.json", "midspan/plots/polar.svg", "midspan/plots/streamlines-vortex.svg",
			"midspan/export/section.geo", "midspan/export/template.svg", "midspan/export/cp.csv",
			"midspan/compare.json", "midspan/compare.csv", "midspan/plots/compare.svg", "verdicts.csv"}},
		{"rotor", 5, exitOutOfTolerance, []string{"r700/results/stiffness.json", "r300/plots/prep.svg", "stations.svg", "r700/compare.json", "r700/plots/compare-dcp.svg", "verdicts.csv"}},
	} {
		t.Run(ex.name, func(t *testing.T) {
			pipe := filepath.Join(dir, "examples", ex.name, "pipeline.json")
			first, second := filepath.Join(dir, "run1-"+ex.name), filepath.Join(dir, "run2-"+ex.name)
			for i, out := range []string{first, second} {
				stdout, stderr, code := runCLI(t, "run", pipe, "-o", out, "--jobs", []string{"1", "2"}[i])
				if code != ex.code {
					t.Fatalf("run %d: exit %d, want %d\n%s\n%s", i+1, code, ex.code, stdout, stderr)
				}
				if !strings.Contains(stdout, "section(s): ") || strings.Count(stdout, "\nok ")+boolInt(strings.HasPrefix(stdout, "ok ")) != ex.sections || !strings.Contains(stdout, "verdicts against the design") {
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
				checkRotorCp(t, first)
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

// TestExampleVerdicts checks the planted facts the comparisons find: the
// tunnel model (NACA 2412, NACA Report 824, 3 µm probing noise) is within
// its drawing (nose ±0.02 mm, elsewhere ±0.05 mm); the printed rotor blade
// is within ±0.2 mm at its nose but out of ±0.3 mm at its trailing edge,
// which the printer rounded to a 0.6 mm radius (demogen: the cap reaches
// 0.6 mm beyond the design's blunt end).
func TestExampleVerdicts(t *testing.T) {
	dir := t.TempDir()
	rep := filepath.Join(dir, "tunnel.json")
	if _, stderr, code := runCLI(t, "compare", "../../examples/tunnel-model/probe.csv", "--design", "naca4:2412", "--chord", "200",
		"--tolerance", "0.05", "--zone", "name=nose,x=0:0.05,tol=0.02", "--no-aero", "-q", "-o", rep); code != exitOK {
		t.Fatalf("tunnel model: exit %d: %s", code, stderr)
	}
	data, _ := os.ReadFile(rep)
	r := readReport(t, data)
	if r.Verdict != "pass" || r.Deviation.RMS > 0.005 || math.Abs(r.Derived.Chord.Difference) > 0.05 {
		t.Errorf("tunnel model: verdict %s, RMS %.4f mm, chord off by %.4f mm", r.Verdict, r.Deviation.RMS, r.Derived.Chord.Difference)
	}
	rep = filepath.Join(dir, "r700.json")
	_, stderr, code := runCLI(t, "compare", "../../examples/rotor/blade-scan.stl", "--units", "mm", "--cut", "z=700", "--noise", "0.04",
		"--design", "../../examples/rotor/design/r700.dat", "--design-units", "chord", "--chord", "117.3684", "--twist", "9.3684", "--offset=-34.7409,5.7316",
		"--align", "datum", "--datum", "nominal", "--tolerance", "0.3", "--zone", "name=nose,x=0:0.05,tol=0.2", "--no-aero", "-q", "-o", rep)
	if code != exitOutOfTolerance {
		t.Fatalf("rotor r700: exit %d: %s", code, stderr)
	}
	data, _ = os.ReadFile(rep)
	r = readReport(t, data)
	w := r.Deviation.Worst[0]
	if r.Zones[0].Verdict != "pass" || r.Zones[1].Verdict != "fail" || w.XC < 0.99 || math.Abs(w.Deviation-0.6) > 0.1 {
		t.Errorf("rotor r700: nose %s, elsewhere %s, worst %+.3f mm at x/c %.4f", r.Zones[0].Verdict, r.Zones[1].Verdict, w.Deviation, w.XC)
	}
	if math.Abs(r.Derived.TwistDeg.Difference) > 0.1 {
		t.Errorf("rotor r700: twist off by %.3f° in the rotor frame", r.Derived.TwistDeg.Difference)
	}
}

func boolInt(b bool) int {
	if b {
		return 1
	}
	return 0
}
