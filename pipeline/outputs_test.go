package pipeline

import (
	"bytes"
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/pointfile"
	"github.com/foilwright/foilwright/plugins/stage"
	"github.com/foilwright/foilwright/prep"
	"github.com/tidwall/gjson"
)

// artifactPrep is fakePrep that also returns a picture named name.
type artifactPrep struct{ name string }

func (a artifactPrep) Prepare(ctx context.Context, in Input, s prep.Settings) (Prepared, error) {
	p, err := fakePrep{}.Prepare(ctx, in, s)
	p.Artifacts = append(p.Artifacts, stage.Artifact{Name: a.name, MediaType: "image/svg+xml", Data: []byte("<svg/>")})
	return p, err
}

// Two outputs of one name (a preparation picture and a stage's, here)
// fail the section before anything is written, instead of the second
// silently replacing the first.
func TestRunOutputsCollide(t *testing.T) {
	path := setup(t, `{"foilwright": 1, "name": "collide",
	  "inputs": [{"name": "s", "files": ["in/s.dat"]}],
	  "stages": [{"id": "plot", "stage": "plot"}]}`, map[string]string{"in/s.dat": thinPoints})
	sum, err := Run(context.Background(), loadPlan(t, path), RunOptions{Preparer: artifactPrep{"Shape.svg"}, NewRunner: (&fakeRegistry{}).New})
	if err != nil {
		t.Fatal(err)
	}
	r := sum.Sections[0]
	if r.Status != StatusFailed || !strings.Contains(r.Err, "two outputs would be written to s/plots/shape.svg") {
		t.Errorf("section %+v, want it failed for the two pictures", r)
	}
	if _, err := os.Stat(filepath.Join(filepath.Dir(path), "runs", "collide", "s", "plots")); err == nil {
		t.Error("pictures written for a section that failed")
	}
}

// The chain names the preparation pictures as prep --plot does
// (prep.svg, prep-deviation.svg, ...), apart from the plots stage's
// section.svg.
func TestChainPictureNames(t *testing.T) {
	data, err := os.ReadFile("../examples/tunnel-model/probe.csv")
	if err != nil {
		t.Fatal(err)
	}
	p, err := Chain{}.Prepare(context.Background(), Input{Section: "probe", Files: []prep.File{prep.NewFile("probe.csv", data)}, PlotFormat: "svg"}, prep.Settings{})
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, a := range p.Artifacts {
		names = append(names, a.Name)
	}
	if got := strings.Join(names, " "); got != "prep.svg prep-deviation.svg prep-nodes.svg prep-section.svg" {
		t.Errorf("pictures %s", got)
	}
}

