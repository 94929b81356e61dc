package frame

import (
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/internal/enum"
)

// Frame maps the normalised section back to the part, in input units:
// chord, twist (degrees, positive nose-up), the leading edge in input
// coordinates, and whether the section was mirrored to bring it into the
// normalised frame. Methods that apply it live beside the normalisation code.
type Frame struct {
	Chord    float64    `json:"chord"`
	TwistDeg float64    `json:"twist_deg"`
	LE       [2]float64 `json:"le"`
	Mirrored bool       `json:"mirrored"`
	// Plane is set when the section was cut from or fitted to 3D data: the
	// section's 2D input coordinates (u, v) are Origin + u·U + v·V in space.
	Plane *geometry.Plane `json:"plane,omitempty"`
}

// TrailingEdge reports the kind of trailing edge found and what was done to it.
type TrailingEdge struct {
	Kind      string  `json:"kind"`      // sharp | blunt | rounded | open
	Thickness float64 `json:"thickness"` // as found, chord units
	Action    string  `json:"action"`    // kept | closed | thinned | thickened | sharpened
	MaxShift  float64 `json:"max_shift"` // input units
	// Target is the thickness a reshape gave the edge (chord units); nil
	// when it was not reshaped.
	Target *float64 `json:"target_thickness,omitempty"`
	// Blend is the length ahead of the edge over which a reshape blended
	// into the surfaces (chord units); 0 when it was not reshaped.
	Blend float64 `json:"blend_length,omitempty"`
}

// matrix returns the linear part of ToChord: R(τ)·M/c, with M the
// mirror x ↦ −x when mirrored.
func (f Frame) matrix() [2][2]float64 {
	s, c := math.Sincos(f.TwistDeg * math.Pi / 180)
	m := [2][2]float64{{c / f.Chord, -s / f.Chord}, {s / f.Chord, c / f.Chord}}
	if f.Mirrored {
		m[0][0], m[1][0] = -m[0][0], -m[1][0]
	}
	return m
}

// ToChord maps a point p of the part (input coordinates) into the
// normalised frame:
//
//	q = R(τ) · M · (p − LE) / c
//
// where c is the chord, τ the twist (radians, positive nose-up), R(τ) the
// counter-clockwise rotation by τ, and M the mirror x ↦ −x when Mirrored.
// It is the exact inverse of ToPart. It panics if the chord is not positive.
func (f Frame) ToChord(p geometry.Point) geometry.Point {
	if !(f.Chord > 0) {
		panic("geometry: frame with non-positive chord")
	}
	m := f.matrix()
	d := p.Sub(geometry.Point{X: f.LE[0], Y: f.LE[1]})
	return geometry.Point{X: m[0][0]*d.X + m[0][1]*d.Y, Y: m[1][0]*d.X + m[1][1]*d.Y}
}

// ToPart maps a point q of the normalised frame back to the part:
//
//	p = LE + c · M · R(−τ) · q
//
// It is the exact inverse of ToChord. It panics if the chord is not
// positive.
func (f Frame) ToPart(q geometry.Point) geometry.Point {
	if !(f.Chord > 0) {
		panic("geometry: frame with non-positive chord")
	}
	p := q.Rotate(-f.TwistDeg * math.Pi / 180).Scale(f.Chord)
	if f.Mirrored {
		p.X = -p.X
	}
	return p.Add(geometry.Point{X: f.LE[0], Y: f.LE[1]})
}

// fromEdges returns the frame whose leading edge is le and whose
// trailing-edge midpoint is te.
func fromEdges(le, te geometry.Point, mirrored bool) Frame {
	d := te.Sub(le)
	if mirrored {
		d.X = -d.X
	}
	tw := -math.Atan2(d.Y, d.X) * 180 / math.Pi
	if tw <= -180 { // twist in (−180°, 180°]
		tw += 360
	}
	return Frame{Chord: te.Dist(le), TwistDeg: tw, LE: [2]float64{le.X, le.Y}, Mirrored: mirrored}
}

