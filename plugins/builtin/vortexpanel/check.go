package vortexpanel

import (
	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/plugins/builtin/solver"
)

// MinNodes is the smallest number of nodes a section may have.
const MinNodes = solver.MinNodes

// pkgName prefixes the messages of this package.
const pkgName = "vortexpanel"

// Errors returned for bad input, wrapped with figures in the message; the
// panel solvers share them (package solver). Callers test them with
// errors.Is.
var (
	// ErrTooFewNodes means the section has fewer than MinNodes nodes.
	ErrTooFewNodes = solver.ErrTooFewNodes
	// ErrNonFinite means a coordinate or an angle is NaN or infinite.
	ErrNonFinite = solver.ErrNonFinite
	// ErrRepeatedNode means two consecutive nodes coincide (a zero-length panel).
	ErrRepeatedNode = solver.ErrRepeatedNode
	// ErrCrossing means two panels of the contour cross or touch.
	ErrCrossing = solver.ErrCrossing
	// ErrClockwise means the nodes run clockwise, against the node order of
	// package geometry.
	ErrClockwise = solver.ErrClockwise
	// ErrAlphaRange means an angle of attack is outside [−90°, 90°].
	ErrAlphaRange = solver.ErrAlphaRange
	// ErrIllConditioned means the influence matrix is too close to singular
	// to trust its solution; see ConditionError.
	ErrIllConditioned = solver.ErrIllConditioned
	// ErrInside means a flow-field point lies inside the body.
	ErrInside = solver.ErrInside
)

// A ConditionError reports an influence matrix whose condition number
// exceeds MaxCondition. It wraps ErrIllConditioned.
type ConditionError = solver.ConditionError

// Timings are the durations of the phases of a solution, measured inside
// the solver: building the influence matrix and factoring it (both in New),
// and the last call to Solve.
type Timings = solver.Timings

// checkNodes validates a contour in node order and reports whether its
// first and last node coincide (a sharp trailing edge).
func checkNodes(nodes []geometry.Point) (sharp bool, err error) {
	return solver.CheckNodes(pkgName, nodes)
}

// checkAlphas returns an error for an angle that is not finite or whose
// magnitude exceeds π/2.
func checkAlphas(alphas []float64) error {
	return solver.CheckAlphas(pkgName, alphas, ErrNonFinite)
}
