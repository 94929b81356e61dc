package clean

import (
	"math"
	"slices"

	"github.com/foilwright/foilwright/geometry"
)

// Regions of a section order (sectionCoords).
const (
	regionNone  = -1
	regionUpper = 0 // between the caps, upper surface: y(x)
	regionNose  = 1 // the nose cap: radius about its centre against angle
	regionLower = 2 // between the caps, lower surface: y(x)
	regionTail  = 3 // the tail cap: radius about its centre against angle
)

// sectionWindow is the half-width, in points, of the robust fits of a
// section order: wide enough that a run of up to four outliers (a
// scanner's reflection) is a minority of the window.
const sectionWindow = 8

// surfaceSpan is the largest distance along the chord, as a share of a
// point's distance from the nose, of the neighbours of the shorter of the
// two fits between the caps (see fitAt): a surface's curvature grows
// towards the nose as the distance from it shrinks, and on a surface probed
// far more coarsely than the other sectionWindow points span half the
// chord, over which a parabola misses the good points near the nose by
// more than any noise.
const surfaceSpan = 0.5

// shortMin is the number of nearest neighbours on each side that the
// shorter window keeps whatever their distance.
const shortMin = 2

// capSpan is the largest place difference (in the units of the section
// order's u, where a cap spans 1, i.e. 180°) of the neighbours of a
// point's fit in a cap: the radius about the cap's centre turns quickly
// round a nose much smaller than the cap, and a parabola in the angle
// follows it only over about 20°.
const capSpan = 0.11

// sectionCoords holds, per point, where the section order placed it: its
// region and the coordinates in which the region is a function, v(t) (in
// chord units): y against x between the caps, the radius about the cap's
// centre against the place round the cap in the caps.
type sectionCoords struct {
	region []int8
	t, v   []float64
	// The frame and the nose cap's centre (chord units), to turn a foot
	// found in the coordinates back into the input's.
	frame  chordFrame
	xn, yn float64
	xt     float64
	// place is each point's place round the loop (the u of sectionOrder,
	// from 3.5 on), by point index.
	place []float64
	// spared marks, by point index, the points of the trailing edge's end
	// zone (nil: none): no fit of another point takes them in.
	spared []bool
	// The last robust fit made for each point (by point index), with the
	// neighbours it was made on in order, as offsets from the point's own
	// index (memoD, sectionWindow·2 a point; memoK of them, −1 when none
	// is kept, as when an offset does not fit in 16 bits). A point's fit
	// depends on nothing else (its t and v and theirs are fixed), so a
	// point whose neighbours are the same as last time gets the same fit
	// back: the outlier rounds and the feet refit every point, and most
	// have the same neighbours as before.
	memoD   []int16
	memoK   []int8
	memoFit [][2]float64
}

func newSectionCoords(n int) *sectionCoords {
	sc := &sectionCoords{region: make([]int8, n), t: make([]float64, n), v: make([]float64, n), place: make([]float64, n),
		memoD: make([]int16, n*2*sectionWindow), memoK: make([]int8, n), memoFit: make([][2]float64, n)}
	for i := range sc.region {
		sc.region[i] = regionNone
		sc.memoK[i] = -1
	}
	return sc
}

func (sc *sectionCoords) set(i int32, region int8, t, v float64) {
	sc.region[i], sc.t[i], sc.v[i] = region, t, v
}

// residualsAt sets r[i], for each position i of the loop seq in at (every
// position when at is nil), to the residual of its point against a robust
// local fit of v(t) to up to sectionWindow neighbours on each side within
// its region (itself and the spared points of the end zone left out): a
// parabola, weighted by Tukey's biweight after a plain fit (three rounds,
// common practice), so that a few outliers
// among the neighbours, even in a run, do not pull it. Between the caps the
// offset in y is turned into the distance normal to the fitted surface.
// In a section order a point's neighbours along the chord lie at about its
// x whatever their order across a noisy band, so these fits see no
// zigzag. A point with fewer than four neighbours in its region takes the
// point-to-point fit of localFit. Input units: the chord scale is chord.
func (sc *sectionCoords) residualsAt(pts []geometry.Point, seq []int32, at []int, r []float64, chord float64) {
	n := len(seq)
	m := n
	if at != nil {
		m = len(at)
	}
	parallel(m, func(a, b int) {
		for j := a; j < b; j++ {
			i := j
			if at != nil {
				i = at[j]
			}
			p := seq[i]
			v0, slope, ok := sc.fitAt(seq, i)
			if !ok {
				r[i] = localFit(pts, seq, i, min(fitK, (n-1)/2))
				continue
			}
			d := math.Abs(sc.v[p] - v0)
			if g := sc.region[p]; g == regionUpper || g == regionLower {
				d /= math.Sqrt(1 + slope*slope)
			}
			r[i] = d * chord
		}
	})
}

