package stage_test

import (
	"encoding/json"
	"errors"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/plugins/stage"
)

var testParams = []stage.Param{
	{Name: "alpha_deg", Type: stage.Numbers, Default: json.RawMessage("[0]"), Min: stage.Bound(-90), Max: stage.Bound(90), MinItems: 1, MaxItems: 4, Unit: "degrees"},
	{Name: "panels", Type: stage.Integer, Default: json.RawMessage("100"), Min: stage.Bound(8), Max: stage.Bound(2000)},
	{Name: "mach", Type: stage.Number, Default: json.RawMessage("0"), Min: stage.Bound(0), Max: stage.Bound(0.7)},
	{Name: "kutta", Type: stage.Boolean, Default: json.RawMessage("true")},
	{Name: "spacing", Type: stage.String, Default: json.RawMessage(`"cosine"`), Choices: []string{"cosine", "uniform"}},
	{Name: "label", Type: stage.String},
}

func TestValidateAccepts(t *testing.T) {
	v, err := stage.Validate(testParams, []byte(`{"label": "x", "alpha_deg": [-4, 2.5, 90], "panels": 1.6e2, "kutta": false}`))
	if err != nil {
		t.Fatal(err)
	}
	if got := v.Numbers("alpha_deg"); len(got) != 3 || got[1] != 2.5 || got[2] != 90 {
		t.Errorf("alpha_deg = %v", got)
	}
	if v.Int("panels") != 160 || v.Bool("kutta") || v.String("spacing") != "cosine" || v.Number("mach") != 0 || v.String("label") != "x" {
		t.Errorf("values: panels %d kutta %v spacing %q mach %g", v.Int("panels"), v.Bool("kutta"), v.String("spacing"), v.Number("mach"))
	}
}

func TestValidateRejects(t *testing.T) {
	for _, tc := range []struct {
		params string
		text   string
	}{
		{`{}`, `parameter "label": required`},
		{`{"label": "x", "alpha_deg": [1, 91]}`, `parameter "alpha_deg": element 1 91 is above the maximum 90`},
		{`{"label": "x", "alpha_deg": [1, "2"]}`, `element 1: want a number, got "2"`},
		{`{"label": "x", "alpha_deg": []}`, `want at least 1 value(s), got 0`},
		{`{"label": "x", "alpha_deg": [1, 2, 3, 4, 5]}`, `want at most 4 value(s), got 5`},
		{`{"label": "x", "alpha_deg": 3}`, `want an array of numbers, got "3"`},
		{`{"label": "x", "panels": 160.5}`, `parameter "panels": want an integer, got 160.5`},
		{`{"label": "x", "panels": 4}`, `4 is below the minimum 8`},
		{`{"label": "x", "panels": 1e400}`, `number 1e400 is out of range`},
		{`{"label": "x", "mach": "0.3"}`, `want a number, got "0.3"`},
		{`{"label": "x", "kutta": "yes"}`, `want true or false, got "yes"`},
		{`{"label": "x", "spacing": "sine"}`, `"sine" is not one of cosine, uniform`},
		{`{"label": 3}`, `want a string, got "3"`},
		{`{"label": "x", "pannels": 100}`, `parameter "pannels": unknown parameter (known: alpha_deg, panels`},
		{`{"label": "x", "label": "y"}`, `parameter "label": given twice`},
		{`{"label": "x",}`, `not valid JSON`},
		{`[1]`, `must be a JSON object`},
	} {
		_, err := stage.Validate(testParams, []byte(tc.params))
		if !errors.Is(err, stage.ErrBadInput) || !strings.Contains(err.Error(), tc.text) {
			t.Errorf("%s: error %v, want ErrBadInput containing %q", tc.params, err, tc.text)
		}
	}
}

func TestValidateEmptyMeansDefaults(t *testing.T) {
	ps := testParams[:5]
	for _, in := range []string{"", "  ", "{}"} {
		v, err := stage.Validate(ps, []byte(in))
		if err != nil {
			t.Fatalf("%q: %v", in, err)
		}
		if v.Int("panels") != 100 {
			t.Errorf("%q: panels = %d", in, v.Int("panels"))
		}
	}
}

func TestValuesPanicOnUndeclared(t *testing.T) {
	v, err := stage.Validate(testParams[:1], nil)
	if err != nil {
		t.Fatal(err)
	}
	for name, f := range map[string]func(){
		"unknown":    func() { v.Number("nope") },
		"wrong type": func() { v.Int("alpha_deg") },
	} {
		if !panics(f) {
			t.Errorf("%s: no panic", name)
		}
	}
}

func panics(f func()) (p bool) {
	defer func() { p = recover() != nil }()
	f()
	return false
}

func TestCheckInfo(t *testing.T) {
	good := stage.Info{Name: "vortex-panel", Version: "1.0.0", Summary: "a stage", Params: testParams}
	if err := stage.CheckInfo(good); err != nil {
		t.Fatalf("good info: %v", err)
	}
	for _, tc := range []struct {
		name string
		edit func(*stage.Info)
		text string
	}{
		{"name", func(i *stage.Info) { i.Name = "Vortex_Panel" }, "not kebab-case"},
		{"version", func(i *stage.Info) { i.Version = "" }, "no version"},
		{"summary", func(i *stage.Info) { i.Summary = "two\nlines" }, "must be one line"},
		{"param name", func(i *stage.Info) { i.Params = []stage.Param{{Name: "Alpha", Type: stage.Number}} }, "not snake_case"},
		{"type", func(i *stage.Info) { i.Params = []stage.Param{{Name: "a", Type: "float"}} }, `unknown type "float"`},
		{"twice", func(i *stage.Info) { i.Params = append(i.Params, testParams[0]) }, "declared twice"},
		{"bounds", func(i *stage.Info) {
			i.Params = []stage.Param{{Name: "a", Type: stage.Number, Min: stage.Bound(2), Max: stage.Bound(1)}}
		}, "min 2 > max 1"},
		{"default", func(i *stage.Info) {
			i.Params = []stage.Param{{Name: "a", Type: stage.Number, Default: json.RawMessage("5"), Max: stage.Bound(1)}}
		}, "default: parameter \"a\": 5 is above the maximum 1"},
		{"concurrency", func(i *stage.Info) { i.MaxConcurrency = -1 }, "negative"},
	} {
		info := good
		info.Params = append([]stage.Param(nil), good.Params...)
		tc.edit(&info)
		if err := stage.CheckInfo(info); err == nil || !strings.Contains(err.Error(), tc.text) {
			t.Errorf("%s: error %v, want %q", tc.name, err, tc.text)
		}
	}
}
