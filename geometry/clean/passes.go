package clean

import (
	"math"
	"slices"

	"github.com/foilwright/foilwright/geometry"
)

// PassOffset is the disagreement of two passes of a probe program that
// measured the same stretch of the outline (overlapping passes, a stretch
// measured again): the part re-seated, the probe re-qualified or its
// radius compensated differently between them. Clean measures it where the
// passes' points interleave along the loop and reports it when it stands
// out from the noise (see passOffsets).
type PassOffset struct {
	// First and Second are where the two passes start in the file.
	First, Second geometry.Origin
	// Offset is how far the second pass lies from the first, normal to
	// the outline, input units (positive: outside it).
	Offset float64
	// Spread is the standard error of Offset, input units.
	Spread float64
	// Points counts the points of both passes on the stretch both measured.
	Points int
}

// Sizes of the pass analysis, in positions along the loop.
const (
	// passStep is the farthest apart along the loop two points next to
	// each other in the file may lie and still belong to one pass: where
	// two passes interleave, each pass's points are separated by the
	// other's (up to the ratio of their steps).
	passStep = 2 * sectionWindow
	// passReach is how far along the loop a point looks, each way, for the
	// other pass's points about it.
	passReach = sectionWindow
	// passMin is the fewest points of each pass on a shared stretch for an
	// offset to be measured.
	passMin = 5
)

// passOffsets finds the passes of the file in the loop seq (runs of points
// that follow each other in the file and lie next to each other along the
// loop, at least minPoints long; a shuffled file has none) and, for every
// two passes whose points interleave along a stretch, measures how far
// apart they lie: each point's signed distance from the chord between the
// other pass's points either side of it, averaged, taken both ways and
// halved (the chord of a convex stretch lies inside it by its sagitta for
// either pass, which the difference cancels). It returns the offsets
// beyond three standard errors and beyond noise, the scatter of the points
// about the local fits (input units): a pass moved by less is not told
// from the noise.
func passOffsets(pts []geometry.Point, src []int32, seq []int32, origins []geometry.Origin, noise float64) []PassOffset {
	n := len(seq)
	if n < 2*minPoints {
		return nil
	}
	pos := make([]int32, len(pts))
	for i := range pos {
		pos[i] = -1
	}
	for k, i := range seq {
		pos[i] = int32(k)
	}
	byFile := slices.Clone(seq)
	sortByInput(byFile, src)
	run := make([]int32, len(pts))
	for i := range run {
		run[i] = -1
	}
	var starts []int32 // the first point of each run, by run
	var runs [][]int32
	cur := []int32{byFile[0]}
	flush := func() {
		if len(cur) >= minPoints {
			id := int32(len(runs))
			for _, i := range cur {
				run[i] = id
			}
			runs = append(runs, cur)
			starts = append(starts, cur[0])
		}
	}
	for k := 1; k < len(byFile); k++ {
		a, b := pos[byFile[k-1]], pos[byFile[k]]
		d := int(math.Abs(float64(a - b)))
		if min(d, n-d) > passStep {
			flush()
			cur = nil
		}
		cur = append(cur, byFile[k])
	}
	flush()
	if len(runs) < 2 {
		return nil
	}
	// The signed distance of each point from the chord between the other
	// pass's nearest points either side of it along the loop, summed by
	// (its pass, the other pass).
	type acc struct {
		n       int
		sum, sq float64
	}
	sums := make(map[[2]int32]*acc)
	for k, i := range seq {
		r := run[i]
		if r < 0 {
			continue
		}
		var side [2]int32
		ok := true
		for s, dir := range [2]int{-1, 1} {
			side[s] = -1
			for d := 1; d <= passReach; d++ {
				q := seq[((k+dir*d)%n+n)%n]
				if run[q] >= 0 && run[q] != r {
					side[s] = q
					break
				}
			}
			ok = ok && side[s] >= 0
		}
		if !ok || run[side[0]] != run[side[1]] {
			continue
		}
		a, b := pts[side[0]], pts[side[1]]
		ab := b.Sub(a)
		l := ab.Norm()
		if l == 0 {
			continue
		}
		if t := pts[i].Sub(a).Dot(ab) / (l * l); t < 0 || t > 1 {
			continue
		}
		// Clean's loop runs counter-clockwise: right of its way is outside.
		off := -ab.Cross(pts[i].Sub(a)) / l
		key := [2]int32{r, run[side[0]]}
		c := sums[key]
		if c == nil {
			c = &acc{}
			sums[key] = c
		}
		c.n++
		c.sum += off
		c.sq += off * off
	}
	var out []PassOffset
	for key, ba := range sums {
		if key[0] > key[1] {
			continue
		}
		ab := sums[[2]int32{key[1], key[0]}]
		if ab == nil || ba.n < passMin || ab.n < passMin {
			continue
		}
		mean := func(c *acc) (float64, float64) {
			m := c.sum / float64(c.n)
			v := max(0, c.sq/float64(c.n)-m*m) * float64(c.n) / float64(c.n-1)
			return m, v / float64(c.n)
		}
		m1, v1 := mean(ba) // the earlier pass about the later
		m2, v2 := mean(ab) // the later about the earlier
		off := (m2 - m1) / 2
		se := math.Sqrt(v1+v2) / 2
		if math.Abs(off) <= 3*se || math.Abs(off) <= noise {
			continue
		}
		out = append(out, PassOffset{First: origins[src[starts[key[0]]]], Second: origins[src[starts[key[1]]]], Offset: off, Spread: se, Points: ba.n + ab.n})
	}
	slices.SortFunc(out, func(a, b PassOffset) int { return originCmp(a.Second, b.Second) })
	return out
}
