package pipeline

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"sync"
	"time"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/pointfile"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/plugins/stage"
	"github.com/foilwright/foilwright/prep"
	"github.com/tidwall/gjson"
)

// fakePrep is an honest stand-in for the geometry chain: it reads "x y"
// lines, shifts the point with the smallest x to the origin, divides by the
// chord (the x extent) and returns the result as a section document. A file
// with a line that is not two numbers fails, naming the file and line.
type fakePrep struct{}

func (fakePrep) Prepare(ctx context.Context, in Input, s prep.Settings) (Prepared, error) {
	var pts []geometry.Point
	for _, f := range in.Files {
		sc := bufio.NewScanner(bytes.NewReader(f.Data))
		for line := 1; sc.Scan(); line++ {
			text := strings.TrimSpace(sc.Text())
			if text == "" || strings.HasPrefix(text, "#") {
				continue
			}
			fields := strings.Fields(text)
			if len(fields) != 2 {
				return Prepared{}, &geometry.ParseError{File: f.Path, Line: line, Err: pointfile.ErrColumnCount}
			}
			x, errx := strconv.ParseFloat(fields[0], 64)
			y, erry := strconv.ParseFloat(fields[1], 64)
			if errx != nil || erry != nil {
				return Prepared{}, &geometry.ParseError{File: f.Path, Line: line, Err: pointfile.ErrNotNumeric}
			}
			pts = append(pts, geometry.Point{X: x, Y: y})
		}
	}
	if len(pts) < 3 {
		return Prepared{}, geometry.ErrTooFewPoints
	}
	lo, hi := pts[0], pts[0]
	for _, p := range pts {
		if p.X < lo.X {
			lo = p
		}
		hi.X = math.Max(hi.X, p.X)
	}
	chord := hi.X - lo.X
	for i := range pts {
		pts[i] = geometry.Point{X: (pts[i].X - lo.X) / chord, Y: (pts[i].Y - lo.Y) / chord}
	}
	sec := &section.Section{Name: in.Section, Units: geometry.Unit(s.Units), Nodes: pts,
		Frame: &section.Frame{Chord: chord, LE: [2]float64{lo.X, lo.Y}}}
	var b bytes.Buffer
	if err := section.Write(&b, sec); err != nil {
		return Prepared{}, err
	}
	return Prepared{Section: b.Bytes(), Summary: fmt.Sprintf("%d points, chord %g", len(pts), chord)}, nil
}

// fakeStages names the built-in stages the fake runner serves.
func fakeStages(name string) bool {
	switch name {
	case "area", "scale", "plot", "fail", "slow", "badplot", "pressure", "count":
		return true
	}
	return false
}

// fakeRunner serves the fake stages in process:
//
//	area     the shoelace area of the section's nodes
//	scale    params.factor times the "area" scalar of the stage it runs after
//	plot     an SVG polyline of the nodes as an artifact
//	fail     always fails
//	slow     waits params.ms milliseconds, or until its context ends
//	badplot  returns an artifact with a path for a name
//	pressure two cases (0° and 2°) with Cp = 1 − x at every node, as a
//	         decoded document (as the host gives a packed reply)
//	count    the number of Cp points of the stage it runs after
type fakeRunner struct {
	reg     *fakeRegistry
	version string
	calls   int
	closed  bool
}

// fakeRegistry counts the runners made and closed, to check that each
// worker gets its own and all are closed.
type fakeRegistry struct {
	mu      sync.Mutex
	version string // the version the stages report; "" is "1.0"
	runners []*fakeRunner
	areaAdd float64 // added to every area, to simulate a changed stage
}

func (r *fakeRegistry) New() (StageRunner, error) {
	r.mu.Lock()
	defer r.mu.Unlock()
	v := r.version
	if v == "" {
		v = "1.0"
	}
	fr := &fakeRunner{reg: r, version: v}
	r.runners = append(r.runners, fr)
	return fr, nil
}

func (f *fakeRunner) Describe(ctx context.Context, call StageCall) (stage.Info, string, error) {
	if f.closed {
		return stage.Info{}, "", errors.New("runner closed")
	}
	info := stage.Info{Name: call.Stage, Version: f.version}
	switch call.Stage {
	case "scale":
		info.Params = []stage.Param{{Name: "factor", Type: stage.Number, Default: json.RawMessage("1")}}
	case "slow":
		info.Params = []stage.Param{{Name: "ms", Type: stage.Integer, Default: json.RawMessage("0")}}
	}
	return info, strings.Repeat("ab", 32), nil
}

