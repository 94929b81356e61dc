// Package solver is the base the panel solvers share: the checks of their
// input (nodes in the node order of package geometry, angles of attack),
// the sentinel errors those checks and the solvers return, the error of an
// ill-conditioned influence matrix, and the phase timings. Each solver
// names itself in the messages, so that an error says where it came from.
package solver

import (
	"errors"
	"fmt"
	"math"
	"time"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
)

// MinNodes is the smallest number of nodes a section may have.
const MinNodes = section.MinNodes

// Errors returned for bad input, wrapped with figures in the message.
// Callers test them with errors.Is.
var (
	// ErrTooFewNodes means the section has fewer than MinNodes nodes.
	ErrTooFewNodes = section.ErrTooFewNodes
	// ErrNonFinite means a coordinate or an angle is NaN or infinite.
	ErrNonFinite = geometry.ErrNonFinite
	// ErrRepeatedNode means two consecutive nodes coincide (a zero-length panel).
	ErrRepeatedNode = section.ErrRepeatedNode
	// ErrCrossing means two panels of the contour cross or touch.
	ErrCrossing = section.ErrCrossing
	// ErrClockwise means the nodes run clockwise, against the node order of
	// package geometry.
	ErrClockwise = section.ErrClockwise
	// ErrAlphaRange means an angle of attack is outside [−90°, 90°].
	ErrAlphaRange = errors.New("angle of attack outside [-90°, 90°]")
	// ErrIllConditioned means the influence matrix is too close to singular
	// to trust its solution; see ConditionError.
	ErrIllConditioned = errors.New("influence matrix is ill-conditioned")
	// ErrInside means a flow-field point lies inside the body.
	ErrInside = errors.New("point inside the body")
)

// A ConditionError reports an influence matrix whose condition number
// exceeds the largest the solver accepts. It wraps ErrIllConditioned.
type ConditionError struct {
	Solver string  // the solver's name, which starts the message
	Cond   float64 // condition number estimate
	Max    float64 // the largest condition number the solver accepts
}

func (e *ConditionError) Error() string {
	return fmt.Sprintf("%s: %v: condition number %.3g exceeds %.3g", e.Solver, ErrIllConditioned, e.Cond, e.Max)
}

func (e *ConditionError) Unwrap() error { return ErrIllConditioned }

// Timings are the durations of the phases of a solution, measured inside a
// solver: building the influence matrix and factoring it, and the last
// solve.
type Timings struct {
	Build, Factor, Solve time.Duration
}

// CheckNodes validates a contour in node order (section.CheckNodes) for the
// solver named solver and reports whether its first and last node
// coincide (a sharp trailing edge). Errors start with the solver's name.
func CheckNodes(solver string, nodes []geometry.Point) (sharp bool, err error) {
	sharp, err = section.CheckNodes(nodes)
	if err != nil {
		return false, fmt.Errorf("%s: %w", solver, err)
	}
	return sharp, nil
}

// CheckAlphas returns an error for an angle (radians) that is not finite,
// wrapping nonFinite, or whose magnitude exceeds π/2, wrapping
// ErrAlphaRange. Errors start with the solver's name.
func CheckAlphas(solver string, alphas []float64, nonFinite error) error {
	for i, a := range alphas {
		if math.IsNaN(a) || math.IsInf(a, 0) {
			return fmt.Errorf("%s: %w: angle %d is %g", solver, nonFinite, i, a)
		}
		if math.Abs(a) > math.Pi/2*(1+1e-15) {
			return fmt.Errorf("%s: %w: angle %d is %.6g°", solver, ErrAlphaRange, i, a*180/math.Pi)
		}
	}
	return nil
}
