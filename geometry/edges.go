package geometry

import (
	"errors"
	"fmt"
	"math"

	"github.com/foilwright/foilwright/internal/numeric"
)

// Trailing-edge kinds (TrailingEdge.Kind).
const (
	TESharp   = "sharp"   // the surfaces meet in a corner
	TEBlunt   = "blunt"   // a straight base of some thickness joins the surfaces
	TERounded = "rounded" // a small-radius, nose-like end
	TEOpen    = "open"    // the ends do not meet and no base joins them
)

// Trailing-edge treatments (EdgeOptions.TE) and what was done
// (TrailingEdge.Action).
const (
	TEAuto      = "auto"    // keep every edge as found (see EdgeOptions.TE)
	TEKeep      = "keep"    // leave the edge as it is
	TEClose     = "close"   // close a blunt edge by blending its thickness away
	TESharpen   = "sharpen" // extend both surfaces to their intersection
	TEKept      = "kept"
	TEClosed    = "closed"
	TESharpened = "sharpened"
)

// Mirror modes (EdgeOptions.Mirror).
const (
	MirrorAuto = "auto" // decide from the sign of the camber
	MirrorYes  = "yes"
	MirrorNo   = "no"
)

// Tolerances of the edge analysis, in chord units, that users can see.
const (
	// EdgeSharpGap is the largest distance between the curve ends for which
	// they count as meeting (a sharp trailing edge).
	EdgeSharpGap = 1e-4
	// EdgeDefaultBlend is the aft chord fraction over which a blunt edge is
	// closed when EdgeOptions.Blend is 0.
	EdgeDefaultBlend = 0.1
	// EdgeMaxWidth is the largest width of the body across its chord line,
	// as a fraction of the chord, for which it counts as a section with an
	// identifiable leading edge.
	EdgeMaxWidth = 0.5
	// EdgeMaxTERadius is the largest radius of a rounded trailing edge, as a
	// fraction of the chord.
	EdgeMaxTERadius = 0.05
	// EdgeMirrorCentroid is how far below the chord line (chord units) the
	// centroid must lie before an automatic mirror is applied.
	EdgeMirrorCentroid = 1e-3
)

// CornerTurn is the tangent turn (radians, 10°) at the start of a closed
// curve that makes it a corner rather than a smooth, rounded edge.
const CornerTurn = 10 * math.Pi / 180

// ErrNoLeadingEdge means the body has no distinct far point and trailing
// edge (a circle, a square), so the leading edge must be given.
var ErrNoLeadingEdge = errors.New("no identifiable leading edge")

// ErrTrailingEdge means the requested trailing-edge treatment cannot be
// applied to the edge found.
var ErrTrailingEdge = errors.New("cannot treat the trailing edge")

// EdgeOptions controls Normalize. The zero value finds both edges
// automatically, keeps the trailing edge as found (sharp, blunt, open or
// rounded), and mirrors when the camber says the section is upside down.
type EdgeOptions struct {
	// TE is TEAuto (or ""), TEKeep, TEClose or TESharpen. TEAuto keeps
	// every edge: a rounded end is the shape of the part (a printed or worn
	// edge), and sharpening it adds material that is not there, about
	// r/sin(θ/2) − r behind the tip for radius r and included angle θ
	// (2–3 % of the chord for a 0.5 % chord radius on a 20° edge), which
	// lengthens the chord and shifts every chord-unit figure. So auto
	// keeps it, reports it (kind rounded, its radius, thickness and the
	// angle of the surfaces just ahead of it) and says in a warning how far
	// sharpening would move the tip; TESharpen is the explicit request.
	TE string
	// Blend is the aft chord fraction over which TEClose blends a blunt
	// edge's thickness away; 0 means EdgeDefaultBlend. It must lie in (0, 1).
	Blend float64
	// LEAt, when set, places the leading edge at the curve point nearest to
	// it (input coordinates) instead of the point farthest from the
	// trailing edge.
	LEAt *Point
	// Mirror is MirrorAuto (or ""), MirrorYes or MirrorNo.
	Mirror string
}

