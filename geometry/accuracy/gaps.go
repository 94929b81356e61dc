package accuracy

import (
	"fmt"
	"math"
	"sort"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/frame"
)

// Limits of Gaps.
const (
	// gapTurnDeg is the largest turn of the outline (degrees) between two
	// neighbouring points that passes without a warning: a curve through
	// points that far apart round a bend guesses its shape.
	gapTurnDeg = 45
	// gapsListed is the most gaps listed; the rest are counted.
	gapsListed = 4
	// gapMin is the shortest gap considered, in chords.
	gapMin = 1e-3
)

// Gaps returns warnings for stretches of the outline the points do not
// support: where the outline turns by more than gapTurnDeg between two
// neighbouring points, the nose (the stretch holding the leading edge)
// first, each with the size of the gap, the turn and the points either
// side (file:line), the worst gapsListed of the rest listed. c is the
// contour fitted, rep the fit's report (the arc length of each point's
// foot on cv), nz the normalised section.
func Gaps(c *geometry.Contour, rep *curve.FitReport, cv *curve.Curve, nz *frame.Normalized) []string {
	n := c.Len()
	if n < 2 || len(rep.S) != n {
		return nil
	}
	chord := nz.Frame.Chord
	L := cv.Length()
	order := make([]int, n)
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool { return rep.S[order[a]] < rep.S[order[b]] })
	origin := func(i int) string {
		if i < len(c.Origins) {
			return c.Origins[i].String()
		}
		return fmt.Sprintf("point %d", i+1)
	}
	at := func(s float64) float64 { // a closed curve wraps
		if cv.Closed() {
			return math.Mod(s, L)
		}
		return s
	}
	turn := func(a, b float64) float64 { return turnBetween(cv, a, b) }
	sLE, _ := cv.Project(geometry.Point{X: nz.Frame.LE[0], Y: nz.Frame.LE[1]})
	type gap struct {
		i, j      int
		len, turn float64
		nose      bool
		at        float64 // chord station of its middle
	}
	var gaps []gap
	for k := 0; k < n; k++ {
		i, j := order[k], order[(k+1)%n]
		a, b := rep.S[i], rep.S[j]
		if k == n-1 {
			if !cv.Closed() {
				break
			}
			b += L
		}
		if b-a <= gapMin*chord {
			continue // too short to hide anything (points at a corner)
		}
		tg := turn(a, b)
		if tg <= gapTurnDeg {
			continue
		}
		nose := (sLE >= a && sLE < b) || (sLE+L >= a && sLE+L < b)
		gaps = append(gaps, gap{i: i, j: j, len: b - a, turn: tg, nose: nose, at: nz.Frame.ToChord(cv.At(at((a + b) / 2))).X})
	}
	sort.SliceStable(gaps, func(a, b int) bool {
		if gaps[a].nose != gaps[b].nose {
			return gaps[a].nose
		}
		return gaps[a].turn > gaps[b].turn
	})
	var out []string
	for k, g := range gaps {
		if k == gapsListed {
			out = append(out, fmt.Sprintf("and %d more stretch(es) where the outline turns more than %d° between neighbouring points", len(gaps)-k, gapTurnDeg))
			break
		}
		if g.nose {
			out = append(out, fmt.Sprintf("the nose is sampled too sparsely: %s and %s, either side of the leading edge, are %.3g %s (%.3g c) apart and the outline turns %.0f° between them; the leading edge, the chord and the nose radius rest on the curve's guess there",
				origin(g.i), origin(g.j), g.len, c.Units, g.len/chord, g.turn))
			continue
		}
		out = append(out, fmt.Sprintf("the outline turns %.0f° between %s and %s, %.3g %s (%.3g c) apart about x = %.2f: the curve there is a guess",
			g.turn, origin(g.i), origin(g.j), g.len, c.Units, g.len/chord, g.at))
	}
	return out
}

// turnBetween returns the turn of cv's tangent, in degrees, from arc
// length a to b (b may pass the length of a closed curve), summed over
// short steps.
func turnBetween(cv *curve.Curve, a, b float64) float64 {
	L := cv.Length()
	at := func(s float64) float64 {
		if cv.Closed() {
			return math.Mod(s, L)
		}
		return s
	}
	const steps = 16
	var total float64
	prev := cv.Tangent(at(a))
	for k := 1; k <= steps; k++ {
		t := cv.Tangent(at(a + (b-a)*float64(k)/steps))
		total += math.Atan2(prev.Cross(t), prev.Dot(t))
		prev = t
	}
	return math.Abs(total) * 180 / math.Pi
}

