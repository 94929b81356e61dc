package stage_test

import (
	"errors"
	"math"
	"reflect"
	"strings"
	"testing"

	"google.golang.org/protobuf/proto"

	"github.com/foilwright/foilwright/plugins/gen/stagev1"
	"github.com/foilwright/foilwright/plugins/stage"
)

// TestPackedRoundTrip: a result document crosses as a packed message and
// comes back the same, bit for bit, through the wire encoding.
func TestPackedRoundTrip(t *testing.T) {
	d := sample()
	m := stage.ResultToProto(d)
	if len(m.CpX) != 5 || len(m.LoadX) != 3 || len(m.Cases[1].CpX) != 0 || !m.Cases[3].Failed {
		t.Errorf("shared points not factored out: %d cp_x, %d load_x, case cp_x %d", len(m.CpX), len(m.LoadX), len(m.Cases[1].CpX))
	}
	if !reflect.DeepEqual(m.CheckNames, []string{"closure", "x_cp"}) || !math.IsNaN(m.Cases[0].Checks[1]) || m.Cases[2].Checks[1] != 0.31 {
		t.Errorf("checks: names %q, case 0 %v, case 2 %v", m.CheckNames, m.Cases[0].Checks, m.Cases[2].Checks)
	}
	wire, err := proto.Marshal(m)
	if err != nil {
		t.Fatal(err)
	}
	var back stagev1.Result
	if err := proto.Unmarshal(wire, &back); err != nil {
		t.Fatal(err)
	}
	got, err := stage.ResultFromProto(&back)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(got, d) {
		t.Errorf("came back %+v\nwant %+v", got, d)
	}
	// Packed, the document is less than half its text in rows.
	text, _ := d.EncodeV1()
	if len(wire)*2 > len(text) {
		t.Errorf("packed %d bytes, rows as JSON %d", len(wire), len(text))
	}
}

// TestPackedOwnPoints: a case with its own points carries them.
func TestPackedOwnPoints(t *testing.T) {
	d := stage.NewResultDoc(stage.Info{Name: "toy", Version: "1"})
	d.AddCase(stage.Case{AlphaDeg: 0, Cp: []stage.CpPoint{{X: 0, Y: 0, Cp: 1}, {X: 1, Y: 0, Cp: 0.5}}, Load: []stage.LoadPoint{{X: 0.5, DCp: 1}}})
	d.AddCase(stage.Case{AlphaDeg: 2, Cp: []stage.CpPoint{{X: 0, Y: 0, Cp: 1}}, Load: []stage.LoadPoint{{X: 0.4, DCp: 2}}})
	m := stage.ResultToProto(d)
	if len(m.CpX) != 0 || len(m.Cases[1].CpX) != 1 || len(m.LoadX) != 0 || len(m.Cases[0].LoadX) != 1 {
		t.Errorf("message %v", m)
	}
	got, err := stage.ResultFromProto(m)
	if err != nil || !reflect.DeepEqual(got, d) {
		t.Errorf("came back %+v (%v)", got, err)
	}
}

func TestResultFromProtoRejects(t *testing.T) {
	good := func() *stagev1.Result { return stage.ResultToProto(sample()) }
	for _, tc := range []struct {
		name string
		edit func(m *stagev1.Result)
		text string
	}{
		{"no stage", func(m *stagev1.Result) { m.Stage = "" }, `stage "", version "1.2"`},
		{"NaN scalar", func(m *stagev1.Result) { m.Scalars["panels"] = math.NaN() }, "scalar panels is NaN"},
		{"NaN cl", func(m *stagev1.Result) { m.Cases[0].Cl = math.NaN() }, "case 0: alpha_deg -2, cl NaN"},
		{"infinite Cp", func(m *stagev1.Result) { m.Cases[1].Cp[2] = math.Inf(-1) }, "case 1: cp point 2 is (0, 0, -Inf)"},
		{"infinite point", func(m *stagev1.Result) { m.CpY[4] = math.Inf(1) }, "case 0: cp point 4 is (1, +Inf"},
		{"short column", func(m *stagev1.Result) { m.Cases[2].Cp = m.Cases[2].Cp[:3] }, "case 2: 3 cp value(s) at 5 x and 5 y"},
		{"x and y differ", func(m *stagev1.Result) { m.CpY = m.CpY[:4] }, "5 cp_x and 4 cp_y"},
		{"no points", func(m *stagev1.Result) { m.CpX, m.CpY = nil, nil }, "points given nowhere"},
		{"no stations", func(m *stagev1.Result) { m.LoadX = nil }, "stations given nowhere"},
		{"infinite load", func(m *stagev1.Result) { m.Cases[0].LoadDcp[0] = math.Inf(1) }, "case 0: load point 0"},
		{"checks without names", func(m *stagev1.Result) { m.CheckNames = m.CheckNames[:1] }, "case 0: 2 check value(s) for 1 check_names"},
		{"name twice", func(m *stagev1.Result) { m.CheckNames[1] = "closure" }, `check name "closure" is empty or given twice`},
		{"infinite check", func(m *stagev1.Result) { m.Cases[1].Checks[0] = math.Inf(1) }, "case 1: check closure is +Inf"},
		{"field size", func(m *stagev1.Result) { m.Cases[0].Field.Nx = 4 }, "field of 4 × 2 points has 6 psi"},
		{"infinite field", func(m *stagev1.Result) { m.Cases[0].Field.Cp[0] = math.Inf(1) }, "field cp: value 0 is +Inf"},
		{"grid", func(m *stagev1.Result) { m.Cases[0].Field.Dx = math.NaN() }, "field grid"},
	} {
		m := good()
		tc.edit(m)
		_, err := stage.ResultFromProto(m)
		if !errors.Is(err, stage.ErrMalformed) || !strings.Contains(err.Error(), tc.text) {
			t.Errorf("%s: got %v, want ErrMalformed containing %q", tc.name, err, tc.text)
		}
	}
}
