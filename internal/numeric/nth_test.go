package numeric

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestNth checks Nth against a full sort (slices.Sort, the reference
// order) at every rank of random sets, with ties, NaN and sets that
// defeat a naive pivot (sorted, reversed, all equal).
func TestNth(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	var sets [][]float64
	for _, n := range []int{1, 2, 3, 7, 16, 33, 100, 1001} {
		a := make([]float64, n)
		for i := range a {
			a[i] = rng.NormFloat64()
		}
		sets = append(sets, a)
		ties := make([]float64, n)
		for i := range ties {
			ties[i] = float64(rng.IntN(4))
		}
		sets = append(sets, ties)
		withNaN := slices.Clone(a)
		withNaN[rng.IntN(n)] = math.NaN()
		sets = append(sets, withNaN)
		up := slices.Clone(a)
		slices.Sort(up)
		down := slices.Clone(up)
		slices.Reverse(down)
		sets = append(sets, up, down, make([]float64, n))
	}
	for s, set := range sets {
		want := slices.Clone(set)
		slices.Sort(want)
		for k := range set {
			xs := slices.Clone(set)
			got := Nth(xs, k)
			if !(got == want[k] || math.IsNaN(got) && math.IsNaN(want[k])) {
				t.Fatalf("set %d (n %d) rank %d: got %v, want %v", s, len(set), k, got, want[k])
			}
			for i, x := range xs {
				if i < k && x > got || i > k && x < got {
					t.Fatalf("set %d rank %d: xs[%d] = %v on the wrong side of %v", s, k, i, x, got)
				}
			}
		}
	}
}
