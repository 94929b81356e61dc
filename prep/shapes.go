package prep

import (
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/frame"
	"github.com/foilwright/foilwright/geometry/props"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/plot"
	"github.com/foilwright/foilwright/repanel"
)

// NACA4Section returns the section document of foil with the given number
// of panels (foil.Nodes: cosine spacing in x on each surface, a node at the
// leading edge), with its panel summary but no properties yet (see
// NodeProperties).
func NACA4Section(foil shape.NACA4, panels int) *section.Section {
	nodes := foil.Nodes(panels)
	le := (panels + 1) / 2
	kind, thick := frame.TEBlunt, nodes[0].Dist(nodes[len(nodes)-1])
	if foil.SharpTE {
		kind, thick = frame.TESharp, 0
	}
	s := &section.Section{
		Format:       section.Format,
		Name:         "NACA " + foil.String(),
		Units:        geometry.ChordUnit,
		TrailingEdge: &section.TrailingEdge{Kind: kind, Thickness: thick, Action: frame.TEKept},
		LEIndex:      &le,
		Nodes:        nodes,
	}
	setPanels(s, repanel.LawCosine)
	return s
}

// KarmanTrefftzSection returns the section document of the Kármán–Trefftz
// section of circle centre c (mapping plane) and included trailing-edge
// angle teAngleDeg (degrees), normalised, with panels panels equally spaced
// in the circle angle and its panel summary, but no properties yet (see
// NodeProperties). It returns the error of shape.KarmanTrefftz.Normalized
// for a circle or an angle that gives no section.
func KarmanTrefftzSection(c geometry.Point, teAngleDeg float64, panels int) (*section.Section, error) {
	kt := shape.KarmanTrefftz{Centre: c, TEAngle: teAngleDeg * math.Pi / 180}
	nodes, err := kt.Normalized(panels)
	if err != nil {
		return nil, err
	}
	le := 0
	for i, p := range nodes {
		if p.Norm() < nodes[le].Norm() {
			le = i
		}
	}
	s := &section.Section{
		Format:       section.Format,
		Name:         fmt.Sprintf("Karman-Trefftz centre (%g, %g), TE angle %g deg", c.X, c.Y, teAngleDeg),
		Units:        geometry.ChordUnit,
		TrailingEdge: &section.TrailingEdge{Kind: frame.TESharp, Action: frame.TEKept},
		LEIndex:      &le,
		Nodes:        nodes,
	}
	setPanels(s, "circle-angle")
	return s, nil
}

// NodeProperties computes the properties of s from its nodes, through the
// interpolating spline of the nodes (curve.NodeCurve), records them in s,
// and returns the data of the section's picture.
func NodeProperties(s *section.Section) (plot.SectionData, error) {
	cv, sle, err := curve.NodeCurve(s.Nodes)
	if err != nil {
		return plot.SectionData{}, err
	}
	pr, camber, err := props.Compute(cv, sle, props.Options{})
	if err != nil {
		return plot.SectionData{}, err
	}
	docProps := section.Properties(pr.Properties)
	s.Properties = &docProps
	d := plot.SectionData{
		Name: s.Name, Nodes: s.Nodes, LECentre: pr.LECenter, LERadius: pr.LERadius,
		MaxThickness: geometry.Point{X: pr.ThicknessAt, Y: pr.Thickness},
		MaxCamber:    geometry.Point{X: pr.CamberAt, Y: pr.Camber},
	}
	for i, x := range camber.X {
		d.Camber = append(d.Camber, geometry.Point{X: x, Y: camber.Y[i]})
		d.Thickness = append(d.Thickness, geometry.Point{X: x, Y: camber.Thickness[i]})
	}
	return d, nil
}

// setPanels records the panel count, spacing law and quality of s.Nodes,
// and the quality warnings.
func setPanels(s *section.Section, spacing string) {
	q := repanel.Measure(s.Nodes)
	s.Panels = &section.PanelSummary{Count: len(s.Nodes) - 1, Spacing: spacing, MaxRatio: q.MaxRatio, MaxTurnDeg: q.MaxTurnDeg}
	s.Warnings = append(s.Warnings, q.Warnings...)
}
