package stage

import (
	"fmt"
	"math"
	"sort"

	"github.com/foilwright/foilwright/plugins/gen/stagev1"
)

// ResultToProto returns d as the packed Result message of the protocol:
// the Cp points or load stations every case shares go once into the
// message, the others with their case. d's numbers must be finite (as
// AddCase and SetScalar keep them); field values that are null become NaN.
func ResultToProto(d *ResultDoc) *stagev1.Result {
	m := &stagev1.Result{
		Stage:    d.Stage,
		Version:  d.Version,
		Scalars:  d.Scalars,
		Warnings: d.Warnings,
		Cases:    make([]*stagev1.Case, len(d.Cases)),
	}
	names := checkNames(d.Cases)
	m.CheckNames = names
	cpX, cpY, sharedCp := sharedCpPoints(d.Cases)
	loadX, sharedLoad := sharedLoadStations(d.Cases)
	if sharedCp {
		m.CpX, m.CpY = cpX, cpY
	}
	if sharedLoad {
		m.LoadX = loadX
	}
	for i, c := range d.Cases {
		if c == nil {
			m.Cases[i] = &stagev1.Case{Failed: true}
			continue
		}
		pc := &stagev1.Case{AlphaDeg: c.AlphaDeg, Cl: c.CL, CmC4: c.CMc4}
		if len(c.Checks) > 0 {
			pc.Checks = make([]float64, len(names))
			for k, name := range names {
				v, ok := c.Checks[name]
				if !ok {
					v = math.NaN()
				}
				pc.Checks[k] = v
			}
		}
		if n := len(c.Cp); n > 0 {
			pc.Cp = make([]float64, n)
			if !sharedCp {
				pc.CpX, pc.CpY = make([]float64, n), make([]float64, n)
			}
			for k, p := range c.Cp {
				pc.Cp[k] = p.Cp
				if !sharedCp {
					pc.CpX[k], pc.CpY[k] = p.X, p.Y
				}
			}
		}
		if n := len(c.Load); n > 0 {
			pc.LoadDcp = make([]float64, n)
			if !sharedLoad {
				pc.LoadX = make([]float64, n)
			}
			for k, p := range c.Load {
				pc.LoadDcp[k] = p.DCp
				if !sharedLoad {
					pc.LoadX[k] = p.X
				}
			}
		}
		if f := c.Field; f != nil {
			pc.Field = &stagev1.Field{X0: f.X0, Y0: f.Y0, Dx: f.DX, Dy: f.DY, Nx: int32(f.NX), Ny: int32(f.NY),
				Psi: unnull(f.Psi), Cp: unnull(f.Cp)}
		}
		m.Cases[i] = pc
	}
	return m
}

// checkNames returns the names of the checks of any case, sorted.
func checkNames(cases []*Case) []string {
	seen := map[string]bool{}
	var names []string
	for _, c := range cases {
		if c == nil {
			continue
		}
		for k := range c.Checks {
			if !seen[k] {
				seen[k] = true
				names = append(names, k)
			}
		}
	}
	sort.Strings(names)
	return names
}

// unnull returns vs with nil as NaN.
func unnull(vs []*float64) []float64 {
	out := make([]float64, len(vs))
	for k, v := range vs {
		if v == nil {
			out[k] = math.NaN()
		} else {
			out[k] = *v
		}
	}
	return out
}

// ResultFromProto checks a packed Result message and returns it as a
// result document. It returns an error wrapping ErrMalformed if the stage
// or version is empty, a number is not finite (field values excepted: NaN
// there is null), a column's length differs from that of its points, or a
// case's points are given nowhere.
func ResultFromProto(m *stagev1.Result) (*ResultDoc, error) {
	d, err := packedHead(m.GetStage(), m.GetVersion(), m.GetScalars(), m.GetWarnings(), m.GetCheckNames(),
		m.GetCpX(), m.GetCpY(), len(m.GetCases()))
	if err != nil {
		return nil, err
	}
	shared := sharedColumns{cpX: m.GetCpX(), cpY: m.GetCpY(), loadX: m.GetLoadX(), checkNames: m.GetCheckNames()}
	for i, c := range m.GetCases() {
		if c.GetFailed() {
			continue
		}
		cols := caseColumns{
			alpha: c.GetAlphaDeg(), cl: c.GetCl(), cm: c.GetCmC4(),
			checks: c.GetChecks(), cp: c.GetCp(), cpX: c.GetCpX(), cpY: c.GetCpY(),
			loadDcp: c.GetLoadDcp(), loadX: c.GetLoadX(), field: c.GetField(),
		}
		if d.Cases[i], err = cols.result(i, &shared); err != nil {
			return nil, err
		}
	}
	return d, nil
}

