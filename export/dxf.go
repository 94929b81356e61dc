package export

import (
	"bufio"
	"fmt"
	"io"
	"strconv"

	"github.com/foilwright/foilwright/geometry"
)

// Layers of the DXF exports.
const (
	LayerSection = "SECTION" // the closed polyline through the nodes
	LayerSpline  = "SPLINE"  // the cubic spline through the same nodes, and a blunt trailing edge's base
	LayerChord   = "CHORD"   // the chord line
	LayerDatum   = "DATUM"   // marks at the leading edge, the trailing edge and the quarter chord
)

// num formats v with the fewest digits that read back to exactly v, and
// never with an exponent (which some DXF readers refuse).
func num(v float64) string {
	if v == 0 {
		return "0" // also for −0
	}
	return strconv.FormatFloat(v, 'f', -1, 64)
}

// insUnits returns the DXF $INSUNITS code of u: 1 inches, 4 millimetres,
// 6 metres, 0 unitless (chord units).
func insUnits(u geometry.Unit) int {
	switch u {
	case geometry.Inch:
		return 1
	case geometry.Millimetre:
		return 4
	case geometry.Metre:
		return 6
	}
	return 0
}

// dxfWriter writes group-code / value pairs and keeps the first error.
type dxfWriter struct {
	w   *bufio.Writer
	err error
}

func (d *dxfWriter) pair(code int, value string) {
	if d.err == nil {
		_, d.err = fmt.Fprintf(d.w, "%3d\n%s\n", code, value)
	}
}

func (d *dxfWriter) int(code, v int) { d.pair(code, strconv.Itoa(v)) }

func (d *dxfWriter) float(code int, v float64) { d.pair(code, num(v)) }

func (d *dxfWriter) point(base int, p geometry.Vec3) {
	d.float(base, p.X)
	d.float(base+10, p.Y)
	d.float(base+20, p.Z)
}

// header writes the HEADER section (release 12, the unit and the extents)
// and the tables: line types and layers.
func (d *dxfWriter) header(u geometry.Unit, lo, hi geometry.Vec3, layers []dxfLayer) {
	d.pair(999, "written by foilwright")
	d.pair(0, "SECTION")
	d.pair(2, "HEADER")
	d.pair(9, "$ACADVER")
	d.pair(1, "AC1009")
	d.pair(9, "$INSUNITS")
	d.int(70, insUnits(u))
	d.pair(9, "$MEASUREMENT")
	if u == geometry.Inch {
		d.int(70, 0)
	} else {
		d.int(70, 1)
	}
	d.pair(9, "$EXTMIN")
	d.point(10, lo)
	d.pair(9, "$EXTMAX")
	d.point(10, hi)
	d.pair(0, "ENDSEC")

	d.pair(0, "SECTION")
	d.pair(2, "TABLES")
	d.pair(0, "TABLE")
	d.pair(2, "LTYPE")
	d.int(70, 2)
	d.pair(0, "LTYPE")
	d.pair(2, "CONTINUOUS")
	d.int(70, 0)
	d.pair(3, "Solid line")
	d.int(72, 65)
	d.int(73, 0)
	d.float(40, 0)
	d.pair(0, "LTYPE")
	d.pair(2, "DASHED")
	d.int(70, 0)
	d.pair(3, "Dashed __ __ __")
	d.int(72, 65)
	d.int(73, 2)
	d.float(40, 0.75)
	d.float(49, 0.5)
	d.float(49, -0.25)
	d.pair(0, "ENDTAB")
	d.pair(0, "TABLE")
	d.pair(2, "LAYER")
	d.int(70, len(layers))
	for _, l := range layers {
		d.pair(0, "LAYER")
		d.pair(2, l.name)
		d.int(70, 0)
		d.int(62, l.colour)
		d.pair(6, l.ltype)
	}
	d.pair(0, "ENDTAB")
	d.pair(0, "ENDSEC")
	d.pair(0, "SECTION")
	d.pair(2, "ENTITIES")
}

// dxfLayer is one layer of the LAYER table: name, colour number of the
// DXF palette and line type.
type dxfLayer struct {
	name   string
	colour int
	ltype  string
}

// sectionLayers are the layers of a section export.
var sectionLayers = []dxfLayer{
	{LayerSection, 7, "CONTINUOUS"}, // white (black on a light background)
	{LayerSpline, 5, "CONTINUOUS"},  // blue
	{LayerChord, 8, "DASHED"},       // grey
	{LayerDatum, 1, "CONTINUOUS"},   // red
}

// finish closes the ENTITIES section and the file.
func (d *dxfWriter) finish() error {
	d.pair(0, "ENDSEC")
	d.pair(0, "EOF")
	if d.err == nil {
		d.err = d.w.Flush()
	}
	return d.err
}

