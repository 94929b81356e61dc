package curve

import (
	"math"
	"sync"
	"testing"

	"github.com/foilwright/foilwright/internal/numeric"
)

func TestGoldenAheadAsGolden(t *testing.T) {
	// goldenAhead promises numeric.Golden's result bit for bit, having
	// evaluated every point Golden evaluates (and some ahead besides).
	for _, c := range []struct {
		name string
		f    func(float64) float64
		a, b float64
	}{
		{"parabola", func(x float64) float64 { return (x - 0.3) * (x - 0.3) }, -2, 5},
		{"minimum at the left end", func(x float64) float64 { return x }, 0, 1},
		{"minimum at the right end", func(x float64) float64 { return -x }, -3, 7},
		{"asymmetric", func(x float64) float64 { return math.Exp(x) - 3*x }, -1, 4},
		{"infinite beyond a point", func(x float64) float64 {
			if x > 1.2 {
				return math.Inf(1)
			}
			return math.Cos(3 * x)
		}, 0, 2},
		{"flat", func(float64) float64 { return 1 }, -1, 1},
	} {
		var mu sync.Mutex
		seen := map[float64]bool{}
		var need []float64
		want := numeric.Golden(func(x float64) float64 { need = append(need, x); return c.f(x) }, c.a, c.b, 14)
		got := goldenAhead(func(x float64) float64 {
			mu.Lock()
			seen[x] = true
			mu.Unlock()
			return c.f(x)
		}, c.a, c.b, 14)
		if math.Float64bits(got) != math.Float64bits(want) {
			t.Errorf("%s: %v, want numeric.Golden's %v", c.name, got, want)
		}
		for _, x := range need {
			if !seen[x] {
				t.Errorf("%s: Golden's point %v not evaluated", c.name, x)
			}
		}
		if len(seen) > 2*len(need) {
			t.Errorf("%s: %d points evaluated for Golden's %d", c.name, len(seen), len(need))
		}
	}
}
