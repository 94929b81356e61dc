package sourcepanel

import (
	"errors"
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
)

// MinNodes is the smallest number of nodes a section may have.
const MinNodes = section.MinNodes

// pkgName prefixes the messages of this package.
const pkgName = "sourcepanel"

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
	// ErrOpenContour means the first and last node differ: the source panel
	// method needs a closed body.
	ErrOpenContour = errors.New("contour is not closed")
	// ErrIllConditioned means the influence matrix is too close to singular
	// to trust its solution; see ConditionError.
	ErrIllConditioned = errors.New("influence matrix is ill-conditioned")
	// ErrInside means a flow-field point lies inside the body.
	ErrInside = errors.New("point inside the body")
)

// checkNodes validates a contour in node order (geometry.CheckNodes) and
// reports whether its first and last node coincide (a sharp trailing edge).
func checkNodes(nodes []geometry.Point) (sharp bool, err error) {
	sharp, err = section.CheckNodes(nodes)
	if err != nil {
		return false, fmt.Errorf("%s: %w", pkgName, err)
	}
	return sharp, nil
}

// checkAlphas returns an error for an angle that is not finite or whose
// magnitude exceeds π/2.
func checkAlphas(alphas []float64) error {
	for i, a := range alphas {
		if math.IsNaN(a) || math.IsInf(a, 0) {
			return fmt.Errorf("sourcepanel: %w: angle %d is %g", ErrNonFinite, i, a)
		}
		if math.Abs(a) > math.Pi/2*(1+1e-15) {
			return fmt.Errorf("sourcepanel: %w: angle %d is %.6g°", ErrAlphaRange, i, a*180/math.Pi)
		}
	}
	return nil
}
