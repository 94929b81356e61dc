package pipeline

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"sort"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/plugins/stage"
	"github.com/foilwright/foilwright/prep"
	"github.com/tidwall/gjson"
)

// Invented input points, in the package node order (trailing edge, upper,
// leading edge, lower, trailing edge).
const (
	// Chord 1: the polygon is two triangles on the chord, heights 0.06 and
	// 0.04, so its area is (0.06 + 0.04) / 2 = 0.05 (calculated by hand).
	thinPoints = "# invented\n1 0\n0.5 0.06\n0 0\n0.5 -0.04\n1 0\n"
	// Chord 200 with its leading edge at (0, 0): normalised, heights 0.1 and
	// 0.05, area 0.075 (calculated by hand).
	thickPoints = "# invented\n200 0\n100 20\n0 0\n100 -10\n200 0\n"
)

// areaTol is the tolerance on areas computed from exactly representable
// points; rounding alone separates them from the hand values.
const areaTol = 1e-15

// setup writes the pipeline and the input files into a fresh folder and
// returns the pipeline file's path.
func setup(t *testing.T, pipeline string, files map[string]string) string {
	t.Helper()
	dir := t.TempDir()
	for name, data := range files {
		p := filepath.Join(dir, filepath.FromSlash(name))
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, []byte(data), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	path := filepath.Join(dir, "pipeline.json")
	if err := os.WriteFile(path, []byte(pipeline), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

const rotorPipeline = `{
  "foilwright": 1,
  "name": "rotor",
  "inputs": [
    {"name": "thin", "files": ["in/thin.dat"], "station": 0.4},
    {"files": ["in/probe-*.dat"], "per_file": true, "units": "mm"}
  ],
  "prepare": {"units": "chord", "panels": 160},
  "stages": [
    {"id": "double", "stage": "scale", "after": ["area"], "params": {"factor": 2}},
    {"id": "area", "stage": "area"},
    {"id": "plot", "stage": "plot"}
  ],
  "outputs": {"folder": "out"}
}`

var rotorFiles = map[string]string{
	"in/thin.dat":     thinPoints,
	"in/probe-b.dat":  thickPoints,
	"in/probe-a.dat":  thinPoints,
	"in/ignored.txt":  "not an input",
	"in/probe-c.dat":  thickPoints,
	"in/probe-d.data": "not matched by the glob",
}

func loadPlan(t *testing.T, path string) *Plan {
	t.Helper()
	p, err := Load(path, fakeStages)
	if err != nil {
		t.Fatal(err)
	}
	return p.Plan()
}

// readTree returns every file under dir by slash path.
func readTree(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	files := map[string][]byte{}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		data, err := os.ReadFile(p)
		rel, _ := filepath.Rel(dir, p)
		files[filepath.ToSlash(rel)] = data
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return files
}

func hexSum(b []byte) string {
	s := sha256.Sum256(b)
	return hex.EncodeToString(s[:])
}

func TestRun(t *testing.T) {
	path := setup(t, rotorPipeline, rotorFiles)
	pl := loadPlan(t, path)
	reg := &fakeRegistry{}
	sum, err := Run(context.Background(), pl, RunOptions{Jobs: 2, Preparer: fakePrep{}, NewRunner: reg.New})
	if err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(filepath.Dir(path), "out")
	if sum.Folder != out || len(sum.Failed()) != 0 {
		t.Fatalf("summary %+v", sum)
	}
	var names []string
	for _, s := range sum.Sections {
		names = append(names, s.Name+":"+s.Status)
	}
	if want := []string{"thin:ok", "probe-a:ok", "probe-b:ok", "probe-c:ok"}; !reflect.DeepEqual(names, want) {
		t.Errorf("sections %q, want %q", names, want)
	}

	files := readTree(t, out)
	wantArea := map[string]float64{"thin": 0.05, "probe-a": 0.05, "probe-b": 0.075, "probe-c": 0.075}
	for name, area := range wantArea {
		for _, f := range []string{"section.json", "nodes.dat", "results/area.json", "results/double.json", "results/plot.json", "plots/shape.svg"} {
			if _, ok := files[name+"/"+f]; !ok {
				t.Errorf("%s/%s not written", name, f)
			}
		}
		got := gjson.GetBytes(files[name+"/results/area.json"], "scalars.area").Float()
		if math.Abs(got-area) > areaTol {
			t.Errorf("%s: area %v, want %v", name, got, area)
		}
		// The scale stage saw the area stage's result.
		if got := gjson.GetBytes(files[name+"/results/double.json"], "scalars.scaled").Float(); math.Abs(got-2*area) > 2*areaTol {
			t.Errorf("%s: doubled area %v, want %v", name, got, 2*area)
		}
	}
	// nodes.dat: name line, then "x y" in shortest form.
	if got, want := string(files["probe-b/nodes.dat"]), "probe-b\n1 0\n0.5 0.1\n0 0\n0.5 -0.05\n1 0\n"; got != want {
		t.Errorf("nodes.dat:\n%s\nwant\n%s", got, want)
	}

	m, err := ReadManifest(filepath.Join(out, ManifestName))
	if err != nil {
		t.Fatal(err)
	}
	// Every output on disk is in the manifest with its sha256, and nothing else is.
	delete(files, ManifestName)
	if len(m.Outputs) != len(files) {
		t.Errorf("manifest lists %d outputs, the folder holds %d", len(m.Outputs), len(files))
	}
	for p, data := range files {
		if m.Outputs[p] != hexSum(data) {
			t.Errorf("%s: manifest sha256 %q, file has %s", p, m.Outputs[p], hexSum(data))
		}
	}
	pipeData, _ := os.ReadFile(path)
	if filepath.Join(out, filepath.FromSlash(m.Pipeline.File)) != path || m.Pipeline.SHA256 != hexSum(pipeData) || m.Pipeline.Name != "rotor" || m.Tool.Name != "foilwright" || m.Tool.Version == "" {
		t.Errorf("manifest head %+v %+v", m.Tool, m.Pipeline)
	}
	var order []string
	for _, s := range m.Stages {
		order = append(order, s.ID+"="+s.Name+"@"+s.Version)
	}
	if want := []string{"area=area@1.0", "double=scale@1.0", "plot=plot@1.0"}; !reflect.DeepEqual(order, want) {
		t.Errorf("manifest stages %q, want %q", order, want)
	}
	var params bytes.Buffer
	json.Compact(&params, m.Stages[1].Params)
	if params.String() != `{"factor":2}` || !reflect.DeepEqual(m.Stages[1].After, []string{"area"}) {
		t.Errorf("double stage record %+v", m.Stages[1])
	}
	probeB := m.Sections[2]
	if probeB.Name != "probe-b" || len(probeB.Inputs) != 1 || probeB.Inputs[0].Path != "in/probe-b.dat" ||
		probeB.Inputs[0].SHA256 != hexSum([]byte(thickPoints)) || probeB.Settings.Units != "mm" || *probeB.Settings.Panels != 160 {
		t.Errorf("probe-b record %+v", probeB)
	}
	if s := m.Sections[0]; s.Station == nil || *s.Station != 0.4 || s.Settings.Units != "chord" {
		t.Errorf("thin record %+v", s)
	}
	if w := m.Sections[0].Stages[1].Warnings; !reflect.DeepEqual(w, []string{"scaled by the factor"}) {
		t.Errorf("warnings %q", w)
	}
	if len(m.Timings.Sections) != 4 || m.Timings.Jobs != 2 {
		t.Errorf("timings %+v", m.Timings)
	}
	// One runner per worker, each closed, all calls made through them.
	calls := 0
	for _, r := range reg.runners {
		if !r.closed {
			t.Error("a runner was not closed")
		}
		calls += r.calls
	}
	if len(reg.runners) != 2 || calls != 12 {
		t.Errorf("%d runners made %d calls, want 2 runners and 12 calls", len(reg.runners), calls)
	}
}

// withoutTimings returns the manifest's fields, raw, with "timings" removed.
func withoutTimings(t *testing.T, data []byte) map[string]string {
	t.Helper()
	var m map[string]json.RawMessage
	if err := json.Unmarshal(data, &m); err != nil {
		t.Fatal(err)
	}
	if _, ok := m["timings"]; !ok {
		t.Fatal("manifest has no timings")
	}
	delete(m, "timings")
	s := map[string]string{}
	for k, v := range m {
		s[k] = string(v)
	}
	return s
}

// TestRunDeterministic runs the same pipeline twice, with different numbers
// of workers: every file has the same bytes, the manifest apart from its
// timings too.
func TestRunDeterministic(t *testing.T) {
	path := setup(t, rotorPipeline, rotorFiles)
	pl := loadPlan(t, path)
	var trees []map[string][]byte
	for _, jobs := range []int{1, 3} {
		folder := filepath.Join(t.TempDir(), "run")
		reg := &fakeRegistry{}
		if _, err := Run(context.Background(), pl, RunOptions{Folder: folder, Jobs: jobs, Preparer: fakePrep{}, NewRunner: reg.New}); err != nil {
			t.Fatal(err)
		}
		trees = append(trees, readTree(t, folder))
	}
	a, b := trees[0], trees[1]
	if len(a) != len(b) || len(a) < 20 {
		t.Fatalf("%d and %d files", len(a), len(b))
	}
	for p := range a {
		if p == ManifestName {
			if x, y := withoutTimings(t, a[p]), withoutTimings(t, b[p]); !reflect.DeepEqual(x, y) {
				t.Errorf("manifests differ outside timings:\n%v\n%v", x, y)
			}
			continue
		}
		if !bytes.Equal(a[p], b[p]) {
			t.Errorf("%s differs between runs", p)
		}
	}
}

func TestRunFailedSectionIsolated(t *testing.T) {
	files := map[string]string{
		"in/good.dat": thinPoints,
		"in/bad.dat":  "# invented\n1 0\n0.5 oops\n0 0\n",
		"in/more.dat": thickPoints,
	}
	path := setup(t, `{"foilwright": 1, "name": "iso",
	  "inputs": [{"files": ["in/good.dat"]}, {"files": ["in/bad.dat"]}, {"files": ["in/more.dat"]}],
	  "stages": [{"id": "area", "stage": "area"}]}`, files)
	pl := loadPlan(t, path)
	reg := &fakeRegistry{}
	sum, err := Run(context.Background(), pl, RunOptions{Jobs: 2, Preparer: fakePrep{}, NewRunner: reg.New})
	if err != nil {
		t.Fatal(err)
	}
	failed := sum.Failed()
	if len(failed) != 1 || failed[0].Name != "bad" || failed[0].Err != "prepare: in/bad.dat:3: not a number" {
		t.Fatalf("failed sections %+v", failed)
	}
	tree := readTree(t, sum.Folder)
	for _, p := range []string{"good/section.json", "good/results/area.json", "more/results/area.json"} {
		if _, ok := tree[p]; !ok {
			t.Errorf("%s missing: the failed section harmed the others", p)
		}
	}
	for p := range tree {
		if strings.HasPrefix(p, "bad/") {
			t.Errorf("failed section left %s", p)
		}
	}
	m, err := ReadManifest(sum.Manifest)
	if err != nil {
		t.Fatal(err)
	}
	if s := m.Sections[1]; s.Status != StatusFailed || s.Err != failed[0].Err {
		t.Errorf("manifest records %+v", s)
	}
}

func TestRunOnError(t *testing.T) {
	pipeline := `{"foilwright": 1, "name": "onerr",
	  "inputs": [{"name": "s", "files": ["in/s.dat"]}],
	  "stages": [
	    {"id": "area", "stage": "area"},
	    {"id": "broken", "stage": "fail", "on_error": "%s"},
	    {"id": "needs-broken", "stage": "area", "after": ["broken"]},
	    {"id": "double", "stage": "scale", "after": ["area"], "params": {"factor": 2}}
	  ]}`
	for _, tc := range []struct {
		onError string
		status  string
		stages  []string
		files   []string
	}{
		{"continue", StatusPartial, []string{"area:ok", "broken:failed", "needs-broken:skipped", "double:ok"},
			[]string{TableName, "s/nodes.dat", "s/results/area.json", "s/results/double.json", "s/section.json"}},
		{"stop", StatusFailed, []string{"area:ok", "broken:failed", "needs-broken:not-run", "double:not-run"},
			[]string{TableName, "s/nodes.dat", "s/results/area.json", "s/section.json"}},
	} {
		t.Run(tc.onError, func(t *testing.T) {
			path := setup(t, strings.Replace(pipeline, "%s", tc.onError, 1), map[string]string{"in/s.dat": thinPoints})
			sum, err := Run(context.Background(), loadPlan(t, path), RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
			if err != nil {
				t.Fatal(err)
			}
			r := sum.Sections[0]
			var stages []string
			for _, s := range r.Stages {
				stages = append(stages, s.ID+":"+s.Status)
			}
			if r.Status != tc.status || !reflect.DeepEqual(stages, tc.stages) {
				t.Errorf("status %s stages %q, want %s %q", r.Status, stages, tc.status, tc.stages)
			}
			if tc.onError == "stop" && r.Err != `stage "broken": the fake stage fails on purpose` {
				t.Errorf("reason %q", r.Err)
			}
			var files []string
			for p := range readTree(t, sum.Folder) {
				if p != ManifestName {
					files = append(files, p)
				}
			}
			sort.Strings(files)
			if !reflect.DeepEqual(files, tc.files) {
				t.Errorf("files %q, want %q", files, tc.files)
			}
		})
	}
}

func TestRunStageTimeoutAndBadArtifact(t *testing.T) {
	path := setup(t, `{"foilwright": 1, "name": "limits",
	  "inputs": [{"name": "s", "files": ["in/s.dat"]}],
	  "stages": [
	    {"id": "slow", "stage": "slow", "params": {"ms": 60000}, "timeout_s": 0.05, "on_error": "continue"},
	    {"id": "plot", "stage": "plot", "on_error": "continue"},
	    {"id": "plot2", "stage": "plot", "on_error": "continue"},
	    {"id": "bad", "stage": "badplot", "on_error": "continue"}
	  ]}`, map[string]string{"in/s.dat": thinPoints})
	sum, err := Run(context.Background(), loadPlan(t, path), RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
	if err != nil {
		t.Fatal(err)
	}
	got := map[string]string{}
	for _, s := range sum.Sections[0].Stages {
		got[s.ID] = s.Status + ": " + s.Err
	}
	want := map[string]string{
		"slow":  "failed: timed out after 50ms: context deadline exceeded",
		"plot":  "ok: ",
		"plot2": `failed: artifact "shape.svg" is also returned by stage "plot"`,
		"bad":   `failed: the stage returned an artifact named "../shape.svg" (want a plain file name)`,
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("got %q\nwant %q", got, want)
	}
}

// TestRunCancel cancels the run while the second section's last stage is
// under way, as Ctrl-C would: the first section keeps its outputs, the
// second (whose first stage had finished) and third have none, and no
// temporary file is left.
func TestRunCancel(t *testing.T) {
	path := setup(t, `{"foilwright": 1, "name": "cancel",
	  "inputs": [{"files": ["in/a.dat"]}, {"files": ["in/b.dat"]}, {"files": ["in/c.dat"]}],
	  "stages": [{"id": "area", "stage": "area"}, {"id": "wait", "stage": "slow", "after": ["area"], "params": {"ms": 600000}}]}`,
		map[string]string{"in/a.dat": thinPoints, "in/b.dat": thickPoints, "in/c.dat": thinPoints})
	pl := loadPlan(t, path)
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	runner := &switchRunner{reg: &fakeRegistry{}, onSecond: cancel}
	var reports []string
	done := func(r SectionReport) { reports = append(reports, r.Name+":"+r.Status) }
	sum, err := Run(ctx, pl, RunOptions{Jobs: 1, Preparer: fakePrep{}, NewRunner: runner.New, Done: done})
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("err %v, want context.Canceled", err)
	}
	var statuses []string
	for _, s := range sum.Sections {
		statuses = append(statuses, s.Name+":"+s.Status)
	}
	if want := []string{"a:ok", "b:cancelled", "c:cancelled"}; !reflect.DeepEqual(statuses, want) {
		t.Errorf("sections %q, want %q", statuses, want)
	}
	if reports[0] != "a:ok" || reports[1] != "b:cancelled" {
		t.Errorf("Done saw %q", reports)
	}
	tree := readTree(t, sum.Folder)
	var files []string
	for p := range tree {
		files = append(files, p)
	}
	sort.Strings(files)
	want := []string{"a/nodes.dat", "a/results/area.json", "a/results/wait.json", "a/section.json", ManifestName}
	if !reflect.DeepEqual(files, want) {
		t.Errorf("files after cancel %q, want %q (no temporary files)", files, want)
	}
	m, err := ReadManifest(sum.Manifest)
	if err != nil {
		t.Fatal(err)
	}
	if !m.Interrupted || len(m.Outputs) != 4 {
		t.Errorf("manifest interrupted=%v outputs %d", m.Interrupted, len(m.Outputs))
	}
}

// switchRunner runs the first "slow" call without waiting and calls
// onSecond when the second one starts.
type switchRunner struct {
	reg      *fakeRegistry
	onSecond func()
	seen     int
}

func (s *switchRunner) New() (StageRunner, error) {
	r, err := s.reg.New()
	return &switched{r.(*fakeRunner), s}, err
}

type switched struct {
	*fakeRunner
	s *switchRunner
}

func (w *switched) Run(ctx context.Context, call StageCall, in stage.Request) (stage.Result, error) {
	if call.Stage == "slow" {
		w.s.seen++
		switch w.s.seen {
		case 1:
			call.Params = []byte(`{"ms": 0}`)
		case 2:
			w.s.onSecond()
		}
	}
	return w.fakeRunner.Run(ctx, call, in)
}

func TestRunFolder(t *testing.T) {
	path := setup(t, `{"foilwright": 1, "name": "again", "inputs": [{"files": ["in/a.dat"]}],
	  "stages": [{"id": "area", "stage": "area"}]}`, map[string]string{"in/a.dat": thinPoints})
	pl := loadPlan(t, path)
	opts := RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New}
	if _, err := Run(context.Background(), pl, opts); err != nil {
		t.Fatal(err)
	}
	folder := pl.Pipeline.Folder()
	if want := filepath.Join(filepath.Dir(path), "runs", "again"); folder != want {
		t.Errorf("default folder %s, want %s", folder, want)
	}
	if _, err := Run(context.Background(), pl, opts); !errors.Is(err, ErrFolderNotEmpty) {
		t.Errorf("second run into the same folder: %v, want ErrFolderNotEmpty", err)
	}
	// A replacement replaces the whole folder, so a folder holding what
	// the earlier run did not write is refused, naming it.
	mine := filepath.Join(folder, "notes.txt")
	os.WriteFile(mine, []byte("mine"), 0o644)
	opts.Replace = true
	if _, err := Run(context.Background(), pl, opts); !errors.Is(err, ErrFolderUnsafe) || !strings.Contains(err.Error(), "notes.txt") {
		t.Errorf("replace with a foreign file: %v, want ErrFolderUnsafe naming it", err)
	}
	if got, _ := os.ReadFile(mine); string(got) != "mine" {
		t.Error("the refused replace touched the foreign file")
	}
	os.Remove(mine)
	// Replace drops every file of the earlier run, also one its manifest
	// lists and the new run does not make.
	stale := filepath.Join(folder, "a", "results", "old.json")
	m, _ := ReadManifest(filepath.Join(folder, ManifestName))
	m.Outputs["a/results/old.json"] = "00"
	os.WriteFile(stale, []byte("{}"), 0o644)
	if err := writeManifest(filepath.Join(folder, ManifestName), m); err != nil {
		t.Fatal(err)
	}
	if _, err := Run(context.Background(), pl, opts); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(stale); !errors.Is(err, os.ErrNotExist) {
		t.Error("stale output of the earlier run survived the replace")
	}
	assertNoLeftovers(t, filepath.Dir(folder))
	// A folder with files but no manifest is never replaced.
	other := t.TempDir()
	os.WriteFile(filepath.Join(other, "x"), nil, 0o644)
	opts.Folder = other
	if _, err := Run(context.Background(), pl, opts); !errors.Is(err, ErrFolderNotEmpty) {
		t.Errorf("replace in a foreign folder: %v", err)
	}
}

// badPrep returns a document that is not a section.
type badPrep struct{}

func (badPrep) Prepare(context.Context, Input, prep.Settings) (Prepared, error) {
	return Prepared{Section: []byte(`{"format": "foilwright.result/1", "nodes": []}`)}, nil
}

func TestRunChecksWhatItIsGiven(t *testing.T) {
	path := setup(t, `{"foilwright": 1, "name": "bad", "inputs": [{"files": ["in/a.dat"]}],
	  "stages": [{"id": "area", "stage": "area"}]}`, map[string]string{"in/a.dat": thinPoints})
	pl := loadPlan(t, path)
	if _, err := Run(context.Background(), pl, RunOptions{Preparer: fakePrep{}}); err == nil || !strings.Contains(err.Error(), "no stage runner") {
		t.Errorf("run without a stage runner: %v", err)
	}
	sum, err := Run(context.Background(), pl, RunOptions{Preparer: badPrep{}, NewRunner: (&fakeRegistry{}).New})
	if err != nil {
		t.Fatal(err)
	}
	if f := sum.Failed(); len(f) != 1 || !strings.Contains(f[0].Err, "prepare gave a bad section document") {
		t.Errorf("failed %+v", f)
	}
}

func TestSummaryWrite(t *testing.T) {
	s := &Summary{Manifest: "out/manifest.json", Sections: []SectionReport{
		{Name: "a", Status: StatusOK, Summary: "5 points\nchord 1"},
		{Name: "b", Status: StatusFailed, Err: "prepare: b.dat:3: not a number"},
		{Name: "c", Status: StatusPartial, Stages: []StageReport{{ID: "x", Status: "failed", Err: "boom"}, {ID: "y", Status: "skipped", Err: `runs after "x", which did not succeed`}}},
	}}
	var b strings.Builder
	if err := s.Write(&b); err != nil {
		t.Fatal(err)
	}
	want := `ok        a: 5 points; chord 1
failed    b
          prepare: b.dat:3: not a number
partial   c
          stage "x" failed: boom
          stage "y" skipped: runs after "x", which did not succeed
3 section(s): 1 ok, 1 partial, 1 failed; manifest out/manifest.json
`
	if b.String() != want {
		t.Errorf("got\n%s\nwant\n%s", b.String(), want)
	}
}

// assertNoLeftovers fails if parent holds a staging folder, a parked run
// or a lock file of a run folder.
func assertNoLeftovers(t *testing.T, parent string) {
	t.Helper()
	entries, _ := os.ReadDir(parent)
	for _, e := range entries {
		if n := e.Name(); strings.Contains(n, stagingInfix) || strings.Contains(n, parkedInfix) || strings.HasSuffix(n, ".lock") {
			t.Errorf("left %s in %s", n, parent)
		}
	}
}
