package pipeline

import (
	"context"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// runRotor makes a run of rotorPipeline and returns its manifest path.
func runRotor(t *testing.T) (pipeline, manifest string) {
	t.Helper()
	path := setup(t, rotorPipeline, rotorFiles)
	sum, err := Run(context.Background(), loadPlan(t, path), RunOptions{Jobs: 2, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
	if err != nil {
		t.Fatal(err)
	}
	return path, sum.Manifest
}

func verifyOpts(t *testing.T, reg *fakeRegistry) VerifyOptions {
	return VerifyOptions{Known: fakeStages, Jobs: 2, Preparer: fakePrep{}, NewRunner: reg.New, TempDir: t.TempDir()}
}

func TestVerifyReproduces(t *testing.T) {
	_, manifest := runRotor(t)
	opts := verifyOpts(t, &fakeRegistry{})
	rep, err := Verify(context.Background(), manifest, opts)
	if err != nil {
		t.Fatal(err)
	}
	if !rep.OK() || rep.Checked != 25 || len(rep.Notes) != 0 {
		t.Errorf("report %+v, want OK over 25 outputs (24 and the batch table)", rep)
	}
	if left, _ := os.ReadDir(opts.TempDir); len(left) != 0 {
		t.Errorf("verify left %d entries in its scratch folder", len(left))
	}
}

// TestVerifyDetectsChangedOutput changes what the area stage computes (and
// its version): verify lists exactly the outputs that depend on it.
func TestVerifyDetectsChangedOutput(t *testing.T) {
	_, manifest := runRotor(t)
	m, err := ReadManifest(manifest)
	if err != nil {
		t.Fatal(err)
	}
	rep, err := Verify(context.Background(), manifest, verifyOpts(t, &fakeRegistry{areaAdd: 1e-12, version: "1.1"}))
	if err != nil {
		t.Fatal(err)
	}
	if rep.OK() {
		t.Fatal("verify passed a run whose stage changed")
	}
	var paths []string
	for _, d := range rep.Differences {
		paths = append(paths, d.Path)
		if d.Want != m.Outputs[d.Path] || d.Got == "" || d.Got == d.Want {
			t.Errorf("difference %+v", d)
		}
	}
	// Results carry the stage version, so every result changes, and the
	// batch table with them; the section documents, nodes and plots do not.
	want := []string{TableName}
	for _, s := range []string{"probe-a", "probe-b", "probe-c", "thin"} {
		for _, f := range []string{"area", "double", "plot"} {
			want = append(want, s+"/results/"+f+".json")
		}
	}
	if strings.Join(paths, " ") != strings.Join(want, " ") {
		t.Errorf("differences %q\nwant %q", paths, want)
	}
	if len(rep.Notes) != 3 || !strings.Contains(rep.Notes[0], "stage area was area 1.0") {
		t.Errorf("notes %q", rep.Notes)
	}
	if s := rep.Differences[1].String(); !strings.HasPrefix(s, "probe-a/results/area.json: want sha256 "+m.Outputs["probe-a/results/area.json"]+", got ") {
		t.Errorf("difference prints %q", s)
	}
}

// TestVerifyDetectsTamperedManifest edits one recorded sha256 and drops one
// output from the manifest.
func TestVerifyDetectsTamperedManifest(t *testing.T) {
	_, manifest := runRotor(t)
	m, _ := ReadManifest(manifest)
	m.Outputs["thin/nodes.dat"] = strings.Repeat("0", 64)
	got := m.Outputs["thin/plots/shape.svg"]
	delete(m.Outputs, "thin/plots/shape.svg")
	if err := writeManifest(manifest, m); err != nil {
		t.Fatal(err)
	}
	rep, err := Verify(context.Background(), manifest, verifyOpts(t, &fakeRegistry{}))
	if err != nil {
		t.Fatal(err)
	}
	// Each shows twice: the files on disk and the re-run both depart
	// from the altered manifest.
	if len(rep.Differences) != 4 {
		t.Fatalf("differences %+v", rep.Differences)
	}
	for i, onDisk := range []bool{true, true, false, false} {
		d := rep.Differences[i]
		if d.OnDisk != onDisk {
			t.Errorf("difference %d: on disk %v, want %v", i, d.OnDisk, onDisk)
		}
		if i%2 == 0 && (d.Path != "thin/nodes.dat" || d.Want != strings.Repeat("0", 64) || d.Got == "") {
			t.Errorf("difference %d: %+v", i, d)
		}
		if i%2 == 1 && (d.Path != "thin/plots/shape.svg" || d.Want != "" || d.Got != got) {
			t.Errorf("difference %d: %+v", i, d)
		}
	}
}

// TestVerifyChecksFilesOnDisk is the regression test of defect 7 of issue
// 11: with outputs altered or deleted in the run folder, verify said
// "reproduced" and exited 0, because it never read the folder.
func TestVerifyChecksFilesOnDisk(t *testing.T) {
	_, manifest := runRotor(t)
	run := filepath.Dir(manifest)
	os.WriteFile(filepath.Join(run, "thin", "section.json"), []byte("{}\n"), 0o644)
	os.Remove(filepath.Join(run, "thin", "nodes.dat"))
	os.WriteFile(filepath.Join(run, "thin", "extra.txt"), []byte("x"), 0o644)
	os.Remove(filepath.Join(run, "thin", "results", "area.json"))
	os.Symlink("../section.json", filepath.Join(run, "thin", "results", "area.json"))
	rep, err := Verify(context.Background(), manifest, verifyOpts(t, &fakeRegistry{}))
	if err != nil {
		t.Fatal(err)
	}
	if rep.OK() {
		t.Fatal("verify passed a tampered run folder")
	}
	var named []string
	for _, d := range rep.Differences {
		if !d.OnDisk {
			t.Errorf("the re-run differs: %v", d)
			continue
		}
		named = append(named, d.String())
	}
	want := []string{
		"thin/nodes.dat: missing",
		"thin/results/area.json: not a regular file",
		"thin/section.json: want sha256",
		"thin/extra.txt: not in the manifest",
	}
	if len(named) != len(want) {
		t.Fatalf("on disk: %q, want %d differences", named, len(want))
	}
	for i, w := range want {
		if !strings.HasPrefix(named[i], w) {
			t.Errorf("difference %d: %q, want %q…", i, named[i], w)
		}
	}
	var b strings.Builder
	rep.Write(&b)
	for _, f := range []string{"thin/nodes.dat", "thin/results/area.json", "thin/section.json", "thin/extra.txt", "not reproduced: 4 file(s) of the run folder differ"} {
		if !strings.Contains(b.String(), f) {
			t.Errorf("report lacks %q:\n%s", f, b.String())
		}
	}
}

func TestVerifyRefusesChangedInputs(t *testing.T) {
	for _, tc := range []struct {
		name   string
		change func(dir string) error
		want   error
		msg    string
	}{
		{"pipeline edited", func(dir string) error {
			return os.WriteFile(filepath.Join(dir, "pipeline.json"), []byte(strings.Replace(rotorPipeline, `"factor": 2`, `"factor": 3`, 1)), 0o644)
		}, ErrPipelineChanged, "pipeline.json has sha256"},
		{"pipeline gone", func(dir string) error { return os.Remove(filepath.Join(dir, "pipeline.json")) }, ErrPipelineChanged, "no such file"},
		{"input edited", func(dir string) error {
			return os.WriteFile(filepath.Join(dir, "in/probe-b.dat"), []byte(thickPoints+"\n"), 0o644)
		}, ErrInputChanged, "in/probe-b.dat: sha256"},
		{"new file matches a glob", func(dir string) error {
			return os.WriteFile(filepath.Join(dir, "in/probe-e.dat"), []byte(thinPoints), 0o644)
		}, ErrInputChanged, "section probe-e is new (in/probe-e.dat)"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			path, manifest := runRotor(t)
			if err := tc.change(filepath.Dir(path)); err != nil {
				t.Fatal(err)
			}
			_, err := Verify(context.Background(), manifest, verifyOpts(t, &fakeRegistry{}))
			if !errors.Is(err, tc.want) || !strings.Contains(err.Error(), tc.msg) {
				t.Errorf("got %v, want %v containing %q", err, tc.want, tc.msg)
			}
		})
	}
}

func TestVerifyNotManifest(t *testing.T) {
	p := filepath.Join(t.TempDir(), "m.json")
	os.WriteFile(p, []byte(`{"format": "foilwright.section/1"}`), 0o644)
	if _, err := Verify(context.Background(), p, verifyOpts(t, &fakeRegistry{})); !errors.Is(err, ErrNotManifest) {
		t.Errorf("got %v, want ErrNotManifest", err)
	}
}

func TestVerifyReportWrite(t *testing.T) {
	r := &VerifyReport{Manifest: "m.json", Checked: 3,
		Differences: []Difference{{Path: "a/x.json", Want: "11", Got: "22"}, {Path: "a/y.json", Want: "33"}},
		Notes:       []string{"foilwright was 0.1.0, now 0.2.0"}}
	var b strings.Builder
	r.Write(&b)
	want := "differs in the re-run: a/x.json: want sha256 11, got 22\ndiffers in the re-run: a/y.json: missing (want sha256 33)\n" +
		"note: foilwright was 0.1.0, now 0.2.0\nnot reproduced: 0 file(s) of the run folder differ from m.json, 2 output(s) of the re-run differ, 0 section(s) changed\n"
	if b.String() != want {
		t.Errorf("got\n%s\nwant\n%s", b.String(), want)
	}
}
