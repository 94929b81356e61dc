package pipeline

import (
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/prep"
)

// builtins is the stage lookup the parser tests use.
func builtins(name string) bool { return name == "vortex-panel" || name == "source-panel" }

// TestParseInvalid checks every validation error against its fixture: the
// whole list of messages, with line:column counted by hand in the fixture.
func TestParseInvalid(t *testing.T) {
	for _, tc := range []struct {
		file string
		want []string
	}{
		{"invalid-cycle.json", []string{
			"invalid-cycle.json:7:60: stages[1].after: dependency cycle: \"a\" after \"c\" after \"b\" after \"a\"",
		}},
		{"invalid-duplicate-key.json", []string{
			"invalid-duplicate-key.json:5:30: prepare.panels: duplicate key \"panels\" (first at 5:15)",
			"invalid-duplicate-key.json:6:88: stages[0].params.alpha_deg[1].x: duplicate key \"x\" (first at 6:80)",
			"invalid-duplicate-key.json:6:98: stages[0].params.alpha_deg: duplicate key \"alpha_deg\" (first at 6:62)",
			"invalid-duplicate-key.json:7:3: name: duplicate key \"name\" (first at 3:3)",
		}},
		{"invalid-empty.json", []string{
			"invalid-empty.json: file is empty",
		}},
		{"invalid-enum.json", []string{
			"invalid-enum.json:4:55: inputs[0].format: want one of \"auto\", \"delimited\", \"loop\", \"surfaces\", \"dxf\", \"stl\", got \"xlsx\"",
			"invalid-enum.json:5:24: prepare.units: want one of \"mm\", \"in\", \"m\", \"chord\", got \"cm\"",
			"invalid-enum.json:5:41: prepare.spacing: want one of \"cosine\", \"half-cosine\", \"uniform\", \"curvature\", got \"sine\"",
			"invalid-enum.json:5:55: prepare.te: want one of \"auto\", \"keep\", \"sharpen\", got \"round\"",
			"invalid-enum.json:5:73: prepare.noise: want \"auto\" or a number at least 0, got \"high\"",
			"invalid-enum.json:6:63: stages[0].on_error: want one of \"stop\", \"continue\", got \"ignore\"",
			"invalid-enum.json:6:81: stages[0].keep: want one of \"scalars\", \"cases\", \"all\", got \"cp\"",
			"invalid-enum.json:7:40: outputs.documents[1]: want one of \"section\", \"nodes\", \"results\", \"compare\", got \"sections\"",
			"invalid-enum.json:7:52: outputs.documents[2]: \"section\" listed twice",
		}},
		{"invalid-files.json", []string{
			"invalid-files.json:5:29: inputs[0].files[0]: file \"points/missing.dat\" not found",
			"invalid-files.json:6:29: inputs[1].files[0]: no file matches \"points/*.xyz\"",
			"invalid-files.json:7:29: inputs[2].files[0]: bad pattern \"points/[.dat\": syntax error in pattern",
			"invalid-files.json:8:28: inputs[3].files: no files",
			"invalid-files.json:9:29: inputs[4].files[0]: \"points\" is not a regular file",
		}},
		{"invalid-missing.json", []string{
			"invalid-missing.json:1:1: missing key \"foilwright\" (the file format version, 1)",
			"invalid-missing.json:1:1: missing key \"name\"",
			"invalid-missing.json:1:1: missing key \"inputs\"",
			"invalid-missing.json:3:14: stages[0]: missing key \"id\"",
			"invalid-missing.json:3:14: stages[0]: missing key \"stage\" (a built-in stage name or an executable path)",
		}},
		{"invalid-range.json", []string{
			"invalid-range.json:2:17: foilwright: file format version 2 is not supported (this foilwright reads 1)",
			"invalid-range.json:4:53: inputs[0].band: want a number greater than 0, got -1",
			"invalid-range.json:6:15: prepare.panels: want an integer in [16, 2000], got 8",
			"invalid-range.json:7:17: prepare.te_blend: want a number in (0, 1], got 0",
			"invalid-range.json:8:22: prepare.outlier_sigma: number 1e400 is out of range",
			"invalid-range.json:9:19: prepare.le_cluster: want a number in [-3, 3], got 4",
			"invalid-range.json:10:13: prepare.loop: want an integer in [0, 1000], got -1",
			"invalid-range.json:11:14: prepare.le_at: want [x, y], got 1 number(s)",
			"invalid-range.json:12:18: prepare.merge_tol: want a number at least 0, got -0.5",
			"invalid-range.json:14:64: stages[0].timeout_s: want a number in (0, 86400], got 0",
		}},
		{"invalid-stages.json", []string{
			"invalid-stages.json:7:12: stages[1].id: duplicate stage id \"vortex\" (first at 6:12)",
			"invalid-stages.json:8:12: stages[2].id: \"Vortex Panel\" is not a usable stage id (letters, digits, '.', '_', '-'; up to 64, starting with a letter or digit)",
			"invalid-stages.json:9:27: stages[3].stage: unknown stage \"vortx-panel\" (not a built-in stage; write a path such as \"./vortx-panel\" for an executable)",
			"invalid-stages.json:9:62: stages[3].after[1]: unknown stage id \"votrex\" (did you mean \"vortex\"?)",
			"invalid-stages.json:10:28: stages[4].stage: stage executable \"./stages/missing\" not found",
			"invalid-stages.json:11:29: stages[5].stage: stage \"stages/not-executable\" is not executable",
			"invalid-stages.json:12:58: stages[6].sha256: want 64 hexadecimal digits, got \"abc\"",
			"invalid-stages.json:13:58: stages[7].sha256: stage executable \"stages/external\" has sha256 ec3747dcc2e9074050d0c56d3b655eb90d4e8b13fb3c7d76164a6da19221e02a, the pipeline pins 0000000000000000000000000000000000000000000000000000000000000000",
			"invalid-stages.json:14:55: stages[8].after[0]: stage \"self\" cannot run after itself",
		}},
		{"invalid-syntax.json", []string{
			"invalid-syntax.json:4:45: invalid JSON: invalid character ']' looking for beginning of value",
		}},
		{"invalid-top-array.json", []string{
			"invalid-top-array.json:1:1: want object, got array",
		}},
		{"invalid-truncated.json", []string{
			"invalid-truncated.json:5:1: invalid JSON: unexpected end of JSON input",
		}},
		{"invalid-types.json", []string{
			"invalid-types.json:2:17: foilwright: want integer, got string \"1\"",
			"invalid-types.json:3:11: name: want string, got 3",
			"invalid-types.json:4:24: inputs[0].files: want array, got string \"points/r040.dat\"",
			"invalid-types.json:4:54: inputs[0].station: want number, got string \"240\"",
			"invalid-types.json:5:25: prepare.panels: want integer, got 160.5",
			"invalid-types.json:5:49: prepare.keep_outliers: want true or false, got string \"yes\"",
			"invalid-types.json:5:67: prepare.spacing: want one of \"cosine\", \"half-cosine\", \"uniform\", \"curvature\", got 3",
			"invalid-types.json:5:79: prepare.noise: want \"auto\" or a number, got boolean true",
			"invalid-types.json:5:94: prepare.le_at: want array, got string \"0,0\"",
			"invalid-types.json:6:60: stages[0].after: want array, got string \"b\"",
			"invalid-types.json:6:75: stages[0].params: want object, got array",
			"invalid-types.json:7:24: outputs.plots: want array, got string \"cp\"",
			"invalid-types.json:7:43: outputs.documents: want array, got null",
		}},
		{"invalid-unknown-key.json", []string{
			"invalid-unknown-key.json:4:3: stagse: unknown key \"stagse\" (did you mean \"stages\"?)",
			"invalid-unknown-key.json:5:45: inputs[0].unit: unknown key \"unit\" (did you mean \"units\"?)",
			"invalid-unknown-key.json:6:15: prepare.pannels: unknown key \"pannels\" (did you mean \"panels\"?)",
			"invalid-unknown-key.json:6:31: prepare.\"te.close\": unknown key \"te.close\"",
			"invalid-unknown-key.json:7:51: stages[0].param: unknown key \"param\" (did you mean \"params\"?)",
			"invalid-unknown-key.json:8:32: outputs.plot: unknown key \"plot\" (did you mean \"plots\"?)",
		}},
		{"invalid-values.json", []string{
			"invalid-values.json:3:11: name: \"my run\" is not a usable name (letters, digits, '.', '_', '-'; up to 64, starting with a letter or digit)",
			"invalid-values.json:5:47: inputs[0].columns: want 2 or 3 columns separated by commas, got \"1\"",
			"invalid-values.json:6:5: inputs[1]: section name \"r040\" is also made by inputs[0]; give each input its own \"name\"",
			"invalid-values.json:6:43: inputs[1].cut: plane \"w=3\": the axis must be x, y or z (want e.g. \"z=240\" or \"0,0,240:0,0,1\")",
			"invalid-values.json:7:60: inputs[2].cut: plane \"0,0,0:0,0,0\": the normal is zero (want e.g. \"z=240\" or \"0,0,240:0,0,1\")",
			"invalid-values.json:8:85: inputs[3].columns: mix of column numbers and names in \"x,2\"",
			"invalid-values.json:9:5: inputs[4]: section name \"probe-probe-1\" is also made by inputs[3]; give each input its own \"name\"",
			"invalid-values.json:9:72: inputs[4].columns: column \"x\" chosen twice",
			"invalid-values.json:10:5: inputs[5]: section name \"PLANE\" is also made by inputs[2]; give each input its own \"name\"",
			"invalid-values.json:10:53: inputs[5].panels: \"panels\" cannot be set per input; set it in \"prepare\" (an input may set format, columns, units, cut, layer, band, flat_tol)",
			"invalid-values.json:11:5: inputs[6]: section name \"manifest.json\" is the manifest's file name; give the input another \"name\"",
			"invalid-values.json:13:31: prepare.probe_radius: want a ball radius such as 1.5 or \"1.5mm\" (0 or more, in a length unit, not a share of the chord), got \"0.02c\"",
			"invalid-values.json:14:64: stages[1].id: stage id \"Vortex\" differs only in case from \"vortex\" (at 14:21)",
		}},
	} {
		t.Run(tc.file, func(t *testing.T) {
			data, err := os.ReadFile(filepath.Join("testdata", tc.file))
			if err != nil {
				t.Fatal(err)
			}
			_, err = Parse(data, tc.file, ParseOptions{Dir: "testdata", Known: builtins})
			var list ErrorList
			if !errors.As(err, &list) {
				t.Fatalf("got error %v (%T), want an ErrorList", err, err)
			}
			got := strings.Split(list.Error(), "\n")
			if !reflect.DeepEqual(got, tc.want) {
				t.Errorf("got\n\t%s\nwant\n\t%s", strings.Join(got, "\n\t"), strings.Join(tc.want, "\n\t"))
			}
		})
	}
	if files, _ := filepath.Glob("testdata/invalid-*.json"); len(files) != 14 {
		t.Errorf("%d invalid-*.json fixtures, the table covers 14: add the new ones", len(files))
	}
}

