package stage

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"sort"
	"strconv"
)

// encodeV2 writes d in ResultFormat: the top-level keys one per line,
// each case on its own lines, every array of numbers on one line.
func encodeV2(d *ResultDoc) ([]byte, error) {
	if err := d.checkFinite(); err != nil {
		return nil, fmt.Errorf("stage: encode result: %w", err)
	}
	cpX, cpY, sharedCp := sharedCpPoints(d.Cases)
	loadX, sharedLoad := sharedLoadStations(d.Cases)

	b := make([]byte, 0, d.sizeHint())
	b = append(b, "{\n  \"format\": "...)
	b = appendString(b, ResultFormat)
	b = append(b, ",\n  \"stage\": "...)
	b = appendString(b, d.Stage)
	b = append(b, ",\n  \"version\": "...)
	b = appendString(b, d.Version)
	if d.Kept != "" {
		b = append(b, ",\n  \"kept\": "...)
		b = appendString(b, d.Kept)
	}
	b = append(b, ",\n  \"scalars\": "...)
	b = appendMap(b, d.Scalars)
	if sharedCp {
		b = append(b, ",\n  \"cp_at\": {\"x\": "...)
		b = appendFloats(b, cpX)
		b = append(b, ", \"y\": "...)
		b = appendFloats(b, cpY)
		b = append(b, '}')
	}
	if sharedLoad {
		b = append(b, ",\n  \"load_at\": {\"x\": "...)
		b = appendFloats(b, loadX)
		b = append(b, '}')
	}
	b = append(b, ",\n  \"cases\": ["...)
	for i, c := range d.Cases {
		if i > 0 {
			b = append(b, ',')
		}
		b = append(b, "\n    "...)
		if c == nil {
			b = append(b, "null"...)
			continue
		}
		b = append(b, "{\n      \"alpha_deg\": "...)
		b = appendFloat(b, c.AlphaDeg)
		b = append(b, ", \"cl\": "...)
		b = appendFloat(b, c.CL)
		b = append(b, ", \"cm_c4\": "...)
		b = appendFloat(b, c.CMc4)
		if len(c.Checks) > 0 {
			b = append(b, ",\n      \"checks\": "...)
			b = appendMap(b, c.Checks)
		}
		if len(c.Cp) > 0 {
			b = append(b, ",\n      \"cp\": {"...)
			if !sharedCp {
				b = append(b, "\"x\": "...)
				b = appendColumn(b, len(c.Cp), func(k int) float64 { return c.Cp[k].X })
				b = append(b, ", \"y\": "...)
				b = appendColumn(b, len(c.Cp), func(k int) float64 { return c.Cp[k].Y })
				b = append(b, ", "...)
			}
			b = append(b, "\"cp\": "...)
			b = appendColumn(b, len(c.Cp), func(k int) float64 { return c.Cp[k].Cp })
			b = append(b, '}')
		}
		if len(c.Load) > 0 {
			b = append(b, ",\n      \"load\": {"...)
			if !sharedLoad {
				b = append(b, "\"x\": "...)
				b = appendColumn(b, len(c.Load), func(k int) float64 { return c.Load[k].X })
				b = append(b, ", "...)
			}
			b = append(b, "\"dcp\": "...)
			b = appendColumn(b, len(c.Load), func(k int) float64 { return c.Load[k].DCp })
			b = append(b, '}')
		}
		if f := c.Field; f != nil {
			b = append(b, ",\n      \"field\": {\"x0\": "...)
			b = appendFloat(b, f.X0)
			b = append(b, ", \"y0\": "...)
			b = appendFloat(b, f.Y0)
			b = append(b, ", \"dx\": "...)
			b = appendFloat(b, f.DX)
			b = append(b, ", \"dy\": "...)
			b = appendFloat(b, f.DY)
			b = append(b, ", \"nx\": "...)
			b = strconv.AppendInt(b, int64(f.NX), 10)
			b = append(b, ", \"ny\": "...)
			b = strconv.AppendInt(b, int64(f.NY), 10)
			b = append(b, ",\n        \"psi\": "...)
			b = appendNullable(b, f.Psi)
			b = append(b, ",\n        \"cp\": "...)
			b = appendNullable(b, f.Cp)
			b = append(b, '}')
		}
		b = append(b, "\n    }"...)
	}
	if len(d.Cases) > 0 {
		b = append(b, "\n  "...)
	}
	b = append(b, "],\n  \"warnings\": ["...)
	for i, w := range d.Warnings {
		if i > 0 {
			b = append(b, ',')
		}
		b = append(b, "\n    "...)
		b = appendString(b, w)
	}
	if len(d.Warnings) > 0 {
		b = append(b, "\n  "...)
	}
	b = append(b, "]\n}\n"...)
	return b, nil
}