// polyline writes a POLYLINE with its VERTEX entities and SEQEND: a 3D
// polyline (flag 8) when threeD, closed (flag 1) when closed.
func (d *dxfWriter) polyline(layer string, pts []geometry.Vec3, closed, threeD bool) {
	flags, vflags := 0, 0
	if closed {
		flags |= 1
	}
	if threeD {
		flags |= 8
		vflags = 32
	}
	d.pair(0, "POLYLINE")
	d.pair(8, layer)
	d.int(66, 1)
	d.point(10, geometry.Vec3{})
	d.int(70, flags)
	for _, p := range pts {
		d.pair(0, "VERTEX")
		d.pair(8, layer)
		d.point(10, p)
		d.int(70, vflags)
	}
	d.pair(0, "SEQEND")
	d.pair(8, layer)
}

// spline writes a SPLINE entity through pts: its fit points, and the
// control points and knots of the interpolating cubic B-spline. normal is
// the normal of the plane the spline lies in.
func (d *dxfWriter) spline(layer string, pts []geometry.Vec3, normal geometry.Vec3) error {
	b, _, err := interpolate(pts)
	if err != nil {
		return err
	}
	d.pair(0, "SPLINE")
	d.pair(100, "AcDbEntity")
	d.pair(8, layer)
	d.pair(100, "AcDbSpline")
	d.point(210, normal)
	d.int(70, 8) // planar
	d.int(71, 3) // degree
	d.int(72, len(b.knots))
	d.int(73, len(b.ctrl))
	d.int(74, len(pts))
	d.float(42, 1e-10)
	d.float(43, 1e-10)
	d.float(44, 1e-10)
	for _, k := range b.knots {
		d.float(40, k)
	}
	for _, c := range b.ctrl {
		d.point(10, c)
	}
	for _, p := range pts {
		d.point(11, p)
	}
	return nil
}

func (d *dxfWriter) line(layer string, a, b geometry.Vec3) {
	d.pair(0, "LINE")
	d.pair(8, layer)
	d.point(10, a)
	d.point(11, b)
}

func (d *dxfWriter) pointEntity(layer string, p geometry.Vec3) {
	d.pair(0, "POINT")
	d.pair(8, layer)
	d.point(10, p)
}

func (d *dxfWriter) text(layer string, at geometry.Vec3, height float64, s string) {
	d.pair(0, "TEXT")
	d.pair(8, layer)
	d.point(10, at)
	d.float(40, height)
	d.pair(1, s)
}

// DXF writes p as an ASCII DXF file (see the package documentation): the
// closed polyline, the spline, the chord line and the datum marks, on
// their layers, in p's unit, in the coordinates of the section's plane
// (StationsDXF places sections in space). It returns the first error of
// w, and an error for nodes a spline cannot pass through.
func DXF(w io.Writer, p *Placed) error {
	flat := *p
	flat.Plane = nil // one section: in its own plane's coordinates
	p = &flat
	d := &dxfWriter{w: bufio.NewWriter(w)}
	pts := p.space(p.outline())
	lo, hi := extent(pts)
	d.header(p.Units, lo, hi, sectionLayers)
	if err := d.section(p, LayerSection, LayerSpline); err != nil {
		return err
	}
	d.line(LayerChord, p.In3D(p.LE), p.In3D(p.TE))
	mark := 0.02 * p.Chord
	for _, m := range []struct {
		at    geometry.Point
		label string
	}{{p.LE, "LE"}, {p.TE, "TE"}, {p.QuarterChord, "c/4"}} {
		d.datum(p, m.at, mark, m.label)
	}
	return d.finish()
}

// section writes the outline of p on layer poly (closed polyline) and on
// layer spl (a spline through the same nodes, closed by a line across a
// blunt trailing edge).
func (d *dxfWriter) section(p *Placed, poly, spl string) error {
	pts := p.space(p.outline())
	d.polyline(poly, pts, true, p.Plane != nil)
	all := p.space(p.Nodes)
	if err := d.spline(spl, all, p.normal()); err != nil {
		return err
	}
	if !p.Sharp {
		d.line(spl, all[len(all)-1], all[0])
	}
	return nil
}

// datum writes a cross of half-size s at q (in the section's plane), a
// POINT at its centre and, for a section in the drawing plane, its label
// (TEXT lies in its own coordinate system, which a section in space does
// not share).
func (d *dxfWriter) datum(p *Placed, q geometry.Point, s float64, label string) {
	dir := p.TE.Sub(p.LE).Scale(1 / p.TE.Dist(p.LE))
	nrm := geometry.Point{X: -dir.Y, Y: dir.X}
	d.line(LayerDatum, p.In3D(q.Sub(dir.Scale(s))), p.In3D(q.Add(dir.Scale(s))))
	d.line(LayerDatum, p.In3D(q.Sub(nrm.Scale(s))), p.In3D(q.Add(nrm.Scale(s))))
	d.pointEntity(LayerDatum, p.In3D(q))
	if p.Plane == nil {
		d.text(LayerDatum, p.In3D(q.Add(nrm.Scale(1.5*s)).Add(dir.Scale(0.5*s))), s, label)
	}
}

