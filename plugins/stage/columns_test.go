package stage_test

import (
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"reflect"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/plugins/stage"
)

// sample returns a result document with every kind of content: scalars,
// a failed case, checks that differ between cases, pressures at shared
// points, loads at shared stations, a field with holes, a warning.
func sample() *stage.ResultDoc {
	d := stage.NewResultDoc(stage.Info{Name: "toy", Version: "1.2"})
	d.SetScalar("panels", 4)
	d.SetScalar("condition", 1.25e7)
	at := []stage.CpPoint{{X: 1, Y: 0}, {X: 0.5, Y: 0.0625}, {X: 0, Y: 0}, {X: 0.5, Y: -0.0625}, {X: 1, Y: 0}}
	for i, a := range []float64{-2, 0, 4} {
		c := stage.Case{AlphaDeg: a, CL: 0.11 * a, CMc4: -0.05, Checks: map[string]float64{"closure": 1e-16 * float64(i)}}
		if a == 4 {
			c.Checks["x_cp"] = 0.31
		}
		for _, p := range at {
			c.Cp = append(c.Cp, stage.CpPoint{X: p.X, Y: p.Y, Cp: 1 - 0.1*a*p.X})
		}
		for _, x := range []float64{0.25, 0.5, 0.75} {
			c.Load = append(c.Load, stage.LoadPoint{X: x, DCp: 0.1 * a * (1 - x)})
		}
		d.AddCase(c)
	}
	d.FailCase(12, errors.New("the solver gave up"))
	one, two := 0.5, -1.5
	d.Cases[0].Field = &stage.Field{X0: -0.5, Y0: -0.5, DX: 0.5, DY: 1, NX: 3, NY: 2,
		Psi: []*float64{&one, nil, &two, &one, &one, nil}, Cp: []*float64{&two, nil, &one, &two, &two, nil}}
	return d
}

func TestResultColumnsRoundTrip(t *testing.T) {
	d := sample()
	b, err := d.Encode()
	if err != nil {
		t.Fatal(err)
	}
	text := string(b)
	for _, want := range []string{
		`"format": "foilwright.result/2"`,
		`"cp_at": {"x": [1, 0.5, 0, 0.5, 1], "y": [0, 0.0625, 0, -0.0625, 0]}`,
		`"load_at": {"x": [0.25, 0.5, 0.75]}`,
		`"cp": {"cp": [`,
		`"load": {"dcp": [`,
		`"psi": [0.5, null, -1.5, 0.5, 0.5, null]`,
		"\n    null",
		`"condition": 12500000`,
	} {
		if !strings.Contains(text, want) {
			t.Errorf("document lacks %s:\n%s", want, text)
		}
	}
	if !json.Valid(b) {
		t.Fatalf("not valid JSON:\n%s", b)
	}
	got, err := stage.DecodeResult(b)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(got, d) {
		t.Errorf("read back %+v\nwant %+v", got, d)
	}
	again, err := got.Encode()
	if err != nil || !bytes.Equal(again, b) {
		t.Errorf("re-encoding changed the document: %v", err)
	}
	// The row form of foilwright.result/1 holds the same document.
	v1, err := d.EncodeV1()
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(v1), `"format": "foilwright.result/1"`) || !strings.Contains(string(v1), `"cp": [`) {
		t.Errorf("EncodeV1 is not the row form:\n%.300s", v1)
	}
	old, err := stage.DecodeResult(v1)
	if err != nil {
		t.Fatal(err)
	}
	old.Format = d.Format
	if !reflect.DeepEqual(old, d) {
		t.Errorf("the row form reads back %+v\nwant %+v", old, d)
	}
	if len(b) >= len(v1)/2 {
		t.Errorf("columns take %d bytes, rows %d: want less than half", len(b), len(v1))
	}
}

// TestResultOwnPoints: cases whose pressures are at different points keep
// their own x and y.
func TestResultOwnPoints(t *testing.T) {
	d := stage.NewResultDoc(stage.Info{Name: "toy", Version: "1"})
	d.AddCase(stage.Case{AlphaDeg: 0, Cp: []stage.CpPoint{{X: 0, Y: 0, Cp: 1}, {X: 1, Y: 0, Cp: 0.5}}})
	d.AddCase(stage.Case{AlphaDeg: 2, Cp: []stage.CpPoint{{X: 0, Y: 0, Cp: 1}, {X: 0.9, Y: 0, Cp: 0.4}}})
	b, err := d.Encode()
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(string(b), "cp_at") || !strings.Contains(string(b), `"cp": {"x": [0, 0.9], "y": [0, 0], "cp": [1, 0.4]}`) {
		t.Errorf("document:\n%s", b)
	}
	got, err := stage.DecodeResult(b)
	if err != nil || !reflect.DeepEqual(got, d) {
		t.Errorf("read back %+v (%v)", got, err)
	}
}