func (f *fakeRunner) Close() error {
	if f.closed {
		return errors.New("closed twice")
	}
	f.closed = true
	return nil
}

func (f *fakeRunner) Run(ctx context.Context, call StageCall, in stage.Request) (stage.Result, error) {
	if f.closed {
		return stage.Result{}, errors.New("runner closed")
	}
	f.calls++
	sec, err := in.DecodeSection()
	if err != nil {
		return stage.Result{}, err
	}
	params := gjson.ParseBytes(call.Params)
	result := func(scalars map[string]float64, warnings ...string) (stage.Result, error) {
		b, err := json.MarshalIndent(map[string]any{"format": "foilwright.result/1", "stage": call.Stage,
			"version": f.version, "scalars": scalars, "warnings": warnings}, "", "  ")
		return stage.Result{JSON: b, Warnings: warnings}, err
	}
	switch call.Stage {
	case "area":
		return result(map[string]float64{"area": shoelace(sec.Nodes) + f.reg.areaAdd})
	case "scale":
		ids := in.DepIDs()
		if len(ids) != 1 {
			return stage.Result{}, fmt.Errorf("scale wants one dependency, got %d", len(ids))
		}
		dep, err := in.Dep(ids[0])
		if err != nil {
			return stage.Result{}, err
		}
		a, ok := dep.Scalars["area"]
		if !ok {
			return stage.Result{}, errors.New("dependency has no area")
		}
		return result(map[string]float64{"scaled": params.Get("factor").Float() * a}, "scaled by the factor")
	case "plot", "badplot":
		var b strings.Builder
		b.WriteString(`<svg xmlns="http://www.w3.org/2000/svg"><polyline points="`)
		for i, p := range sec.Nodes {
			if i > 0 {
				b.WriteByte(' ')
			}
			fmt.Fprintf(&b, "%g,%g", p.X, -p.Y)
		}
		b.WriteString(`"/></svg>` + "\n")
		out, err := result(map[string]float64{"nodes": float64(len(sec.Nodes))})
		name := "shape.svg"
		if call.Stage == "badplot" {
			name = "../shape.svg"
		}
		out.Artifacts = []stage.Artifact{{Name: name, MediaType: "image/svg+xml", Data: []byte(b.String())}}
		return out, err
	case "pressure":
		d := stage.NewResultDoc(stage.Info{Name: call.Stage, Version: f.version})
		d.SetScalar("nodes", float64(len(sec.Nodes)))
		for _, a := range []float64{0, 2} {
			c := stage.Case{AlphaDeg: a, CL: 0.1 * a, Checks: map[string]float64{"sum": 0}}
			for _, p := range sec.Nodes {
				c.Cp = append(c.Cp, stage.CpPoint{X: p.X, Y: p.Y, Cp: 1 - p.X})
			}
			d.AddCase(c)
		}
		return stage.Result{Doc: d}, nil
	case "count":
		ids := in.DepIDs()
		if len(ids) != 1 {
			return stage.Result{}, fmt.Errorf("count wants one dependency, got %d", len(ids))
		}
		dep, err := in.Dep(ids[0])
		if err != nil {
			return stage.Result{}, err
		}
		n := 0
		for _, c := range dep.Cases {
			if c != nil {
				n += len(c.Cp)
			}
		}
		return result(map[string]float64{"points": float64(n)})
	case "fail":
		return stage.Result{}, errors.New("the fake stage fails on purpose")
	case "slow":
		select {
		case <-time.After(time.Duration(params.Get("ms").Int()) * time.Millisecond):
			return result(map[string]float64{})
		case <-ctx.Done():
			return stage.Result{}, ctx.Err()
		}
	}
	return stage.Result{}, fmt.Errorf("unknown stage %q", call.Stage)
}

// shoelace returns the area enclosed by the closed polygon through pts,
// positive counter-clockwise.
func shoelace(pts []geometry.Point) float64 {
	var a float64
	for i := range pts {
		p, q := pts[i], pts[(i+1)%len(pts)]
		a += p.X*q.Y - q.X*p.Y
	}
	return a / 2
}