// fitAt returns the robust local fit of v(t) at position i of seq (see
// residualsAt): its value and slope at the point's t; ok is false when
// fewer than four neighbours share its region.
func (sc *sectionCoords) fitAt(seq []int32, i int) (v0, slope float64, ok bool) {
	n := len(seq)
	var ts, vs [2 * sectionWindow]float64
	var ids [2 * sectionWindow]int32
	p := seq[i]
	g := sc.region[p]
	if g == regionNone {
		return 0, 0, false
	}
	// Between the caps a second, shorter window is sized by the local
	// feature size (see shortWindow): near holds, by position in ts, the
	// neighbours within it.
	reach := math.Inf(1)
	if g == regionUpper || g == regionLower {
		reach = surfaceSpan * max(sc.t[p], noseCap)
	}
	var near [2 * sectionWindow]bool
	k, short := 0, 0
	for _, dir := range [2]int{-1, 1} {
		side := 0
		for s := 1; s <= sectionWindow && s < n/2; s++ {
			q := seq[((i+dir*s)%n+n)%n]
			if sc.spared != nil && sc.spared[q] {
				continue // the end zone is the edge models' to judge
			}
			if sc.region[q] != g || (g == regionNose || g == regionTail) && math.Abs(sc.t[q]-sc.t[p]) > capSpan {
				break
			}
			ts[k], vs[k], ids[k] = sc.t[q]-sc.t[p], sc.v[q], q
			if side < shortMin || math.Abs(ts[k]) <= reach {
				near[k] = true
				short++
			}
			k++
			side++
		}
	}
	if k < 4 {
		return 0, 0, false
	}
	last := sc.memoD[int(p)*2*sectionWindow : int(p+1)*2*sectionWindow][:k]
	same, fits := int(sc.memoK[p]) == k, true
	for j, q := range ids[:k] {
		d := q - p
		same = same && int32(last[j]) == d
		fits = fits && d == int32(int16(d))
	}
	if same {
		f := sc.memoFit[p]
		return f[0], f[1], true
	}
	v0, slope = robustParabola(ts[:k], vs[:k])
	if short >= 4 && short < k {
		// The shorter window's fit where it lies nearer the point: a good
		// point where a coarse step spreads the window over a stretch
		// that curves more than a parabola follows is matched by it; a
		// gross outlier, never in its own fit, is off both.
		var st, sv [2 * sectionWindow]float64
		m := 0
		for j := range k {
			if near[j] {
				st[m], sv[m] = ts[j], vs[j]
				m++
			}
		}
		if w0, w1 := robustParabola(st[:m], sv[:m]); math.Abs(sc.v[p]-w0) < math.Abs(sc.v[p]-v0) {
			v0, slope = w0, w1
		}
	}
	sc.memoK[p] = -1
	if fits {
		for j, q := range ids[:k] {
			last[j] = int16(q - p)
		}
		sc.memoK[p], sc.memoFit[p] = int8(k), [2]float64{v0, slope}
	}
	return v0, slope, true
}

// feet returns, by point index (len(pts); the zero point and false where
// none was found), the foot of each point of the loop seq on the robust
// local curve through its neighbours (input coordinates): between the caps
// the projection onto the fitted line y(x), in the nose cap the point at
// the fitted radius in its direction from the cap's centre. For a band of
// points the feet lie along a smooth curve, in order.
func (sc *sectionCoords) feet(pts []geometry.Point, seq []int32) ([]geometry.Point, []bool) {
	out := make([]geometry.Point, len(pts))
	have := make([]bool, len(pts))
	parallel(len(seq), func(a, b int) {
		for i := a; i < b; i++ {
			p := seq[i]
			v0, slope, ok := sc.fitAt(seq, i)
			if !ok {
				continue
			}
			switch sc.region[p] {
			case regionUpper, regionLower:
				x, y := sc.t[p], sc.v[p]
				xf := x + slope*(y-v0)/(1+slope*slope)
				out[p], have[p] = sc.frame.point(xf, v0+slope*(xf-x)), true
			case regionNose:
				x, y := sc.frame.at(pts[p])
				dx, dy := x-sc.xn, y-sc.yn
				if d := math.Hypot(dx, dy); d > 0 {
					out[p], have[p] = sc.frame.point(sc.xn+dx*v0/d, sc.yn+dy*v0/d), true
				}
			}
		}
	})
	return out, have
}

