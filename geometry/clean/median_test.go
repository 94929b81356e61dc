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

// TestSortNonNegative checks sort16 by the 0–1 principle (a network that
// sorts every sequence of zeros and ones sorts every sequence; Knuth, The
// Art of Computer Programming vol. 3, 5.3.4) on all 2^16 such sequences,
// and sortNonNegative against slices.Sort (the reference) on random values,
// ties and zeros at every size up to 16; values with a sign bit or a NaN
// are refused and left alone.
func TestSortNonNegative(t *testing.T) {
	for m := range 1 << 16 {
		var v [16]uint64
		for i := range v {
			v[i] = uint64(m >> i & 1)
		}
		sort16(&v)
		for i := 1; i < 16; i++ {
			if v[i-1] > v[i] {
				t.Fatalf("sort16 leaves %016b out of order: %v", m, v)
			}
		}
	}
	rng := rand.New(rand.NewPCG(18, 5))
	for trial := range 20000 {
		n := 1 + trial%16
		xs := make([]float64, n)
		for i := range xs {
			switch rng.IntN(4) {
			case 0:
				xs[i] = float64(rng.IntN(3)) // ties and zeros
			case 1:
				xs[i] = math.Inf(1)
			default:
				xs[i] = math.Abs(rng.NormFloat64()) * math.Pow(10, float64(rng.IntN(40)-20))
			}
		}
		want := slices.Clone(xs)
		slices.Sort(want)
		if !sortNonNegative(xs) || !slices.Equal(xs, want) {
			t.Fatalf("n=%d: sortNonNegative gives %v, slices.Sort %v", n, xs, want)
		}
	}
	for _, bad := range []float64{-1, math.Copysign(0, -1), math.NaN(), math.Inf(-1)} {
		xs := []float64{3, 1, bad, 2}
		before := slices.Clone(xs)
		if sortNonNegative(xs) || !slices.EqualFunc(xs, before, func(a, b float64) bool { return math.Float64bits(a) == math.Float64bits(b) }) {
			t.Errorf("%v: sorted or changed to %v, want refused and left alone", before, xs)
		}
	}
}