// Normalized is a section brought into the normalised frame by Normalize.
type Normalized struct {
	// Path is the section in chord units, in the package node order: closed
	// (first point = last point = (1, 0)) for a sharp, closed, sharpened or
	// kept rounded trailing edge; open from the upper to the lower corner
	// for a kept blunt or open edge. It is a *Curve.
	Path geometry.Path
	// SLE is the arc length of the leading edge (0, 0) along Path.
	SLE float64
	// Frame maps Path back to the part.
	Frame Frame
	// Farthest is the frame whose leading edge is the curve point
	// farthest from the trailing edge itself, before the form of the nose
	// placed it (refineLE); equal to Frame when the form was not used.
	// Package accuracy measures the spread of both.
	Farthest Frame
	// TE reports the trailing edge found and what was done to it.
	TE TrailingEdge
	// Warnings are remarks for the user (ambiguous mirroring, an open
	// outline, a treatment that changed nothing).
	Warnings []string
	// MirrorOpen is set when MirrorAuto could not tell the upper side
	// from the lower: the section is (nearly) symmetric, its nose is
	// unsampled, or its camber is fainter than its thickness can fake
	// (noseBias). The outline turned over is then as likely a reading of
	// the points, and the section's uncertainty takes it in.
	MirrorOpen bool
	// Untangled is the distance (input units) from the corner of a sharp
	// trailing edge to Crossing, where its surfaces cross ahead of it
	// (untangle); 0 when they do not cross. The edge was kept at the
	// corner when Cornered is set, else put at the crossing. The part's
	// edge may lie anywhere from the crossing to the corner.
	Untangled float64
	Crossing  geometry.Point
	Cornered  bool
}

