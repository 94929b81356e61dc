package pipeline

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/internal/limits"
	"github.com/foilwright/foilwright/plugins/stage"
)

// deepPipeline is a valid pipeline whose vortex-panel stage has a
// parameter nested depth levels deep.
func deepPipeline(depth int) []byte {
	return []byte(`{"foilwright": 1, "name": "deep", "inputs": [{"files": ["points/r040.dat"]}],
  "stages": [{"id": "v", "stage": "vortex-panel", "params": {"x": ` +
		strings.Repeat(`{"a": `, depth) + "1" + strings.Repeat("}", depth) + `}}]}`)
}

// TestParseDeepNestingIsLinear is the regression test of defect 1 of issue
// 11: nested JSON in a pipeline file cost quadratic memory (a key path per
// level): a 200 KB file took a minute and 15 GB, 2 MB ran out of memory.
// The nesting is now refused in one pass before anything recurses, at the
// bracket that goes too deep; the memory a parse takes grows with the
// file, not with its size times its depth.
func TestParseDeepNestingIsLinear(t *testing.T) {
	for _, depth := range []int{40000, 400000} {
		data := deepPipeline(depth)
		var before, after runtime.MemStats
		runtime.ReadMemStats(&before)
		_, err := Parse(data, "deep.json", ParseOptions{Dir: "testdata", Known: builtins})
		runtime.ReadMemStats(&after)
		var list ErrorList
		if !errors.As(err, &list) || len(list) != 1 {
			t.Fatalf("depth %d: %v", depth, err)
		}
		e := list[0]
		// The position is that of the 65th opening bracket: the file's
		// own four levels, then 61 of the parameter's.
		if want := strings.Index(string(data), `"x": `) + len(`"x": `) + 60*len(`{"a": `); e.offset != want || e.Line != 2 ||
			!strings.Contains(e.Msg, "nested more than 64 deep") || !strings.Contains(e.Msg, "--limit json-depth=") {
			t.Errorf("depth %d: %v at offset %d, want %d", depth, e, e.offset, want)
		}
		if grown := after.TotalAlloc - before.TotalAlloc; grown > uint64(4*len(data)+(1<<20)) {
			t.Errorf("depth %d (%d bytes): the parse allocated %d bytes", depth, len(data), grown)
		}
	}
	// At the limit the file parses; a raised limit lets more through.
	if _, err := Parse(deepPipeline(60), "deep.json", ParseOptions{Dir: "testdata", Known: builtins}); err != nil {
		t.Errorf("depth 60 (64 with the file's own levels): %v", err)
	}
	if _, err := Parse(deepPipeline(100), "deep.json", ParseOptions{Dir: "testdata", Known: builtins, MaxDepth: 200}); err != nil {
		t.Errorf("depth 100 with json-depth 200: %v", err)
	}
}

// TestParseParamsDeeperThanManifests is the regression test of defect 2 of
// issue 11: parameters nested deeper than 10000 levels were accepted, the
// outputs written, then the manifest failed ("exceeded max depth") and
// --replace refused the folder. The file is refused before anything runs,
// and json-depth cannot be raised to where a manifest could not be
// written.
func TestParseParamsDeeperThanManifests(t *testing.T) {
	_, err := Parse(deepPipeline(10001), "deep.json", ParseOptions{Dir: "testdata", Known: builtins})
	if err == nil || !strings.Contains(err.Error(), "deep.json:2:") {
		t.Errorf("got %v", err)
	}
	var l limits.Limits
	if err := l.Set("json-depth=10001"); err == nil {
		t.Error("json-depth can be raised past what encoding/json writes")
	}
	// What parses, a manifest can record.
	p, err := Parse(deepPipeline(limits.MaxJSONDepth-4), "deep.json", ParseOptions{Dir: "testdata", Known: builtins, MaxDepth: limits.MaxJSONDepth})
	if err != nil {
		t.Fatal(err)
	}
	m := &Manifest{Format: ManifestFormat, Stages: []StageRecord{{ID: "v", Params: json.RawMessage(p.Stages[0].Params)}}, Outputs: map[string]string{}}
	path := filepath.Join(t.TempDir(), ManifestName)
	if err := writeManifest(path, m); err != nil {
		t.Fatalf("manifest of the deepest parameters allowed: %v", err)
	}
	if _, err := ReadManifest(path); err != nil {
		t.Errorf("read it back: %v", err)
	}
	// Indented, the manifest grows with the square of the depth: at the
	// deepest allowed it stays a few megabytes.
	if fi, err := os.Stat(path); err != nil || fi.Size() > 4<<20 {
		t.Errorf("manifest of the deepest parameters: %v bytes (%v)", fi.Size(), err)
	}
}