// sizeHint guesses the encoded size: about 22 bytes a number.
func (d *ResultDoc) sizeHint() int {
	n := 512 + 64*len(d.Scalars) + 128*len(d.Warnings)
	for _, c := range d.Cases {
		if c != nil {
			n += 256 + 40*len(c.Checks) + 3*22*len(c.Cp) + 2*22*len(c.Load)
			if c.Field != nil {
				n += 2 * 22 * len(c.Field.Psi)
			}
		}
	}
	return n
}

// checkFinite reports the first non-finite number of d (JSON has no NaN).
func (d *ResultDoc) checkFinite() error {
	for _, k := range sortedKeys(d.Scalars) {
		if !finite(d.Scalars[k]) {
			return fmt.Errorf("scalar %s is %g", k, d.Scalars[k])
		}
	}
	for i, c := range d.Cases {
		if c == nil {
			continue
		}
		if name, bad := c.nonFinite(); bad {
			return fmt.Errorf("case %d: %s is not finite", i, name)
		}
		if f := c.Field; f != nil {
			if !finite(f.X0) || !finite(f.Y0) || !finite(f.DX) || !finite(f.DY) {
				return fmt.Errorf("case %d: field grid is not finite", i)
			}
			for _, vs := range [][]*float64{f.Psi, f.Cp} {
				for _, v := range vs {
					if v != nil && !finite(*v) {
						return fmt.Errorf("case %d: field value %g (use null)", i, *v)
					}
				}
			}
		}
	}
	return nil
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// sharedCpPoints reports whether every case with a pressure distribution
// gives it at the same points (bit for bit), and returns them.
func sharedCpPoints(cases []*Case) (xs, ys []float64, ok bool) {
	first, ok := sharedCp(cases)
	if !ok {
		return nil, nil, false
	}
	xs, ys = make([]float64, len(first)), make([]float64, len(first))
	for k, p := range first {
		xs[k], ys[k] = p.X, p.Y
	}
	return xs, ys, true
}

// sharedCp is sharedCpPoints giving the points as the first case with a
// pressure distribution has them, not copied.
func sharedCp(cases []*Case) (first []CpPoint, ok bool) {
	for _, c := range cases {
		if c == nil || len(c.Cp) == 0 {
			continue
		}
		if first == nil {
			first = c.Cp
			continue
		}
		if len(c.Cp) != len(first) {
			return nil, false
		}
		for k, p := range c.Cp {
			if math.Float64bits(p.X) != math.Float64bits(first[k].X) || math.Float64bits(p.Y) != math.Float64bits(first[k].Y) {
				return nil, false
			}
		}
	}
	return first, first != nil
}

// sharedLoadStations is sharedCpPoints for the load distributions.
func sharedLoadStations(cases []*Case) (xs []float64, ok bool) {
	first, ok := sharedLoad(cases)
	if !ok {
		return nil, false
	}
	xs = make([]float64, len(first))
	for k, p := range first {
		xs[k] = p.X
	}
	return xs, true
}

// sharedLoad is sharedCp for the load distributions.
func sharedLoad(cases []*Case) (first []LoadPoint, ok bool) {
	for _, c := range cases {
		if c == nil || len(c.Load) == 0 {
			continue
		}
		if first == nil {
			first = c.Load
			continue
		}
		if len(c.Load) != len(first) {
			return nil, false
		}
		for k, p := range c.Load {
			if math.Float64bits(p.X) != math.Float64bits(first[k].X) {
				return nil, false
			}
		}
	}
	return first, first != nil
}

// appendFloat appends v as encoding/json writes a float64: the shortest
// decimal that reads back to v, in exponent form below 1e-6 and from 1e21.
func appendFloat(b []byte, v float64) []byte {
	abs := math.Abs(v)
	format := byte('f')
	if abs != 0 && (abs < 1e-6 || abs >= 1e21) {
		format = 'e'
	}
	b = strconv.AppendFloat(b, v, format, -1, 64)
	if format == 'e' {
		// e-09 → e-9, as encoding/json does.
		if n := len(b); n >= 4 && b[n-4] == 'e' && b[n-3] == '-' && b[n-2] == '0' {
			b[n-2] = b[n-1]
			b = b[:n-1]
		}
	}
	return b
}

func appendFloats(b []byte, vs []float64) []byte {
	return appendColumn(b, len(vs), func(k int) float64 { return vs[k] })
}

func appendColumn(b []byte, n int, at func(int) float64) []byte {
	b = append(b, '[')
	for k := range n {
		if k > 0 {
			b = append(b, ", "...)
		}
		b = appendFloat(b, at(k))
	}
	return append(b, ']')
}

func appendNullable(b []byte, vs []*float64) []byte {
	b = append(b, '[')
	for k, v := range vs {
		if k > 0 {
			b = append(b, ", "...)
		}
		if v == nil {
			b = append(b, "null"...)
		} else {
			b = appendFloat(b, *v)
		}
	}
	return append(b, ']')
}

func appendMap(b []byte, m map[string]float64) []byte {
	b = append(b, '{')
	for i, k := range sortedKeys(m) {
		if i > 0 {
			b = append(b, ", "...)
		}
		b = appendString(b, k)
		b = append(b, ": "...)
		b = appendFloat(b, m[k])
	}
	return append(b, '}')
}

// appendString appends s as a JSON string, as encoding/json quotes it
// (HTML characters escaped).
func appendString(b []byte, s string) []byte {
	q, _ := json.Marshal(s) // a string always marshals
	return append(b, q...)
}

func sortedKeys(m map[string]float64) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}

