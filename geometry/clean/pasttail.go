package clean

import (
	"cmp"
	"math"
	"slices"

	"github.com/foilwright/foilwright/geometry"
)

// pastTail returns the points of idx that lie past the tail end of the
// chord frame f (drawn from the points of sel) and continue a surface
// there: a surface of sel and in (the points withinChord let in) that runs
// aft into the tail leads to them on its own fitted continuation, within
// its scatter about that line, at its own spacing (continued); or close
// the end there, between both surfaces carried on, within a step of a
// surface's end, as a blunt end's base does (closing).
//
// Where one surface is shadowed short of the trailing edge, the other
// surface's last points are the only evidence of the edge, and they are
// isolated (their nearest neighbours on the shadowed surface are gone):
// the frame, drawn without them, ends short of them, and put back by the
// loop's polygon they would lie past its end, far from it, and be dropped
// as outliers. Joined here, the fits along their surface judge them. A
// stray return behind the edge continues no surface (off its line, or
// alone at a distance no step of it spans) and stays out.
func pastTail(pts []geometry.Point, idx, sel, in []int32, f chordFrame, ws []float64) []int32 {
	var cs []tailPoint
	for _, i := range idx {
		if x, y := f.at(pts[i]); x > 1 && x <= 1+tailReach && math.Abs(y) <= maxHalfWidth {
			cs = append(cs, tailPoint{i, geometry.Point{X: x, Y: y}})
		}
	}
	if len(cs) == 0 {
		return nil
	}
	all := slices.Concat(sel, in)
	xs, ys := make([]float64, len(all)), make([]float64, len(all))
	var sw []float64
	if ws != nil {
		sw = make([]float64, len(all))
	}
	for k, i := range all {
		xs[k], ys[k] = f.at(pts[i])
		if ws != nil {
			sw[k] = ws[i]
		}
	}
	upper, _ := sides(xs, ys, sw)
	var surf [2]tailSurface
	var ends [2]geometry.Point
	var fitted [2]bool
	for k, side := range [2]bool{true, false} {
		var ps []geometry.Point
		for j := range all {
			if upper[j] == side && xs[j] >= 1-tailSide {
				ps = append(ps, geometry.Point{X: xs[j], Y: ys[j]})
			}
		}
		surf[k], ends[k], fitted[k] = surfaceEnd(ps)
	}
	taken := make([]bool, len(cs))
	var out []int32
	for k := range 2 {
		if !fitted[k] {
			continue
		}
		for _, j := range surf[k].continued(ends[k], cs, taken) {
			taken[j] = true
			out = append(out, cs[j].i)
		}
	}
	if fitted[0] && fitted[1] {
		for k := range 2 {
			for _, j := range surf[k].closing(ends[k], surf[1-k], ends[1-k], cs, taken) {
				taken[j] = true
				out = append(out, cs[j].i)
			}
		}
	}
	slices.Sort(out)
	return out
}

// tailPoint is a point past the tail: its index and chord coordinates.
type tailPoint struct {
	i int32
	p geometry.Point
}

// tailSurface is the straight line fitted to a surface's last points
// before its end: through c along u (a unit vector heading aft), the
// points' rms distance from it, their median step and the extent along
// u they cover.
type tailSurface struct {
	c, u      geometry.Point
	rms, step float64
	length    float64
	lastAlong float64 // the end's place along u from c
	maxStep   float64 // the longest step between the points fitted
}

