package builtin

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/plot"
	"github.com/foilwright/foilwright/plugins/stage"
)

func init() { register(plots{}) }

// plots is the stage "plots": it draws the section and the results of the
// stages it runs after (pressure distributions, Cl and Cm against α for
// every method on one chart, streamlines where a panel stage gave a flow
// field) and returns the pictures as artifacts. It computes nothing new.
type plots struct{}

// maxCpCases is the most angles drawn on one Cp chart.
const maxCpCases = 5

// streamAlphaDeg is the angle of attack whose streamlines are drawn, or the
// nearest one with a flow field.
const streamAlphaDeg = 6

var plotsInfo = stage.Info{
	MaxNodes: PlotsMaxNodes,
	Name:     "plots",
	Version:  Version,
	Summary:  "pictures of the section and of the results of the stages it runs after: Cp, Cl and Cm against alpha, streamlines",
	Params: []stage.Param{
		{Name: "format", Type: stage.String, Default: json.RawMessage(`"svg"`), Choices: []string{plot.SVG, plot.PNG}, Doc: "picture format"},
		{Name: "section", Type: stage.Boolean, Default: json.RawMessage("true"), Doc: "draw the section (section.FORMAT)"},
		{Name: "cp", Type: stage.Boolean, Default: json.RawMessage("true"), Doc: "draw Cp against x/c of each stage with pressures (cp-STAGEID.FORMAT) over the section's outline, at most 5 angles each (the title says when some are left out); the points within one base length of the corners of a blunt trailing edge, where Cp is singular, are left out"},
		{Name: "polar", Type: stage.Boolean, Default: json.RawMessage("true"), Doc: "draw Cl and Cm against alpha of every stage with two or more angles on one chart (polar.FORMAT)"},
		{Name: "streamlines", Type: stage.Boolean, Default: json.RawMessage("true"), Doc: "draw the streamlines of the case nearest 6° among those with a flow field (streamlines-STAGEID.FORMAT)"},
	},
	Scalars: []stage.Scalar{{Name: "figures", Doc: "number of pictures drawn"}},
}

func (plots) Describe(context.Context) (stage.Info, error) { return described(plotsInfo), nil }

func (plots) Run(ctx context.Context, req stage.Request) (stage.Result, error) {
	r, err := decode(described(plotsInfo), req)
	if err != nil {
		return stage.Result{}, err
	}
	if n := len(r.section.Nodes); n < 8 {
		return stage.Result{}, stage.BadInput(fmt.Errorf("section %s: %d node(s), want at least 8", req.SectionName, n))
	}
	format := r.v.String("format")
	d := stage.NewResultDoc(plotsInfo)
	var arts []stage.Artifact
	add := func(name string, f *plot.Figure, err error) {
		if err != nil {
			d.Warnings = append(d.Warnings, fmt.Sprintf("%s: %v", name, err))
			return
		}
		data, err := plot.Encode(f, format)
		if err != nil {
			d.Warnings = append(d.Warnings, fmt.Sprintf("%s: %v", name, err))
			return
		}
		arts = append(arts, stage.Artifact{Name: name + "." + format, MediaType: plot.MediaType(format), Data: data})
	}
	if r.v.Bool("section") {
		f, err := plot.SectionPlot(plot.SectionFrom(r.section))
		add("section", f, err)
	}
	ids := req.DepIDs()
	nodes := r.section.Nodes
	var polars []plot.PolarSeries
	streamDone := !r.v.Bool("streamlines")
	for _, id := range ids {
		doc, err := req.Dep(id)
		if err != nil {
			return stage.Result{}, err
		}
		var cases []*stage.Case
		for _, c := range doc.Cases {
			if c != nil {
				cases = append(cases, c)
			}
		}
		if r.v.Bool("cp") {
			var cps []plot.CpCase
			withCp := 0
			for _, c := range cases {
				if len(c.Cp) >= 3 {
					withCp++
				}
			}
			for _, c := range pick(cases, maxCpCases) {
				if len(c.Cp) < 3 {
					continue
				}
				cc := plot.CpCase{AlphaDeg: c.AlphaDeg, Method: doc.Stage}
				at := make([]geometry.Point, len(c.Cp))
				for i, p := range c.Cp {
					at[i] = geometry.Point{X: p.X, Y: p.Y}
				}
				// Near the corners of a blunt trailing edge the flow turns
				// round a sharp edge and the values are singular; they
				// would set the scale of the whole chart.
				skip := plot.TrailingEdgeCorners(nodes, at)
				for i, p := range c.Cp {
					if !skip[i] {
						cc.X, cc.Y, cc.Cp = append(cc.X, p.X), append(cc.Y, p.Y), append(cc.Cp, p.Cp)
					}
				}
				if len(cc.X) >= 3 {
					cps = append(cps, cc)
				}
			}
			if len(cps) > 0 {
				o := plot.CpOptions{Outline: nodes}
				if len(cps) < withCp {
					o.Note = fmt.Sprintf("%d of %d angles", len(cps), withCp)
				}
				f, err := plot.CpPlot(cps, o)
				add("cp-"+id, f, err)
			}
		}
		if len(cases) >= 2 {
			ps := plot.PolarSeries{Method: doc.Stage}
			for _, c := range cases {
				ps.AlphaDeg, ps.Cl, ps.Cm = append(ps.AlphaDeg, c.AlphaDeg), append(ps.Cl, c.CL), append(ps.Cm, c.CMc4)
			}
			polars = append(polars, ps)
		}
		if !streamDone {
			// The case nearest streamAlphaDeg, a typical working angle.
			var best *stage.Case
			for _, c := range cases {
				if c.Field != nil && (best == nil || math.Abs(c.AlphaDeg-streamAlphaDeg) < math.Abs(best.AlphaDeg-streamAlphaDeg)) {
					best = c
				}
			}
			if best != nil {
				f, err := plot.StreamlinePlot(flowOf(best, doc.Stage, r.section.Nodes))
				add("streamlines-"+id, f, err)
				streamDone = true
			}
		}
	}
	if r.v.Bool("polar") && len(polars) > 0 {
		f, err := plot.PolarPlot(polars)
		add("polar", f, err)
	}
	d.SetScalar("figures", float64(len(arts)))
	res, err := finish(d, nil)
	res.Artifacts = arts
	return res, err
}

