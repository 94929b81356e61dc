package builtin

import (
	"context"
	"time"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/plugins/builtin/vortexpanel"
	"github.com/foilwright/foilwright/plugins/stage"
)

func init() { register(vortexPanel{}) }

// vortexPanel is the stage "vortex-panel": the linear-strength vortex
// panel method with the Kutta condition (package vortexpanel).
//
// Scalars: panels (count), condition (condition number estimate of the
// influence matrix), blunt (1 for a blunt trailing edge closed by a source
// base panel, else 0). Checks per case: cl_pressure (Cl from the integrated
// surface pressure), cl_diff (Kutta–Joukowski Cl minus cl_pressure),
// cd_pressure (pressure drag, zero in exact potential flow), stagnation_x,
// and base_source for a blunt trailing edge.
type vortexPanel struct{}

var vortexPanelInfo = stage.Info{
	MaxNodes: PanelMaxNodes,
	Name:     "vortex-panel",
	Version:  Version,
	Summary:  "inviscid lift, moment and pressure by linear-strength vortex panels with the Kutta condition",
	Params:   []stage.Param{alphaParam, cpParam, fieldParam},
	Scalars: []stage.Scalar{
		{Name: "panels", Doc: "number of panels along the surface"},
		{Name: "condition", Doc: "condition number estimate of the influence matrix"},
		{Name: "blunt", Doc: "1 if the trailing edge is blunt and closed by a source base panel, else 0"},
	},
}

func (vortexPanel) Describe(context.Context) (stage.Info, error) {
	return described(vortexPanelInfo), nil
}

func (vortexPanel) Run(ctx context.Context, req stage.Request) (stage.Result, error) {
	start := time.Now()
	r, err := decode(described(vortexPanelInfo), req)
	if err != nil {
		return stage.Result{}, err
	}
	sv, err := vortexpanel.New(r.section.Nodes)
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
	d := stage.NewResultDoc(vortexPanelInfo)
	d.SetScalar("panels", float64(len(r.section.Nodes)-1))
	d.SetScalar("condition", sv.Cond())
	blunt := 0.0
	if sv.Blunt() {
		blunt = 1
	}
	d.SetScalar("blunt", blunt)
	withCp := r.v.Bool("cp")
	g, withField, err := fieldGrid(r.v)
	if err != nil {
		return stage.Result{}, err
	}
	for i, c := range cases {
		out := stage.Case{
			AlphaDeg: r.alphasDeg[i],
			CL:       c.Cl,
			CMc4:     c.Cm,
			Checks: map[string]float64{
				"cl_pressure":  c.ClPressure,
				"cl_diff":      c.ClDiff,
				"cd_pressure":  c.CdPressure,
				"stagnation_x": c.Stagnation.X,
			},
		}
		if sv.Blunt() {
			out.Checks["base_source"] = c.BaseSource
		}
		if withCp {
			out.Cp = cpPoints(r.section.Nodes, c.Cp)
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
	return finish(d, timings(tm, start))
}
