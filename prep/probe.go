package prep

import (
	"errors"
	"fmt"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/frame"
)

// A coordinate measuring machine that reports the centre of its probe ball
// gives points on the path the centre takes round the part: the part's
// outline offset outward by the ball's radius (common practice: the
// "probe radius compensation" of a CMM's own software, done here when the
// export skipped it). The path is a parallel curve of the outline, so the
// outline is the path's inner parallel at the same distance, each point
// moved by the radius along the path's normal at its foot: a sharp
// trailing edge, round which the ball swings on an arc of that radius,
// comes back to its corner, and a nose of radius ρ, traced at ρ + r,
// comes back to ρ.

// ErrProbeRadius reports a probe radius the settings cannot take.
var ErrProbeRadius = errors.New("probe radius")

// probeRadius returns the probe ball radius of the settings in the
// input's units, 0 when none is set.
func probeRadius(s Settings, units geometry.Unit) (float64, error) {
	if s.ProbeRadius == "" {
		return 0, nil
	}
	l, err := geometry.ParseLength(s.ProbeRadius)
	if err == nil && l.Unit == geometry.ChordUnit {
		err = errors.New("a ball's radius is a length on the part, not a share of the chord")
	}
	if err == nil {
		l, err = l.For(units)
	}
	if err == nil && (l.Value < 0 || l.Value != l.Value) {
		err = fmt.Errorf("%s is negative", s.ProbeRadius)
	}
	if err != nil {
		return 0, fmt.Errorf("%w %q: %v", ErrProbeRadius, s.ProbeRadius, err)
	}
	return l.Value, nil
}

// compensated returns a copy of cl, not yet cleaned, whose planar cloud has
// every point moved r toward the part along the outward normal of the
// outline fitted to it: the normal at the point's foot for a kept point
// (fit.S), the straight base's normal for a point on a blunt base, and the
// normal at the nearest point of the curve for a point the cleaning left
// out (an outlier stays one r nearer the part). It also returns the
// smallest radius of a convex bend of the path under half the ball's: a
// ball's centre rounds every convex feature of the part at r or more (a
// sharp corner at exactly r), so a path bending tighter was not traced by
// a ball of that radius, and the inner parallel folds there; 0 when there
// is none.
func (cl *Cleaned) compensated(cv *curve.Curve, fit *curve.FitReport, r float64) (*Cleaned, float64) {
	sign := 1.0 // Curve.Normal points out of a counter-clockwise loop
	if cv.AreaIntegrals().A < 0 {
		sign = -1
	}
	outward := func(s float64) geometry.Point { return cv.Normal(s).Scale(sign) }
	// The straight base between the curve's ends closes the loop from
	// End to Start; its outward normal follows the same rule.
	var baseOut geometry.Point
	if d := cv.Start().Sub(cv.End()); d.Norm() > 0 {
		d = d.Scale(1 / d.Norm())
		baseOut = geometry.Point{X: d.Y, Y: -d.X}.Scale(sign)
	}
	onBase := make(map[geometry.Origin]bool, len(fit.Base))
	for _, o := range fit.Base {
		onBase[o] = true
	}
	feet := make(map[geometry.Origin]float64, cl.Contour.Len())
	for i, o := range cl.Contour.Origins {
		if i < len(fit.S) {
			feet[o] = fit.S[i]
		}
	}
	tight := 0.0
	src := cl.cloud
	moved := *src
	moved.Points = make([]geometry.Vec3, len(src.Points))
	for i, q := range src.Points {
		p := geometry.Point{X: q.X, Y: q.Y}
		o := src.Origins[i]
		var n geometry.Point
		if onBase[o] && baseOut != (geometry.Point{}) {
			n = baseOut
		} else {
			s, ok := feet[o]
			if !ok {
				s, _ = cv.Project(p)
			}
			n = outward(s)
			// Convex (the loop turning in its own sense) tighter than
			// the ball allows, with room for a fit's error at a corner's
			// arc.
			if k := cv.Curvature(s) * sign; k > 0 && 1/k < r/2 && (tight == 0 || 1/k < tight) {
				tight = 1 / k
			}
		}
		p = p.Sub(n.Scale(r))
		moved.Points[i] = geometry.Vec3{X: p.X, Y: p.Y, Z: q.Z}
	}
	alt := *cl
	alt.cloud = &moved
	alt.Contour, alt.Clean, alt.alongFit = nil, nil, false
	return &alt, tight
}

// compensate runs the chain again on the points of cl moved r toward the
// part (compensated) by the outline p fitted to the ball centres, and
// records the radius in the section document.
func compensate(name string, cl *Cleaned, p *Preparation, s Settings, r float64) (*Preparation, error) {
	alt, tight := cl.compensated(p.Curve, p.Fit, r)
	where := fmt.Sprintf("after moving the points %s toward the part (probe radius)", LengthText(r, cl.Units))
	if err := alt.clean(s, ""); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	q, err := prepareCleaned(name, alt, s)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	q.Section.Source.ProbeRadius = r
	// Round the thin end the ball touches both surfaces in turn, and its
	// centres pass a diameter apart or more: an end the centres close
	// thinner than that (allowing the fit's error) was not traced by it.
	te := p.Section.TrailingEdge
	if thick := te.Thickness * p.Shape.Frame.Chord; te.Kind == frame.TESharp || thick < 0.8*2*r {
		q.Section.Warnings = append(q.Section.Warnings, fmt.Sprintf("the points end %s thick at the trailing edge (%s), under the probe ball's diameter %s, where a ball's centres pass a diameter apart or more: check that they are ball centres, not points already compensated, and the radius", LengthText(thick, cl.Units), te.Kind, LengthText(2*r, cl.Units)))
	}
	if tight > 0 {
		q.Section.Warnings = append(q.Section.Warnings, fmt.Sprintf("the points bend with a radius of %s, under half the probe ball's %s, where a ball's centre rounds every corner at its own radius or more: check the probe radius, and the points there", LengthText(tight, cl.Units), LengthText(r, cl.Units)))
	}
	return q, nil
}
