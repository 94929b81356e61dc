package pipeline

import (
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

func TestSlurmTime(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want int
	}{
		{"30", 1800}, {"30:15", 1815}, {"01:02:03", 3723}, {"2-00", 172800}, {"1-02:30", 95400}, {"1-02:03:04", 93784},
	} {
		got, err := ParseSlurmTime(tc.in)
		if err != nil || got != tc.want {
			t.Errorf("ParseSlurmTime(%q) = %d, %v; want %d", tc.in, got, err, tc.want)
		}
		if back, _ := ParseSlurmTime(SlurmTime(got)); back != got {
			t.Errorf("%q: SlurmTime(%d) = %q reads back as %d", tc.in, got, SlurmTime(got), back)
		}
	}
	for _, bad := range []string{"", "0", "a", "1:2:3:4", "-5", "1-", "10m"} {
		if _, err := ParseSlurmTime(bad); err == nil {
			t.Errorf("ParseSlurmTime(%q) took it", bad)
		}
	}
	if SlurmTime(93784) != "1-02:03:04" || SlurmTime(300) != "00:05:00" {
		t.Errorf("SlurmTime: %s, %s", SlurmTime(93784), SlurmTime(300))
	}
}

// TestFitLine recovers an exact line and keeps the fit physical.
func TestFitLine(t *testing.T) {
	xs := []float64{0.1, 0.5, 1, 2, 4}
	ys := make([]float64, len(xs))
	for i, x := range xs {
		ys[i] = 0.3 + 1.7*x
	}
	if a, b := fitLine(xs, ys); math.Abs(a-0.3) > 1e-12 || math.Abs(b-1.7) > 1e-12 {
		t.Errorf("fit %g + %g x, want 0.3 + 1.7 x", a, b)
	}
	if a, b := fitLine([]float64{1, 1, 1}, []float64{2, 3, 4}); a != 3 || b != 0 {
		t.Errorf("one size: %g + %g x, want the mean", a, b)
	}
	if a, b := fitLine([]float64{1, 2}, []float64{5, 1}); a < 0 || b < 0 {
		t.Errorf("falling times: %g + %g x", a, b)
	}
}

func TestCalibrateCost(t *testing.T) {
	_, manifest := runRotor(t)
	c, err := CalibrateCost([]string{manifest}, DefaultCostModel)
	if err != nil {
		t.Fatal(err)
	}
	if c.Fixed < 0 || c.PerMB < 0 || !strings.Contains(c.Source, "4 section(s)") || c.BaseMiB < DefaultCostModel.BaseMiB {
		t.Errorf("calibrated %+v", c)
	}
}

func TestJobScript(t *testing.T) {
	path := setup(t, rotorPipeline, rotorFiles)
	pl := loadPlan(t, path)
	o := JobScriptOptions{Foilwright: "/opt/fw it's/foilwright", Pipeline: path, Folder: "/scratch/run", CPUs: 2, Tasks: 3,
		Partition: "short", Cost: CostModel{Fixed: 600, PerMB: 0, BaseMiB: 100, StageMiB: 50, PerPointKiB: 1, BytesPerPoint: 30, Source: "a test model"}}
	script, est, err := JobScript(pl, o)
	if err != nil {
		t.Fatal(err)
	}
	s := string(script)
	// 4 sections of 600 s on 3 tasks: the dearest task has 2 (1200 s), on 2
	// CPUs 600 s, asked twice over.
	if est.CoreS != 2400 || est.DearestS != 1200 || est.TimeS != 1200 {
		t.Errorf("estimate %+v", est)
	}
	// Memory: 100 + 2 workers × (3 stages × 50 + the largest section's points).
	points := float64(est.LargestB) / 30
	if want := roundUp((100+2*(150+points/1024))*memMargin, 64); est.MemMiB != want {
		t.Errorf("memory %d MiB, want %d", est.MemMiB, want)
	}
	for _, want := range []string{"#SBATCH --array=0-2\n", "#SBATCH --cpus-per-task=2\n", "#SBATCH --time=00:20:00\n",
		"#SBATCH --partition=short\n", "#SBATCH --requeue\n", `FOILWRIGHT='/opt/fw it'\''s/foilwright'`,
		"--shard auto --resume", "--dependency=afterok:", "merge $(printf %q \"$RUN\")", "a test model"} {
		if !strings.Contains(s, want) {
			t.Errorf("the script lacks %q:\n%s", want, s)
		}
	}
	if again, _, _ := JobScript(pl, o); string(again) != s {
		t.Error("the same plan gave another script")
	}
	if bash, err := exec.LookPath("bash"); err == nil {
		f := filepath.Join(t.TempDir(), "job.sbatch")
		os.WriteFile(f, script, 0o644)
		if out, err := exec.Command(bash, "-n", f).CombinedOutput(); err != nil {
			t.Errorf("bash -n: %v: %s", err, out)
		}
	}
	// Estimated tasks: about 30 minutes of work each.
	o.Tasks = 0
	if _, est, _ = JobScript(pl, o); est.Tasks != 1 {
		t.Errorf("%d tasks for 2400 core-seconds on 2 CPUs", est.Tasks)
	}
	o.TaskTargetS = 300
	if _, est, _ = JobScript(pl, o); est.Tasks != 4 {
		t.Errorf("%d tasks for 2400 core-seconds, 300 s a task on 2 CPUs (at most the 4 sections)", est.Tasks)
	}
}