// noseStretchGaps is the most sparse gaps taken into the nose's stretch
// on each side of the one holding the leading edge (noseStretch): a nose
// guessed over more than that is far beyond what a bound can mend, and
// the widening stops growing with a sampling that coarse everywhere.
const noseStretchGaps = 3

// noseStretch returns the arc lengths a < b on cv of the points that end
// the stretch of the nose the points leave to the curve's guess, and
// whether there is one: the gap between the points either side of the
// leading edge (arc lengths rep.S) when it is longer than gapMin chords
// and the outline turns more than gapTurnDeg over it (the nose Gaps
// warns of), together with the gaps next to it, up to noseStretchGaps on
// each side, that are sparse the same way: the part's leading edge may
// lie anywhere over them. On a closed curve b may exceed its length.
func noseStretch(rep *curve.FitReport, cv *curve.Curve, nz *frame.Normalized) (a, b float64, ok bool) {
	n := len(rep.S)
	if n < 2 || !(nz.Frame.Chord > 0) {
		return 0, 0, false
	}
	L := cv.Length()
	closed := cv.Closed()
	s := append([]float64(nil), rep.S...)
	sort.Float64s(s)
	// at returns the arc length of the k-th point, k counted on round a
	// closed curve (k < 0 or k ≥ n) with L added per turn.
	at := func(k int) float64 {
		turns := math.Floor(float64(k) / float64(n))
		return s[k-int(turns)*n] + turns*L
	}
	sparse := func(k int) bool { // the gap from point k to point k+1
		if !closed && (k < 0 || k+1 >= n) {
			return false
		}
		lo, hi := at(k), at(k+1)
		if lo < 0 {
			lo, hi = lo+L, hi+L
		}
		return hi-lo > gapMin*nz.Frame.Chord && turnBetween(cv, lo, hi) > gapTurnDeg
	}
	sLE, _ := cv.Project(geometry.Point{X: nz.Frame.LE[0], Y: nz.Frame.LE[1]})
	k := sort.SearchFloat64s(s, sLE) - 1 // the gap from point k to k+1 holds sLE
	if k < 0 || k >= n-1 {
		if !closed {
			return 0, 0, false
		}
		k = n - 1 // the gap across the start of the curve
		if sLE < s[0] {
			k = -1
		}
	}
	if !sparse(k) {
		return 0, 0, false
	}
	lo, hi := k, k+1
	for m := 0; m < noseStretchGaps && sparse(lo-1) && hi-(lo-1) < n; m++ {
		lo--
	}
	for m := 0; m < noseStretchGaps && sparse(hi) && hi+1-lo < n; m++ {
		hi++
	}
	a, b = at(lo), at(hi)
	if a < 0 {
		a, b = a+L, b+L
	}
	return a, b, true
}

// stretchPoints returns the arc lengths on cv, increasing, of the points
// of the nose's stretch [a, b] (noseStretch) and of one point either side
// of it, and whether both exist. On a closed curve they are counted on
// round (the first may be negative, the last may exceed the length).
func stretchPoints(rep *curve.FitReport, cv *curve.Curve, a, b float64) ([]float64, bool) {
	n := len(rep.S)
	L := cv.Length()
	if n < 4 || !(L > 0) {
		return nil, false
	}
	s := append([]float64(nil), rep.S...)
	sort.Float64s(s)
	closed := cv.Closed()
	// at returns the arc length of the k-th point, k counted on round a
	// closed curve with L added per turn.
	at := func(k int) float64 {
		turns := math.Floor(float64(k) / float64(n))
		return s[k-int(turns)*n] + turns*L
	}
	eps := 1e-9 * L
	turns := math.Floor(a / L)
	if !closed {
		turns = 0
	}
	k0 := sort.SearchFloat64s(s, a-turns*L-eps) + int(turns)*n // the point at a
	if at(k0) > a+eps || at(k0) < a-eps {
		return nil, false
	}
	out := []float64{}
	for k := k0 - 1; ; k++ {
		if !closed && (k < 0 || k >= n) {
			return nil, false
		}
		if k-(k0-1) > n {
			return nil, false
		}
		out = append(out, at(k))
		if at(k) > b+eps {
			break
		}
	}
	if len(out) < 4 {
		return nil, false
	}
	return out, true
}

