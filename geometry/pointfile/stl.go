package pointfile

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/planar"
)

// STL binary layout (common practice): an 80-byte header, a little-endian
// uint32 facet count, then 50 bytes per facet: normal and three vertices as
// 12 float32 values and a 2-byte attribute.
const (
	stlHeader = 84
	stlFacet  = 50
)

// ReadSTL reads an ASCII or binary STL file from r, telling them apart by
// content. name is used in errors. A binary file that is not an STL mesh
// gives ErrNotSTL; one that ends before the facet count of its header says
// gives ErrTruncated; both in a *ParseError.
func ReadSTL(r io.Reader, name string) (*planar.Mesh, error) {
	data, err := readAll(r)
	if err != nil {
		return nil, &geometry.ParseError{File: name, Err: err}
	}
	return parseSTL(data, name)
}

// readSTLCut reads an STL mesh from data and cuts it with opts.Cut, which
// it must have.
func readSTLCut(data []byte, _, name string, opts Options) (*geometry.Cloud, statedUnit, error) {
	m, err := parseSTL(data, name)
	if err != nil {
		return nil, statedUnit{}, err
	}
	if opts.Cut == nil {
		return nil, statedUnit{}, fmt.Errorf("geometry: %s: an STL mesh needs a cut plane (e.g. \"z=240\") to give a section", name)
	}
	c, err := m.Slice(*opts.Cut)
	if err != nil {
		return nil, statedUnit{}, err
	}
	c.Format = FormatSTL
	return c, statedUnit{}, nil
}

// stlBinarySizeMatches reports whether data has exactly the size its
// binary STL header promises.
func stlBinarySizeMatches(data []byte) bool {
	if len(data) < stlHeader {
		return false
	}
	n := uint64(binary.LittleEndian.Uint32(data[80:84]))
	return stlHeader+stlFacet*n == uint64(len(data))
}

func parseSTL(data []byte, name string) (*planar.Mesh, error) {
	if len(bytes.TrimSpace(data)) == 0 {
		return nil, &geometry.ParseError{File: name, Err: geometry.ErrEmpty}
	}
	if stlBinarySizeMatches(data) || isBinary(data[:min(len(data), 1024)]) {
		return readSTLBinary(data, name)
	}
	s := asText(data)
	if t := strings.TrimLeft(s, " \t\r\n"); len(t) < 5 || !strings.EqualFold(t[:5], "solid") {
		return nil, &geometry.ParseError{File: name, Err: fmt.Errorf("%w: text that does not start with \"solid\"", ErrNotSTL)}
	}
	return readSTLText(s, name)
}

// stlWelder maps each distinct vertex to one index.
type stlWelder struct {
	m   *planar.Mesh
	ids map[geometry.Vec3]int
}

func (w *stlWelder) id(v geometry.Vec3) int {
	if k, ok := w.ids[v]; ok {
		return k
	}
	k := len(w.m.Vertices)
	w.m.Vertices = append(w.m.Vertices, v)
	w.ids[v] = k
	return k
}

// stlPlausible reports whether the facet record b looks like STL data:
// finite values, a normal of length at most about 1 (or zero) and
// coordinates below 1e18. Random bytes almost never pass for a whole facet.
func stlPlausible(b []byte) bool {
	var n2 float64
	for i := range 12 {
		v := float64(math.Float32frombits(binary.LittleEndian.Uint32(b[4*i:])))
		if math.IsNaN(v) || math.IsInf(v, 0) || math.Abs(v) > 1e18 {
			return false
		}
		if i < 3 {
			n2 += v * v
		}
	}
	return n2 <= 1.01
}

func readSTLBinary(data []byte, name string) (*planar.Mesh, error) {
	if len(data) < stlHeader {
		return nil, &geometry.ParseError{File: name, Err: fmt.Errorf("%w: %d bytes, fewer than the %d of a binary STL header", ErrTruncated, len(data), stlHeader)}
	}
	n := uint64(binary.LittleEndian.Uint32(data[80:84]))
	avail := uint64(len(data)-stlHeader) / stlFacet
	m := &planar.Mesh{File: name, Name: stlHeaderName(data[:80])}
	if uint64(len(data)) != stlHeader+stlFacet*n {
		// The size does not match the count: tell a cut-off or padded mesh
		// from data that is no mesh at all by what the facets hold.
		for i := range min(avail, max(n, 1)) {
			if !stlPlausible(data[stlHeader+stlFacet*i:]) {
				return nil, &geometry.ParseError{File: name, Err: fmt.Errorf("%w: binary data whose record %d is not a facet", ErrNotSTL, i+1)}
			}
		}
		switch {
		case n > 1e8:
			return nil, &geometry.ParseError{File: name, Err: fmt.Errorf("%w: binary data with an implausible facet count %d", ErrNotSTL, n)}
		case n > avail:
			return nil, &geometry.ParseError{File: name, Err: fmt.Errorf("%w: the header promises %d facet(s), the file holds %d (%d bytes)", ErrTruncated, n, avail, len(data))}
		}
		m.Notes = append(m.Notes, geometry.Note{Origin: geometry.Origin{File: name},
			Reason: fmt.Sprintf("%d byte(s) after the last of %d facets ignored", uint64(len(data))-stlHeader-stlFacet*n, n)})
	}
	w := stlWelder{m: m, ids: make(map[geometry.Vec3]int, n/2+1)}
	m.Facets = make([][3]int, 0, n)
	for i := range n {
		b := data[stlHeader+stlFacet*i+12:]
		var f [3]int
		for k := range 3 {
			var v [3]float64
			for j := range 3 {
				v[j] = float64(math.Float32frombits(binary.LittleEndian.Uint32(b[12*k+4*j:])))
				if math.IsNaN(v[j]) || math.IsInf(v[j], 0) {
					return nil, &geometry.ParseError{File: name, Err: fmt.Errorf("facet %d: %w", i+1, geometry.ErrNonFinite)}
				}
			}
			f[k] = w.id(geometry.Vec3{X: v[0], Y: v[1], Z: v[2]})
		}
		m.Facets = append(m.Facets, f)
	}
	return m, nil
}

