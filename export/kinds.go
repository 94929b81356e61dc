package export

import (
	"fmt"
	"io"

	"github.com/foilwright/foilwright/internal/enum"
)

// Kinds of export, as named by the export command's --to and the
// pipeline file's outputs.exports.
const (
	KindDXF      = "dxf"
	KindSVG      = "svg"
	KindCSV      = "csv"
	KindGeo      = "geo"
	KindPolarCSV = "polar-csv"
	KindCpCSV    = "cp-csv"
)

// kinds is the one list of the exports of one section: the name, what it
// writes and the file name a run folder gives it.
var kinds = []struct {
	name, doc, file string
	results         bool // made from the stages' results, not the geometry
}{
	{KindDXF, "DXF for CAD: polyline, spline, chord line and datum marks on their layers", "section.dxf", false},
	{KindSVG, "SVG template at 1:1 with a scale bar and the chord line", "template.svg", false},
	{KindCSV, "CSV of the nodes, x,y", "section.csv", false},
	{KindGeo, "Gmsh geometry script: the section as splines, a far-field circle, mesh sizes", "section.geo", false},
	{KindPolarCSV, "CSV of Cl and Cm against alpha, one row per angle per stage", "polars.csv", true},
	{KindCpCSV, "CSV of x, y and Cp, one row per node per angle per stage", "cp.csv", true},
}

// Kinds returns the kinds of export of one section, with what each writes,
// in the order help texts give them.
func Kinds() []enum.Choice {
	out := make([]enum.Choice, len(kinds))
	for i, k := range kinds {
		out[i] = enum.Choice{Name: k.name, Doc: k.doc}
	}
	return out
}

// StationKinds returns the kinds of the stations export of a blade.
func StationKinds() []enum.Choice {
	return []enum.Choice{
		{Name: KindDXF, Doc: "DXF: a 3D polyline and a spline per station, guide lines through the edges"},
		{Name: KindCSV, Doc: "CSV: x,y,z,station, one block per station"},
	}
}

// FromResults reports whether kind is made from the stages' results.
func FromResults(kind string) bool {
	for _, k := range kinds {
		if k.name == kind {
			return k.results
		}
	}
	return false
}

// FileName returns the file name a run folder gives the export kind, or
// "" for an unknown kind.
func FileName(kind string) string {
	for _, k := range kinds {
		if k.name == kind {
			return k.file
		}
	}
	return ""
}

// Options are the options of the geometric exports.
type Options struct {
	Geo GeoOptions
}

// Write writes p as the geometric export kind (dxf, svg, csv or geo). It
// returns an error for another kind and the errors of the writer.
func Write(w io.Writer, kind string, p *Placed, o Options) error {
	switch kind {
	case KindDXF:
		return DXF(w, p)
	case KindSVG:
		return SVG(w, p)
	case KindCSV:
		return CSV(w, p)
	case KindGeo:
		return Geo(w, p, o.Geo)
	}
	return fmt.Errorf("export: %q is not a geometric export (want %s)", kind, enum.Or(KindDXF, KindSVG, KindCSV, KindGeo))
}