// Normalize locates the trailing and leading edge of the fitted curve cv
// (input coordinates, counter-clockwise), treats the trailing edge as opts
// says, and maps the result into the normalised frame: leading edge at
// (0, 0), trailing-edge midpoint at (1, 0), upper surface towards +y.
//
// Trailing edge. An open curve whose ends meet (within EdgeSharpGap chord)
// has a sharp edge; one whose ends are joined by a short base roughly across
// the chord line is blunt, otherwise open. A closed (periodic) curve has a
// rounded edge: its tip, the trailing-edge point, is the curve point
// farthest from the leading edge (common practice); TEKeep (and TEAuto)
// keep it as a closed path through the tip, TESharpen extends the straight
// continuations of both surfaces just ahead of the rounding to their
// intersection (see Options.TE). TrailingEdge.Thickness of a kept
// rounded edge is the distance between the surfaces where the rounding
// starts.
//
// Leading edge. The curve point farthest from the trailing-edge midpoint
// (or tip) (common practice), read from a least-squares form of the nose
// round the curve's own farthest point (refineLE, nose.go), so that the
// curve's wiggles do not slide it along the nose; the chord is its
// distance from the trailing edge. opts.LEAt replaces it by the curve
// point nearest to the given coordinates.
//
// Mirroring. The contour is counter-clockwise, so a section whose nose
// points the other way, or which was measured upside down, is a reflection
// that no rotation undoes, and it shows as negative camber: its centroid
// lies below the chord line. In MirrorAuto mode a centroid more than
// EdgeMirrorCentroid chord below the line mirrors the section (x ↦ −x before
// the rotation) when its mean line also sags down (below the straight line
// through its ends at 1 % and 90 % of the chord, by more than EdgeMirrorSag
// on average): on a thick, blunt nose the leading edge's place tilts the
// chord line enough to move the centroid of a symmetric section below it,
// but a tilt does not make the mean line sag. A symmetric section cannot
// tell and is left as it is. Nor can a thick section whose camber is
// fainter than its nose's thickness can fake (noseBias): the decision
// stands, and Normalized.MirrorOpen says the upper side is open, as it
// does wherever mirroring cannot be detected or decided.
//
// Normalize returns an error wrapping ErrNoLeadingEdge for a body with no
// distinct nose and tail (a circle, a square), and ErrTrailingEdge when the
// requested treatment cannot be applied.
func Normalize(cv *curve.Curve, opts Options) (*Normalized, error) {
	if opts.TE != "" && opts.TE != TEClose && !enum.Has(Treatments(), opts.TE) {
		return nil, fmt.Errorf("geometry: trailing-edge treatment %q: want %s", opts.TE, enum.Or(enum.Names(Treatments())...))
	}
	if opts.Mirror != "" && !enum.Has(MirrorModes(), opts.Mirror) {
		return nil, fmt.Errorf("geometry: mirror %q: want %s", opts.Mirror, enum.Or(enum.Names(MirrorModes())...))
	}
	if opts.Blend < 0 || opts.Blend >= 1 || math.IsNaN(opts.Blend) {
		return nil, fmt.Errorf("geometry: blend %g: want a chord fraction in (0, 1)", opts.Blend)
	}
	if opts.LEAt != nil && !opts.LEAt.IsFinite() {
		return nil, fmt.Errorf("geometry: leading edge at (%g, %g): %w", opts.LEAt.X, opts.LEAt.Y, geometry.ErrNonFinite)
	}
	out := &Normalized{}
	warn := func(s string) { out.Warnings = append(out.Warnings, s) }
	fitted := cv // the curve Support's arc lengths run along
	if !cv.Closed() {
		// A sharp edge whose surfaces cross just ahead of it (a thin,
		// noisy edge, or points offset inwards) keeps its corner, the
		// surfaces carried on straight to it from ahead of the crossing,
		// where points lie beyond the crossing (opts.Untangle), or else
		// ends where they cross.
		reached := beyond(opts.Support)
		switch opts.Untangle {
		case UntangleCorner:
			reached = func(float64, float64) bool { return true }
		case UntangleCut:
			reached = func(float64, float64) bool { return false }
		}
		if fixed, moved, at, cornered, ok := untangle(cv, reached); ok {
			chord := cv.Start().Dist(cv.At(cv.Length() / 2))
			if cv.Start().Dist(cv.End()) <= EdgeSharpGap*max(chord, moved) {
				out.Untangled, out.Crossing = moved, at
				if out.Cornered = cornered; cornered {
					warn(fmt.Sprintf("the surfaces near the trailing edge are within the noise of each other and crossed %.3g chord ahead of the corner the points reach; the edge was kept at the corner, the surfaces carried on straight to it", moved/chord))
				} else {
					warn(fmt.Sprintf("the surfaces near the trailing edge are within the noise of each other and crossed %.3g chord ahead of the corner; the edge was put where they cross", moved/chord))
				}
				cv = fixed
			}
		}
	}
	e, err := locate(cv, opts.LEAt)
	if err != nil {
		return nil, err
	}
	if opts.Base && e.kind == TEOpen {
		e.kind = TEBlunt
	}
	treated, action, shift, err := treat(cv, e, opts, warn)
	if err != nil {
		return nil, err
	}
	out.TE = TrailingEdge{Kind: e.kind, Action: action, MaxShift: shift}
	if t, b, reshaped, _ := reshapeOf(e, opts); reshaped && action != TEKept {
		t /= e.chord
		out.TE.Target, out.TE.Blend = &t, b/e.chord
	}
	switch {
	case e.kind == TEBlunt || e.kind == TEOpen:
		out.TE.Thickness = e.gap / e.chord
	case e.kind == TERounded && action == TEKept && e.roundOK:
		// The thickness where the rounding starts, in units of the chord
		// from the leading edge to the tip.
		out.TE.Thickness = e.round.Thickness / e.chord
	}
	// Trailing-edge point and leading edge of the treated curve.
	te := e.te
	if treated.Closed() {
		te = treated.Start()
	} else {
		te = treated.Start().Add(treated.End()).Scale(0.5)
	}
	var sLE float64
	if opts.LEAt != nil {
		sLE, _ = treated.Project(*opts.LEAt)
	} else if treated.Closed() {
		// Keep the search away from the trailing edge itself.
		L := treated.Length()
		sLE, _ = treated.Farthest(te, 0.05*L, 0.95*L)
	} else {
		sLE, _ = treated.Farthest(te, 0, treated.Length())
	}
	far := treated.At(sLE)
	if opts.LEAt == nil {
		if s, ok := refineLE(treated, te, sLE); ok {
			sLE = s
		}
	}
	le := treated.At(sLE)
	fr := fromEdges(le, te, false)
	var chord *curve.Curve
	if opts.Mirror != MirrorYes {
		chord = fr.apply(treated) // a mirrored section is mapped below
	}
	var mirrored bool
	switch opts.Mirror {
	case MirrorYes:
		mirrored = true
	case MirrorNo:
	default:
		_, cy := chord.Centroid()
		from := max(sagFrom, supportedFrom(fitted, opts.Support, le, fr))
		sag, sagOK := meanLineSag(chord, sLE/fr.Chord, from)
		sagMin := max(EdgeMirrorSag, opts.Noise/fr.Chord, sampledSag(fitted, opts.Support, fr.Chord))
		// The thickness alone could have bowed the mean line this far,
		// and aft of the nose, where it cannot, the mean line does not
		// bow enough to say either.
		bias, biasOK := noseBias(chord, sLE/fr.Chord)
		aft, aftOK := meanLineSag(chord, sLE/fr.Chord, max(from, sagAftFrom))
		faint := !sagOK || !biasOK || math.Abs(sag) <= sagMin+bias
		faint = faint && (!aftOK || math.Abs(aft) <= sagAftFactor*sagMin)
		out.MirrorOpen = true // unless a case below decides
		switch {
		case cy < -EdgeMirrorCentroid && from > sagFrom && (!sagOK || sag >= -sagMin):
			// The points leave the nose unsampled and the mean line aft
			// of it does not say the section is upside down: the
			// centroid's word rests on the curve's guess at the nose.
			warn(fmt.Sprintf("mirroring cannot be decided: the centroid lies %.3g chord below the chord line, but the points leave the nose unsampled to x = %.2g and the mean line aft of it does not sag the other way; kept as measured: use mirror yes if it was measured upside down", -cy, from))
		case cy < -EdgeMirrorCentroid && (!sagOK || sag < -sagMin):
			mirrored = true
			if faint {
				warn(fmt.Sprintf("section mirrored, but the points cannot tell its upper side for sure: its centroid lies %.3g chord below the chord line and its mean line sags down by %.2g chord, and a section this thick can sag that far right way up when its mean line rises steeply at the nose (by up to %.2g chord, a NACA 5-digit section cambered near its nose); the surface's bound takes in the outline turned over; use mirror no to keep it as measured", -cy, math.Abs(sag), bias+sagMin))
			} else {
				out.MirrorOpen = false
				warn(fmt.Sprintf("section mirrored: its centroid lies %.3g chord below the chord line (negative camber), so it was taken as upside down or nose-reversed; use mirror no to keep it", -cy))
			}
		case cy < -EdgeMirrorCentroid:
			// The centroid says mirrored but the mean line does not sag
			// the other way: a (nearly) symmetric section whose chord
			// line the place of the leading edge on its nose tilts.
			way := "down (as upside down)"
			if sag >= 0 {
				way = "up (as right way up)"
			}
			warn(fmt.Sprintf("section is (nearly) symmetric: its centroid lies %.3g chord below the chord line but its mean line bows %s by only %.2g chord, and camber needs more than %.2g (the largest of %.1g, the noise and what the spacing of the points leaves), so mirroring cannot be detected and it was kept as measured; use mirror yes if it was measured upside down", -cy, way, math.Abs(sag), sagMin, EdgeMirrorSag))
		case math.Abs(cy) <= EdgeMirrorCentroid:
			warn("section is (nearly) symmetric: mirroring cannot be detected; use mirror yes if it was measured upside down")
		case faint:
			warn(fmt.Sprintf("the points cannot tell the section's upper side for sure: its centroid lies %.3g chord above the chord line and its mean line bows %.2g chord, but a section this thick can bow that far when its mean line rises steeply at the nose (by up to %.2g chord, a NACA 5-digit section cambered near its nose, measured upside down); kept as measured; the surface's bound takes in the outline turned over; use mirror yes if it was measured upside down", cy, math.Abs(sag), bias+sagMin))
		default:
			out.MirrorOpen = false
		}
	}
	// Affine maps scale arc length by 1/chord; a reversal counts it from the
	// other end.
	out.SLE = sLE / fr.Chord
	if mirrored {
		fr = fromEdges(le, te, true)
		chord = fr.apply(treated).Reverse()
		out.SLE = chord.Length() - sLE/fr.Chord
	}
	out.Frame = fr
	out.Farthest = fromEdges(far, te, mirrored)
	out.Path = chord
	return out, nil
}

// apply maps cv into the normalised frame of f.
func (f Frame) apply(cv *curve.Curve) *curve.Curve {
	m := f.matrix()
	le := geometry.Point{X: f.LE[0], Y: f.LE[1]}
	b := geometry.Point{X: -(m[0][0]*le.X + m[0][1]*le.Y), Y: -(m[1][0]*le.X + m[1][1]*le.Y)}
	return cv.Transform(m, b)
}