// noseRegionFar returns how far from the section's leading edge le (input
// coordinates) the part's leading edge may lie when its nose is sampled
// sparsely over the stretch [a, b] of cv (noseStretch), and whether the
// points bound it. The nose of an aerofoil is convex (common practice),
// and a convex outline between two neighbouring points p₁, p₂ lies
// outside the line p₁–p₂ and inside the lines through each of them and
// its other neighbour, carried on past it: in the triangle p₁, q, p₂, q
// where those lines cross (common practice). Over the stretch that is one
// triangle a gap; the part's leading edge, the point farthest forward
// along the chord line, lies in their union, and no further aft than the
// foremost point measured. The answer is the largest distance from le to
// that region, plus noiseMargin times the noise or the largest residual
// of the points that place the lines, if larger (their scatter moves the
// lines). ok is false where the points turn the other way
// somewhere over the stretch and its neighbours, or two lines do not cross
// ahead of the points (a gap turning half a turn): the region is then
// not bounded by the points; and where a point outside the stretch lies
// ahead of all of it.
func noseRegionFar(rep *curve.FitReport, cv *curve.Curve, fr frame.Frame, le geometry.Point, a, b float64) (far float64, ok bool) {
	ts, ok := stretchPoints(rep, cv, a, b)
	if !ok || !(fr.Chord > 0) {
		return 0, false
	}
	L := cv.Length()
	at := func(t float64) geometry.Point {
		if cv.Closed() {
			t = math.Mod(math.Mod(t, L)+L, L)
		}
		return fr.ToChord(cv.At(t))
	}
	ps := make([]geometry.Point, len(ts))
	for k, t := range ts {
		ps[k] = at(t)
	}
	// Convex: the points turn one way at every point of the stretch.
	sign := 0.0
	for k := 1; k+1 < len(ps); k++ {
		c := ps[k].Sub(ps[k-1]).Cross(ps[k+1].Sub(ps[k]))
		if !(c != 0) || (sign != 0 && math.Copysign(1, c) != sign) {
			return 0, false
		}
		sign = math.Copysign(1, c)
	}
	// The foremost point measured (the leading edge lies at or ahead of
	// it; x runs aft in the normalised frame).
	x0 := math.Inf(1)
	for _, t := range rep.S {
		x0 = math.Min(x0, at(t).X)
	}
	o := fr.ToChord(le)
	found := false
	for k := 1; k+2 < len(ps); k++ {
		p1, p2 := ps[k], ps[k+1]
		d1, d2 := p1.Sub(ps[k-1]), p2.Sub(ps[k+2])
		det := d1.Cross(d2)
		if det == 0 {
			return 0, false
		}
		// p1 + s·d1 = p2 + t·d2 with s, t > 0: the lines cross ahead of
		// both points.
		w := p2.Sub(p1)
		s, t := w.Cross(d2)/det, w.Cross(d1)/det
		if !(s > 0) || !(t > 0) {
			return 0, false
		}
		q := p1.Add(d1.Scale(s))
		for _, r := range clipAft([]geometry.Point{p1, q, p2}, x0) {
			far, found = math.Max(far, r.Dist(o)), true
		}
	}
	if !found {
		// A point outside the stretch lies foremost: the leading edge is
		// not in the stretch's gaps, and they do not bound it.
		return 0, false
	}
	// The lines run through the points' feet on the curve; a point that
	// lies off it by more than the noise (an outlier kept, listed, at the
	// gap's end) may pull the curve and the lines by its residual.
	margin := noiseMargin * rep.NoiseEstimate
	if len(rep.Residual) == len(rep.S) {
		lo, hi := ts[0], ts[len(ts)-1]
		for i, t := range rep.S {
			for _, u := range []float64{t - L, t, t + L} {
				if u >= lo-1e-9*L && u <= hi+1e-9*L {
					margin = math.Max(margin, math.Abs(rep.Residual[i]))
				}
			}
		}
	}
	return far*fr.Chord + margin, true
}

// clipAft returns the polygon poly cut to its part with x ≤ x0 (one
// half-plane of Sutherland–Hodgman clipping, common practice).
func clipAft(poly []geometry.Point, x0 float64) []geometry.Point {
	var out []geometry.Point
	for k := range poly {
		c, d := poly[k], poly[(k+1)%len(poly)]
		cin, din := c.X <= x0, d.X <= x0
		if cin {
			out = append(out, c)
		}
		if cin != din {
			out = append(out, c.Add(d.Sub(c).Scale((x0-c.X)/(d.X-c.X))))
		}
	}
	return out
}

// noiseMargin is how many noise figures noseRegionFar adds for the
// scatter of the points that place its lines.
const noiseMargin = 3

