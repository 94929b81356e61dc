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
