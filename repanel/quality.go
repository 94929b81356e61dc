package repanel

import (
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// Limits above which Measure warns. They are judgement values of common
// practice, chosen so that the plain laws at 160 panels stay quiet on
// ordinary sections and the usual trouble does not:
//
//   - RatioLimit bounds the length ratio of neighbouring panels. Cosine
//     spacing itself has a ratio just under 3 between the first and second
//     panel at each clustered end, since (1 − cos 2h)/(1 − cos h) → 4 as
//     h → 0; the limit sits just above it, so only laws or clustering
//     strengths that grow panels faster than plain cosine spacing warn.
//   - TurnLimitDeg bounds the turn of the surface between neighbouring
//     panels, in degrees: coarser panels misrepresent the nose. Cosine
//     spacing with 160 panels on a NACA 0012 turns at most about 10°;
//     uniform spacing with 160 panels turns about 43° at its nose.
//   - ShortLimit bounds the shortest panel relative to the whole perimeter:
//     shorter panels usually come from near-duplicate nodes or extreme
//     clustering and add round-off rather than resolution.
const (
	RatioLimit   = 3.5
	TurnLimitDeg = 15.0
	ShortLimit   = 1e-7
)

// Quality describes the panels between consecutive nodes.
type Quality struct {
	MinLength  float64  // shortest panel, in the units of the nodes
	MaxLength  float64  // longest panel
	MaxRatio   float64  // largest length ratio (≥ 1) of two neighbouring panels
	MaxTurnDeg float64  // largest turn between neighbouring panels, degrees
	Warnings   []string // one line per limit exceeded, naming the worst panel or node
}

// Measure returns the quality of the panels joining consecutive nodes. The
// ratio and the turn are taken at every interior node (1 … len(nodes)−2); the
// first and last node, at the trailing edge, are left out, since a sharp
// trailing edge is a corner by design. Panels of zero length are reported
// and left out of the ratio and the turn. Measure warns when MaxRatio
// exceeds RatioLimit, MaxTurnDeg exceeds TurnLimitDeg, or a panel is shorter
// than ShortLimit times the perimeter; and when fewer than 2 nodes are
// given or a node is NaN or infinite, in which case every figure is zero.
func Measure(nodes []geometry.Point) Quality {
	var q Quality
	if len(nodes) < 2 {
		q.Warnings = append(q.Warnings, fmt.Sprintf("%d node(s): need at least 2 to form a panel", len(nodes)))
		return q
	}
	for i, p := range nodes {
		if !p.IsFinite() {
			q.Warnings = append(q.Warnings, fmt.Sprintf("node %d (%g, %g) is not finite", i, p.X, p.Y))
			return q
		}
	}
	n := len(nodes) - 1
	lens := make([]float64, n)
	var perim float64
	q.MinLength = math.Inf(1)
	minAt, zeros := 0, 0
	for i := range n {
		lens[i] = nodes[i].Dist(nodes[i+1])
		perim += lens[i]
		if lens[i] < q.MinLength {
			q.MinLength, minAt = lens[i], i
		}
		q.MaxLength = max(q.MaxLength, lens[i])
		if lens[i] == 0 {
			if zeros == 0 {
				q.Warnings = append(q.Warnings, fmt.Sprintf("panel %d (nodes %d-%d) has zero length", i, i, i+1))
			}
			zeros++
		}
	}
	if zeros > 1 {
		q.Warnings = append(q.Warnings, fmt.Sprintf("%d panel(s) have zero length in all", zeros))
	}
	ratioAt, turnAt := 0, 0
	for i := 1; i < n; i++ {
		a, b := lens[i-1], lens[i]
		if a == 0 || b == 0 {
			continue
		}
		if r := max(a/b, b/a); r > q.MaxRatio {
			q.MaxRatio, ratioAt = r, i
		}
		d0, d1 := nodes[i].Sub(nodes[i-1]), nodes[i+1].Sub(nodes[i])
		turn := math.Abs(math.Atan2(d0.Cross(d1), d0.Dot(d1))) * 180 / math.Pi
		if turn > q.MaxTurnDeg {
			q.MaxTurnDeg, turnAt = turn, i
		}
	}
	if zeros == 0 && q.MinLength < ShortLimit*perim {
		q.Warnings = append(q.Warnings, fmt.Sprintf("panel %d is %.3g of the perimeter long, shorter than %g", minAt, q.MinLength/perim, ShortLimit))
	}
	if q.MaxRatio > RatioLimit {
		q.Warnings = append(q.Warnings, fmt.Sprintf("panels %d and %d differ in length by a factor %.2f, more than %g", ratioAt-1, ratioAt, q.MaxRatio, RatioLimit))
	}
	if q.MaxTurnDeg > TurnLimitDeg {
		q.Warnings = append(q.Warnings, fmt.Sprintf("the surface turns %.1f° at node %d, more than %g°", q.MaxTurnDeg, turnAt, TurnLimitDeg))
	}
	return q
}
