package builtin

import (
	"encoding/json"
	"errors"
	"math"
	"time"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/internal/version"
	"github.com/foilwright/foilwright/plugins/builtin/solver"
	"github.com/foilwright/foilwright/plugins/stage"
)

// Version is the version of every built-in stage: that of foilwright, which
// serves them.
var Version = version.Version

// MaxAngles is the most angles of attack one request may ask for.
const MaxAngles = 1000

// The most section nodes each built-in stage takes (stage.Info.MaxNodes),
// chosen so that the largest section allowed runs in a few seconds and a
// few hundred megabytes (measured with 21 angles on a 2-core machine:
// vortex-panel 2.2 s and source-panel 2.8 s at 2501 nodes, 0.2 GB each;
// thin-aerofoil 2.6 s and 0.2 GB at 8001). The panel stages' cost grows
// with the cube of the nodes, thin-aerofoil's memory with their square.
// The stage-nodes limit (stage.MaxNodesEnv) replaces them.
const (
	PanelMaxNodes = 2501
	ThinMaxNodes  = 8001
	PlotsMaxNodes = 20001
)

// described returns info with the maximum number of nodes the host asked
// for, if it did. Every built-in stage takes its arrays packed: it reads
// the section through Request.DecodeSection and its dependencies through
// Request.Dep.
func described(info stage.Info) stage.Info {
	info.MaxNodes = stage.MaxNodesOr(info.MaxNodes)
	info.Packed = true
	return info
}

// alphaParam is the angle-of-attack list every built-in takes.
var alphaParam = stage.Param{
	Name:     "alpha_deg",
	Type:     stage.Numbers,
	Default:  json.RawMessage("[0]"),
	Min:      stage.Bound(-90),
	Max:      stage.Bound(90),
	MinItems: 1,
	MaxItems: MaxAngles,
	Unit:     "degrees",
	Doc:      "angles of attack, positive nose-up",
}

// cpParam switches the pressure distribution in the result on or off.
var cpParam = stage.Param{
	Name:    "cp",
	Type:    stage.Boolean,
	Default: json.RawMessage("true"),
	Doc:     "include the pressure distribution of each case",
}

// request is a checked request: parameters, section, angles.
type request struct {
	v         stage.Values
	section   *section.Section
	alphasDeg []float64
	alphas    []float64 // radians
}

// decode validates the parameters against info, checks the number of
// nodes against info.MaxNodes before anything is decoded, and decodes the
// section.
func decode(info stage.Info, req stage.Request) (*request, error) {
	v, err := stage.Validate(info.Params, req.Params)
	if err != nil {
		return nil, err
	}
	if n := req.NodeCount(); info.MaxNodes > 0 && n > info.MaxNodes {
		return nil, stage.BadInputf("the section has %d nodes; %s takes at most %d (the stage-nodes limit raises it)", n, info.Name, info.MaxNodes)
	}
	s, err := req.DecodeSection()
	if err != nil {
		return nil, err
	}
	r := &request{v: v, section: s}
	if _, ok := info.Param("alpha_deg"); ok {
		r.alphasDeg = v.Numbers("alpha_deg")
		r.alphas = make([]float64, len(r.alphasDeg))
		for i, a := range r.alphasDeg {
			r.alphas[i] = a * math.Pi / 180
		}
	}
	return r, nil
}

// finish returns d as a Result with the given timings. The document is
// not encoded here: it crosses to the host packed, and the host writes it.
func finish(d *stage.ResultDoc, timings map[string]time.Duration) (stage.Result, error) {
	return stage.Result{Doc: d, Timings: timings}, nil
}

// cpPoints pairs the nodes with their pressure coefficients.
func cpPoints(nodes []geometry.Point, cp []float64) []stage.CpPoint {
	out := make([]stage.CpPoint, len(cp))
	for i := range cp {
		out[i] = stage.CpPoint{X: nodes[i].X, Y: nodes[i].Y, Cp: cp[i]}
	}
	return out
}

// timings returns the phase times of a solver run for Result.Timings, with
// the total since start.
func timings(tm solver.Timings, start time.Time) map[string]time.Duration {
	return map[string]time.Duration{"build": tm.Build, "factor": tm.Factor, "solve": tm.Solve, "total": time.Since(start)}
}

// panelError marks a panel solver's error: an ill-conditioned system is
// ErrDiverged, anything else is a property of the input. The host adds the
// stage and section to the message.
func panelError(err error) error {
	if errors.Is(err, solver.ErrIllConditioned) {
		return stage.Diverged(err)
	}
	return stage.BadInput(err)
}