// Limits of tipStretch.
const (
	// tipTurnDeg is the least turn of the outline (degrees) over a gap
	// between points at the end of a kept rounded trailing edge for the
	// end to count as unsampled: a quarter turn, more than half of what
	// an end of included angle up to 90° turns in all (our choice).
	tipTurnDeg = 90
	// tipReach is how far along the outline either side of the tip
	// (chords) a gap may start or end to count as one at the end: as far
	// as the largest rounded end reaches (frame.EdgeMaxTERadius, times
	// the quarter turn π/2 that takes round it).
	tipReach = frame.EdgeMaxTERadius * math.Pi / 2
	// tipSpacings is how many mean spacings of the points round the end
	// an unsampled stretch there may span (see tipStretch), and how many
	// gaps on either side that mean is taken over.
	tipSpacings = 5
	// tipGaps is how many times the gap at the end an unsampled stretch
	// there may span (see tipStretch).
	tipGaps = 4
)

// tipStretch returns, for a section nz whose kept rounded trailing edge
// the points leave unsampled, how far (chord units) the point where the
// surfaces' straight continuations meet (frame.RoundedEnd.Sharp) lies
// from the tip along the chord line and across it; ok is false otherwise.
// The end is unsampled when a gap between neighbouring points (arc
// lengths rep.S on cv) within tipReach of the tip turns the outline by
// more than tipTurnDeg: a point at the tip with the rest of the end's turn
// unsampled on one side leaves the end's shape as much a guess as a gap
// over the tip.
func tipStretch(rep *curve.FitReport, cv *curve.Curve, nz *frame.Normalized) (along, across float64, ok bool) {
	if nz.TE.Kind != frame.TERounded || nz.TE.Action != frame.TEKept || !cv.Closed() || !(nz.Frame.Chord > 0) {
		return 0, 0, false
	}
	path, isCurve := nz.Path.(*curve.Curve)
	n := len(rep.S)
	if !isCurve || n < 4 {
		return 0, 0, false
	}
	L := cv.Length()
	reach := tipReach * nz.Frame.Chord
	if !(2*reach < L) {
		return 0, 0, false
	}
	sTip, _ := cv.Project(geometry.Point(nz.Frame.ToPart(geometry.Point{X: 1})))
	s := append([]float64(nil), rep.S...)
	sort.Float64s(s)
	// at returns the arc length of the k-th point counted on round the
	// closed curve, L added per turn, relative to the tip.
	at := func(k int) float64 {
		turns := math.Floor(float64(k) / float64(n))
		d := s[k-int(turns)*n] + turns*L - sTip
		return d
	}
	// The points from the last before −reach to the first after +reach.
	k0 := sort.SearchFloat64s(s, sTip) // the gap from point k0−1 to k0 holds the tip
	lo, hi := k0-1, k0
	for lo > k0-n && at(lo) > -reach {
		lo--
	}
	for hi < k0+n && at(hi) < reach {
		hi++
	}
	gap := 0.0 // the longest gap at the end that turns more than tipTurnDeg
	for j := lo; j < hi; j++ {
		a, b := sTip+at(j), sTip+at(j+1)
		for a < 0 {
			a, b = a+L, b+L
		}
		if turnBetween(cv, a, b) > tipTurnDeg {
			gap = max(gap, b-a)
		}
	}
	if !(gap > 0) {
		return 0, 0, false
	}
	// How far on the surfaces may run unseen: the outline the points
	// leave unsampled runs from the gap's ends out to the corner and
	// back, about twice as far as the corner lies beyond the tip. Points
	// at random leave a stretch tipSpacings times their mean spacing
	// round the end (over the tipSpacings gaps beyond the end's stretch
	// either side) unsampled only rarely (in about 4 % of cases for
	// Poisson-placed points, e^−5, common practice), and a stretch
	// tipGaps times the gap the points did leave no more often in the
	// campaign (seed 2851: a corner 0.040 c beyond the tip, an unsampled
	// stretch 3.4 times the 0.024 c gap, points spaced log-normally with
	// σ 0.78). The corner lies no farther on than half of the longer of
	// the two: surfaces that meet at a small angle (their corner a fifth
	// of the chord behind a rounded end, seed 5569, its gap 0.017 c) would
	// otherwise leave a stretch unsampled that no sampling of the rest of
	// the outline makes likely (our choice of limits).
	var sum float64
	for j := 1; j <= tipSpacings; j++ {
		sum += at(lo-j+1) - at(lo-j) + at(hi+j) - at(hi+j-1)
	}
	reachMax := max(tipGaps*gap, sum/2) / 2 / nz.Frame.Chord
	r, ok := frame.AnalyseRounded(path, 0, 1)
	if !ok {
		return 0, 0, false
	}
	sharp, ok := r.Sharp()
	if !ok {
		return 0, 0, false
	}
	along, across = math.Abs(sharp.X-1), math.Abs(sharp.Y)
	if d := math.Hypot(along, across); d > reachMax {
		along, across = along*reachMax/d, across*reachMax/d
	}
	return along, across, true
}
