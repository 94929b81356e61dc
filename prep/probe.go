package prep

import (
	"errors"
	"fmt"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
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
// closed curve cv fitted to it: the normal at the point's foot for a kept
// point (fit.S), at the nearest point of the curve for a point the
// cleaning left out (an outlier stays one r nearer the part). It also
// returns the smallest radius of a convex bend of the path under a quarter
// of the ball's: a ball's centre rounds every convex feature of the part
// at r or more (a sharp corner at exactly r), so a path bending tighter
// was not traced by a ball of that radius, and the inner parallel folds
// there; 0 when there is none.
func (cl *Cleaned) compensated(cv *curve.Curve, fit *curve.FitReport, r float64) (*Cleaned, float64) {
	sign := 1.0 // Curve.Normal points out of a counter-clockwise loop
	if cv.AreaIntegrals().A < 0 {
		sign = -1
	}
	outward := func(s float64) geometry.Point { return cv.Normal(s).Scale(sign) }
	feet := feetOf(cl.Contour, fit)
	tight := 0.0
	src := cl.cloud
	moved := *src
	moved.Points = make([]geometry.Vec3, len(src.Points))
	for i, q := range src.Points {
		p := geometry.Point{X: q.X, Y: q.Y}
		o := src.Origins[i]
		s, ok := feet[o]
		if !ok {
			s, _ = cv.Project(p)
		}
		// Convex (the loop turning in its own sense) tighter than the
		// ball allows, with room for a closed fit's overshoot round a
		// corner's arc sampled by a few points (down to 0.3 r on the
		// independent check's ball centres; our margin).
		if k := cv.Curvature(s) * sign; k > 0 && 1/k < r/4 && (tight == 0 || 1/k < tight) {
			tight = 1 / k
		}
		p = p.Sub(outward(s).Scale(r))
		moved.Points[i] = geometry.Vec3{X: p.X, Y: p.Y, Z: q.Z}
	}
	alt := *cl
	alt.cloud = &moved
	alt.Contour, alt.Clean, alt.alongFit = nil, nil, false
	return &alt, tight
}

// retargeted returns a copy of cl, not yet cleaned, whose planar cloud has
// every point the section q kept moved r toward its nearest point on q's
// outline: the contact point of a ball centred there, when q is the part
// (the nearest point of a part to a ball's centre is where it touches).
// A point's nearest point is taken at its compensated position's foot on
// q (fit.S; on the straight base for a base point), which a centre near a
// corner of q shares with the corner itself; a point q left out is
// projected on q's outline.
func (cl *Cleaned) retargeted(q *Preparation, prev *geometry.Cloud, r float64) *Cleaned {
	cv, fit := q.Curve, q.Fit
	a, b := cv.End(), cv.Start() // the straight base, when open
	onBase := make(map[geometry.Origin]bool, len(fit.Base))
	for _, o := range fit.Base {
		onBase[o] = true
	}
	feet := feetOf(q.Contour, fit)
	src := cl.cloud
	moved := *prev
	moved.Points = make([]geometry.Vec3, len(prev.Points))
	copy(moved.Points, prev.Points)
	for i, c := range src.Points {
		o := src.Origins[i]
		centre := geometry.Point{X: c.X, Y: c.Y}
		var foot geometry.Point
		if s, ok := feet[o]; ok {
			foot = cv.At(s)
			if onBase[o] {
				foot = geometry.SegmentFoot(centre, a, b)
			}
		} else {
			// A point q left out (an outlier there, or a merged
			// duplicate): its nearest point on q's outline, the curve or
			// the straight base. The centres round a corner q cut short
			// are still nearest to its end, and come back beyond it.
			s, d := cv.Project(centre)
			foot = cv.At(s)
			if f := geometry.SegmentFoot(centre, a, b); a != b && f.Dist(centre) < d {
				foot = f
			}
		}
		d := centre.Sub(foot)
		if n := d.Norm(); n > 0 {
			p := centre.Sub(d.Scale(r / n))
			moved.Points[i] = geometry.Vec3{X: p.X, Y: p.Y, Z: c.Z}
		}
	}
	alt := *cl
	alt.cloud = &moved
	alt.Contour, alt.Clean, alt.alongFit = nil, nil, false
	return &alt
}

// compensate fits the path of the ball's centre, the cleaned points cl, by
// a closed curve (a ball rolled round a part leaves a smooth path, with no
// corner: an arc of its own radius round each of the part's), runs the
// chain on the points moved r toward the part along that curve's normal
// (compensated), then once more on the points moved r toward their
// nearest point on that first estimate of the part (retargeted), which
// puts the centres on a corner's arc back on the corner where the path's
// normal, smoothed round the arc, had not; and records the radius in the
// section document.
func compensate(name string, cl *Cleaned, s Settings, r float64) (*Preparation, error) {
	where := fmt.Sprintf("the path of the probe ball's centre (radius %s)", LengthText(r, cl.Units))
	fo, err := fitOptions(cl, s)
	if err != nil {
		return nil, err
	}
	fo.Ends = curve.FitEndsClosed
	var path Preparation
	cv, rep, err := curve.Fit(cl.Contour, fo)
	if err := path.finishFit(cl, s, cv, rep, err); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	alt, tight := cl.compensated(path.Curve, path.Fit, r)
	where = fmt.Sprintf("after moving the points %s toward the part (probe radius)", LengthText(r, cl.Units))
	if err := alt.clean(s, ""); err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	q, err := prepareCleaned(name, alt, s)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	if again := cl.retargeted(q, alt.cloud, r); again.clean(s, "") == nil {
		if q2, err := prepareCleaned(name, again, s); err == nil {
			q = q2
		}
	}
	q.Section.Source.ProbeRadius = r
	if tight > 0 {
		q.Section.Warnings = append(q.Section.Warnings, fmt.Sprintf("the points bend with a radius of %s, under a quarter of the probe ball's %s, where a ball's centre rounds every corner, and the end, at its own radius or more: check that they are ball centres, not points already compensated, and the radius", LengthText(tight, cl.Units), LengthText(r, cl.Units)))
	}
	return q, nil
}

// feetOf maps each point of the contour fitted by fit to the arc length of
// its foot on the curve (FitReport.S).
func feetOf(c *geometry.Contour, fit *curve.FitReport) map[geometry.Origin]float64 {
	feet := make(map[geometry.Origin]float64, c.Len())
	for i, o := range c.Origins {
		if i < len(fit.S) {
			feet[o] = fit.S[i]
		}
	}
	return feet
}
