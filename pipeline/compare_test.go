package pipeline

import (
	"bytes"
	"context"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/tidwall/gjson"

	fwcompare "github.com/foilwright/foilwright/compare"
	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/plugins/builtin"
	"github.com/foilwright/foilwright/plugins/stage"
)

// inProcessRunner runs the built-in stages in this process (the stage
// processes are tested by the command's tests).
type inProcessRunner struct{}

func (inProcessRunner) Describe(ctx context.Context, call StageCall) (stage.Info, string, error) {
	st, _ := builtin.Lookup(call.Stage)
	info, err := st.Describe(ctx)
	return info, strings.Repeat("cd", 32), err
}

func (inProcessRunner) Run(ctx context.Context, call StageCall, req stage.Request) (stage.Result, error) {
	st, ok := builtin.Lookup(call.Stage)
	if !ok {
		return stage.Result{}, fmt.Errorf("no stage %q", call.Stage)
	}
	return st.Run(ctx, req)
}

func (inProcessRunner) Close() error { return nil }

func known(name string) bool { _, ok := builtin.Lookup(name); return ok }

// probeCSV returns an invented probe file of NACA 2412 (NACA Report 824),
// 200 mm chord, 4° nose-up, nose at (412, 118) mm, with a bump of height
// bump (mm) on the upper surface at 30 % chord.
func probeCSV(bump float64) string {
	foil := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12}
	var b strings.Builder
	b.WriteString("# units: mm\nx,y\n")
	pts := foil.Nodes(240)
	// Centre the bump on the probed station nearest 30 %.
	x0 := 0.0
	for k := range 121 {
		if x := shape.CosineStation(k, 120); math.Abs(x-0.3) < math.Abs(x0-0.3) {
			x0 = x
		}
	}
	for i, q := range pts[:len(pts)-1] {
		if x := shape.CosineStation(120-i, 120); i < 120 && math.Abs(x-x0) < 0.02 {
			c := math.Cos(math.Pi / 2 * (x - x0) / 0.02)
			q.Y += bump / 200 * c * c
		}
		p := q.Scale(200).Rotate(-4 * math.Pi / 180).Add(geometry.Point{X: 412, Y: 118})
		fmt.Fprintf(&b, "%.10g,%.10g\n", p.X, p.Y)
	}
	return b.String()
}

const comparePipeline = `{
  "foilwright": 1,
  "name": "models",
  "inputs": [
    {"name": "good", "files": ["good.csv"]},
    {"name": "bumped", "files": ["bumped.csv"], "compare": {"tolerance": 0.05, "aero": false, "align": "datum", "datum": "nominal"}}
  ],
  "compare": {
    "design": "naca4:2412", "chord": 200, "twist": 4, "offset": [412, 118],
    "tolerance": "+0.02/-0.02",
    "zones": [{"name": "nose", "x": [0, 0.05], "tolerance": 0.01}],
    "alpha_deg": [0, 4]
  },
  "outputs": {"folder": "out", "plots": ["compare"]}
}`

func TestRunCompare(t *testing.T) {
	path := setup(t, comparePipeline, map[string]string{"good.csv": probeCSV(0), "bumped.csv": probeCSV(0.04)})
	p, err := Load(path, known)
	if err != nil {
		t.Fatal(err)
	}
	pl := p.Plan()
	if c := pl.Sections[1].Compare; c.Design != "naca4:2412" || c.Tolerance.Plus != 0.05 || len(c.Zones) != 1 || c.aero() {
		t.Fatalf("merged compare block of the second input: %+v", c)
	}
	sum, err := Run(context.Background(), pl, RunOptions{Preparer: Chain{}, NewRunner: func() (StageRunner, error) { return inProcessRunner{}, nil }})
	if err != nil {
		t.Fatal(err)
	}
	if len(sum.Failed()) != 0 {
		t.Fatalf("failed: %+v", sum.Failed())
	}
	out := filepath.Join(filepath.Dir(path), "out")
	files := readTree(t, out)
	for _, f := range []string{"good/compare.json", "good/compare.csv", "good/plots/compare.svg", "good/plots/compare-deviation.svg",
		"good/plots/compare-dcp.svg", "bumped/compare.json", "bumped/plots/compare.svg", VerdictsName} {
		if _, ok := files[f]; !ok {
			t.Errorf("%s not written", f)
		}
	}
	if _, ok := files["bumped/plots/compare-dcp.svg"]; ok {
		t.Error("ΔCp drawn without the aerodynamic comparison")
	}
	good, bumped := files["good/compare.json"], files["bumped/compare.json"]
	if v := gjson.GetBytes(good, "verdict").Str; v != fwcompare.VerdictPass {
		t.Errorf("good: verdict %s", v)
	}
	if n := gjson.GetBytes(good, "aero.methods.#").Int(); n != 2 {
		t.Errorf("good: %d aero methods", n)
	}
	// The bump of 0.04 mm at 30 % chord is inside ±0.05 (the nose zone,
	// ±0.01, does not reach it): a pass, and in the nominal placement its
	// full height shows.
	if v, mx := gjson.GetBytes(bumped, "verdict").Str, gjson.GetBytes(bumped, "deviation.max").Float(); v != fwcompare.VerdictPass || math.Abs(mx-0.04) > 0.002 {
		t.Errorf("bumped: verdict %s, max %.4f", v, mx)
	}
	table := string(files[VerdictsName])
	if !strings.HasPrefix(table, "section,station,design,verdict") || strings.Count(table, "\n") != 3 {
		t.Errorf("verdicts.csv:\n%s", table)
	}
	m, err := ReadManifest(filepath.Join(out, ManifestName))
	if err != nil {
		t.Fatal(err)
	}
	if c := m.Sections[0].Compare; c == nil || c.Verdict.Verdict != fwcompare.VerdictPass || c.Settings.Design != "naca4:2412" {
		t.Errorf("manifest compare record %+v", c)
	}
	if _, ok := m.Outputs[VerdictsName]; !ok {
		t.Error("verdicts.csv not in the manifest")
	}
	var b bytes.Buffer
	sum.Write(&b)
	if !strings.Contains(b.String(), "verdicts against the design") {
		t.Errorf("summary:\n%s", b.String())
	}
	// Tighter: the bump is out, and the summary counts it.
	tight := strings.Replace(comparePipeline, `"tolerance": 0.05,`, `"tolerance": 0.03,`, 1)
	path2 := setup(t, tight, map[string]string{"good.csv": probeCSV(0), "bumped.csv": probeCSV(0.04)})
	p2, _ := Load(path2, known)
	sum2, err := Run(context.Background(), p2.Plan(), RunOptions{Preparer: Chain{}, NewRunner: func() (StageRunner, error) { return inProcessRunner{}, nil }})
	if err != nil {
		t.Fatal(err)
	}
	if o := sum2.OutOfTolerance(); len(o) != 1 || o[0].Name != "bumped" {
		t.Errorf("out of tolerance: %+v", o)
	}
	// Re-running the manifest reproduces every output, the comparison's
	// included.
	rep, err := Verify(context.Background(), filepath.Join(out, ManifestName), VerifyOptions{Known: known, Preparer: Chain{}, NewRunner: func() (StageRunner, error) { return inProcessRunner{}, nil }})
	if err != nil {
		t.Fatal(err)
	}
	if !rep.OK() {
		t.Errorf("verify: %+v", rep)
	}
}

