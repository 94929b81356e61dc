package frame

import (
	"errors"
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/internal/enum"
)

// Trailing-edge kinds (TrailingEdge.Kind).
const (
	TESharp   = "sharp"   // the surfaces meet in a corner
	TEBlunt   = "blunt"   // a straight base of some thickness joins the surfaces
	TERounded = "rounded" // a small-radius, nose-like end
	TEOpen    = "open"    // the ends do not meet and no base joins them
)

// Trailing-edge treatments (Options.TE) and what was done
// (TrailingEdge.Action).
const (
	TEAuto    = "auto"    // keep every edge as found (see Options.TE)
	TEKeep    = "keep"    // leave the edge as it is
	TESharpen = "sharpen" // extend both surfaces to their intersection
	// TEClose is the earlier name of a reshape to zero thickness over an
	// aft fraction of the chord (Options.Blend); Normalize still accepts
	// it, but Treatments no longer lists it.
	TEClose     = "close"
	TEKept      = "kept"
	TEClosed    = "closed"    // reshaped to zero thickness
	TEThinned   = "thinned"   // reshaped to a smaller thickness
	TEThickened = "thickened" // reshaped to a larger thickness
	TESharpened = "sharpened"
)

// Mirror modes (Options.Mirror).
const (
	MirrorAuto = "auto" // decide from the sign of the camber
	MirrorYes  = "yes"
	MirrorNo   = "no"
)

// Places of a sharp edge whose surfaces cross ahead of its corner
// (Options.Untangle).
const (
	UntangleCorner = "corner" // keep the corner, the surfaces carried on straight to it
	UntangleCut    = "cut"    // put the edge where the surfaces cross
)

// Treatments lists the trailing-edge treatments a user may ask for
// (Options.TE), with what each does, in the order help texts, completions,
// the pipeline file's checks and messages give them.
func Treatments() []enum.Choice {
	return []enum.Choice{
		{Name: TEAuto, Doc: "keep it as found and report it"},
		{Name: TEKeep},
		{Name: TESharpen, Doc: "extend the surfaces of a rounded edge to their intersection"},
	}
}

// MirrorModes lists the mirror modes (Options.Mirror) in the order help
// texts give them.
func MirrorModes() []enum.Choice {
	return []enum.Choice{{Name: MirrorAuto}, {Name: MirrorYes}, {Name: MirrorNo}}
}