// TestParseSizeLimit: a pipeline file past json-bytes is refused, naming
// the limit.
func TestParseSizeLimit(t *testing.T) {
	data := []byte(`{"foilwright": 1, "name": "big", "inputs": [{"files": ["points/r040.dat"]}]}` + strings.Repeat(" ", 2000))
	_, err := Parse(data, "big.json", ParseOptions{Dir: "testdata", MaxBytes: 1000})
	if want := fmt.Sprintf("big.json: %d bytes: over the json-bytes limit of 1000 bytes", len(data)); err == nil || !strings.Contains(err.Error(), want) {
		t.Errorf("got %v", err)
	}
	dir := t.TempDir()
	path := filepath.Join(dir, "big.json")
	os.WriteFile(path, data, 0o644)
	_, err = LoadWith(path, ParseOptions{MaxBytes: 1000})
	if !errors.Is(err, limits.ErrLimit) {
		t.Errorf("load: %v", err)
	}
}

// vortexInfo describes a stage with the vortex-panel's angle parameter,
// for the parse-time check of built-in parameters.
func vortexInfo(name string) (stage.Info, bool) {
	if !builtins(name) {
		return stage.Info{}, false
	}
	return stage.Info{Name: name, Version: "1", Summary: "test", Params: []stage.Param{
		{Name: "alpha_deg", Type: stage.Numbers, Default: json.RawMessage("[0]"), Min: stage.Bound(-90), Max: stage.Bound(90), MaxItems: 1000},
	}}, true
}

// TestParseChecksBuiltinParams is the regression test of defect 12 of
// issue 11: stage parameters were checked only when the stage ran
// (alpha_deg [1e400]: prep ran and wrote, then exit 1 with no line:col),
// though the file is said to be checked before anything runs.
func TestParseChecksBuiltinParams(t *testing.T) {
	for _, tc := range []struct{ params, want string }{
		{`{"alpha_deg": [1e400]}`, `p.json:2:75: stages[0].params.alpha_deg: element 0: number 1e400 is out of range`},
		{`{"alpah_deg": [1]}`, `p.json:2:75: stages[0].params.alpah_deg: unknown parameter`},
		{`{"alpha_deg": "0,4"}`, `p.json:2:75: stages[0].params.alpha_deg: want an array of numbers`},
		{`{"alpha_deg": [1000]}`, `p.json:2:75: stages[0].params.alpha_deg: element 0 1000 is above the maximum 90`},
	} {
		data := []byte(`{"foilwright": 1, "name": "p", "inputs": [{"files": ["points/r040.dat"]}],
  "stages": [{"id": "v", "stage": "vortex-panel", "params": ` + tc.params + `}]}`)
		_, err := Parse(data, "p.json", ParseOptions{Dir: "testdata", Known: builtins, Describe: vortexInfo})
		if err == nil || !strings.HasPrefix(err.Error(), tc.want) {
			t.Errorf("%s: got %v, want %s…", tc.params, err, tc.want)
		}
	}
}