// The JSON shape of a ResultFormat document, for decoding.
type (
	docV2 struct {
		Format   string             `json:"format"`
		Stage    string             `json:"stage"`
		Version  string             `json:"version"`
		Kept     string             `json:"kept"`
		Scalars  map[string]float64 `json:"scalars"`
		CpAt     *columnsV2         `json:"cp_at"`
		LoadAt   *columnsV2         `json:"load_at"`
		Cases    []*caseV2          `json:"cases"`
		Warnings []string           `json:"warnings"`
	}
	caseV2 struct {
		AlphaDeg float64            `json:"alpha_deg"`
		CL       float64            `json:"cl"`
		CMc4     float64            `json:"cm_c4"`
		Checks   map[string]float64 `json:"checks"`
		Cp       *columnsV2         `json:"cp"`
		Load     *columnsV2         `json:"load"`
		Field    *Field             `json:"field"`
	}
	columnsV2 struct {
		X   []float64 `json:"x"`
		Y   []float64 `json:"y"`
		Cp  []float64 `json:"cp"`
		DCp []float64 `json:"dcp"`
	}
)

// decodeV2 decodes a ResultFormat document whose top level DecodeResult
// has checked.
func decodeV2(data []byte) (*ResultDoc, error) {
	var v docV2
	if err := json.NewDecoder(bytes.NewReader(data)).Decode(&v); err != nil {
		return nil, fmt.Errorf("%w: result: %v", ErrMalformed, err)
	}
	bad := func(format string, args ...any) error {
		return fmt.Errorf("%w: result "+format, append([]any{ErrMalformed}, args...)...)
	}
	d := &ResultDoc{Format: v.Format, Stage: v.Stage, Version: v.Version, Kept: v.Kept,
		Scalars: v.Scalars, Warnings: v.Warnings, Cases: make([]*Case, len(v.Cases))}
	var cpAt, loadAt *columnsV2
	if v.CpAt != nil {
		if len(v.CpAt.X) != len(v.CpAt.Y) {
			return nil, bad("cp_at: %d x and %d y", len(v.CpAt.X), len(v.CpAt.Y))
		}
		cpAt = v.CpAt
	}
	if v.LoadAt != nil {
		loadAt = v.LoadAt
	}
	for i, c := range v.Cases {
		if c == nil {
			continue
		}
		out := &Case{AlphaDeg: c.AlphaDeg, CL: c.CL, CMc4: c.CMc4, Checks: c.Checks, Field: c.Field}
		if p := c.Cp; p != nil {
			xs, ys := p.X, p.Y
			if xs == nil && ys == nil && cpAt != nil {
				xs, ys = cpAt.X, cpAt.Y
			}
			if len(xs) != len(p.Cp) || len(ys) != len(p.Cp) {
				return nil, bad("case %d: cp has %d value(s) at %d x and %d y (points given nowhere?)", i, len(p.Cp), len(xs), len(ys))
			}
			out.Cp = make([]CpPoint, len(p.Cp))
			for k := range p.Cp {
				out.Cp[k] = CpPoint{X: xs[k], Y: ys[k], Cp: p.Cp[k]}
			}
		}
		if l := c.Load; l != nil {
			xs := l.X
			if xs == nil && loadAt != nil {
				xs = loadAt.X
			}
			if len(xs) != len(l.DCp) {
				return nil, bad("case %d: load has %d value(s) at %d x (stations given nowhere?)", i, len(l.DCp), len(xs))
			}
			out.Load = make([]LoadPoint, len(l.DCp))
			for k := range l.DCp {
				out.Load[k] = LoadPoint{X: xs[k], DCp: l.DCp[k]}
			}
		}
		if f := c.Field; f != nil {
			if f.NX < 0 || f.NY < 0 || f.NX*f.NY != len(f.Psi) || len(f.Psi) != len(f.Cp) {
				return nil, bad("case %d: field of %d × %d points has %d psi and %d cp", i, f.NX, f.NY, len(f.Psi), len(f.Cp))
			}
		}
		d.Cases[i] = out
	}
	return d, nil
}