// TestPlanDigest: the digest follows the sections' files, not the order
// of the directory.
func TestPlanDigest(t *testing.T) {
	path := setup(t, rotorPipeline, rotorFiles)
	d := loadPlan(t, path).Digest()
	if d != loadPlan(t, path).Digest() {
		t.Fatal("the same plan has two digests")
	}
	os.WriteFile(filepath.Join(filepath.Dir(path), "in", "probe-e.dat"), []byte(thinPoints), 0o644)
	if d == loadPlan(t, path).Digest() {
		t.Error("another section, the same digest")
	}
}

// TestCalibrateCostExact fits the model to two recorded runs whose times
// lie on a known line, one with time outside its sections: least squares
// recovers the line exactly (a line through the points is its own fit),
// and the run's unaccounted time is shared out among its sections.
func TestCalibrateCostExact(t *testing.T) {
	dir := t.TempDir()
	write := func(name string, files map[string]int, prep map[string]float64, total float64, jobs int) string {
		m := Manifest{Format: ManifestFormat, Pipeline: PipelineRef{File: "pipeline.json"}, Timings: Timings{TotalS: total, Jobs: jobs}}
		for f, n := range files {
			if err := os.WriteFile(filepath.Join(dir, f), make([]byte, n), 0o644); err != nil {
				t.Fatal(err)
			}
			m.Sections = append(m.Sections, SectionRecord{Name: f, Inputs: []FileHash{{Path: f}}})
			m.Timings.Sections = append(m.Timings.Sections, SectionTiming{Name: f, PrepareS: prep[f] / 2, Stages: []StageTiming{{ID: "a", S: prep[f] / 2}}})
		}
		path := filepath.Join(dir, name)
		if err := writeManifest(path, &m); err != nil {
			t.Fatal(err)
		}
		return path
	}
	// 0.5 s + 2 s per MB, no time outside the sections.
	a := write("a.json", map[string]int{"s1": 1e6, "s2": 3e6}, map[string]float64{"s1": 2.5, "s2": 6.5}, 9, 1)
	c, err := CalibrateCost([]string{a}, DefaultCostModel)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(c.Fixed-0.5) > 1e-9 || math.Abs(c.PerMB-2) > 1e-9 {
		t.Errorf("one run: %g s + %g s/MB, want 0.5 + 2", c.Fixed, c.PerMB)
	}
	// Two workers for 7 s: 14 core-seconds, 13 of them in the sections,
	// so 0.5 s more a section: 1 s + 2 s per MB.
	b := write("b.json", map[string]int{"s3": 2e6, "s4": 4e6}, map[string]float64{"s3": 4.5, "s4": 8.5}, 7, 2)
	c, err = CalibrateCost([]string{b}, DefaultCostModel)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(c.Fixed-1) > 1e-9 || math.Abs(c.PerMB-2) > 1e-9 {
		t.Errorf("run with time outside its sections: %g s + %g s/MB, want 1 + 2", c.Fixed, c.PerMB)
	}
	c, err = CalibrateCost([]string{a, b}, DefaultCostModel)
	if err != nil {
		t.Fatal(err)
	}
	// Points (1, 2.5), (3, 6.5), (2, 5), (4, 9): by the normal equations
	// (x̄ = 2.5, ȳ = 5.75, Sxy = 10.5, Sxx = 5) slope 2.1, intercept
	// 5.75 - 2.1·2.5 = 0.5.
	if math.Abs(c.Fixed-0.5) > 1e-9 || math.Abs(c.PerMB-2.1) > 1e-9 || !strings.Contains(c.Source, "4 section(s)") {
		t.Errorf("two runs: %g s + %g s/MB (%s), want 0.5 + 2.1", c.Fixed, c.PerMB, c.Source)
	}
	if _, err := CalibrateCost(nil, DefaultCostModel); err == nil {
		t.Error("no manifest: no error")
	}
}
