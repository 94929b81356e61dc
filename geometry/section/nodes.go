package section

import (
	"errors"
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// MinNodes is the smallest number of nodes a section may have for the panel
// methods.
const MinNodes = 8

// Errors of CheckNodes, wrapped with figures in the message.
var (
	// ErrTooFewNodes means a section has fewer than MinNodes nodes.
	ErrTooFewNodes = errors.New("too few nodes")
	// ErrRepeatedNode means two consecutive nodes coincide (a zero-length panel).
	ErrRepeatedNode = errors.New("repeated node")
	// ErrCrossing means two panels of a section cross or touch.
	ErrCrossing = errors.New("panels cross")
	// ErrClockwise means the nodes run clockwise, against the node order of
	// package geometry.
	ErrClockwise = errors.New("nodes run clockwise")
)

// loopCoincide is the distance, relative to the size of the section, below
// which two nodes count as the same point.
const loopCoincide = 1e-12

// CheckNodes validates the nodes of a section in the node order of package
// geometry and reports whether its first and last node coincide (a sharp
// trailing edge).
// The section is checked as a closed loop: for an open one, the segment from
// the last node back to the first is part of it. It returns an error
// wrapping ErrTooFewNodes, ErrNonFinite, ErrRepeatedNode, ErrCrossing or
// ErrClockwise, with the node or panel numbers (panel k joins nodes k and
// k+1).
func CheckNodes(nodes []geometry.Point) (sharp bool, err error) {
	if len(nodes) < MinNodes {
		return false, fmt.Errorf("%w: %d node(s), want at least %d", ErrTooFewNodes, len(nodes), MinNodes)
	}
	lo, hi := geometry.Point{X: math.Inf(1), Y: math.Inf(1)}, geometry.Point{X: math.Inf(-1), Y: math.Inf(-1)}
	for i, p := range nodes {
		if !p.IsFinite() {
			return false, fmt.Errorf("%w: node %d is (%g, %g)", geometry.ErrNonFinite, i, p.X, p.Y)
		}
		lo = geometry.Point{X: math.Min(lo.X, p.X), Y: math.Min(lo.Y, p.Y)}
		hi = geometry.Point{X: math.Max(hi.X, p.X), Y: math.Max(hi.Y, p.Y)}
	}
	tol := loopCoincide * hi.Sub(lo).Norm()
	n := len(nodes) - 1
	for i := range n {
		if nodes[i].Dist(nodes[i+1]) <= tol {
			return false, fmt.Errorf("%w: nodes %d and %d are both (%g, %g)", ErrRepeatedNode, i, i+1, nodes[i].X, nodes[i].Y)
		}
	}
	sharp = nodes[0].Dist(nodes[n]) <= tol
	loop := nodes
	if sharp {
		loop = nodes[:n]
	}
	if i, j, ok := geometry.LoopCrossing(loop); ok {
		return false, fmt.Errorf("%w: panels %d and %d (panel k joins nodes k and k+1)", ErrCrossing, i, j)
	}
	if a := geometry.SignedArea(loop); a <= 0 {
		return false, fmt.Errorf("%w: signed area %g, want > 0 (trailing edge, upper surface, leading edge, lower surface)", ErrClockwise, a)
	}
	return sharp, nil
}