// TestRunChecksParamsBeforeSections: an external stage's parameters are
// checked against its description before any section is made, with the
// position in the file.
func TestRunChecksParamsBeforeSections(t *testing.T) {
	path := setup(t, `{"foilwright": 1, "name": "p", "inputs": [{"files": ["in/a.dat"]}],
  "stages": [{"id": "w", "stage": "slow", "params": {"ms": "soon"}}]}`, map[string]string{"in/a.dat": thinPoints})
	pl := loadPlan(t, path)
	sum, err := Run(context.Background(), pl, RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
	var list ErrorList
	if !errors.As(err, &list) || !strings.Contains(err.Error(), "pipeline.json:2:60: stages[0].params.ms: want a number") {
		t.Errorf("got %v", err)
	}
	if sum != nil {
		t.Errorf("a summary of a run that did not start: %+v", sum)
	}
	if _, err := os.Stat(pl.Pipeline.Folder()); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("the run folder was made: %v", err)
	}
	assertNoLeftovers(t, filepath.Dir(pl.Pipeline.Folder()))
}

// TestParseByteOrderMark is the regression test of the pipeline part of
// defect 14 of issue 11: a pipeline file with a byte-order mark gave
// "invalid character 'ï'" (the point readers accept one).
func TestParseByteOrderMark(t *testing.T) {
	good := `{"foilwright": 1, "name": "bom", "inputs": [{"files": ["points/r040.dat"]}]}`
	p, err := Parse([]byte("\ufeff"+good), "bom.json", ParseOptions{Dir: "testdata"})
	if err != nil {
		t.Fatal(err)
	}
	if p.SHA256 == "" || p.SHA256 == mustParse(t, good).SHA256 {
		t.Error("the digest is not that of the file's own bytes")
	}
	_, err = Parse([]byte("\ufeff"+strings.Replace(good, `"foilwright": 1`, `"foilwright": 2`, 1)), "bom.json", ParseOptions{Dir: "testdata"})
	if err == nil || !strings.HasPrefix(err.Error(), "bom.json:1:16: foilwright: file format version 2") {
		t.Errorf("got %v", err)
	}
}