func ptr[T any](v T) *T { return &v }

// TestParseGood reads a file that uses every key and checks what came out.
func TestParseGood(t *testing.T) {
	p, err := Load("testdata/good.json", builtins)
	if err != nil {
		t.Fatal(err)
	}
	wantPrep := prep.Settings{
		Columns: "1,2", Units: "mm", Cut: "z=240", Band: ptr(0.2), FlatTol: ptr(0.05),
		MergeTol: ptr(0.01), OutlierSigma: ptr(4.0), KeepOutliers: ptr(false), Loop: ptr(0),
		Noise: ptr(0.02), FitTol: ptr(0.1), TE: "sharpen", TEBlend: ptr(0.1), LEAt: &[2]float64{12.5, -3}, Mirror: "no",
		Panels: ptr(200), Spacing: "half-cosine", LECluster: ptr(0.8), TECluster: ptr(0.0), CurvatureWeight: ptr(0.25),
		ThicknessMode: "camber", CamberMode: "inscribed",
	}
	if !reflect.DeepEqual(p.Prepare, wantPrep) {
		t.Errorf("prepare:\ngot  %+v\nwant %+v", p.Prepare, wantPrep)
	}
	if p.Name != "mast-rotor" || p.Outputs.Folder != "out/rotor" || !p.Outputs.Has(DocSection) || p.Outputs.Has(DocNodes) ||
		!reflect.DeepEqual(p.Outputs.Plots, []string{"stations", "prep"}) || p.Outputs.PlotFormat != "png" {
		t.Errorf("name %q, outputs %+v", p.Name, p.Outputs)
	}
	abs, _ := filepath.Abs("testdata")
	if p.Dir != abs || p.Path != filepath.Join(abs, "good.json") {
		t.Errorf("dir %q path %q", p.Dir, p.Path)
	}

	pl := p.Plan()
	var names []string
	for _, s := range pl.Sections {
		names = append(names, s.Name+"="+strings.Join(s.Files, "+"))
	}
	wantNames := []string{"r040=points/r040.dat", "r080=points/r080.dat",
		"probe-probe-1=points/probe-1.csv", "probe-probe-2=points/probe-2.csv"}
	if !reflect.DeepEqual(names, wantNames) {
		t.Errorf("sections %q, want %q", names, wantNames)
	}
	r040, r080, probe := pl.Sections[0].Settings, pl.Sections[1].Settings, pl.Sections[2].Settings
	if r040.Units != "in" || *r040.Band != 0.5 || r040.Cut != "z=240" || *r040.Panels != 200 || *pl.Sections[0].Station != 240 {
		t.Errorf("r040 overrides: %+v", r040)
	}
	if r080.Cut != "0,0,480:0,0.1,1" || r080.Units != "mm" || *r080.Band != 0.2 {
		t.Errorf("r080 overrides: %+v", r080)
	}
	if probe.Columns != "x,y" || probe.Format != "delimited" || pl.Sections[2].Station != nil {
		t.Errorf("probe overrides: %+v", probe)
	}

	var order []string
	for _, s := range pl.Stages {
		order = append(order, s.ID)
	}
	if want := []string{"vortex", "source", "report"}; !reflect.DeepEqual(order, want) {
		t.Errorf("stage order %q, want %q", order, want)
	}
	rep := pl.Stages[2]
	if rep.Exec != filepath.Join(abs, "stages/external") || rep.SHA256 != "ec3747dcc2e9074050d0c56d3b655eb90d4e8b13fb3c7d76164a6da19221e02a" ||
		rep.OnError != OnErrorContinue || rep.TimeoutS != 2.5 || string(rep.Params) != `{"title": "cp", "te.close": {"a": [1, 2]}}` {
		t.Errorf("report stage %+v", rep)
	}
	if v := pl.Stages[1]; v.Exec != "" || string(v.Params) != "{}" || v.OnError != OnErrorStop || v.TimeoutS != 0 {
		t.Errorf("source stage defaults %+v", v)
	}
}