// TestResultNumbers: every float64 is written as the shortest text that
// reads back to it, the way encoding/json writes it.
func TestResultNumbers(t *testing.T) {
	for _, v := range []float64{0, math.Copysign(0, -1), 1, -1.5, 0.1, 1.0 / 3, 1e-7, -2.5e-300, 1e21, 123456789012345680000, math.SmallestNonzeroFloat64, math.MaxFloat64, 0.9999999999999999, -6.938893903907228e-18} {
		d := stage.NewResultDoc(stage.Info{Name: "toy", Version: "1"})
		d.SetScalar("v", v)
		b, err := d.Encode()
		if err != nil {
			t.Fatal(err)
		}
		want, _ := json.Marshal(v)
		if !strings.Contains(string(b), `"scalars": {"v": `+string(want)+`}`) {
			t.Errorf("%g written as in\n%s\nwant %s", v, b, want)
		}
		got, err := stage.DecodeResult(b)
		if err != nil || math.Float64bits(got.Scalars["v"]) != math.Float64bits(v) {
			t.Errorf("%g read back as %g (%v)", v, got.Scalars["v"], err)
		}
	}
}

func TestResultTrim(t *testing.T) {
	d := sample()
	for _, tc := range []struct {
		keep     string
		cases    int
		cp, kept string
	}{
		{stage.KeepAll, 4, "cp_at", ""},
		{stage.KeepCases, 4, "", "cases"},
		{stage.KeepScalars, 0, "", "scalars"},
	} {
		tr := d.Trim(tc.keep)
		b, err := tr.Encode()
		if err != nil {
			t.Fatal(err)
		}
		got, err := stage.DecodeResult(b)
		if err != nil {
			t.Fatalf("%s: %v", tc.keep, err)
		}
		if got.Kept != tc.kept || len(got.Cases) != tc.cases || !reflect.DeepEqual(got.Scalars, d.Scalars) || !reflect.DeepEqual(got.Warnings, d.Warnings) {
			t.Errorf("%s: kept %q, %d cases, scalars %v, warnings %q", tc.keep, got.Kept, len(got.Cases), got.Scalars, got.Warnings)
		}
		if tc.keep == stage.KeepCases {
			if got.Cases[3] != nil || got.Cases[0].Cp != nil || got.Cases[0].Load != nil || got.Cases[0].Field != nil || got.Cases[2].CL != d.Cases[2].CL || got.Cases[2].Checks["x_cp"] != 0.31 {
				t.Errorf("cases: %+v", got.Cases[0])
			}
		}
		if (tc.cp != "") != strings.Contains(string(b), "cp_at") {
			t.Errorf("%s: cp_at present: %v", tc.keep, !(tc.cp != ""))
		}
	}
	if d.Kept != "" || len(d.Cases[0].Cp) == 0 {
		t.Error("Trim changed the document it trimmed")
	}
}

func TestDecodeResultColumnsRejects(t *testing.T) {
	head := `{"format": "foilwright.result/2", "stage": "a", "version": "1", `
	for _, tc := range []struct{ doc, text string }{
		{head + `"cases": [{"alpha_deg": 0, "cp": {"cp": [1, 2]}}]}`, "points given nowhere"},
		{head + `"cp_at": {"x": [0, 1], "y": [0]}, "cases": []}`, "cp_at: 2 x and 1 y"},
		{head + `"cp_at": {"x": [0, 1], "y": [0, 0]}, "cases": [{"alpha_deg": 0, "cp": {"cp": [1, 2, 3]}}]}`, "3 value(s) at 2 x"},
		{head + `"cases": [{"alpha_deg": 0, "load": {"dcp": [1]}}]}`, "stations given nowhere"},
		{head + `"cases": [{"alpha_deg": 0, "field": {"nx": 2, "ny": 2, "psi": [1, 2, 3], "cp": [1, 2, 3]}}]}`, "field of 2 × 2 points has 3 psi"},
		{head + `"kept": "some", "cases": []}`, `kept is "some"`},
		{`{"format": "foilwright.result/3", "stage": "a", "version": "1"}`, `want "foilwright.result/2" or "foilwright.result/1"`},
	} {
		_, err := stage.DecodeResult([]byte(tc.doc))
		if !errors.Is(err, stage.ErrMalformed) || !strings.Contains(err.Error(), tc.text) {
			t.Errorf("%s: error %v, want ErrMalformed containing %q", tc.doc, err, tc.text)
		}
	}
}

func TestEncodeRefusesNonFinite(t *testing.T) {
	d := sample()
	d.Cases[0].Cp[1].Cp = math.Inf(1)
	if _, err := d.Encode(); err == nil || !strings.Contains(err.Error(), "case 0: cp point 1 is not finite") {
		t.Errorf("got %v", err)
	}
	d = sample()
	bad := math.NaN()
	d.Cases[0].Field.Psi[1] = &bad
	if _, err := d.Encode(); err == nil || !strings.Contains(err.Error(), "field value NaN") {
		t.Errorf("got %v", err)
	}
}