// edgeFarthest returns the arc length in [s0, s1] (s1 < s0 wraps through the
// start of a closed curve) of the curve point farthest from p, refined by
// golden-section search between the neighbours of the best sample.
func edgeFarthest(cv *Curve, p Point, s0, s1 float64) (float64, float64) {
	L := cv.Length()
	in := func(s float64) bool {
		if s0 <= s1 {
			return s >= s0 && s <= s1
		}
		return s >= s0 || s <= s1
	}
	best, bestD := math.NaN(), -1.0
	step := L / float64(4*cv.Pieces())
	for i := 0; i < cv.Pieces(); i++ {
		for _, f := range [...]float64{0, 0.25, 0.5, 0.75} {
			u := f * cv.Span(i)
			q, _, _ := cv.Eval(i, u)
			var s float64
			if f == 0 {
				s = cv.ss[i]
			} else {
				s = cv.arc(i, u)
			}
			if !in(s) {
				continue
			}
			if d := q.Dist(p); d > bestD {
				best, bestD = s, d
			}
		}
	}
	if e := cv.End(); in(L) && e.Dist(p) > bestD {
		best, bestD = L, e.Dist(p)
	}
	if math.IsNaN(best) {
		return s0, cv.At(s0).Dist(p)
	}
	// Refine on [best − 2 step, best + 2 step] (the largest sample gap is
	// below a quarter piece, so this brackets the maximum).
	span := 0.0
	for i := 0; i < cv.Pieces(); i++ {
		span = math.Max(span, cv.ss[i+1]-cv.ss[i])
	}
	span = math.Max(span/2, step)
	a, b := best-span, best+span
	wrap := func(s float64) float64 {
		if cv.closed {
			return math.Mod(math.Mod(s, L)+L, L)
		}
		return math.Max(0, math.Min(L, s))
	}
	s := numeric.Golden(func(s float64) float64 { return -cv.At(wrap(s)).Dist(p) }, a, b, 60)
	s = wrap(s)
	if d := cv.At(s).Dist(p); d > bestD {
		return s, d
	}
	return best, bestD
}

// edgeFind locates the trailing edge and the leading edge of cv (input
// coordinates) and classifies the trailing edge.
type edgeFind struct {
	kind   string
	te     Point   // trailing-edge point: midpoint of the ends, or the tip of a rounded edge
	sTip   float64 // arc length of the tip (rounded)
	sLE    float64 // arc length of the leading edge
	le     Point
	chord  float64
	gap    float64 // distance between the ends (input units)
	rTip   float64 // radius of a rounded edge (input units)
	width  float64 // width across the chord line (input units)
	cosGap float64 // |cos| of the angle between the base and the chord line
	// round describes a rounded end (valid when roundOK).
	round   RoundedEnd
	roundOK bool
}

