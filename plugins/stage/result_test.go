package stage_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/plugins/stage"
)

func TestResultRoundTrip(t *testing.T) {
	d := stage.NewResultDoc(stage.Info{Name: "toy", Version: "1"})
	d.AddCase(stage.Case{AlphaDeg: 2, CL: 0.25, CMc4: -0.01, Checks: map[string]float64{"closure": 1e-15}, Cp: []stage.CpPoint{{X: 1, Y: 0, Cp: 0.2}}})
	d.AddCase(stage.Case{AlphaDeg: 4, CL: math.NaN()})
	d.SetScalar("cl_alpha", 6.2)
	d.SetScalar("bad", math.Inf(1))
	b, err := d.Encode()
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(b), "null") {
		t.Errorf("failed case not written as null:\n%s", b)
	}
	got, err := stage.DecodeResult(b)
	if err != nil {
		t.Fatal(err)
	}
	if len(got.Cases) != 2 || got.Cases[1] != nil || got.Cases[0].Checks["closure"] != 1e-15 || got.Cases[0].Cp[0].Cp != 0.2 {
		t.Errorf("cases = %+v", got.Cases)
	}
	if len(got.Warnings) != 2 || !strings.Contains(got.Warnings[0], "case 1 (alpha 4 deg): cl is not finite") ||
		!strings.Contains(got.Warnings[1], "scalar bad is not finite") {
		t.Errorf("warnings = %q", got.Warnings)
	}
	if _, ok := got.Scalars["bad"]; ok || got.Scalars["cl_alpha"] != 6.2 {
		t.Errorf("scalars = %v", got.Scalars)
	}
	again, err := got.Encode()
	if err != nil || string(again) != string(b) {
		t.Errorf("re-encoding changed the document:\n%s\n%s", b, again)
	}
}

func TestDecodeResultRejects(t *testing.T) {
	for _, tc := range []struct{ doc, text string }{
		{`{"format": "foilwright.result/1", "stage": "a", "version": "1",`, "not valid JSON"},
		{`{"format": "foilwright.section/1", "stage": "a", "version": "1"}`, `format "foilwright.section/1"`},
		{`{"format": "foilwright.result/1", "version": "1"}`, "stage is missing"},
		{`{"format": "foilwright.result/1", "stage": "a", "version": 1}`, "version is \"1\""},
		{`{"format": "foilwright.result/1", "stage": "a", "version": "1", "cases": {}}`, "cases is"},
		{`{"format": "foilwright.result/1", "stage": "a", "version": "1", "cases": [null, {"cl": 1}]}`, "case 1: alpha_deg is missing"},
		{`{"format": "foilwright.result/1", "stage": "a", "version": "1", "scalars": {"x": "1"}}`, "result:"},
	} {
		_, err := stage.DecodeResult([]byte(tc.doc))
		if !errors.Is(err, stage.ErrMalformed) || !strings.Contains(err.Error(), tc.text) {
			t.Errorf("%s: error %v, want ErrMalformed containing %q", tc.doc, err, tc.text)
		}
	}
}

func TestCodes(t *testing.T) {
	for _, tc := range []struct {
		err  error
		code stage.Code
	}{
		{nil, stage.CodeOK},
		{stage.BadInputf("x %d", 1), stage.CodeBadInput},
		{stage.Diverged(errors.New("x")), stage.CodeDiverged},
		{stage.Unsupported(errors.New("x")), stage.CodeUnsupported},
		{errors.New("x"), stage.CodeInternal},
		{&stage.ParamError{Name: "a", Reason: "b"}, stage.CodeBadInput},
	} {
		if got := stage.CodeOf(tc.err); got != tc.code {
			t.Errorf("CodeOf(%v) = %d, want %d", tc.err, got, tc.code)
		}
		remote := &stage.RemoteError{Code: tc.code, Message: "m"}
		if tc.code != stage.CodeOK && !errors.Is(remote, tc.code.Sentinel()) {
			t.Errorf("remote error of code %d is not its sentinel", tc.code)
		}
	}
	if stage.BadInput(nil) != nil {
		t.Error("BadInput(nil) != nil")
	}
	if e := stage.BadInputf("too few nodes"); e.Error() != "too few nodes" {
		t.Errorf("marking changed the message: %q", e)
	}
}
