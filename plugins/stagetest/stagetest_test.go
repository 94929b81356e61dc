package stagetest_test

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"strings"
	"sync/atomic"
	"testing"

	"github.com/foilwright/foilwright/plugins/stage"
	"github.com/foilwright/foilwright/plugins/stagetest"
)

// areaStage reports the enclosed area of a section (shoelace formula) as a
// scalar and one case per angle with cl = 0: a small stage that keeps the
// contract.
type areaStage struct{}

var areaInfo = stage.Info{
	Name:    "area",
	Version: "1.0.0",
	Summary: "enclosed area of a section",
	Params: []stage.Param{
		{Name: "alpha_deg", Type: stage.Numbers, Default: json.RawMessage("[0]"), Min: stage.Bound(-90), Max: stage.Bound(90), MinItems: 1, Unit: "degrees"},
		{Name: "scale", Type: stage.Number, Default: json.RawMessage("1"), Min: stage.Bound(0), Max: stage.Bound(10)},
	},
	Scalars: []stage.Scalar{{Name: "area", Doc: "enclosed area, chord² units"}},
}

func (areaStage) Describe(context.Context) (stage.Info, error) { return areaInfo, nil }

func (areaStage) Run(ctx context.Context, req stage.Request) (stage.Result, error) {
	v, err := stage.Validate(areaInfo.Params, req.Params)
	if err != nil {
		return stage.Result{}, err
	}
	s, err := req.DecodeSection()
	if err != nil {
		return stage.Result{}, err
	}
	if len(s.Nodes) < 3 {
		return stage.Result{}, stage.BadInputf("%s: %d node(s), want at least 3", req.SectionName, len(s.Nodes))
	}
	a := 0.0
	for i := range len(s.Nodes) - 1 {
		a += s.Nodes[i].Cross(s.Nodes[i+1])
	}
	d := stage.NewResultDoc(areaInfo)
	d.SetScalar("area", v.Number("scale")*a/2)
	for _, alpha := range v.Numbers("alpha_deg") {
		d.AddCase(stage.Case{AlphaDeg: alpha})
	}
	b, err := d.Encode()
	return stage.Result{JSON: b}, err
}

func TestConformingStagePasses(t *testing.T) {
	stagetest.Run(t, areaStage{})
}

// TestSectionArea checks the sample section against the NACA 0012 area,
// 0.0822 chord² (from memory; 0.685·t for the 4-digit thickness form).
func TestSectionArea(t *testing.T) {
	res, err := stagetest.Connect(t, areaStage{}).Run(t.Context(), stage.Request{Section: stagetest.Section(80)})
	if err != nil {
		t.Fatal(err)
	}
	doc, err := stage.DecodeResult(res.JSON)
	if err != nil {
		t.Fatal(err)
	}
	if a := doc.Scalars["area"]; a < 0.0815 || a > 0.0830 {
		t.Errorf("area of the sample section %g, want about 0.0822", a)
	}
}

// broken wraps areaStage with one fault.
type broken struct {
	describe func(stage.Info) stage.Info
	run      func(ctx context.Context, req stage.Request) (stage.Result, error)
}

func (b broken) Describe(ctx context.Context) (stage.Info, error) {
	info, _ := areaStage{}.Describe(ctx)
	if b.describe != nil {
		info = b.describe(info)
	}
	return info, nil
}

func (b broken) Run(ctx context.Context, req stage.Request) (stage.Result, error) {
	if b.run != nil {
		return b.run(ctx, req)
	}
	return areaStage{}.Run(ctx, req)
}

func TestBrokenStagesFail(t *testing.T) {
	var calls atomic.Int64
	for _, tc := range []struct {
		name string
		s    stage.Stage
		want string
	}{
		{"bad name", broken{describe: func(i stage.Info) stage.Info { i.Name = "Area"; return i }}, "not kebab-case"},
		{"undeclared scalar", broken{describe: func(i stage.Info) stage.Info { i.Scalars = nil; return i }}, `scalar "area" is not declared`},
		{"ignores unknown parameters", broken{run: func(ctx context.Context, req stage.Request) (stage.Result, error) {
			return areaStage{}.Run(ctx, stage.Request{Section: req.Section})
		}}, "unknown parameter: got error <nil>"},
		{"accepts two nodes", broken{run: func(ctx context.Context, req stage.Request) (stage.Result, error) {
			if strings.Contains(string(req.Section), `[[1, 0], [0, 0]]`) {
				return areaStage{}.Run(ctx, stage.Request{Section: []byte(stagetest.Section(10)), Params: req.Params})
			}
			return areaStage{}.Run(ctx, req)
		}}, "section with two nodes: got error <nil>"},
		{"plain error for bad input", broken{run: func(ctx context.Context, req stage.Request) (stage.Result, error) {
			res, err := areaStage{}.Run(ctx, req)
			if err != nil {
				return res, errors.New(err.Error())
			}
			return res, nil
		}}, "want stage.ErrBadInput"},
		{"not deterministic", broken{run: func(ctx context.Context, req stage.Request) (stage.Result, error) {
			d := stage.NewResultDoc(areaInfo)
			d.AddCase(stage.Case{AlphaDeg: float64(calls.Add(1))})
			b, _ := d.Encode()
			return stage.Result{JSON: b}, nil
		}}, "not deterministic"},
		{"bad artifact", broken{run: func(ctx context.Context, req stage.Request) (stage.Result, error) {
			res, err := areaStage{}.Run(ctx, req)
			res.Artifacts = []stage.Artifact{{Name: "plots/cp.svg", MediaType: "image/svg+xml"}}
			return res, err
		}}, `artifact name "plots/cp.svg"`},
		{"wrong format", broken{run: func(ctx context.Context, req stage.Request) (stage.Result, error) {
			return stage.Result{JSON: []byte(`{"format": "mine", "stage": "area", "version": "1.0.0"}`)}, nil
		}}, `result format "mine"`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			for _, via := range []string{"direct", "grpc"} {
				s := tc.s
				if via == "grpc" {
					s = stagetest.Connect(t, tc.s)
				}
				err := stagetest.Check(t.Context(), s, stagetest.Options{})
				if err == nil || !strings.Contains(err.Error(), tc.want) {
					t.Errorf("%s: Check = %v, want a failure containing %q", via, err, tc.want)
				}
			}
		})
	}
}

func ExampleCheck() {
	err := stagetest.Check(context.Background(), areaStage{}, stagetest.Options{})
	fmt.Println(err)
	// Output: <nil>
}
