package compare

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/plot"
)

// Pictures of a comparison, by name: the design's outline with the
// deviations drawn magnified along their directions, the deviation along
// the outline with the tolerance bands, and ΔCp along the chord (when the
// aerodynamic comparison ran).
const (
	PictureOutline   = "compare"
	PictureDeviation = "deviation"
	PictureDeltaCp   = "dcp"
)

// PictureNames lists the pictures in the order they are written.
var PictureNames = []string{PictureOutline, PictureDeviation, PictureDeltaCp}

// SiblingPath returns the path of the picture called name beside the
// main picture at path: path itself for the outline, else path with
// "-name" before its extension (cmp.svg, cmp-deviation.svg, cmp-dcp.svg).
func SiblingPath(path, name string) string { return plot.Beside(path, PictureOutline, name) }

// PictureData returns what the outline and deviation pictures draw,
// magnified by magnify on the outline (0 chooses a round factor).
func (c *Comparison) PictureData(magnify float64) plot.CompareData {
	o := c.Design.Outline
	cv := o.Curve()
	design := cv.Samples(4 * cv.Pieces())
	if o.base {
		design = append(design, cv.Start())
	}
	d := plot.CompareData{
		Name: c.Measurement.Name, Units: string(c.Measurement.Units), Design: design,
		LE:      geometry.Point{X: c.Design.Frame.LE[0], Y: c.Design.Frame.LE[1]},
		TE:      c.Design.Frame.ToPart(geometry.Point{X: 1}),
		Magnify: magnify,
		SLE:     o.position(o.leI, o.leU),
	}
	for _, p := range c.Points {
		d.Feet = append(d.Feet, p.Foot)
		d.Normals = append(d.Normals, p.Normal)
		d.Deviation = append(d.Deviation, p.Deviation)
		d.In = append(d.In, p.In)
		d.S = append(d.S, p.Position)
		lo, hi := math.NaN(), math.NaN()
		if p.Band != nil {
			lo, hi = -p.Band.Minus, p.Band.Plus
		}
		d.Lower, d.Upper = append(d.Lower, lo), append(d.Upper, hi)
	}
	return d
}

// Figures draws the pictures of the comparison, by name (PictureNames);
// ΔCp only when the aerodynamic comparison ran and gave one.
func (c *Comparison) Figures(magnify float64) (map[string]*plot.Figure, error) {
	data := c.PictureData(magnify)
	out := map[string]*plot.Figure{}
	f, err := plot.CompareOutlinePlot(data)
	if err != nil {
		return nil, err
	}
	out[PictureOutline] = f
	if f, err = plot.CompareDeviationPlot(data); err != nil {
		return nil, err
	}
	out[PictureDeviation] = f
	if cp := c.Cp; cp != nil && cp.Delta != nil {
		dd := plot.DeltaCpData{Name: c.Measurement.Name, Method: cp.Stage, AlphaDeg: cp.AlphaDeg}
		for _, q := range cp.Design {
			dd.Design = append(dd.Design, geometry.Point{X: q.X, Y: q.Cp})
		}
		for _, q := range cp.Measured {
			dd.Measured = append(dd.Measured, geometry.Point{X: q.X, Y: q.Cp})
		}
		for _, q := range cp.Delta.Upper {
			dd.Upper = append(dd.Upper, geometry.Point{X: q[0], Y: q[1]})
		}
		for _, q := range cp.Delta.Lower {
			dd.Lower = append(dd.Lower, geometry.Point{X: q[0], Y: q[1]})
		}
		if f, err = plot.DeltaCpPlot(dd); err != nil {
			return nil, err
		}
		out[PictureDeltaCp] = f
	}
	return out, nil
}