// surfaceEnd fits a straight line (total least squares) to the last
// surfacePts points of one surface near the tail, ps in chord
// coordinates, by x, with the point farthest off it set aside once when
// it lies off by more than three times the others' scatter (a stray
// among them); it returns the line and the surface's end, its aftmost
// point. It fails on fewer than surfacePts+1 points (the points fitted)
// or a line not heading aft, or points that do not follow a line: they
// scatter about it by more than lineScatter of their median step.
func surfaceEnd(ps []geometry.Point) (tailSurface, geometry.Point, bool) {
	slices.SortFunc(ps, func(a, b geometry.Point) int { return cmp.Compare(a.X, b.X) })
	ps = slices.CompactFunc(ps, func(a, b geometry.Point) bool { return a == b })
	if len(ps) <= surfacePts {
		return tailSurface{}, geometry.Point{}, false
	}
	run := slices.Clone(ps[len(ps)-surfacePts-1:])
	s := fitTail(run)
	worst, wd := -1, 0.0
	for k, p := range run {
		if d := math.Abs(s.u.Cross(p.Sub(s.c))); d > wd {
			worst, wd = k, d
		}
	}
	if worst >= 0 {
		rest := slices.Delete(slices.Clone(run), worst, worst+1)
		if r := fitTail(rest); wd > 3*r.rms {
			run, s = rest, r
		}
	}
	end := run[len(run)-1]
	if s.u.X < math.Cos(aftCone) || s.rms > lineScatter*s.step {
		return tailSurface{}, end, false
	}
	s.lastAlong = s.u.Dot(end.Sub(s.c))
	return s, end, true
}

// fitTail fits the line of tailSurface to run, points sorted by x.
func fitTail(run []geometry.Point) tailSurface {
	var c geometry.Point
	for _, p := range run {
		c = c.Add(p)
	}
	c = c.Scale(1 / float64(len(run)))
	var sxx, sxy, syy float64
	for _, p := range run {
		d := p.Sub(c)
		sxx += d.X * d.X
		sxy += d.X * d.Y
		syy += d.Y * d.Y
	}
	a := 0.5 * math.Atan2(2*sxy, sxx-syy)
	u := geometry.Point{X: math.Cos(a), Y: math.Sin(a)}
	if u.X < 0 {
		u = u.Scale(-1)
	}
	s := tailSurface{c: c, u: u}
	lo, hi := math.Inf(1), math.Inf(-1)
	steps := make([]float64, 0, len(run)-1)
	for k, p := range run {
		d := p.Sub(c)
		s.rms += sq(u.Cross(d))
		t := u.Dot(d)
		lo, hi = min(lo, t), max(hi, t)
		if k > 0 {
			steps = append(steps, p.Dist(run[k-1]))
		}
	}
	s.rms = math.Sqrt(s.rms / float64(len(run)-2))
	s.maxStep = slices.Max(steps)
	s.step = median(steps)
	s.length = hi - lo
	return s
}

// continued returns the candidates cs (not yet taken) that continue the
// surface s past its end: each ahead of the last one joined (or of the
// end), off the line by no more than its band (off), and no farther on
// from it than the surface's reach; or, across a hole in the sampling up
// to holeFar of the chord long, the first of at least holePts points that
// lie on the line and follow each other within that reach over at least
// one median step, as the points of a surface do and a stray return or a
// burst of them at one place do not.
func (s tailSurface) continued(end geometry.Point, cs []tailPoint, taken []bool) []int {
	along := func(p geometry.Point) float64 { return s.u.Dot(p.Sub(s.c)) }
	on := func(k int) bool {
		return !taken[k] && math.Abs(s.u.Cross(cs[k].p.Sub(s.c))) <= s.off(along(cs[k].p)-s.lastAlong)
	}
	var out []int
	cur := along(end)
	for {
		// The candidates on the line ahead, nearest first.
		var ahead []int
		for k := range cs {
			if on(k) && !slices.Contains(out, k) && along(cs[k].p) > cur {
				ahead = append(ahead, k)
			}
		}
		if len(ahead) == 0 {
			return out
		}
		slices.SortFunc(ahead, func(a, b int) int {
			return cmp.Compare(along(cs[a].p), along(cs[b].p))
		})
		gap := along(cs[ahead[0]].p) - cur
		if gap <= s.reach() {
			out = append(out, ahead[0])
			cur = along(cs[ahead[0]].p)
			continue
		}
		if gap > holeFar || len(ahead) < holePts {
			return out
		}
		run := 1
		for k := 1; k < len(ahead) && run < holePts; k++ {
			if along(cs[ahead[k]].p)-along(cs[ahead[k-1]].p) > s.reach() {
				break
			}
			run++
		}
		if run < holePts || along(cs[ahead[run-1]].p)-along(cs[ahead[0]].p) < s.step {
			return out // no run beyond the hole, or a burst at one place
		}
		out = append(out, ahead[0])
		cur = along(cs[ahead[0]].p)
	}
}