// pick returns at most n of cases, evenly spread and always the first and
// last.
func pick(cases []*stage.Case, n int) []*stage.Case {
	if len(cases) <= n {
		return cases
	}
	out := make([]*stage.Case, n)
	for i := range n {
		out[i] = cases[int(math.Round(float64(i)*float64(len(cases)-1)/float64(n-1)))]
	}
	return out
}

// flowOf turns a case's flow field into plot data. Points inside the body
// have no value; they get the stream function of the body surface (the
// median of their valued neighbours), which the filled body hides.
func flowOf(c *stage.Case, method string, body []geometry.Point) plot.FlowField {
	f := c.Field
	psi := make([]float64, len(f.Psi))
	var edge []float64
	for k, v := range f.Psi {
		if v != nil {
			psi[k] = *v
			continue
		}
		i, j := k%f.NX, k/f.NX
		for _, d := range [][2]int{{1, 0}, {-1, 0}, {0, 1}, {0, -1}} {
			ii, jj := i+d[0], j+d[1]
			if ii >= 0 && ii < f.NX && jj >= 0 && jj < f.NY {
				if n := f.Psi[jj*f.NX+ii]; n != nil {
					edge = append(edge, *n)
				}
			}
		}
	}
	fill := 0.0
	if len(edge) > 0 {
		sort.Float64s(edge)
		fill = edge[len(edge)/2]
	}
	for k, v := range f.Psi {
		if v == nil {
			psi[k] = fill
		}
	}
	return plot.FlowField{AlphaDeg: c.AlphaDeg, Method: method, Nx: f.NX, Ny: f.NY, X0: f.X0, Y0: f.Y0, DX: f.DX, DY: f.DY, Psi: psi, Body: body}
}

// PictureKind returns the kind of a picture of the plots stage from its
// artifact name, when it draws the result of one stage seen under id:
// "cp", "polar", "section" or "streamlines" for cp-ID.FORMAT, polar.FORMAT,
// section.FORMAT and streamlines-ID.FORMAT.
func PictureKind(artifact, format, id string) string {
	stem := strings.TrimSuffix(artifact, "."+format)
	return strings.TrimSuffix(stem, "-"+id)
}