// Tolerances of the edge analysis, in chord units, that users can see.
const (
	// EdgeSharpGap is the largest distance between the curve ends for which
	// they count as meeting (a sharp trailing edge).
	EdgeSharpGap = 1e-4
	// EdgeDefaultBlend is the length ahead of the trailing edge, as a
	// fraction of the chord, over which a reshaped edge blends into the
	// surfaces when Options.BlendLength is zero.
	EdgeDefaultBlend = 0.1
	// EdgeMaxReshape is the largest trailing-edge thickness a reshape may
	// give, as a fraction of the chord (a thicker base is no longer a
	// trailing edge; see the blunt kind).
	EdgeMaxReshape = 0.1
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

// Options controls Normalize. The zero value finds both edges
// automatically, keeps the trailing edge as found (sharp, blunt, open or
// rounded), and mirrors when the camber says the section is upside down.
type Options struct {
	// TE is TEAuto (or ""), TEKeep or TESharpen (or the earlier TEClose;
	// see Thickness for a reshape). TEAuto keeps
	// every edge: a rounded end is the shape of the part (a printed or worn
	// edge), and sharpening it adds material that is not there, about
	// r/sin(θ/2) − r behind the tip for radius r and included angle θ
	// (2–3 % of the chord for a 0.5 % chord radius on a 20° edge), which
	// lengthens the chord and shifts every chord-unit figure. So auto
	// keeps it, reports it (kind rounded, its radius, thickness and the
	// angle of the surfaces just ahead of it) and says in a warning how far
	// sharpening would move the tip; TESharpen is the explicit request.
	TE string
	// Thickness, when set, reshapes a sharp, blunt or open edge to this
	// thickness: the surfaces within BlendLength of the edge move, smoothly
	// and more the nearer the edge, until their ends lie Thickness apart,
	// symmetrically about the trailing-edge midpoint (which stays, so the
	// chord and twist do not change) along the base of a blunt edge, or
	// across the chord line at a sharp one. The length is in input units,
	// or in chord units when its Unit is geometry.ChordUnit; it must lie in
	// [0, EdgeMaxReshape chord). TE must then be TEAuto or "". A rounded
	// edge cannot be reshaped (sharpen it, or keep it).
	Thickness *geometry.Length
	// BlendLength is the length along the chord line, ahead of the
	// trailing edge, over which a reshape blends into the surfaces (input
	// or chord units, as Thickness); zero means EdgeDefaultBlend chord. It
	// must lie in (0, 1) chord.
	BlendLength geometry.Length
	// Blend is the aft chord fraction of the earlier TEClose, used when
	// BlendLength is zero; 0 means EdgeDefaultBlend. It must lie in [0, 1).
	Blend float64
	// LEAt, when set, places the leading edge at the curve point nearest to
	// it (input coordinates) instead of the point farthest from the
	// trailing edge.
	LEAt *geometry.Point
	// Mirror is MirrorAuto (or ""), MirrorYes or MirrorNo.
	Mirror string
	// Support, when set, holds the arc lengths along the curve of the
	// points it was fitted to (curve.FitReport.S). MirrorAuto then reads
	// the mean line's sag only aft of a nose the points leave unsampled:
	// there the curve's shape is its own guess, and a guessed nose bends
	// the mean line's forward end as far as a faint camber line does.
	Support []float64
	// Untangle says where a sharp edge whose surfaces cross ahead of its
	// corner is put: "" at the corner when a point of Support lies aft of
	// the crossing, else (and without Support) where they cross;
	// UntangleCorner or UntangleCut at the corner or the crossing
	// whatever the points (a replica keeps its section's reading).
	Untangle string
	// Base, when set, says that the ends of an open curve are the corners
	// of a blunt base the points show (the cleaning step's analysis of
	// the end, curve.Edge): an edge whose ends do not meet is then blunt
	// however far its base leans from square to the chord line, never
	// open (a corner placed on a point of a surface's end may lie a
	// little along it from where the base meets the surface). Without
	// it, ends whose gap runs more along the chord line than across it
	// are open.
	Base bool
	// Noise, when positive, is the noise of the points normal to the
	// outline (input units, the fit's estimate). MirrorAuto then asks the
	// mean line to sag by more than it, as well as by EdgeMirrorSag: the
	// sag is read from the fitted curve, whose error at the stations the
	// line is anchored on is a fair fraction of the noise.
	Noise float64
}

// edges locates the trailing edge and the leading edge of cv (input
// coordinates) and classifies the trailing edge.
type edges struct {
	kind   string
	te     geometry.Point // trailing-edge point: midpoint of the ends, or the tip of a rounded edge
	sTip   float64        // arc length of the tip (rounded)
	sLE    float64        // arc length of the leading edge
	le     geometry.Point
	chord  float64
	gap    float64 // distance between the ends (input units)
	rTip   float64 // radius of a rounded edge (input units)
	width  float64 // width across the chord line (input units)
	cosGap float64 // |cos| of the angle between the base and the chord line
	// round describes a rounded end (valid when roundOK).
	round   RoundedEnd
	roundOK bool
}

func locate(cv *curve.Curve, leAt *geometry.Point) (*edges, error) {
	L := cv.Length()
	e := &edges{}
	leFrom := func(te geometry.Point) {
		if leAt != nil {
			e.sLE, _ = cv.Project(*leAt)
		} else {
			e.sLE, _ = cv.Farthest(te, 0, L)
			if s, ok := refineLE(cv, te, e.sLE); ok {
				e.sLE = s
			}
		}
		e.le = cv.At(e.sLE)
	}
	// A closed curve with a corner at its start (a normalised sharp
	// section) is treated like an open one whose ends meet.
	ta, tb := cv.Tangent(L), cv.Tangent(0)
	cornered := math.Abs(math.Atan2(ta.Cross(tb), ta.Dot(tb))) > CornerTurn
	if cv.Closed() && !cornered {
		e.kind = TERounded
		e.te = cv.Start()
		for range 4 {
			leFrom(e.te)
			e.sTip, _ = cv.Farthest(e.le, 0.75*L, 0.25*L)
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
	nrm := geometry.Point{X: -dir.Y, Y: dir.X}
	lo, hi := math.Inf(1), math.Inf(-1)
	for i := 0; i < cv.Pieces(); i++ {
		for _, f := range [...]float64{0, 0.5} {
			q := cv.PointAt(i, f*cv.Span(i))
			v := q.Sub(e.le).Dot(nrm)
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	e.width = hi - lo
	if !cv.Closed() || cornered {
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

// treat applies the treatment to cv and returns the treated curve (input
// coordinates), the action and the largest shift.
func treat(cv *curve.Curve, e *edges, opts Options, warn func(string)) (*curve.Curve, string, float64, error) {
	mode := opts.TE
	if mode == "" || mode == TEAuto {
		mode = TEKeep
	}
	thickness, blend, reshape, err := reshapeOf(e, opts)
	if err != nil {
		return nil, "", 0, err
	}
	if reshape {
		mode = TEClose
	}
	switch e.kind {
	case TESharp:
		if mode == TEClose && thickness > 0 {
			out, shift := reshapeEdge(cv, e, thickness, blend)
			return out, TEThickened, shift, nil
		}
		switch {
		case mode == TEClose:
			warn("trailing edge is already sharp; reshaping it to zero thickness changes nothing")
		case mode != TEKeep:
			warn(fmt.Sprintf("trailing edge is already sharp; %q changes nothing", mode))
		}
		out, shift := cv.SnapEnds()
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
			return sharpenRounded(cv, e)
		default:
			return nil, "", 0, fmt.Errorf("geometry: %w: a rounded edge cannot be reshaped to a thickness (use sharpen or keep)", ErrTrailingEdge)
		}
	default: // blunt, open
		if e.kind == TEOpen {
			warn(fmt.Sprintf("contour ends do not meet (gap %.3g chord) and no base joins them: part of the outline may be missing", e.gap/e.chord))
		}
		switch mode {
		case TEKeep:
			return cv, TEKept, 0, nil
		case TEClose:
			out, shift := reshapeEdge(cv, e, thickness, blend)
			action := TEClosed
			switch {
			case thickness > e.gap:
				action = TEThickened
			case thickness > 0:
				action = TEThinned
			}
			return out, action, shift, nil
		default:
			return extend(cv, e)
		}
	}
}

// reshapeOf returns the thickness and blend (input units) of a reshape
// that opts ask for, and whether they ask for one: Thickness set, or the
// earlier TEClose (thickness 0).
func reshapeOf(e *edges, opts Options) (thickness, blend float64, reshape bool, err error) {
	if opts.Thickness == nil && opts.TE != TEClose {
		return 0, 0, false, nil
	}
	if opts.Thickness != nil {
		if opts.TE != "" && opts.TE != TEAuto && opts.TE != TEClose {
			return 0, 0, false, fmt.Errorf("geometry: %w: a thickness and %q both given", ErrTrailingEdge, opts.TE)
		}
		thickness = opts.Thickness.Of(e.chord)
	}
	if !(thickness >= 0 && thickness < EdgeMaxReshape*e.chord) {
		return 0, 0, false, fmt.Errorf("geometry: %w: thickness %.4g (%.4g chord), want at least 0 and less than %g chord", ErrTrailingEdge, thickness, thickness/e.chord, EdgeMaxReshape)
	}
	blend = opts.BlendLength.Of(e.chord)
	if blend == 0 {
		b := opts.Blend
		if b == 0 {
			b = EdgeDefaultBlend
		}
		blend = b * e.chord
	}
	if !(blend > 0 && blend < e.chord) {
		return 0, 0, false, fmt.Errorf("geometry: %w: blend length %.4g (%.4g chord), want more than 0 and less than the chord", ErrTrailingEdge, blend, blend/e.chord)
	}
	return thickness, blend, true, nil
}

// reshapeEdge gives a sharp, blunt or open edge the thickness t (input
// units), blending the change into the surfaces over the length blend
// ahead of the edge. The target corners are M ± (t/2)·b̂, with M the
// trailing-edge midpoint and b̂ the direction of the base from the lower to
// the upper corner (the chord normal at a sharp edge). A point of the upper
// surface at chord station ξ moves by f(r)·(U′ − U), where U is the upper
// corner and U′ its target, r runs from 0 at ξ = 1 − blend/c to 1 at the
// corner and f(r) = r³(10 − 15r + 6r²) keeps the curvature continuous; the
// lower surface likewise. The treated outline is resampled (every piece in
// the blend region split in eight) and interpolated: closed when t is 0,
// else open with its ends at the new corners. The shift returned is the
// largest any point moves, |g − t|/2 for a base of length g.
func reshapeEdge(cv *curve.Curve, e *edges, t, blend float64) (*curve.Curve, float64) {
	u, l := cv.Start(), cv.End()
	dir := e.te.Sub(e.le).Scale(1 / e.chord)
	base := geometry.Point{X: -dir.Y, Y: dir.X}
	if g := u.Sub(l); e.kind != TESharp && g.Norm() > 0 {
		base = g.Scale(1 / g.Norm())
	}
	targetU, targetL := e.te.Add(base.Scale(t/2)), e.te.Sub(base.Scale(t/2))
	xi := func(p geometry.Point) float64 { return p.Sub(e.le).Dot(dir) / e.chord }
	x0 := 1 - blend/e.chord
	shift := func(p geometry.Point, upper bool) geometry.Point {
		corner, target := l, targetL
		if upper {
			corner, target = u, targetU
		}
		end := xi(corner)
		if end <= x0 {
			return p
		}
		r := math.Max(0, math.Min(1, (xi(p)-x0)/(end-x0)))
		f := r * r * r * (10 - 15*r + 6*r*r)
		return p.Add(target.Sub(corner).Scale(f))
	}
	var pts []geometry.Point
	for i := 0; i < cv.Pieces(); i++ {
		h := cv.Span(i)
		p0, p1 := cv.PointAt(i, 0), cv.PointAt(i, h)
		sub := 1
		if xi(p0) > x0-0.01 || xi(p1) > x0-0.01 {
			sub = 8
		}
		for k := 0; k < sub; k++ {
			uu := h * float64(k) / float64(sub)
			q := cv.PointAt(i, uu)
			pts = append(pts, shift(q, cv.PieceStart(i) < e.sLE))
		}
	}
	if t == 0 {
		pts = append(pts, e.te)
		pts[0] = e.te
		return curve.Interpolate(pts, false).WithClosed(true), e.gap / 2
	}
	pts = append(pts, targetL)
	pts[0] = targetU
	return curve.Interpolate(pts, false), math.Abs(e.gap-t) / 2
}

// meet returns the intersection of the lines p − a·tp and q + b·tq
// with a, b > 0, or false.
func meet(p, tp, q, tq geometry.Point, limit float64) (geometry.Point, bool) {
	// −a tp − b tq = q − p.
	r := q.Sub(p)
	det := tp.Cross(tq)
	if math.Abs(det) < 1e-12 {
		return geometry.Point{}, false
	}
	// Solve [−tp −tq][a b]ᵀ = r by Cramer's rule.
	a := -r.Cross(tq) / det
	b := -tp.Cross(r) / det
	if !(a > 0 && b > 0 && a < limit && b < limit) {
		return geometry.Point{}, false
	}
	return p.Sub(tp.Scale(a)), true
}

// extend sharpens a blunt or open edge by extending both surfaces along
// their end tangents to where they meet.
func extend(cv *curve.Curve, e *edges) (*curve.Curve, string, float64, error) {
	u, l := cv.Start(), cv.End()
	pt, ok := meet(u, cv.Tangent(0), l, cv.Tangent(cv.Length()), 0.5*e.chord)
	if !ok {
		return nil, "", 0, fmt.Errorf("geometry: %w: the surfaces do not converge behind the trailing edge, so they cannot be extended to a point (keep it, or reshape it to a thickness)", ErrTrailingEdge)
	}
	var b curve.Builder
	b.AddLine(pt, u)
	b.AddArc(cv, 0, cv.Length())
	b.AddLine(l, pt)
	return b.Curve(true), TESharpened, pt.Dist(e.te), nil
}

// sharpenRounded replaces the rounded end by the extensions of both
// surfaces: the straight lines that continue them just ahead of the
// rounding (AnalyseRounded) are drawn to their intersection, which becomes
// the trailing-edge point; the shift is its distance from the tip.
func sharpenRounded(cv *curve.Curve, e *edges) (*curve.Curve, string, float64, error) {
	if !e.roundOK {
		return nil, "", 0, fmt.Errorf("geometry: %w: the rounded end does not give way to straighter surfaces", ErrTrailingEdge)
	}
	r := e.round
	if !r.sharpValid {
		return nil, "", 0, fmt.Errorf("geometry: %w: the surfaces do not converge behind the rounded end", ErrTrailingEdge)
	}
	var b curve.Builder
	b.AddLine(r.sharp, r.pu)
	b.AddArc(cv, r.su, r.sl)
	b.AddLine(r.pl, r.sharp)
	return b.Curve(true), TESharpened, r.sharp.Dist(e.te), nil
}
