package plot

import (
	"errors"
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// ErrNoData means there is nothing to draw.
var ErrNoData = errors.New("plot: nothing to draw")

// checkPoints returns an error naming field and index for a non-finite
// point.
func checkPoints(field string, pts []geometry.Point) error {
	for i, p := range pts {
		if !p.IsFinite() {
			return fmt.Errorf("plot: %s[%d] = (%g, %g) is not finite", field, i, p.X, p.Y)
		}
	}
	return nil
}

// checkValues returns an error naming field and index for a non-finite
// value.
func checkValues(field string, vs []float64) error {
	for i, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("plot: %s[%d] = %g is not finite", field, i, v)
		}
	}
	return nil
}

// checkLen returns an error when field has n values but want are needed.
func checkLen(field string, n int, other string, want int) error {
	if n != want {
		return fmt.Errorf("plot: %d value(s) in %s for %d in %s", n, field, want, other)
	}
	return nil
}

// firstErr returns the first non-nil error.
func firstErr(errs ...error) error {
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}
