package curve

import "math"

// A fair curve has no curvature the part does not have. Noise left in a
// smoothing spline shows as wiggles: short arcs of alternating curvature,
// each bounded by two sign changes of the curvature (inflections), much
// shorter than the stretch of outline over which the part itself turns.
// A section's own inflections are few and far apart (the concave aft
// part of a cambered lower surface, a reflex trailing edge), so a lobe
// of curvature much shorter than the local feature scale is counted as
// noise-made.

// Limits of the fairness measure.
const (
	// fairRatio is the largest change of the feature scale across a lobe
	// counted as a wiggle: where a sharp turn meets a gentle one (a
	// rounded end meets the surfaces) a fit cannot place an inflection
	// exactly, and a short lobe there is no sign of noise.
	fairRatio = 2
	// fairLobe is the longest lobe counted as a wiggle, in feature
	// scales of its middle (the arc over which the outline turns by half
	// a radian), at most fairLobeMax of the length of the curve.
	fairLobe    = 0.5
	fairLobeMax = 1.0 / 20
	// fairFlat is the curvature, times the length of the curve, below
	// which the sign of the curvature is not trusted (a straight stretch):
	// an inflection is counted when the curvature passes from beyond
	// +fairFlat to beyond −fairFlat or back (hysteresis).
	fairFlat = 0.5
	// fairSamples is the number of curvature samples per piece.
	fairSamples = 4
	// fairRippleFloor is the least curvature, times the length of the
	// curve, at which Ripples looks for dips (on a section about 5 per
	// chord: the nose and a rounded end, not the surfaces, where noise
	// moves a small curvature by much of itself); fairDip the least rise,
	// relative, from a minimum to the maxima either side that makes it a
	// dip.
	fairRippleFloor = 10
	fairDip         = 0.3
	// fairSag is the bulge of a lobe (the largest distance of the curve
	// from the chord across it), in units of the noise, beyond which the
	// lobe is shape the points carry rather than a wiggle: noise that a
	// fit leaves in the curve bulges by a fraction of the noise (it is
	// averaged over the points along the lobe), while a section's own
	// short lobe (the lower surface of a thin section with its camber
	// forward, as NACA 23008 between 6 % and 16 % of the chord) bulges by
	// tens of times the noise of a good scan, and smoothing it away
	// leaves the curve that far off the points.
	fairSag = 2
	// fairSagSamples is the number of points at which a lobe's bulge is
	// measured.
	fairSagSamples = 16
)

// Fairness measures the fairness of a curve.
type Fairness struct {
	// Inflections counts the sign changes of the curvature (beyond the
	// flat band ±fairFlat/L).
	Inflections int `json:"inflections"`
	// Wiggles counts the lobes of curvature, between two inflections,
	// shorter than fairLobe feature scales and over which the feature
	// scale changes by at most fairRatio: inflections made by noise.
	Wiggles int `json:"wiggles"`
	// lobes are the arcs [a, b] of the wiggles, dips those of the
	// ripples.
	lobes, dips [][2]float64
	// Ripples counts the dips of the curvature on the strongly curved,
	// convex arcs (the nose, a rounded end; curvature above fairRippleFloor
	// over the length): a minimum between two maxima, each at least
	// fairDip beyond it. There the curvature of a section rises to one
	// maximum and falls away; a dip is noise the fit followed, which a
	// panel method turns into a wave of the pressure round the nose, and
	// no sign change of the curvature shows it.
	Ripples int `json:"ripples"`
	// Roughness is the RMS of the derivative of the curvature along the
	// arc, dκ/ds, in the curve's units (1/length²). In chord units a
	// smooth NACA section gives tens (the nose dominates); noise left in
	// the curve, hundreds to thousands.
	Roughness float64 `json:"roughness"`
}

// curvatureSample is the curvature at an arc position.
type curvatureSample struct{ s, k float64 }

// curvatureSamples returns fairSamples curvature samples per piece of cv,
// with their arc positions.
func curvatureSamples(cv *Curve) []curvatureSample {
	out := make([]curvatureSample, 0, fairSamples*cv.Pieces()+1)
	for i := 0; i < cv.Pieces(); i++ {
		h := cv.Span(i)
		for k := 0; k < fairSamples; k++ {
			u := h * (float64(k) + 0.5) / fairSamples
			out = append(out, curvatureSample{s: cv.arc(i, u), k: cv.curvatureAt(i, u)})
		}
	}
	return out
}

