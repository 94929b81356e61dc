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
	bad := func(format string, args ...any) error {
		return fmt.Errorf("%w: packed result: "+format, append([]any{ErrMalformed}, args...)...)
	}
	if m.GetStage() == "" || m.GetVersion() == "" {
		return nil, bad("stage %q, version %q: want both", m.GetStage(), m.GetVersion())
	}
	d := &ResultDoc{
		Format:   ResultFormat,
		Stage:    m.GetStage(),
		Version:  m.GetVersion(),
		Scalars:  map[string]float64{},
		Cases:    make([]*Case, len(m.GetCases())),
		Warnings: append([]string{}, m.GetWarnings()...),
	}
	if err := finiteMap(m.GetScalars(), "scalar"); err != nil {
		return nil, bad("%v", err)
	}
	for k, v := range m.GetScalars() {
		d.Scalars[k] = v
	}
	if names := m.GetCheckNames(); len(names) > 0 {
		seen := make(map[string]bool, len(names))
		for _, n := range names {
			if n == "" || seen[n] {
				return nil, bad("check name %q is empty or given twice", n)
			}
			seen[n] = true
		}
	}
	if len(m.GetCpX()) != len(m.GetCpY()) {
		return nil, bad("%d cp_x and %d cp_y", len(m.GetCpX()), len(m.GetCpY()))
	}
	for i, c := range m.GetCases() {
		if c.GetFailed() {
			continue
		}
		if !finite(c.GetAlphaDeg()) || !finite(c.GetCl()) || !finite(c.GetCmC4()) {
			return nil, bad("case %d: alpha_deg %g, cl %g, cm_c4 %g: want finite numbers (mark a failed case failed, with a warning)",
				i, c.GetAlphaDeg(), c.GetCl(), c.GetCmC4())
		}
		out := &Case{AlphaDeg: c.GetAlphaDeg(), CL: c.GetCl(), CMc4: c.GetCmC4()}
		if vals := c.GetChecks(); len(vals) > 0 {
			names := m.GetCheckNames()
			if len(vals) != len(names) {
				return nil, bad("case %d: %d check value(s) for %d check_names", i, len(vals), len(names))
			}
			out.Checks = make(map[string]float64, len(vals))
			for k, v := range vals {
				switch {
				case math.IsNaN(v): // no such check in this case
				case math.IsInf(v, 0):
					return nil, bad("case %d: check %s is %g", i, names[k], v)
				default:
					out.Checks[names[k]] = v
				}
			}
		}
		if cp := c.GetCp(); len(cp) > 0 {
			xs, ys := c.GetCpX(), c.GetCpY()
			if len(xs) == 0 && len(ys) == 0 {
				xs, ys = m.GetCpX(), m.GetCpY()
			}
			if len(xs) != len(cp) || len(ys) != len(cp) {
				return nil, bad("case %d: %d cp value(s) at %d x and %d y (points given nowhere?)", i, len(cp), len(xs), len(ys))
			}
			out.Cp = make([]CpPoint, len(cp))
			for k := range cp {
				// v-v is 0 for a finite v, NaN for NaN and infinities.
				if cp[k]-cp[k] != 0 || xs[k]-xs[k] != 0 || ys[k]-ys[k] != 0 {
					return nil, bad("case %d: cp point %d is (%g, %g, %g)", i, k, xs[k], ys[k], cp[k])
				}
				out.Cp[k] = CpPoint{X: xs[k], Y: ys[k], Cp: cp[k]}
			}
		}
		if dcp := c.GetLoadDcp(); len(dcp) > 0 {
			xs := c.GetLoadX()
			if len(xs) == 0 {
				xs = m.GetLoadX()
			}
			if len(xs) != len(dcp) {
				return nil, bad("case %d: %d load value(s) at %d x (stations given nowhere?)", i, len(dcp), len(xs))
			}
			out.Load = make([]LoadPoint, len(dcp))
			for k := range dcp {
				if dcp[k]-dcp[k] != 0 || xs[k]-xs[k] != 0 {
					return nil, bad("case %d: load point %d is (%g, %g)", i, k, xs[k], dcp[k])
				}
				out.Load[k] = LoadPoint{X: xs[k], DCp: dcp[k]}
			}
		}
		if f := c.GetField(); f != nil {
			nx, ny := int(f.GetNx()), int(f.GetNy())
			if nx < 0 || ny < 0 || nx*ny != len(f.GetPsi()) || len(f.GetPsi()) != len(f.GetCp()) {
				return nil, bad("case %d: field of %d × %d points has %d psi and %d cp", i, nx, ny, len(f.GetPsi()), len(f.GetCp()))
			}
			if !finite(f.GetX0()) || !finite(f.GetY0()) || !finite(f.GetDx()) || !finite(f.GetDy()) {
				return nil, bad("case %d: field grid (%g, %g) step (%g, %g): want finite numbers", i, f.GetX0(), f.GetY0(), f.GetDx(), f.GetDy())
			}
			psi, err := nullable(f.GetPsi())
			if err != nil {
				return nil, bad("case %d: field psi: %v", i, err)
			}
			cp, err := nullable(f.GetCp())
			if err != nil {
				return nil, bad("case %d: field cp: %v", i, err)
			}
			out.Field = &Field{X0: f.GetX0(), Y0: f.GetY0(), DX: f.GetDx(), DY: f.GetDy(), NX: nx, NY: ny, Psi: psi, Cp: cp}
		}
		d.Cases[i] = out
	}
	return d, nil
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