// malformedPacked returns an error wrapping ErrMalformed about a packed
// result.
func malformedPacked(format string, args ...any) error {
	return fmt.Errorf("%w: packed result: "+format, append([]any{ErrMalformed}, args...)...)
}

// packedHead checks what a packed Result gives besides its cases and
// returns the result document with n cases, all nil yet. The values are
// those of the message's fields stage, version, scalars, warnings,
// check_names, cp_x and cp_y; the maps and slices are copied.
func packedHead(stageName, version string, scalars map[string]float64, warnings, checkNames []string, cpX, cpY []float64, n int) (*ResultDoc, error) {
	if stageName == "" || version == "" {
		return nil, malformedPacked("stage %q, version %q: want both", stageName, version)
	}
	d := &ResultDoc{
		Format:   ResultFormat,
		Stage:    stageName,
		Version:  version,
		Scalars:  make(map[string]float64, len(scalars)),
		Cases:    make([]*Case, n),
		Warnings: append([]string{}, warnings...),
	}
	if err := finiteMap(scalars, "scalar"); err != nil {
		return nil, malformedPacked("%v", err)
	}
	for k, v := range scalars {
		d.Scalars[k] = v
	}
	if len(checkNames) > 0 {
		seen := make(map[string]bool, len(checkNames))
		for _, n := range checkNames {
			if n == "" || seen[n] {
				return nil, malformedPacked("check name %q is empty or given twice", n)
			}
			seen[n] = true
		}
	}
	if len(cpX) != len(cpY) {
		return nil, malformedPacked("%d cp_x and %d cp_y", len(cpX), len(cpY))
	}
	return d, nil
}

// sharedColumns are the columns of a packed Result its cases refer to.
type sharedColumns struct {
	cpX, cpY, loadX []float64
	checkNames      []string
}

// caseColumns are the fields of a packed Case.
type caseColumns struct {
	failed                               bool
	alpha, cl, cm                        float64
	checks, cp, cpX, cpY, loadDcp, loadX []float64
	field                                *stagev1.Field
}