// MeasureFairness returns the fairness of cv. T, when not nil, gives the
// feature scale at arc length s; nil measures lobes against
// fairLobeMax of the length only. noise, when positive, is the noise of
// the points the curve was fitted to: a lobe that bulges by more than
// fairSag times it is not counted as a wiggle.
func MeasureFairness(cv *Curve, T func(s float64) float64, noise float64) Fairness {
	ks := curvatureSamples(cv)
	L := cv.Length()
	var f Fairness
	if len(ks) < 3 || !(L > 0) {
		return f
	}
	// Roughness: RMS of dκ/ds between neighbouring samples.
	var ss, sl float64
	for j := 1; j < len(ks); j++ {
		ds := ks[j].s - ks[j-1].s
		if ds <= 0 {
			continue
		}
		d := (ks[j].k - ks[j-1].k) / ds
		ss += d * d * ds
		sl += ds
	}
	if sl > 0 {
		f.Roughness = math.Sqrt(ss / sl)
	}
	// Inflections with hysteresis: the sign changes when the curvature
	// passes the far side of the flat band.
	flat := fairFlat / L
	var crossings []float64 // arc positions of the inflections
	sign := 0
	var lastOut float64 // arc position where the curvature last left the band on the current side
	for _, c := range ks {
		switch {
		case c.k > flat:
			if sign < 0 {
				crossings = append(crossings, (lastOut+c.s)/2)
			}
			sign, lastOut = 1, c.s
		case c.k < -flat:
			if sign > 0 {
				crossings = append(crossings, (lastOut+c.s)/2)
			}
			sign, lastOut = -1, c.s
		default:
			if sign != 0 {
				// Still on the same side; remember where it was last
				// beyond the band.
				_ = lastOut
			}
		}
	}
	if cv.Closed() && len(crossings) > 0 && len(ks) > 0 {
		// The sign at the start against the sign at the end: one more
		// crossing across the closing point when they differ.
		first := 0
		for _, c := range ks {
			if c.k > flat {
				first = 1
				break
			}
			if c.k < -flat {
				first = -1
				break
			}
		}
		if first != 0 && first != sign {
			crossings = append(crossings, L)
		}
	}
	f.Inflections = len(crossings)
	wrap := func(s float64) float64 {
		if cv.Closed() {
			return s - L*math.Floor(s/L)
		}
		return math.Max(0, math.Min(L, s))
	}
	// short: a lobe short beside the feature scale, where the feature
	// scale does not change fast.
	short := func(a, b float64) bool {
		m := fairLobeMax * L
		if T == nil {
			return b-a < m
		}
		ta, tb, tm := T(wrap(a)), T(wrap(b)), T(wrap((a+b)/2))
		return b-a < math.Min(m, fairLobe*tm) && max(ta, tb, tm) <= fairRatio*min(ta, tb, tm)
	}
	wiggle := func(a, b float64) bool {
		if noise > 0 && lobeSag(cv, a, b, wrap) > fairSag*noise {
			return false
		}
		return short(a, b)
	}
	for j := 1; j < len(crossings); j++ {
		a, b := crossings[j-1], crossings[j]
		if wiggle(a, b) {
			f.Wiggles++
			f.lobes = append(f.lobes, [2]float64{a, b})
		}
	}
	if cv.Closed() && len(crossings) > 1 {
		a, b := crossings[len(crossings)-1], crossings[0]+L
		if wiggle(a, b) {
			f.Wiggles++
			f.lobes = append(f.lobes, [2]float64{a - L, b - L})
		}
	}
	// Dips of the curvature count round the nose only, the middle half of
	// the outline from the trailing edge (a sparse rounded end's arc may
	// dip where its few points put it), and when short beside the feature
	// scale where it does not change fast. (A wiggle's bulge test does not
	// apply: the arc of a dip is curved as the nose is.)
	for _, r := range ripples(ks, fairRippleFloor/L) {
		if r[0] > L/4 && r[1] < 3*L/4 && short(r[0], r[1]) {
			f.Ripples++
			f.dips = append(f.dips, r)
		}
	}
	return f
}

// ripples returns the arcs of the dips of the curvature on its strongly
// curved convex arcs (Fairness.Ripples): each dip's minimum with, either
// side, the arc to the nearer of the maxima that enclose it.
func ripples(ks []curvatureSample, floor float64) [][2]float64 {
	if !(floor > 0) {
		return nil
	}
	var out [][2]float64
	// Extrema with hysteresis, one run of samples above the floor at a
	// time: kind +1 a maximum, −1 a minimum.
	type extremum struct {
		kind int
		s    float64
	}
	var ext []extremum
	flush := func() {
		for j := 1; j+1 < len(ext); j++ {
			if ext[j].kind < 0 && ext[j-1].kind > 0 && ext[j+1].kind > 0 {
				w := math.Min(ext[j].s-ext[j-1].s, ext[j+1].s-ext[j].s)
				out = append(out, [2]float64{ext[j].s - w, ext[j].s + w})
			}
		}
		ext = ext[:0]
	}
	dir := 0
	var ev, es float64
	for _, c := range ks {
		if c.k < floor {
			flush()
			dir, ev = 0, 0
			continue
		}
		switch {
		case dir >= 0:
			if c.k >= ev {
				ev, es = c.k, c.s
			} else if c.k < ev*(1-fairDip) {
				ext = append(ext, extremum{1, es})
				dir, ev, es = -1, c.k, c.s
			}
		default:
			if c.k <= ev {
				ev, es = c.k, c.s
			} else if c.k > ev*(1+fairDip) {
				ext = append(ext, extremum{-1, es})
				dir, ev, es = 1, c.k, c.s
			}
		}
	}
	if dir > 0 {
		ext = append(ext, extremum{1, es})
	}
	flush()
	return out
}

// lobeSag returns the largest distance of cv between arc positions a and
// b (wrapped onto the curve by wrap) from the straight line through its
// points there.
func lobeSag(cv *Curve, a, b float64, wrap func(float64) float64) float64 {
	p, q := cv.At(wrap(a)), cv.At(wrap(b))
	d := q.Sub(p)
	l := math.Hypot(d.X, d.Y)
	if !(l > 0) {
		return 0
	}
	var worst float64
	for k := 1; k < fairSagSamples; k++ {
		r := cv.At(wrap(a + (b-a)*float64(k)/fairSagSamples)).Sub(p)
		worst = math.Max(worst, math.Abs(d.X*r.Y-d.Y*r.X)/l)
	}
	return worst
}