// robustParabola fits v = c0 + c1 t + c2 t² to the pairs (ts, vs), t
// relative to the point of interest at 0, by least squares and then twice
// more with Tukey's biweight (c = 4.685 robust sigmas), and returns the
// value and the slope at t = 0. It takes at most 2·sectionWindow pairs and
// allocates nothing: it runs once per point and outlier round.
func robustParabola(ts, vs []float64) (float64, float64) {
	var scale float64
	for _, t := range ts {
		scale = max(scale, math.Abs(t))
	}
	var buf [2 * sectionWindow]float64
	if scale == 0 {
		return median(append(buf[:0], vs...)), 0
	}
	var us, ws [2 * sectionWindow]float64
	n := len(ts)
	for i, t := range ts {
		us[i], ws[i] = t/scale, 1
	}
	// The normal equations of the weighted fit in the basis (1, u, u²),
	// each sum formed as w·x[r]·x[c] in that order (the products with 1
	// are exact), so the system is the one of the plain triple loop.
	fit := func() ([3]float64, bool) {
		var a00, a01, a02, a11, a12, a21, a22, b0, b1, b2 float64
		for i := range n {
			w, u, v := ws[i], us[i], vs[i]
			u2 := u * u
			wu, wu2 := w*u, w*u2
			a00 += w
			a01 += wu
			a02 += wu2
			a11 += wu * u
			a12 += wu * u2
			a21 += wu2 * u
			a22 += wu2 * u2
			b0 += w * v
			b1 += wu * v
			b2 += wu2 * v
		}
		return solve3([3][3]float64{{a00, a01, a02}, {a01, a11, a12}, {a02, a21, a22}}, [3]float64{b0, b1, b2})
	}
	c, ok := fit()
	if !ok {
		return median(append(buf[:0], vs...)), 0
	}
	var res [2 * sectionWindow]float64
	for range 3 {
		for i := range n {
			u := us[i]
			res[i] = math.Abs(vs[i] - (c[0] + c[1]*u + c[2]*u*u))
		}
		s := 1.4826 * median(append(buf[:0], res[:n]...))
		if s == 0 {
			break
		}
		for i := range n {
			z := res[i] / (4.685 * s)
			if z >= 1 {
				ws[i] = 0
			} else {
				ws[i] = (1 - z*z) * (1 - z*z)
			}
		}
		c2, ok := fit()
		if !ok {
			break
		}
		c = c2
	}
	return c[0], c[1] / scale
}

// byFeet re-orders the loop seq by its points' feet (feet, have): between
// the caps by the chordwise place of the foot rather than of the point,
// which in a noisy band differ by the slope times the noise; and returns
// the loop and each point's position along the polygon of the feet
// (input units, from the first point).
func (sc *sectionCoords) byFeet(pts []geometry.Point, seq []int32, feet []geometry.Point, have []bool) ([]int32, []float64) {
	span := sc.xt - sc.xn
	key := func(i int32) float64 {
		u := sc.place[i]
		if !have[i] {
			return u
		}
		switch sc.region[i] {
		case regionUpper, regionLower:
			x, _ := sc.frame.at(feet[i])
			if x < sc.xn || x > sc.xt {
				return u // the tail cap keeps its angle
			}
			if sc.region[i] == regionUpper {
				u = (sc.xt - x) / span
			} else {
				u = 2 + (x-sc.xn)/span
			}
			if u < 3.5 {
				u += 4
			}
		}
		return u
	}
	out := slices.Clone(seq)
	keys := make([]float64, len(pts)) // by point index
	for _, i := range out {
		keys[i] = key(i)
	}
	slices.SortStableFunc(out, func(a, b int32) int {
		switch ka, kb := keys[a], keys[b]; {
		case ka < kb:
			return -1
		case ka > kb:
			return 1
		}
		return 0
	})
	return out, alongFeet(pts, out, feet, have)
}

// alongFeet returns the position of each point of the loop seq along the
// polygon of its feet (the point itself where it has none), from 0.
func alongFeet(pts []geometry.Point, seq []int32, feet []geometry.Point, have []bool) []float64 {
	at := func(i int32) geometry.Point {
		if have[i] {
			return feet[i]
		}
		return pts[i]
	}
	along := make([]float64, len(seq))
	for k := 1; k < len(seq); k++ {
		along[k] = along[k-1] + at(seq[k]).Dist(at(seq[k-1]))
	}
	return along
}