func TestParseCompareErrors(t *testing.T) {
	dir := t.TempDir()
	os.WriteFile(filepath.Join(dir, "p.csv"), []byte("0 0\n"), 0o644)
	for _, tc := range []struct {
		block string
		want  string
	}{
		{`"compare": {"design": "nowhere.dat"}`, `compare.design: design file "nowhere.dat" not found`},
		{`"compare": {"design": "naca4:2412", "tolerance": "5/2"}`, "compare.tolerance: bad tolerance"},
		{`"compare": {"design": "naca4:2412", "zones": [{"x": [0, 0.1]}]}`, `compare.zones[0]: a zone needs "x"`},
		{`"compare": {"design": "naca4:2412", "zones": [{"x": [0.2, 0.1], "tolerance": 1}]}`, "out of order"},
		{`"compare": {"design": "naca4:2412", "align": "sideways"}`, `compare.align: want one of "best-fit"`},
		{`"compare": {"design": "naca4:2412", "chrd": 200}`, `unknown key "chrd" (did you mean "chord"?)`},
		{`"compare": {"tolerance": 0.1}`, `inputs[0]: compare: no "design"`},
	} {
		data := `{"foilwright": 1, "name": "x", "inputs": [{"files": ["p.csv"]}], ` + tc.block + `}`
		_, err := Parse([]byte(data), "p.json", ParseOptions{Dir: dir, Known: known})
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want %q", tc.block, err, tc.want)
		}
	}
}

// TestCompareShardsMerge: a comparing pipeline split in two shards merges
// into the run one machine makes (the verdicts table, each section's
// comparison record and the batch table's verdict column included), and
// a section that fails is recorded as not compared in both.
func TestCompareShardsMerge(t *testing.T) {
	path := setup(t, comparePipeline, map[string]string{"good.csv": probeCSV(0), "bumped.csv": "1,2\n"})
	dir := filepath.Dir(path)
	load := func() *Plan {
		p, err := Load(path, known)
		if err != nil {
			t.Fatal(err)
		}
		return p.Plan()
	}
	runner := func() (StageRunner, error) { return inProcessRunner{}, nil }
	if _, err := Run(context.Background(), load(), RunOptions{Folder: filepath.Join(dir, "single"), Preparer: Chain{}, NewRunner: runner}); err != nil {
		t.Fatal(err)
	}
	for k := range 2 {
		s := Shard{k, 2}
		if _, err := Run(context.Background(), load(), RunOptions{Folder: filepath.Join(dir, "sharded"), Shard: &s, Preparer: Chain{}, NewRunner: runner}); err != nil {
			t.Fatal(err)
		}
	}
	sum, err := Merge(context.Background(), filepath.Join(dir, "sharded"), MergeOptions{Parse: ParseOptions{Known: known}})
	if err != nil {
		t.Fatal(err)
	}
	if len(sum.Sections) != 2 || sum.Sections[0].Compare == nil || sum.Sections[0].Compare.Verdict != fwcompare.VerdictPass || len(sum.Failed()) != 1 {
		t.Errorf("merged summary %+v", sum.Sections)
	}
	assertSameRun(t, filepath.Join(dir, "single"), filepath.Join(dir, "sharded"))
	files := readTree(t, filepath.Join(dir, "sharded"))
	if v := string(files[VerdictsName]); !strings.Contains(v, "good,,naca4:2412,pass,") || !strings.Contains(v, "bumped,,naca4:2412,not compared (failed)") {
		t.Errorf("verdicts.csv:\n%s", v)
	}
	m, err := ReadManifest(filepath.Join(dir, "sharded", ManifestName))
	if err != nil {
		t.Fatal(err)
	}
	if c := m.Sections[1].Compare; c == nil || c.Verdict.Verdict != "not compared" {
		t.Errorf("the failed section's comparison record: %+v", c)
	}
	if table := string(files[TableName]); !strings.Contains(strings.SplitN(table, "\n", 3)[1], ",pass,") {
		t.Errorf("batch table without the verdict:\n%s", table)
	}
}
