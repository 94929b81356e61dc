package clean

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestMedianSelects checks median's selection against the middle of a full
// sort (slices.Sort, the reference) on sizes either side of the switch from
// insertion to selection, with ties, sorted and reversed runs and NaN.
func TestMedianSelects(t *testing.T) {
	rng := rand.New(rand.NewPCG(14, 1))
	want := func(xs []float64) float64 {
		s := slices.Clone(xs)
		slices.Sort(s)
		n := len(s)
		if n%2 == 1 {
			return s[n/2]
		}
		return (s[n/2-1] + s[n/2]) / 2
	}
	for _, n := range []int{1, 2, 3, 16, 31, 32, 33, 34, 100, 101, 1000, 4097} {
		for kind := range 5 {
			xs := make([]float64, n)
			for i := range xs {
				switch kind {
				case 0:
					xs[i] = rng.NormFloat64()
				case 1:
					xs[i] = float64(rng.IntN(4)) // many ties
				case 2:
					xs[i] = float64(i) // sorted
				case 3:
					xs[i] = float64(n - i) // reversed
				case 4:
					xs[i] = rng.Float64()
					if i%7 == 3 {
						xs[i] = math.NaN()
					}
				}
			}
			w, got := want(xs), median(slices.Clone(xs))
			if got != w && !(math.IsNaN(got) && math.IsNaN(w)) {
				t.Errorf("n=%d kind %d: median %v, the sort's middle %v", n, kind, got, w)
			}
		}
	}
}
