package solver

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

func TestChecks(t *testing.T) {
	nodes := []geometry.Point{{X: 1, Y: 0}, {X: 0.5, Y: 0.1}, {X: 0, Y: 0}, {X: 0.5, Y: -0.1}, {X: 1, Y: 0}}
	if _, err := CheckNodes("demo", nodes); !errors.Is(err, ErrTooFewNodes) || !strings.HasPrefix(err.Error(), "demo: ") {
		t.Errorf("five nodes: %v", err)
	}
	for _, tc := range []struct {
		alphas []float64
		want   error
	}{
		{[]float64{0, 0.1, -math.Pi / 2}, nil},
		{[]float64{0, math.NaN()}, ErrNonFinite},
		{[]float64{math.Inf(-1)}, ErrNonFinite},
		{[]float64{2}, ErrAlphaRange},
	} {
		if err := CheckAlphas("demo", tc.alphas, ErrNonFinite); !errors.Is(err, tc.want) || (err != nil && !strings.HasPrefix(err.Error(), "demo: ")) {
			t.Errorf("%v: err %v, want %v", tc.alphas, err, tc.want)
		}
	}
	var ce *ConditionError
	err := error(&ConditionError{Solver: "demo", Cond: 1e14, Max: 1e12})
	if !errors.Is(err, ErrIllConditioned) || !errors.As(err, &ce) || err.Error() != "demo: influence matrix is ill-conditioned: condition number 1e+14 exceeds 1e+12" {
		t.Errorf("condition error: %v", err)
	}
}
