package prep

import (
	"errors"
	"fmt"
	"math"

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

// probeEndSpare is how far, in ball radii, the zone about the trailing
// edge whose points the cleaning of the ball's centres leaves to the
// end's models reaches beyond its own (clean.Options.EndSpare): the
// path's arc round the end, or round a base's corners, lies within a
// radius of the part's end and turns up to half a turn at the ball's
// radius or more, and a local fit across the few centres a coarse step
// leaves there calls them outliers (the independent check's ball class,
// seeds 5 and 124: the centres round a rounded end dropped, the end read
// blunt, the chord 0.2-0.7 mm short). Only the centres: the points moved
// from them are cleaned as any others.
const probeEndSpare = 2.0

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
	alt.Contour, alt.Clean, alt.alongFit, alt.moved = nil, nil, false, true
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
	alt.Contour, alt.Clean, alt.alongFit, alt.moved = nil, nil, false, true
	return &alt
}

// compensate fits the path of the ball's centre, the cleaned points cl, by
// a closed curve (a ball rolled round a part leaves a smooth path, with no
// corner: an arc of its own radius round each of the part's), runs the
// chain on the points moved r toward the part along that curve's normal
// (compensated), then once more on the points moved r toward their
// nearest point on that first estimate of the part (retargeted), which
// puts the centres on a corner's arc back on the corner where the path's
// normal, smoothed round the arc, had not; widens the bounds by how far
// that section, rolled round by the ball, misses the centres
// (widenForMisfit); and records the radius in the section document.
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
	widenForMisfit(q, misfitOf(q, cl.Contour, r))
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

// ballMisfit is how far the ball's centres sit from the distance r of a
// section's outline, beyond what their noise leaves: the error the
// compensation made where its estimate of the part does not roll the
// ball back through the centres measured (a centre left out of the
// section's points, or an end the section ends otherwise than the
// centres round it). Each centre the cleaning kept has a misfit, its
// distance from the outline (the fitted curve, and the straight base
// when open) less r. The excess of a centre is its misfit beyond
// misfitSigmas of the noise; of a run of misfitRun centres in order, the
// run's mean misfit beyond misfitSigmas of the mean's noise (a bias that
// a single centre's noise hides). aft, nose and all are the largest
// excess, input units, over the centres whose feet lie within endReach
// of the trailing edge, of the leading edge, and anywhere.
type ballMisfit struct {
	aft, nose, all float64
}

const (
	misfitRun    = 5
	misfitSigmas = 4.0
	endReach     = 0.1
	// misfitSurface is the coverage factor of the misfit in the surface's
	// bound: the misfit is the outline's error where a ball touched it,
	// and the outline between two contacts, which no centre sees, may be
	// off by more (a corner cut short, the join of a rounded end); set
	// on the exact ball paths of TestProbeRadiusCoverage and the
	// independent check's ball class (scripts/indep, --class ballr).
	misfitSurface = 2.0
)

// misfitOf returns the misfit of the centres of the contour cl, the
// cleaned ball centres, against the section q compensated from them
// with the ball's radius r.
func misfitOf(q *Preparation, cl *geometry.Contour, r float64) ballMisfit {
	cv, fr := q.Curve, q.Shape.Frame
	a, b := cv.End(), cv.Start()
	n := cl.Len()
	var m ballMisfit
	if n < misfitRun {
		return m
	}
	res := make([]float64, 0, n)
	xs := make([]float64, 0, n)
	gone := make(map[geometry.Origin]bool)
	for _, d := range q.Clean.Dropped {
		gone[d.Origin] = true
	}
	sigma := q.Fit.NoiseEstimate
	last := cv.Pieces() - 1
	k, u := 0, 0.0
	for i, c := range cl.Points {
		if gone[cl.Origins[i]] {
			continue // an outlier of the section's own cleaning
		}
		d := math.Inf(1)
		if i > 0 {
			// from the last centre's foot: the centres run in order
			k, u, d = cv.ProjectFrom(c, k, u)
		}
		if k == 0 || k == last || math.Abs(d-r) > misfitSigmas*sigma {
			// the first, one at an end of an open curve, where the
			// walk stops, or one the walk may have left on the wrong
			// surface: the nearest point anywhere
			s, ds := cv.Project(c)
			if ds < d {
				k, u = cv.Locate(s)
				d = ds
			}
		}
		foot, _, _ := cv.Eval(k, u)
		if a != b {
			if f := geometry.SegmentFoot(c, a, b); f.Dist(c) < d {
				d, foot = f.Dist(c), f
			}
		}
		res = append(res, d-r)
		xs = append(xs, fr.ToChord(foot).X)
	}
	note := func(e, x float64) {
		if e <= 0 {
			return
		}
		m.all = math.Max(m.all, e)
		if x > 1-endReach {
			m.aft = math.Max(m.aft, e)
		}
		if x < endReach {
			m.nose = math.Max(m.nose, e)
		}
	}
	n = len(res)
	if n < misfitRun {
		return m
	}
	for i := range res {
		note(math.Abs(res[i])-misfitSigmas*sigma, xs[i])
		var sum, x float64
		for j := range misfitRun {
			k := (i + j) % n
			sum += res[k]
			x += xs[k]
		}
		note(math.Abs(sum)/misfitRun-misfitSigmas*sigma/math.Sqrt(misfitRun), x/misfitRun)
	}
	return m
}

// widenForMisfit adds the compensation's misfit m to the bounds of q: a
// centre the section leaves farther or nearer than the ball's radius says
// the outline there is off by that much along the centre's line to it,
// so the chord's bound takes in the aft excess (an end placed short or
// long), the leading edge's the nose's, the twist's the aft excess over
// the chord, and the surface's the largest anywhere.
func widenForMisfit(q *Preparation, m ballMisfit) {
	c := q.Shape.Frame.Chord
	if !(c > 0) || m == (ballMisfit{}) {
		return
	}
	u := &q.Uncertainty
	u.Chord += m.aft
	u.LE += m.nose
	u.TwistDeg += math.Atan(m.aft/c) * 180 / math.Pi
	u.Surface += misfitSurface * m.all / c
	u.Shape += misfitSurface * m.all / c
	if d := q.Section.Uncertainty; d != nil {
		d.Chord, d.TwistDeg, d.LE, d.Surface = u.Chord, u.TwistDeg, u.LE, u.Surface
	}
}