// outputs.exports writes each section's exports to <section>/export/ and
// the stations of the run at its root, all in the manifest; the CSV reads
// back to the section's nodes in the part's unit.
func TestRunExports(t *testing.T) {
	path := setup(t, `{"foilwright": 1, "name": "exports",
	  "inputs": [{"name": "a", "files": ["in/a.dat"], "station": 300}, {"name": "b", "files": ["in/b.dat"], "station": 500}],
	  "prepare": {"units": "mm"},
	  "stages": [{"id": "area", "stage": "area"}],
	  "outputs": {"exports": ["csv", "dxf", "polar-csv", "stations-csv", "stations-dxf"]}}`,
		map[string]string{"in/a.dat": thickPoints, "in/b.dat": thickPoints})
	pl := loadPlan(t, path)
	sum, err := Run(context.Background(), pl, RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
	if err != nil || len(sum.Failed()) > 0 {
		t.Fatalf("%v, %+v", err, sum)
	}
	out := filepath.Join(filepath.Dir(path), "runs", "exports")
	m, err := ReadManifest(filepath.Join(out, ManifestName))
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []string{"a/export/section.csv", "a/export/section.dxf", "a/export/polars.csv", "b/export/section.csv", "stations.csv", "stations.dxf"} {
		if m.Outputs[f] == "" {
			t.Errorf("%s not in the manifest", f)
		}
	}
	data, err := os.ReadFile(filepath.Join(out, "a", "export", "section.csv"))
	if err != nil {
		t.Fatal(err)
	}
	c, err := pointfile.Read(bytes.NewReader(data), "section.csv", pointfile.Options{})
	if err != nil {
		t.Fatal(err)
	}
	// thickPoints are the part's own coordinates (the fake chain's frame
	// has no twist): they come back.
	want := []geometry.Vec3{{X: 200}, {X: 100, Y: 20}, {}, {X: 100, Y: -10}, {X: 200}}
	if c.Units != geometry.Millimetre || len(c.Points) != len(want) {
		t.Fatalf("units %q, %d points", c.Units, len(c.Points))
	}
	for i := range want {
		if c.Points[i].Sub(want[i]).Norm() > 1e-9*200 {
			t.Errorf("point %d: %v, want %v", i, c.Points[i], want[i])
		}
	}
	st, err := os.ReadFile(filepath.Join(out, "stations.csv"))
	if err != nil || !strings.Contains(string(st), "# station 300: a") || !strings.Contains(string(st), ",500\n") {
		t.Errorf("stations.csv: %v\n%s", err, st)
	}
}

// TestRunKeep: a stage's "keep" trims only what the run folder keeps of
// its result: the stages after it and the exports see all of it.
func TestRunKeep(t *testing.T) {
	path := setup(t, `{"foilwright": 1, "name": "keep",
	  "inputs": [{"name": "s", "files": ["in/s.dat"]}],
	  "stages": [
	    {"id": "all", "stage": "pressure"},
	    {"id": "cases", "stage": "pressure", "keep": "cases"},
	    {"id": "scalars", "stage": "pressure", "keep": "scalars"},
	    {"id": "count", "stage": "count", "after": ["scalars"]}
	  ],
	  "outputs": {"exports": ["cp-csv"]}}`, map[string]string{"in/s.dat": thinPoints})
	sum, err := Run(context.Background(), loadPlan(t, path), RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
	if err != nil || sum.Sections[0].Status != StatusOK {
		t.Fatalf("%v, %+v", err, sum)
	}
	// The decoded replies are written in the columns of the current
	// format; a reply given as text is written as it came (count's is in
	// the row form of foilwright.result/1).
	read := func(id string) *stage.ResultDoc {
		b, err := os.ReadFile(filepath.Join(sum.Folder, "s", "results", id+".json"))
		if err != nil {
			t.Fatal(err)
		}
		want := stage.ResultFormat
		if id == "count" {
			want = stage.ResultFormatV1
		}
		if f := gjson.GetBytes(b, "format").Str; f != want {
			t.Errorf("%s: format %q, want %q", id, f, want)
		}
		d, err := stage.DecodeResult(b)
		if err != nil {
			t.Fatal(err)
		}
		return d
	}
	all, cases, scalars, count := read("all"), read("cases"), read("scalars"), read("count")
	if all.Kept != "" || len(all.Cases) != 2 || len(all.Cases[1].Cp) != 5 || all.Cases[1].Cp[1].Cp != 0.5 {
		t.Errorf("all: %+v", all)
	}
	if cases.Kept != stage.KeepCases || len(cases.Cases) != 2 || cases.Cases[1].Cp != nil || cases.Cases[1].CL != 0.2 {
		t.Errorf("cases: %+v", cases)
	}
	if scalars.Kept != stage.KeepScalars || len(scalars.Cases) != 0 || scalars.Scalars["nodes"] != 5 {
		t.Errorf("scalars: %+v", scalars)
	}
	if count.Scalars["points"] != 10 {
		t.Errorf("the stage after a trimmed one saw %v points, want 10", count.Scalars["points"])
	}
	csv, err := os.ReadFile(filepath.Join(sum.Folder, "s", "export", "cp.csv"))
	if err != nil {
		t.Fatal(err)
	}
	if n := strings.Count(string(csv), "\ns,pressure,"); n != 30 {
		t.Errorf("cp.csv has %d rows of pressure, want 30 (three stages, two angles, five nodes):\n%s", n, csv)
	}
	m, err := ReadManifest(sum.Manifest)
	if err != nil {
		t.Fatal(err)
	}
	if m.Stages[0].Keep != "" || m.Stages[1].Keep != stage.KeepCases || m.Stages[2].Keep != stage.KeepScalars {
		t.Errorf("manifest keeps %q %q %q", m.Stages[0].Keep, m.Stages[1].Keep, m.Stages[2].Keep)
	}
}