// stlHeaderName returns the text of a binary header that starts with
// "solid ", trimmed, or "".
func stlHeaderName(h []byte) string {
	if !bytes.HasPrefix(h, []byte("solid ")) {
		return ""
	}
	h = h[6:]
	if i := bytes.IndexByte(h, 0); i >= 0 {
		h = h[:i]
	}
	for _, c := range h {
		if c < 0x20 || c > 0x7e {
			return ""
		}
	}
	return strings.TrimSpace(string(h))
}

// readSTLText reads the ASCII form: solid NAME, then facets of the form
// "facet normal nx ny nz / outer loop / vertex x y z (3 or more) / endloop
// / endfacet", then endsolid. A facet of more than three vertices is split
// into a fan of triangles.
func readSTLText(s, name string) (*planar.Mesh, error) {
	m := &planar.Mesh{File: name}
	w := stlWelder{m: m, ids: map[geometry.Vec3]int{}}
	lines := lineScanner{s: s}
	const (
		outside = iota // before solid or after endsolid
		inSolid
		inFacet
		inLoop
		loopDone
	)
	state := outside
	var verts []int
	facetLine, last := 0, 0
	perr := func(no int, err error) error { return &geometry.ParseError{File: name, Line: no, Err: err} }
	for {
		line, no, ok := lines.next()
		if !ok {
			break
		}
		f := strings.Fields(line)
		if len(f) == 0 {
			continue
		}
		last = no
		kw := strings.ToLower(f[0])
		switch {
		case kw == "solid" && state == outside:
			if m.Name == "" && len(f) > 1 {
				m.Name = geometry.Excerpt(strings.Join(f[1:], " "))
			}
			state = inSolid
		case kw == "endsolid" && state == inSolid:
			state = outside
		case kw == "facet" && state == inSolid:
			state, facetLine, verts = inFacet, no, verts[:0]
		case kw == "outer" && state == inFacet:
			state = inLoop
		case kw == "vertex" && state == inLoop:
			if len(f) != 4 {
				return nil, perr(no, fmt.Errorf("%w: vertex with %d coordinate(s), want 3", ErrColumnCount, len(f)-1))
			}
			var v [3]float64
			for j := range 3 {
				x, num := parseNumber(f[j+1], false)
				if !num {
					return nil, perr(no, fmt.Errorf("%w: %q", ErrNotNumeric, geometry.Excerpt(f[j+1])))
				}
				if math.IsNaN(x) || math.IsInf(x, 0) {
					return nil, perr(no, fmt.Errorf("%w: %q", geometry.ErrNonFinite, geometry.Excerpt(f[j+1])))
				}
				v[j] = x
			}
			verts = append(verts, w.id(geometry.Vec3{X: v[0], Y: v[1], Z: v[2]}))
		case kw == "endloop" && state == inLoop:
			if len(verts) < 3 {
				return nil, perr(no, fmt.Errorf("%w: facet with %d vertex(es), want 3", ErrFormat, len(verts)))
			}
			state = loopDone
		case kw == "endfacet" && state == loopDone:
			for k := 1; k+1 < len(verts); k++ {
				m.Facets = append(m.Facets, [3]int{verts[0], verts[k], verts[k+1]})
				m.Lines = append(m.Lines, facetLine)
			}
			state = inSolid
		default:
			return nil, perr(no, fmt.Errorf("%w: unexpected %q", ErrFormat, geometry.Excerpt(line)))
		}
	}
	if state != outside {
		return nil, perr(last, fmt.Errorf("%w: the file ends inside a solid (no endsolid)", ErrTruncated))
	}
	if m.Lines == nil {
		m.Lines = []int{}
	}
	return m, nil
}