// reach returns the longest step that continues the surface: stepFar of
// its median steps, or half as long again as its longest step among the
// points fitted (a surface sampled at random has steps of all lengths).
func (s tailSurface) reach() float64 {
	return max(stepFar*s.step, 1.5*s.maxStep)
}

// closing returns the candidates cs (not yet taken) that close the
// section's end past the end of the surface s, as a blunt end's base
// does: no farther from end than the surface's reach, and between the
// lines of both surfaces carried on (s and o, whose end is oEnd), within
// their bands. Where the surfaces' lines cross ahead of a point (a sharp
// end), no point lies between them.
func (s tailSurface) closing(end geometry.Point, o tailSurface, oEnd geometry.Point, cs []tailPoint, taken []bool) []int {
	side := func(l tailSurface, p geometry.Point) float64 { return l.u.Cross(p.Sub(l.c)) }
	toO := math.Copysign(1, side(s, oEnd)) // the side of s's line o lies on
	toS := math.Copysign(1, side(o, end))
	var out []int
	for k, c := range cs {
		if taken[k] || c.p.Dist(end) > s.reach() || s.u.Dot(c.p.Sub(end)) <= 0 {
			continue
		}
		ts := s.u.Dot(c.p.Sub(s.c)) - s.lastAlong
		to := o.u.Dot(c.p.Sub(o.c)) - o.lastAlong
		if toO*side(s, c.p) >= -s.off(ts) && toS*side(o, c.p) >= -o.off(to) {
			out = append(out, k)
		}
	}
	return out
}

// off returns how far from the line a point t along it past the
// surface's end may lie and continue it: three times the points' scatter
// about the line, the error of the line's slope carried out to t, and the
// bend of a surface straightening into its edge (bendAngle per unit
// carried).
func (s tailSurface) off(t float64) float64 {
	t = max(t, 0)
	n := float64(surfacePts)
	slope := s.rms * math.Sqrt(12/n) / max(s.length, s.step)
	return 3*math.Hypot(s.rms, slope*(t+s.length/2)) + math.Tan(bendAngle)*t
}

// Sizes of the surfaces continued past the tail.
//   - surfacePts: the points of a surface's line (one more is fitted, the
//     farthest off set aside when it lies off the others' line);
//   - aftCone: a surface runs aft into its edge, within 45° of the chord
//     line's aft direction (a fixture's face across the chord behind the
//     edge does not; campaign fixture case 73);
//   - stepFar: the longest step, in the surface's median steps, that
//     continues it (see reach); holeFar, holePts: a hole in its sampling,
//     in chords, and the points beyond it that must run on at its spacing;
//   - bendAngle: a surface's bend away from its line over the distance it is
//     carried (our choice: a trailing edge's surfaces straighten; 3°);
//   - lineScatter: the most the points of a surface's line scatter about
//     it, in their median steps (our choice: the points of a surface near
//     its edge follow a line to well within their spacing, where a mix of a
//     surface and a fixture's face behind the edge, campaign fixture case
//     73, scatters by 0.76 of its step, and a dense noisy run that would
//     not is left to the points' own order).
const (
	surfacePts  = 6
	aftCone     = 45 * math.Pi / 180
	stepFar     = 2.5
	holeFar     = 0.03
	holePts     = 3
	bendAngle   = 3 * math.Pi / 180
	lineScatter = 0.5
)

// tailReach bounds, in chords, how far past the tail end of a frame a
// point may lie to join a section order from outside the dense points
// (pastTail): more than a shadowed surface's usual shortfall of a few
// per cent of the chord.
const tailReach = 0.1
