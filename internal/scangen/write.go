package scangen

import (
	"bytes"
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"

	"github.com/foilwright/foilwright/geometry"
)

// extension returns the file name extension of a format.
func extension(format string) string {
	switch format {
	case "dxf-points", "dxf-polyline":
		return "dxf"
	case "blank", "tab", "semicolon":
		return "txt"
	}
	return "csv"
}

// writer accumulates the lines of a file and counts them.
type writer struct {
	buf  bytes.Buffer
	line int
}

func (w *writer) put(s string) int {
	w.buf.WriteString(s)
	w.buf.WriteByte('\n')
	w.line++
	return w.line
}

// write renders the points as the file of spec and records each point's
// line in tr.Lines, in file order.
func write(pts []point, pl *placement, spec Spec, seed uint64, tr *Truth) ([]byte, error) {
	f := spec.File
	tr.Units = f.Units
	if f.Decimals >= 0 {
		tr.Resolution = math.Pow(10, -float64(f.Decimals)) / pl.chord
	}
	mm, err := unitMM(f.Units)
	if err != nil {
		return nil, err
	}
	step := spec.Noise.StepMM / mm // stair steps, file units
	tr.Resolution = math.Max(tr.Resolution, step/pl.chord)
	num := func(v float64) string {
		if f.Decimals < 0 {
			if f.Sci {
				return strconv.FormatFloat(v, 'e', -1, 64)
			}
			return strconv.FormatFloat(v, 'g', -1, 64)
		}
		if f.Sci {
			// The value the fixed notation would hold, in scientific
			// notation with the digits it needs.
			r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'f', f.Decimals, 64), 64)
			if r == 0 {
				return "0.0e+00"
			}
			return strconv.FormatFloat(r, 'e', -1, 64)
		}
		s := strconv.FormatFloat(v, 'f', f.Decimals, 64)
		if s == "-0" || strings.Trim(s, "-0.") == "" {
			s = strings.TrimPrefix(s, "-")
		}
		return s
	}
	quant := func(v float64) float64 {
		if step <= 0 {
			return v
		}
		return math.Round(v/step) * step
	}
	xyz := make([]geometry.Vec3, len(pts))
	for i, p := range pts {
		v := pl.space(pl.part(p.q), p.z*pl.chord)
		xyz[i] = geometry.Vec3{X: quant(v.X), Y: quant(v.Y), Z: quant(v.Z)}
	}
	w := &writer{}
	nos := make([]int, len(pts))
	switch f.Format {
	case "csv", "blank", "tab", "semicolon":
		err = writeDelimited(w, pts, xyz, pl.dim, f, seed, num, nos)
	case "dxf-points", "dxf-polyline":
		err = writeDXF(w, pts, xyz, pl.dim, f, seed, num, nos)
	default:
		err = fmt.Errorf("scangen: file format %q", f.Format)
	}
	if err != nil {
		return nil, err
	}
	at := make([]int, len(pts)) // file index of each id
	for i, p := range pts {
		at[p.id] = i
	}
	tr.Lines = make([]Line, len(pts))
	for i, p := range pts {
		l := p.line
		l.No = nos[i]
		if p.src >= 0 {
			l.Of = nos[at[p.src]]
		}
		tr.Lines[i] = l
	}
	data := w.buf.Bytes()
	if f.CRLF {
		data = bytes.ReplaceAll(data, []byte("\n"), []byte("\r\n"))
	}
	if f.BOM {
		data = append([]byte("\xef\xbb\xbf"), data...)
	}
	return data, nil
}

// title is the first comment of every file: the data is invented.
func title(seed uint64) string {
	return fmt.Sprintf("invented section scan, scangen case %d (synthetic, not measured)", seed)
}