// TestOrderStages checks that the order is topological and, among stages
// that are ready together, follows the file.
func TestOrderStages(t *testing.T) {
	st := func(id string, after ...string) Stage { return Stage{ID: id, After: after} }
	for _, tc := range []struct {
		name   string
		stages []Stage
		order  []string
		cycle  []string
	}{
		{"independent keep file order", []Stage{st("c"), st("a"), st("b")}, []string{"c", "a", "b"}, nil},
		{"chain reversed", []Stage{st("c", "b"), st("b", "a"), st("a")}, []string{"a", "b", "c"}, nil},
		{"diamond", []Stage{st("join", "l", "r"), st("r", "top"), st("l", "top"), st("top"), st("free")},
			[]string{"top", "r", "l", "join", "free"}, nil},
		{"ready stage earlier in file goes first", []Stage{st("x", "z"), st("y"), st("z")}, []string{"y", "z", "x"}, nil},
		{"two-cycle", []Stage{st("ok"), st("p", "q"), st("q", "p")}, nil, []string{"p", "q"}},
		{"cycle reached through a dependent", []Stage{st("tail", "c"), st("a", "b"), st("b", "c"), st("c", "a")}, nil, []string{"a", "b", "c"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			order, cycle := orderStages(tc.stages)
			ids := func(ix []int) []string {
				var s []string
				for _, i := range ix {
					s = append(s, tc.stages[i].ID)
				}
				return s
			}
			if got := ids(order); !reflect.DeepEqual(got, tc.order) {
				t.Errorf("order %q, want %q", got, tc.order)
			}
			if got := ids(cycle); !reflect.DeepEqual(got, tc.cycle) {
				t.Errorf("cycle %q, want %q", got, tc.cycle)
			}
		})
	}
}