func mustParse(t *testing.T, s string) *Pipeline {
	t.Helper()
	p, err := Parse([]byte(s), "p.json", ParseOptions{Dir: "testdata"})
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// TestSummaryErr is the pipeline part of defect 15 of issue 11: with
// on_error "continue", failed stages still gave exit status 0, and a
// section failing on its input gave 1 where prep gives 2.
func TestSummaryErr(t *testing.T) {
	ok := &Summary{Sections: []SectionReport{{Status: StatusOK}}}
	if err := ok.Err(); err != nil {
		t.Errorf("all ok: %v", err)
	}
	partial := &Summary{Sections: []SectionReport{{Status: StatusOK}, {Status: StatusPartial}}}
	if err := partial.Err(); err == nil || errors.Is(err, ErrBadInput) {
		t.Errorf("a stage failed with on_error continue: %v, want a processing failure", err)
	}
	input := &Summary{Sections: []SectionReport{{Status: StatusFailed}, {Status: StatusFailed, Input: true}}}
	if err := input.Err(); !errors.Is(err, ErrBadInput) {
		t.Errorf("a section failed on its input: %v, want ErrBadInput", err)
	}
}

// TestRunMarksInputFailures: a section whose file cannot be prepared, or
// that a stage refuses as bad input, fails because of its input.
func TestRunMarksInputFailures(t *testing.T) {
	path := setup(t, `{"foilwright": 1, "name": "p", "inputs": [{"files": ["in/a.dat"]}, {"files": ["in/b.dat"]}],
  "stages": [{"id": "area", "stage": "area"}]}`, map[string]string{"in/a.dat": thinPoints, "in/b.dat": "1 2 3\n"})
	sum, err := Run(context.Background(), loadPlan(t, path), RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
	if err != nil {
		t.Fatal(err)
	}
	if s := sum.Sections[1]; s.Status != StatusFailed || !s.Input || !strings.Contains(s.Err, "in/b.dat:1") {
		t.Errorf("section b: %+v", s)
	}
	if !errors.Is(sum.Err(), ErrBadInput) {
		t.Errorf("summary: %v", sum.Err())
	}
	// Reading an input past a limit is a failure of the input too.
	path = setup(t, `{"foilwright": 1, "name": "p", "inputs": [{"files": ["in/a.dat"]}]}`, map[string]string{"in/a.dat": thinPoints})
	lim := limits.Default()
	lim.InputLines = 2
	sum, err = Run(context.Background(), loadPlan(t, path), RunOptions{Preparer: fakePrep{}, Limits: lim})
	if err != nil {
		t.Fatal(err)
	}
	if s := sum.Sections[0]; !s.Input || !strings.Contains(s.Err, "more than 2 lines") {
		t.Errorf("section a: %+v", s)
	}
}

// TestParseEnvAndPins: a stage may name variables it sees and pin more
// files; the pins are checked with the file.
func TestParseEnvAndPins(t *testing.T) {
	dir := t.TempDir()
	os.MkdirAll(filepath.Join(dir, "points"), 0o755)
	os.WriteFile(filepath.Join(dir, "points", "r040.dat"), []byte(thinPoints), 0o644)
	os.WriteFile(filepath.Join(dir, "model.bin"), []byte("model"), 0o644)
	sum := hexSum([]byte("model"))
	text := `{"foilwright": 1, "name": "p", "inputs": [{"files": ["points/r040.dat"]}],
  "stages": [{"id": "v", "stage": "vortex-panel", "env": ["LICENSE_SERVER"], "pins": {"model.bin": "` + sum + `"}}]}`
	p, err := Parse([]byte(text), "p.json", ParseOptions{Dir: dir, Known: builtins})
	if err != nil {
		t.Fatal(err)
	}
	if st := p.Stages[0]; len(st.Env) != 1 || st.Env[0] != "LICENSE_SERVER" || len(st.Pins) != 1 || st.Pins[0].SHA256 != sum {
		t.Errorf("stage %+v", st)
	}
	bad := strings.Replace(strings.Replace(text, sum, strings.Repeat("0", 64), 1), "LICENSE_SERVER", "1BAD", 1)
	_, err = Parse([]byte(bad), "p.json", ParseOptions{Dir: dir, Known: builtins})
	for _, want := range []string{`stages[0].env[0]: "1BAD" is not a variable name`, `stages[0].pins."model.bin": file "model.bin" has sha256 ` + sum} {
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("got %v, want %s", err, want)
		}
	}
}

// TestParseFolderPin: a pin may name a folder (the node_modules of a
// script stage), pinned by its tree digest.
func TestParseFolderPin(t *testing.T) {
	dir := t.TempDir()
	os.MkdirAll(filepath.Join(dir, "points"), 0o755)
	os.WriteFile(filepath.Join(dir, "points", "r040.dat"), []byte(thinPoints), 0o644)
	os.MkdirAll(filepath.Join(dir, "mods", "a"), 0o755)
	os.WriteFile(filepath.Join(dir, "mods", "a", "index.js"), []byte("x\n"), 0o644)
	// The tree digest, written out (digest.Tree): the sha256 of the
	// sha256sum listing of the folder's one file.
	sum := hexSum([]byte(hexSum([]byte("x\n")) + "  a/index.js\n"))
	text := `{"foilwright": 1, "name": "p", "inputs": [{"files": ["points/r040.dat"]}],
  "stages": [{"id": "v", "stage": "vortex-panel", "pins": {"mods": "` + sum + `"}}]}`
	p, err := Parse([]byte(text), "p.json", ParseOptions{Dir: dir, Known: builtins})
	if err != nil {
		t.Fatal(err)
	}
	if st := p.Stages[0]; len(st.Pins) != 1 || st.Pins[0].SHA256 != sum {
		t.Errorf("stage %+v", st)
	}
	os.WriteFile(filepath.Join(dir, "mods", "a", "index.js"), []byte("y\n"), 0o644)
	if _, err := Parse([]byte(text), "p.json", ParseOptions{Dir: dir, Known: builtins}); err == nil || !strings.Contains(err.Error(), `folder "mods" has sha256`) {
		t.Errorf("a changed folder: got %v", err)
	}
}