// space returns qs in space (see In3D).
func (p *Placed) space(qs []geometry.Point) []geometry.Vec3 {
	out := make([]geometry.Vec3, len(qs))
	for i, q := range qs {
		out[i] = p.In3D(q)
	}
	return out
}

// normal returns the normal of the section's plane.
func (p *Placed) normal() geometry.Vec3 {
	if p.Plane == nil {
		return geometry.Vec3{Z: 1}
	}
	n := p.Plane.N
	return geometry.Vec3{X: n[0], Y: n[1], Z: n[2]}
}

// extent returns the corners of the box round pts.
func extent(pts []geometry.Vec3) (lo, hi geometry.Vec3) {
	lo, hi = pts[0], pts[0]
	for _, q := range pts {
		lo = geometry.Vec3{X: min(lo.X, q.X), Y: min(lo.Y, q.Y), Z: min(lo.Z, q.Z)}
		hi = geometry.Vec3{X: max(hi.X, q.X), Y: max(hi.Y, q.Y), Z: max(hi.Z, q.Z)}
	}
	return lo, hi
}

// LayerEdges is the layer of the stations export's guide lines: 3D
// polylines through the leading edges and through the trailing-edge
// midpoints of the stations, in station order (guide rails for a loft).
const LayerEdges = "EDGES"

// StationLayer returns the layer of a station's polyline in the stations
// export: its name in capitals, with characters other than letters,
// digits, '-' and '_' replaced by '_'; its spline goes on the layer of
// that name followed by "-SPLINE".
func StationLayer(name string) string {
	var b []byte
	for _, r := range name {
		switch {
		case r >= 'a' && r <= 'z':
			b = append(b, byte(r-'a'+'A'))
		case r >= 'A' && r <= 'Z', r >= '0' && r <= '9', r == '-', r == '_':
			b = append(b, byte(r))
		default:
			b = append(b, '_')
		}
	}
	if len(b) == 0 {
		return "STATION"
	}
	return string(b)
}

// StationsDXF writes the stations of a blade in space for a CAD loft: for
// each station a closed 3D POLYLINE through its nodes on its own layer
// (StationLayer) and a SPLINE through the same nodes on that layer with
// "-SPLINE" appended (closed across a blunt trailing edge by a LINE), and
// the guide lines through the leading and trailing edges on layer
// LayerEdges. It returns an error for stations in different units, two
// stations on one layer, and the first error of w.
func StationsDXF(w io.Writer, sts []Station) error {
	if err := sameUnits(sts); err != nil {
		return err
	}
	var layers []dxfLayer
	seen := map[string]string{}
	var all []geometry.Vec3
	for k, st := range sts {
		name := StationLayer(st.Section.Name)
		if other, ok := seen[name]; ok {
			return fmt.Errorf("export: stations %q and %q share the layer %s", other, st.Section.Name, name)
		}
		seen[name] = st.Section.Name
		colour := 1 + k%6
		layers = append(layers, dxfLayer{name, colour, "CONTINUOUS"}, dxfLayer{name + "-SPLINE", colour, "CONTINUOUS"})
		all = append(all, st.Section.space(st.Section.Nodes)...)
	}
	layers = append(layers, dxfLayer{LayerEdges, 8, "DASHED"})
	d := &dxfWriter{w: bufio.NewWriter(w)}
	lo, hi := extent(all)
	d.header(sts[0].Section.Units, lo, hi, layers)
	var les, tes []geometry.Vec3
	for _, st := range sts {
		p := st.Section
		name := StationLayer(p.Name)
		pts := p.space(p.outline())
		d.polyline(name, pts, true, true)
		nodes := p.space(p.Nodes)
		if err := d.spline(name+"-SPLINE", nodes, p.normal()); err != nil {
			return fmt.Errorf("export: station %q: %w", p.Name, err)
		}
		if !p.Sharp {
			d.line(name+"-SPLINE", nodes[len(nodes)-1], nodes[0])
		}
		les, tes = append(les, p.In3D(p.LE)), append(tes, p.In3D(p.TE))
	}
	if len(sts) > 1 {
		d.polyline(LayerEdges, les, false, true)
		d.polyline(LayerEdges, tes, false, true)
	}
	return d.finish()
}