// TestErrorListCap checks that all errors are collected and the printed
// list stops at MaxErrors.
func TestErrorListCap(t *testing.T) {
	var b strings.Builder
	b.WriteString(`{"foilwright": 1, "name": "many", "inputs": [{"files": ["points/r040.dat"]}], "prepare": {`)
	for i := range 25 {
		if i > 0 {
			b.WriteString(", ")
		}
		b.WriteString(`"bad` + string(rune('a'+i)) + `": 1`)
	}
	b.WriteString("}}")
	_, err := Parse([]byte(b.String()), "many.json", ParseOptions{Dir: "testdata"})
	var list ErrorList
	if !errors.As(err, &list) || len(list) != 25 {
		t.Fatalf("got %v, want 25 errors", err)
	}
	lines := strings.Split(err.Error(), "\n")
	if len(lines) != MaxErrors+1 || lines[MaxErrors] != "(and 5 more error(s))" {
		t.Errorf("printed %d lines, last %q", len(lines), lines[len(lines)-1])
	}
	if list[0].Line != 1 || list[0].Col != 91 || list[0].Path != "prepare.bada" {
		t.Errorf("first error %+v", list[0])
	}
}

// TestPositionsCountCharacters checks that columns count characters, not
// bytes, and that leading blanks before the root object are accounted for.
func TestPositionsCountCharacters(t *testing.T) {
	data := []byte("\n\n  {\"foilwright\": 1, \"name\": \"x\", \"inputs\": [], \"prepare\": {\"ü\": 1, \"nämé\": 1}}")
	_, err := Parse(data, "p.json", ParseOptions{Dir: "testdata"})
	// Columns counted by hand; "nämé" starts at byte 69 of its line but at
	// character 68.
	want := "p.json:3:44: inputs: no inputs\n" +
		"p.json:3:60: prepare.\"ü\": unknown key \"ü\"\n" +
		"p.json:3:68: prepare.\"nämé\": unknown key \"nämé\""
	if err == nil || err.Error() != want {
		t.Errorf("got\n%v\nwant\n%s", err, want)
	}
}

