package builtin

import (
	"context"
	"encoding/json"
	"math"
	"time"

	"github.com/foilwright/foilwright/plugins/builtin/solver"
	"github.com/foilwright/foilwright/plugins/builtin/thinaerofoil"
	"github.com/foilwright/foilwright/plugins/stage"
)

func init() { register(thinAerofoil{}) }

// thinAerofoil is the stage "thin-aerofoil": thin-aerofoil theory from the
// section's camber line (package thinaerofoil).
//
// Scalars: cl_alpha (per radian), alpha_l0_deg, cm_c4 and camber_samples.
// Per case: a0, a1, a2 (the Fourier coefficients A₀, A₁, A₂) and x_cp
// (centre of pressure, chord fractions, where Cl ≠ 0), and the load ΔCp
// along the chord instead of a surface pressure distribution. Its timings
// are build (camber line from the nodes), factor (spline fit and Fourier
// integrals) and solve.
type thinAerofoil struct{}

var thinAerofoilInfo = stage.Info{
	MaxNodes: ThinMaxNodes,
	Name:     "thin-aerofoil",
	Version:  Version,
	Summary:  "lift slope, zero-lift angle, quarter-chord moment and load by thin-aerofoil theory from the camber line",
	Params: []stage.Param{alphaParam, {
		Name:    "load",
		Type:    stage.Boolean,
		Default: json.RawMessage("true"),
		Doc:     "include the chordwise load distribution of each case",
	}},
	Scalars: []stage.Scalar{
		{Name: "cl_alpha", Doc: "lift slope dCl/dα per radian (2π in the theory)"},
		{Name: "alpha_l0_deg", Doc: "zero-lift angle of attack, degrees"},
		{Name: "cm_c4", Doc: "moment coefficient about the quarter chord, positive nose-up, the same at every angle"},
		{Name: "camber_samples", Doc: "number of camber-line samples taken from the section"},
	},
}

func (thinAerofoil) Describe(context.Context) (stage.Info, error) {
	return described(thinAerofoilInfo), nil
}

func (thinAerofoil) Run(ctx context.Context, req stage.Request) (stage.Result, error) {
	start := time.Now()
	r, err := decode(described(thinAerofoilInfo), req)
	if err != nil {
		return stage.Result{}, err
	}
	xs, ycs, err := thinaerofoil.CamberFromNodes(r.section.Nodes)
	if err != nil {
		return stage.Result{}, stage.BadInput(err)
	}
	t1 := time.Now()
	cam, err := thinaerofoil.New(xs, ycs)
	if err != nil {
		return stage.Result{}, stage.BadInput(err)
	}
	t2 := time.Now()
	cases, err := cam.Solve(r.alphas)
	if err != nil {
		return stage.Result{}, stage.BadInput(err)
	}
	d := stage.NewResultDoc(thinAerofoilInfo)
	d.SetScalar("cl_alpha", 2*math.Pi)
	d.SetScalar("alpha_l0_deg", cam.ZeroLiftAngle()*180/math.Pi)
	d.SetScalar("cm_c4", cam.CmQuarter())
	d.SetScalar("camber_samples", float64(len(xs)))
	var stations []float64
	for _, x := range xs {
		if x > 0 && x < 1 {
			stations = append(stations, x)
		}
	}
	withLoad := r.v.Bool("load")
	for i, c := range cases {
		if err := ctx.Err(); err != nil {
			return stage.Result{}, err
		}
		out := stage.Case{
			AlphaDeg: r.alphasDeg[i],
			CL:       c.Cl,
			CMc4:     c.Cm,
			Checks:   map[string]float64{"a0": c.A0, "a1": c.A1, "a2": c.A2},
		}
		if c.HasXCP {
			out.Checks["x_cp"] = c.XCP
		}
		if withLoad {
			dcp, err := cam.Load(c.Alpha, stations)
			if err != nil {
				return stage.Result{}, stage.BadInput(err)
			}
			out.Load = make([]stage.LoadPoint, len(dcp))
			for j := range dcp {
				out.Load[j] = stage.LoadPoint{X: stations[j], DCp: dcp[j]}
			}
		}
		d.AddCase(out)
	}
	return finish(d, timings(solver.Timings{Build: t1.Sub(start), Factor: t2.Sub(t1), Solve: time.Since(t2)}, start))
}