// writeDelimited writes delimited text: a title comment, the units (in a
// comment or the header), the header, and one point a line.
func writeDelimited(w *writer, pts []point, xyz []geometry.Vec3, dim int, f FileSpec, seed uint64, num func(float64) string, nos []int) error {
	sep := map[string]string{"csv": ",", "blank": " ", "tab": "\t", "semicolon": ";"}[f.Format]
	decComma := f.Format == "semicolon"
	if f.Title != "" {
		w.put(f.Title)
	}
	w.put("# " + title(seed))
	// Blank and comment lines between points fall where a pseudo-random
	// sequence of the seed puts them, so the bytes stay the same.
	breaks := rand.New(rand.NewPCG(seed, 0xb7ea))
	cols := []string{"x", "y"}
	if dim == 3 || f.Header == "idx" {
		cols = append(cols, "z")
	}
	switch f.Header {
	case "none", "":
		w.put("# units: " + f.Units)
	case "names":
		w.put("# units: " + f.Units)
		w.put(strings.Join(cols, sep))
	case "units":
		named := make([]string, len(cols))
		for i, c := range cols {
			named[i] = fmt.Sprintf("%s [%s]", c, f.Units)
		}
		w.put(strings.Join(named, sep))
	case "idx":
		w.put("# units: " + f.Units)
		w.put(strings.Join(append([]string{"idx"}, cols...), sep))
	case "point":
		w.put("# units: " + f.Units)
		w.put(strings.Join(append([]string{"point"}, cols...), sep))
	default:
		return fmt.Errorf("scangen: header %q", f.Header)
	}
	twoPass := len(pts) > 0 && anyPass(pts)
	if twoPass {
		w.put("# pass 1: upper surface, nose to tail")
	}
	for i, p := range pts {
		if p.pass {
			w.put("# pass 2: lower surface, nose to tail")
		}
		v := []float64{xyz[i].X, xyz[i].Y, xyz[i].Z}[:len(cols)]
		fields := make([]string, 0, 4)
		switch f.Header {
		case "idx":
			fields = append(fields, strconv.Itoa(i+1))
		case "point":
			fields = append(fields, strconv.Itoa(1001+i))
		}
		for _, c := range v {
			s := num(c)
			if decComma {
				s = strings.Replace(s, ".", ",", 1)
			}
			fields = append(fields, s)
		}
		line := strings.Join(fields, sep)
		if f.TrailingSep {
			line += sep
		}
		nos[i] = w.put(line)
		if f.Breaks > 0 && breaks.Float64() < f.Breaks {
			if breaks.IntN(2) == 0 {
				w.put("")
			} else {
				w.put("# probe re-seated")
			}
		}
	}
	return nil
}

func anyPass(pts []point) bool {
	for _, p := range pts {
		if p.pass {
			return true
		}
	}
	return false
}

// DXF $INSUNITS codes of the units.
var dxfUnits = map[string]int{"in": 1, "mm": 4, "m": 6}

// writeDXF writes an ASCII DXF file: a comment, the header with
// $INSUNITS, and the points as POINT entities or one LWPOLYLINE (closed
// by its flag unless the points repeat their first at the end).
func writeDXF(w *writer, pts []point, xyz []geometry.Vec3, dim int, f FileSpec, seed uint64, num func(float64) string, nos []int) error {
	pair := func(code int, v string) int {
		w.put(strconv.Itoa(code))
		return w.put(v)
	}
	pair(999, title(seed))
	pair(0, "SECTION")
	pair(2, "HEADER")
	pair(9, "$INSUNITS")
	pair(70, strconv.Itoa(dxfUnits[f.Units]))
	pair(0, "ENDSEC")
	pair(0, "SECTION")
	pair(2, "ENTITIES")
	switch f.Format {
	case "dxf-points":
		for i := range pts {
			pair(0, "POINT")
			pair(8, "0")
			nos[i] = pair(10, num(xyz[i].X))
			pair(20, num(xyz[i].Y))
			pair(30, num(xyz[i].Z))
		}
	case "dxf-polyline":
		if dim != 2 {
			return fmt.Errorf("scangen: a DXF polyline case must be 2D")
		}
		n := len(pts)
		closed := 1
		if n > 1 && pts[n-1].line.Kind == LineDuplicate && pts[n-1].src == 0 {
			closed = 0 // the repeated first point closes it
		}
		pair(0, "LWPOLYLINE")
		pair(8, "0")
		pair(90, strconv.Itoa(n))
		pair(70, strconv.Itoa(closed))
		for i := range pts {
			nos[i] = pair(10, num(xyz[i].X))
			pair(20, num(xyz[i].Y))
		}
	}
	pair(0, "ENDSEC")
	pair(0, "EOF")
	return nil
}