// TestTypedReaders covers the gjson conversions that succeed quietly on
// the wrong type (PLUGINS.md §6, measured): each must be refused.
func TestTypedReaders(t *testing.T) {
	for _, tc := range []struct {
		key, value, want string
	}{
		{"panels", `"160"`, `want integer, got string "160"`},
		{"panels", `160.5`, `want integer, got 160.5`},
		{"panels", `1e400`, `want an integer in [16, 2000], got 1e400`},
		{"panels", `99999999999999999999`, `want an integer in [16, 2000], got 99999999999999999999`},
		{"panels", `null`, `want integer, got null`},
		{"panels", `1.6e2`, ``},
		{"keep_outliers", `"yes"`, `want true or false, got string "yes"`},
		{"keep_outliers", `1`, `want true or false, got 1`},
		{"merge_tol", `"0.1"`, `want number, got string "0.1"`},
		{"merge_tol", `-1e400`, `number -1e400 is out of range`},
		{"merge_tol", `[0.1]`, `want number, got array`},
		{"spacing", `{"law": "cosine"}`, `want one of "cosine", "half-cosine", "uniform", "curvature", got object`},
		{"noise", `"auto"`, ``},
		{"noise", `0`, ``},
		{"le_at", `[1, "2"]`, `want number, got string "2"`},
		{"columns", `""`, `must not be empty`},
	} {
		data := `{"foilwright": 1, "name": "t", "inputs": [{"files": ["points/r040.dat"]}], "prepare": {"` + tc.key + `": ` + tc.value + `}}`
		_, err := Parse([]byte(data), "t.json", ParseOptions{Dir: "testdata"})
		got := ""
		if err != nil {
			got = err.Error()
			_, got, _ = strings.Cut(got, ": "+"prepare."+tc.key)
			got = strings.TrimPrefix(strings.TrimPrefix(got, "[1]"), ": ")
		}
		if got != tc.want {
			t.Errorf("%s: %s: got %q (%v), want %q", tc.key, tc.value, got, err, tc.want)
		}
	}
}