// result checks the columns of case i and returns the case of the result
// document, its slices and maps its own.
func (c *caseColumns) result(i int, shared *sharedColumns) (*Case, error) {
	if !finite(c.alpha) || !finite(c.cl) || !finite(c.cm) {
		return nil, malformedPacked("case %d: alpha_deg %g, cl %g, cm_c4 %g: want finite numbers (mark a failed case failed, with a warning)",
			i, c.alpha, c.cl, c.cm)
	}
	out := &Case{AlphaDeg: c.alpha, CL: c.cl, CMc4: c.cm}
	if vals := c.checks; len(vals) > 0 {
		names := shared.checkNames
		if len(vals) != len(names) {
			return nil, malformedPacked("case %d: %d check value(s) for %d check_names", i, len(vals), len(names))
		}
		out.Checks = make(map[string]float64, len(vals))
		for k, v := range vals {
			switch {
			case math.IsNaN(v): // no such check in this case
			case math.IsInf(v, 0):
				return nil, malformedPacked("case %d: check %s is %g", i, names[k], v)
			default:
				out.Checks[names[k]] = v
			}
		}
	}
	if cp := c.cp; len(cp) > 0 {
		xs, ys := c.cpX, c.cpY
		if len(xs) == 0 && len(ys) == 0 {
			xs, ys = shared.cpX, shared.cpY
		}
		if len(xs) != len(cp) || len(ys) != len(cp) {
			return nil, malformedPacked("case %d: %d cp value(s) at %d x and %d y (points given nowhere?)", i, len(cp), len(xs), len(ys))
		}
		out.Cp = make([]CpPoint, len(cp))
		// v-v is 0 for a finite v, NaN for NaN and infinities: the sum
		// of the differences is NaN if any number is not finite, and
		// only then is the first such point looked for.
		pts, xs, ys := out.Cp[:len(cp)], xs[:len(cp)], ys[:len(cp)]
		var bad float64
		for k, v := range cp {
			x, y := xs[k], ys[k]
			bad += (v - v) + (x - x) + (y - y)
			pts[k] = CpPoint{X: x, Y: y, Cp: v}
		}
		if bad != 0 {
			for k := range cp {
				if cp[k]-cp[k] != 0 || xs[k]-xs[k] != 0 || ys[k]-ys[k] != 0 {
					return nil, malformedPacked("case %d: cp point %d is (%g, %g, %g)", i, k, xs[k], ys[k], cp[k])
				}
			}
		}
	}
	if dcp := c.loadDcp; len(dcp) > 0 {
		xs := c.loadX
		if len(xs) == 0 {
			xs = shared.loadX
		}
		if len(xs) != len(dcp) {
			return nil, malformedPacked("case %d: %d load value(s) at %d x (stations given nowhere?)", i, len(dcp), len(xs))
		}
		out.Load = make([]LoadPoint, len(dcp))
		pts, xs := out.Load[:len(dcp)], xs[:len(dcp)]
		var bad float64 // as for the Cp points
		for k, v := range dcp {
			x := xs[k]
			bad += (v - v) + (x - x)
			pts[k] = LoadPoint{X: x, DCp: v}
		}
		if bad != 0 {
			for k := range dcp {
				if dcp[k]-dcp[k] != 0 || xs[k]-xs[k] != 0 {
					return nil, malformedPacked("case %d: load point %d is (%g, %g)", i, k, xs[k], dcp[k])
				}
			}
		}
	}
	if f := c.field; f != nil {
		nx, ny := int(f.GetNx()), int(f.GetNy())
		if nx < 0 || ny < 0 || nx*ny != len(f.GetPsi()) || len(f.GetPsi()) != len(f.GetCp()) {
			return nil, malformedPacked("case %d: field of %d × %d points has %d psi and %d cp", i, nx, ny, len(f.GetPsi()), len(f.GetCp()))
		}
		if !finite(f.GetX0()) || !finite(f.GetY0()) || !finite(f.GetDx()) || !finite(f.GetDy()) {
			return nil, malformedPacked("case %d: field grid (%g, %g) step (%g, %g): want finite numbers", i, f.GetX0(), f.GetY0(), f.GetDx(), f.GetDy())
		}
		psi, err := nullable(f.GetPsi())
		if err != nil {
			return nil, malformedPacked("case %d: field psi: %v", i, err)
		}
		cp, err := nullable(f.GetCp())
		if err != nil {
			return nil, malformedPacked("case %d: field cp: %v", i, err)
		}
		out.Field = &Field{X0: f.GetX0(), Y0: f.GetY0(), DX: f.GetDx(), DY: f.GetDy(), NX: nx, NY: ny, Psi: psi, Cp: cp}
	}
	return out, nil
}

// nullable returns vs with NaN as nil; an infinity is an error.
func nullable(vs []float64) ([]*float64, error) {
	vals := make([]float64, len(vs))
	out := make([]*float64, len(vs))
	for k, v := range vs {
		switch {
		case math.IsNaN(v):
		case math.IsInf(v, 0):
			return nil, fmt.Errorf("value %d is %g", k, v)
		default:
			vals[k] = v
			out[k] = &vals[k]
		}
	}
	return out, nil
}

func finiteMap(m map[string]float64, what string) error {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		if !finite(m[k]) {
			return fmt.Errorf("%s %s is %g", what, k, m[k])
		}
	}
	return nil
}
