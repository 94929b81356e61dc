package builtin

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"time"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/plugins/builtin/sourcepanel"
	"github.com/foilwright/foilwright/plugins/stage"
)

func init() { register(sourcePanel{}) }

// sourcePanel is the stage "source-panel": the Hess–Smith constant-source
// panel method for non-lifting flow about a closed body (package
// sourcepanel).
//
// Scalars: panels, condition and closure_max (the largest closed-body
// source sum |Σλs/Σ|λ|s| over the cases). Checks per case: closure (the
// source sum of the case, zero for exact closure) and cd_pressure. Its
// lift is a discretisation figure (no circulation) that vanishes as panels
// are added; the pressure is given at the panel midpoints. An open trailing
// edge is closed by a straight base panel unless close_te is false.
type sourcePanel struct{}

var sourcePanelInfo = stage.Info{
	MaxNodes: PanelMaxNodes,
	Name:     "source-panel",
	Version:  Version,
	Summary:  "non-lifting pressure distribution by Hess-Smith constant-source panels, with the closed-body source sum check",
	Params: []stage.Param{alphaParam, cpParam, {
		Name:    "close_te",
		Type:    stage.Boolean,
		Default: json.RawMessage("true"),
		Doc:     "close an open trailing edge with a straight base panel (else an open section is refused)",
	}, fieldParam},
	Scalars: []stage.Scalar{
		{Name: "panels", Doc: "number of panels, including a base panel that closes the trailing edge"},
		{Name: "condition", Doc: "condition number estimate of the influence matrix"},
		{Name: "closure_max", Doc: "largest |Σλs/Σ|λ|s| over the cases: the closed-body source sum, zero for exact closure"},
	},
}

func (sourcePanel) Describe(context.Context) (stage.Info, error) {
	return described(sourcePanelInfo), nil
}

func (sourcePanel) Run(ctx context.Context, req stage.Request) (stage.Result, error) {
	start := time.Now()
	r, err := decode(described(sourcePanelInfo), req)
	if err != nil {
		return stage.Result{}, err
	}
	d := stage.NewResultDoc(sourcePanelInfo)
	nodes := r.section.Nodes
	sv, err := sourcepanel.New(nodes)
	if errors.Is(err, sourcepanel.ErrOpenContour) && r.v.Bool("close_te") && len(nodes) > 0 {
		nodes = append(append([]geometry.Point(nil), nodes...), nodes[0])
		d.Warnings = append(d.Warnings, fmt.Sprintf("open trailing edge (gap %.3g chord) closed by a straight base panel", nodes[0].Dist(nodes[len(nodes)-2])))
		sv, err = sourcepanel.New(nodes)
	}
	if err != nil {
		return stage.Result{}, panelError(err)
	}
	if err := ctx.Err(); err != nil {
		return stage.Result{}, err
	}
	cases, err := sv.Solve(r.alphas)
	if err != nil {
		return stage.Result{}, panelError(err)
	}
	tm := sv.Timings()
	d.SetScalar("panels", float64(len(nodes)-1))
	d.SetScalar("condition", sv.Cond())
	worst := 0.0
	withCp := r.v.Bool("cp")
	g, withField, err := fieldGrid(r.v)
	if err != nil {
		return stage.Result{}, err
	}
	for i, c := range cases {
		worst = math.Max(worst, math.Abs(c.Closure))
		out := stage.Case{
			AlphaDeg: r.alphasDeg[i],
			CL:       c.Cl,
			CMc4:     c.Cm,
			Checks:   map[string]float64{"closure": c.Closure, "cd_pressure": c.CdPressure},
		}
		if withCp {
			// Results are at the control points, the panel midpoints.
			out.Cp = make([]stage.CpPoint, len(c.Cp))
			for j, cp := range c.Cp {
				m := nodes[j].Add(nodes[j+1]).Scale(0.5)
				out.Cp[j] = stage.CpPoint{X: m.X, Y: m.Y, Cp: cp}
			}
		}
		for _, w := range c.Warnings {
			d.Warnings = append(d.Warnings, fmt.Sprintf("alpha %g deg: %s", r.alphasDeg[i], w))
		}
		if withField {
			out.Field = g.sample(func(p geometry.Point) (float64, float64, error) {
				fp, err := c.Field([]geometry.Point{p})
				if err != nil {
					return 0, 0, err
				}
				return fp[0].StreamFunction, fp[0].Cp, nil
			})
		}
		d.AddCase(out)
	}
	d.SetScalar("closure_max", worst)
	return finish(d, timings(tm, start))
}
