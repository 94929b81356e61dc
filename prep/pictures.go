package prep

import (
	"fmt"
	"path/filepath"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/plot"
)

// PrepData returns the data of the preparation plots: the kept points, the
// dropped outliers and strays with their source lines, the fitted curve and
// every point's deviation, in input (or plane) coordinates.
func (p *Preparation) PrepData() plot.PrepData {
	d := plot.PrepData{
		Name:      p.Section.Name,
		Units:     string(p.Section.Units),
		Measured:  p.Contour.Points,
		Curve:     p.Curve.Samples(2000),
		S:         p.Fit.S,
		Residual:  p.Fit.Residual,
		Tolerance: p.Fit.Tolerance,
		LE:        geometry.Point{X: p.Section.Frame.LE[0], Y: p.Section.Frame.LE[1]},
		TE:        p.Shape.Frame.ToPart(geometry.Point{X: 1}),
	}
	for _, dr := range p.Clean.Dropped {
		if dr.Kept {
			continue
		}
		at := dr.Origin
		at.File = filepath.Base(at.File)
		d.Dropped = append(d.Dropped, plot.DroppedPoint{At: dr.Point, Label: at.String(), Reason: dr.Reason})
	}
	return d
}

// PlotData returns the data of the contour picture of a cleaned section:
// the ordered points joined in order, the dropped points with their source
// lines, the provisional trailing edge (the first point) and leading edge
// (the point farthest from it).
func (c *Cleaned) PlotData() plot.PrepData {
	pts := c.Contour.Points
	d := plot.PrepData{Units: string(c.Units), Measured: pts, CurveLabel: "ordered contour"}
	if len(c.Files) > 0 {
		d.Name = filepath.Base(c.Files[0])
	}
	d.Curve = append(append([]geometry.Point(nil), pts...), pts[0])
	d.TE, d.LE = pts[0], pts[0]
	for _, p := range pts {
		if p.Dist(d.TE) > d.LE.Dist(d.TE) {
			d.LE = p
		}
	}
	for _, dr := range c.Clean.Dropped {
		if !dr.Kept {
			at := dr.Origin
			at.File = filepath.Base(at.File)
			d.Dropped = append(d.Dropped, plot.DroppedPoint{At: dr.Point, Label: at.String(), Reason: dr.Reason})
		}
	}
	return d
}

// SectionData returns the data of the section plot: nodes, camber line,
// thickness distribution and leading-edge circle, in chord units.
func (p *Preparation) SectionData() plot.SectionData {
	d := plot.SectionData{
		Name:         p.Section.Name,
		Nodes:        p.Section.Nodes,
		LECentre:     p.Props.LECenter,
		LERadius:     p.Props.LERadius,
		MaxThickness: geometry.Point{X: p.Props.ThicknessAt, Y: p.Props.Thickness},
		MaxCamber:    geometry.Point{X: p.Props.CamberAt, Y: p.Props.Camber},
	}
	if c := p.Camber; c != nil {
		for i, x := range c.X {
			d.Camber = append(d.Camber, geometry.Point{X: x, Y: c.Y[i]})
			if i < len(c.Thickness) {
				d.Thickness = append(d.Thickness, geometry.Point{X: x, Y: c.Thickness[i]})
			}
		}
	}
	return d
}

// PrepFigures draws the four pictures of a preparation, by name: "prep"
// (points against the fitted curve, with the edges magnified), "deviation",
// "nodes" and "section".
func (p *Preparation) PrepFigures() (map[string]*plot.Figure, error) {
	d := p.PrepData()
	out := map[string]*plot.Figure{}
	var err error
	if out["prep"], err = plot.PrepPlot(d); err != nil {
		return nil, fmt.Errorf("prep plot: %w", err)
	}
	if out["deviation"], err = plot.DeviationPlot(d); err != nil {
		return nil, fmt.Errorf("deviation plot: %w", err)
	}
	if out["nodes"], err = plot.NodesPlot(p.Section.Nodes); err != nil {
		return nil, fmt.Errorf("nodes plot: %w", err)
	}
	if out["section"], err = plot.SectionPlot(p.SectionData()); err != nil {
		return nil, fmt.Errorf("section plot: %w", err)
	}
	return out, nil
}

// PlotNames are the names of the preparation pictures, in the order they
// are written.
var PlotNames = []string{"prep", "deviation", "nodes", "section"}

// SiblingPath returns the path of the preparation picture called name
// beside path: path itself for "prep", else path with "-name" before its
// extension.
func SiblingPath(path, name string) string { return plot.Beside(path, "prep", name) }
