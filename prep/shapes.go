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

// NACA4Section returns the section document of foil with po.Panels panels
// (foil.Nodes: cosine spacing in x on each surface, a node at the leading
// edge), or, for po.Panels 0, the fewest panels whose deviation from the
// exact surfaces is at most po.Tolerance (see repanel.Count), with its
// panel summary but no properties yet (see NodeProperties). It returns an
// error for a panel count or tolerance out of range.
func NACA4Section(foil shape.NACA4, po repanel.Options) (*section.Section, error) {
	dev := func(n int) (float64, error) {
		up, lo := (n+1)/2, n/2
		// Node i < up is at the upper station up − i, node i ≥ up at the
		// lower station i − up; the exact surface between them follows
		// the cosine law at fractional indexes.
		station := func(k float64, m int) float64 { return (1 - math.Cos(math.Pi*k/float64(m))) / 2 }
		d, _ := repanel.PolygonDeviation(foil.Nodes(n), func(i int, f float64) geometry.Point {
			if i < up {
				return foil.Upper(station(float64(up-i)-f, up))
			}
			return foil.Lower(station(float64(i-up)+f, lo))
		})
		return d, nil
	}
	panels, deviation, target, err := shapePanels(po, dev)
	if err != nil {
		return nil, err
	}
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
	setPanels(s, repanel.LawCosine, deviation, target)
	return s, nil
}

// shapePanels returns the panel count of an analytic shape, its deviation
// from the exact curve (dev), and the target it was chosen for (0 when
// po.Panels gives the count).
func shapePanels(po repanel.Options, dev func(n int) (float64, error)) (n int, deviation, target float64, err error) {
	if po.Panels != 0 {
		if po.Panels < repanel.MinPanels || po.Panels > repanel.MaxPanels {
			return 0, 0, 0, fmt.Errorf("%w: %d, want %d..%d", repanel.ErrPanelCount, po.Panels, repanel.MinPanels, repanel.MaxPanels)
		}
		d, err := dev(po.Panels)
		return po.Panels, d, 0, err
	}
	target = po.Tolerance
	if target == 0 {
		target = repanel.DefaultTolerance
	}
	n, deviation, _, err = repanel.Count(repanel.AutoMinPanels, repanel.AutoMaxPanels, target, dev)
	return n, deviation, target, err
}

// KarmanTrefftzSection returns the section document of the Kármán–Trefftz
// section of circle centre c (mapping plane) and included trailing-edge
// angle teAngleDeg (degrees), normalised, with po.Panels panels equally
// spaced in the circle angle (for po.Panels 0, the fewest whose deviation
// from the exact section is at most po.Tolerance) and its panel summary,
// but no properties yet (see NodeProperties). It returns the error of
// shape.KarmanTrefftz.Normalized for a circle or an angle that gives no
// section, and an error for a panel count or tolerance out of range.
func KarmanTrefftzSection(c geometry.Point, teAngleDeg float64, po repanel.Options) (*section.Section, error) {
	kt := shape.KarmanTrefftz{Centre: c, TEAngle: teAngleDeg * math.Pi / 180}
	dev := func(n int) (float64, error) {
		// The nodes of 8n panels equally spaced in the circle angle hold
		// those of n and the exact points between them.
		fine, err := kt.Normalized(repanel.DeviationSamples * n)
		if err != nil {
			return 0, err
		}
		nodes := make([]geometry.Point, n+1)
		for i := range nodes {
			nodes[i] = fine[repanel.DeviationSamples*i]
		}
		d, _ := repanel.PolygonDeviation(nodes, func(i int, f float64) geometry.Point {
			return fine[repanel.DeviationSamples*i+int(math.Round(f*repanel.DeviationSamples))]
		})
		return d, nil
	}
	if _, err := kt.Normalized(repanel.MinPanels); err != nil {
		return nil, err
	}
	panels, deviation, target, err := shapePanels(po, dev)
	if err != nil {
		return nil, err
	}
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
	setPanels(s, "circle-angle", deviation, target)
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

// setPanels records the panel count, spacing law, quality and deviation
// of s.Nodes (with the target it was chosen for, or 0), and the quality
// warnings.
func setPanels(s *section.Section, spacing string, deviation, target float64) {
	q := repanel.Measure(s.Nodes)
	s.Panels = &section.PanelSummary{Count: len(s.Nodes) - 1, Spacing: spacing, MaxRatio: q.MaxRatio, MaxTurnDeg: q.MaxTurnDeg,
		Deviation: deviation, Target: target}
	s.Warnings = append(s.Warnings, q.Warnings...)
}
