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
	// spared marks, by point index, the points of the trailing edge's end
	// zone (nil: none): no fit of another point takes them in.
	spared []bool
}

func newSectionCoords(n int) *sectionCoords {
	sc := &sectionCoords{region: make([]int8, n), t: make([]float64, n), v: make([]float64, n)}
	for i := range sc.region {
		sc.region[i] = regionNone
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
		var ts, vs [2 * sectionWindow]float64
		for j := a; j < b; j++ {
			i := j
			if at != nil {
				i = at[j]
			}
			p := seq[i]
			g := sc.region[p]
			k := 0
			if g != regionNone {
				for _, dir := range [2]int{-1, 1} {
					for s := 1; s <= sectionWindow && s < n/2; s++ {
						q := seq[((i+dir*s)%n+n)%n]
						if sc.spared != nil && sc.spared[q] {
							continue // the end zone is the edge models' to judge
						}
						if sc.region[q] != g || (g == regionNose || g == regionTail) && math.Abs(sc.t[q]-sc.t[p]) > capSpan {
							break
						}
						ts[k], vs[k] = sc.t[q]-sc.t[p], sc.v[q]
						k++
					}
				}
			}
			if k < 4 {
				r[i] = localFit(pts, seq, i, min(fitK, (n-1)/2))
				continue
			}
			v0, slope := robustParabola(ts[:k], vs[:k])
			d := math.Abs(sc.v[p] - v0)
			if g == regionUpper || g == regionLower {
				d /= math.Sqrt(1 + slope*slope)
			}
			r[i] = d * chord
		}
	})
}

// robustParabola fits v = c0 + c1 t + c2 t² to the pairs (ts, vs), t
// relative to the point of interest at 0, by least squares and then twice
// more with Tukey's biweight (c = 4.685 robust sigmas), and returns the
// value and the slope at t = 0.
func robustParabola(ts, vs []float64) (float64, float64) {
	var scale float64
	for _, t := range ts {
		scale = max(scale, math.Abs(t))
	}
	if scale == 0 {
		return median(slices.Clone(vs)), 0
	}
	w := make([]float64, len(ts))
	for i := range w {
		w[i] = 1
	}
	fit := func() ([3]float64, bool) {
		var a [3][3]float64
		var b [3]float64
		for i, t := range ts {
			u := t / scale
			x := [3]float64{1, u, u * u}
			for r := range 3 {
				b[r] += w[i] * x[r] * vs[i]
				for c := range 3 {
					a[r][c] += w[i] * x[r] * x[c]
				}
			}
		}
		return solve3(a, b)
	}
	c, ok := fit()
	if !ok {
		return median(slices.Clone(vs)), 0
	}
	res := make([]float64, len(ts))
	for range 3 {
		for i, t := range ts {
			u := t / scale
			res[i] = math.Abs(vs[i] - (c[0] + c[1]*u + c[2]*u*u))
		}
		s := 1.4826 * median(slices.Clone(res))
		if s == 0 {
			break
		}
		for i := range w {
			z := res[i] / (4.685 * s)
			if z >= 1 {
				w[i] = 0
			} else {
				w[i] = (1 - z*z) * (1 - z*z)
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