func edgeLocate(cv *Curve, leAt *Point) (*edgeFind, error) {
	L := cv.Length()
	e := &edgeFind{}
	leFrom := func(te Point) {
		if leAt != nil {
			e.sLE, _ = cv.Project(*leAt)
		} else {
			e.sLE, _ = edgeFarthest(cv, te, 0, L)
		}
		e.le = cv.At(e.sLE)
	}
	// A closed curve with a corner at its start (a normalised sharp
	// section) is treated like an open one whose ends meet.
	ta, tb := cv.Tangent(L), cv.Tangent(0)
	cornered := math.Abs(math.Atan2(ta.Cross(tb), ta.Dot(tb))) > CornerTurn
	if cv.closed && !cornered {
		e.kind = TERounded
		e.te = cv.Start()
		for range 4 {
			leFrom(e.te)
			e.sTip, _ = edgeFarthest(cv, e.le, 0.75*L, 0.25*L)
			e.te = cv.At(e.sTip)
		}
		e.round, e.roundOK = AnalyseRounded(cv, e.sTip, e.le.Dist(e.te))
		if e.roundOK {
			// The farthest curve point of a smooth end slides along it
			// with the slightest wiggle (a radial error δ moves it by
			// about √(2rδ)), so the tip is taken as the curve point
			// nearest to the point of the end's fitted circle farthest
			// from the leading edge.
			c, r := e.round.center, e.round.radius
			if d := c.Sub(e.le); d.Norm() > 0 {
				q := c.Add(d.Scale(r / d.Norm()))
				if s, _ := cv.Project(q); cv.At(s).Dist(e.te) < 2*r {
					e.sTip, e.te = s, cv.At(s)
					leFrom(e.te)
					if r2, ok := AnalyseRounded(cv, e.sTip, e.le.Dist(e.te)); ok {
						e.round = r2
					}
				}
			}
		}
		e.rTip = math.Inf(1)
		if e.roundOK {
			e.rTip = e.round.radius
		} else if k := cv.Curvature(e.sTip); k > 0 {
			e.rTip = 1 / k
		}
	} else {
		u, l := cv.Start(), cv.End()
		e.te = u.Add(l).Scale(0.5)
		e.gap = u.Dist(l)
		leFrom(e.te)
	}
	d := e.te.Sub(e.le)
	e.chord = d.Norm()
	if !(e.chord > 0) {
		return nil, fmt.Errorf("geometry: %w: the leading edge coincides with the trailing edge; set it with --le-at X,Y", ErrNoLeadingEdge)
	}
	dir := d.Scale(1 / e.chord)
	nrm := Point{-dir.Y, dir.X}
	lo, hi := math.Inf(1), math.Inf(-1)
	for i := 0; i < cv.Pieces(); i++ {
		for _, f := range [...]float64{0, 0.5} {
			q, _, _ := cv.Eval(i, f*cv.Span(i))
			v := q.Sub(e.le).Dot(nrm)
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	e.width = hi - lo
	if !cv.closed || cornered {
		switch {
		case e.gap <= EdgeSharpGap*e.chord:
			e.kind = TESharp
		default:
			e.cosGap = math.Abs(cv.End().Sub(cv.Start()).Dot(dir)) / e.gap
			if e.cosGap < 0.5 && e.gap < 0.1*e.chord {
				e.kind = TEBlunt
			} else {
				e.kind = TEOpen
			}
		}
	}
	if leAt == nil {
		if e.width >= EdgeMaxWidth*e.chord {
			return nil, fmt.Errorf("geometry: %w: the body is %.0f%% as wide as it is long, so no point stands out as the nose; set the leading edge with --le-at X,Y", ErrNoLeadingEdge, 100*e.width/e.chord)
		}
		if e.kind == TERounded && !(e.rTip <= EdgeMaxTERadius*e.chord) {
			return nil, fmt.Errorf("geometry: %w: the outline is smooth all round with no small-radius trailing edge (smallest radius at the far end %.3g chord); set the leading edge with --le-at X,Y", ErrNoLeadingEdge, e.rTip/e.chord)
		}
	}
	return e, nil
}

// edgeTreat applies the treatment to cv and returns the treated curve (input
// coordinates), the action and the largest shift.
func edgeTreat(cv *Curve, e *edgeFind, opts EdgeOptions, warn func(string)) (*Curve, string, float64, error) {
	mode := opts.TE
	if mode == "" || mode == TEAuto {
		mode = TEKeep
	}
	switch e.kind {
	case TESharp:
		if mode != TEKeep {
			warn(fmt.Sprintf("trailing edge is already sharp; %q changes nothing", mode))
		}
		out, shift := edgeSnap(cv)
		return out, TEKept, shift, nil
	case TERounded:
		switch mode {
		case TEKeep:
			if e.roundOK {
				msg := fmt.Sprintf("trailing edge is rounded (radius %.3g chord, %.3g chord thick where the rounding starts) and was kept", e.round.radius/e.chord, e.round.Thickness/e.chord)
				if e.round.sharpValid {
					msg += fmt.Sprintf("; sharpen would extend the surfaces to a point %.3g chord behind the tip", e.round.sharp.Dist(e.te)/e.chord)
				}
				warn(msg)
			}
			return cv.Sub(e.sTip, e.sTip), TEKept, 0, nil
		case TESharpen:
			return edgeSharpenRounded(cv, e)
		default:
			return nil, "", 0, fmt.Errorf("geometry: %w: %q applies to a blunt edge, this one is rounded (use sharpen or keep)", ErrTrailingEdge, mode)
		}
	default: // blunt, open
		if e.kind == TEOpen {
			warn(fmt.Sprintf("contour ends do not meet (gap %.3g chord) and no base joins them: part of the outline may be missing", e.gap/e.chord))
		}
		switch mode {
		case TEKeep:
			return cv, TEKept, 0, nil
		case TEClose:
			b := opts.Blend
			if b == 0 {
				b = EdgeDefaultBlend
			}
			out, shift := edgeClose(cv, e, b)
			return out, TEClosed, shift, nil
		default:
			return edgeExtend(cv, e)
		}
	}
}

// edgeSnap moves both ends of an open curve whose ends (nearly) meet to their
// midpoint, fading the move out over the first and last piece, and returns
// the closed curve and the shift.
func edgeSnap(cv *Curve) (*Curve, float64) {
	m := cv.Start().Add(cv.End()).Scale(0.5)
	d0, d1 := m.Sub(cv.Start()), m.Sub(cv.End())
	xs := append([][4]float64(nil), cv.xs...)
	ys := append([][4]float64(nil), cv.ys...)
	// Add δ(1 − u/h)³ to the first piece and δ(u/h)³ to the last.
	h0 := cv.Span(0)
	xs[0] = curveAddCube(xs[0], d0.X, h0, true)
	ys[0] = curveAddCube(ys[0], d0.Y, h0, true)
	k := len(xs) - 1
	hk := cv.Span(k)
	xs[k] = curveAddCube(xs[k], d1.X, hk, false)
	ys[k] = curveAddCube(ys[k], d1.Y, hk, false)
	return curveNew(append([]float64(nil), cv.ts...), xs, ys, true), math.Max(d0.Norm(), d1.Norm())
}

// curveAddCube adds δ(1 − u/h)³ (falling) or δ(u/h)³ (rising) to k.
func curveAddCube(k [4]float64, delta, h float64, falling bool) [4]float64 {
	if falling {
		k[0] += delta
		k[1] -= 3 * delta / h
		k[2] += 3 * delta / (h * h)
		k[3] -= delta / (h * h * h)
	} else {
		k[3] += delta / (h * h * h)
	}
	return k
}

// edgeClose blends the thickness of a blunt edge away over the aft fraction
// blend of the chord: a point of the upper surface at chord station ξ moves
// by f(r)·(M − U), where U is the upper corner, M the midpoint of the
// corners, r runs from 0 at ξ = 1 − blend to 1 at the corner and
// f(r) = r³(10 − 15r + 6r²) keeps the curvature continuous; the lower
// surface likewise. The treated outline is resampled (every piece in the
// blend region split in eight) and interpolated.
func edgeClose(cv *Curve, e *edgeFind, blend float64) (*Curve, float64) {
	u, l := cv.Start(), cv.End()
	dir := e.te.Sub(e.le).Scale(1 / e.chord)
	xi := func(p Point) float64 { return p.Sub(e.le).Dot(dir) / e.chord }
	x0 := 1 - blend
	shift := func(p Point, upper bool) Point {
		corner := l
		if upper {
			corner = u
		}
		end := xi(corner)
		if end <= x0 {
			return p
		}
		r := math.Max(0, math.Min(1, (xi(p)-x0)/(end-x0)))
		f := r * r * r * (10 - 15*r + 6*r*r)
		return p.Add(e.te.Sub(corner).Scale(f))
	}
	var pts []Point
	for i := 0; i < cv.Pieces(); i++ {
		h := cv.Span(i)
		p0, _, _ := cv.Eval(i, 0)
		p1, _, _ := cv.Eval(i, h)
		sub := 1
		if xi(p0) > x0-0.01 || xi(p1) > x0-0.01 {
			sub = 8
		}
		for k := 0; k < sub; k++ {
			uu := h * float64(k) / float64(sub)
			q, _, _ := cv.Eval(i, uu)
			pts = append(pts, shift(q, cv.ss[i] < e.sLE))
		}
	}
	pts = append(pts, e.te)
	pts[0] = e.te
	out := Interpolate(pts, false)
	out.closed = true
	return out, e.gap / 2
}

// edgeLines returns the intersection of the lines p − a·tp and q + b·tq
// with a, b > 0, or false.
func edgeLines(p, tp, q, tq Point, limit float64) (Point, bool) {
	// −a tp − b tq = q − p.
	r := q.Sub(p)
	det := tp.Cross(tq)
	if math.Abs(det) < 1e-12 {
		return Point{}, false
	}
	// Solve [−tp −tq][a b]ᵀ = r by Cramer's rule.
	a := -r.Cross(tq) / det
	b := -tp.Cross(r) / det
	if !(a > 0 && b > 0 && a < limit && b < limit) {
		return Point{}, false
	}
	return p.Sub(tp.Scale(a)), true
}

// edgeExtend sharpens a blunt or open edge by extending both surfaces along
// their end tangents to where they meet.
func edgeExtend(cv *Curve, e *edgeFind) (*Curve, string, float64, error) {
	u, l := cv.Start(), cv.End()
	pt, ok := edgeLines(u, cv.Tangent(0), l, cv.Tangent(cv.Length()), 0.5*e.chord)
	if !ok {
		return nil, "", 0, fmt.Errorf("geometry: %w: the surfaces do not converge behind the trailing edge, so they cannot be extended to a point (use keep or close)", ErrTrailingEdge)
	}
	var b curveBuilder
	b.addLine(pt, u)
	cv.subTo(&b, 0, 0, cv.Pieces()-1, cv.Span(cv.Pieces()-1))
	b.addLine(l, pt)
	return b.curve(true), TESharpened, pt.Dist(e.te), nil
}

// edgeSharpenRounded replaces the rounded end by the extensions of both
// surfaces: the straight lines that continue them just ahead of the
// rounding (roundedAnalyse) are drawn to their intersection, which becomes
// the trailing-edge point; the shift is its distance from the tip.
func edgeSharpenRounded(cv *Curve, e *edgeFind) (*Curve, string, float64, error) {
	if !e.roundOK {
		return nil, "", 0, fmt.Errorf("geometry: %w: the rounded end does not give way to straighter surfaces", ErrTrailingEdge)
	}
	r := e.round
	if !r.sharpValid {
		return nil, "", 0, fmt.Errorf("geometry: %w: the surfaces do not converge behind the rounded end", ErrTrailingEdge)
	}
	var b curveBuilder
	b.addLine(r.sharp, r.pu)
	i0, u0 := cv.Locate(r.su)
	i1, u1 := cv.Locate(r.sl)
	cv.subTo(&b, i0, u0, i1, u1)
	b.addLine(r.pl, r.sharp)
	return b.curve(true), TESharpened, r.sharp.Dist(e.te), nil
}
