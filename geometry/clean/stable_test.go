package clean

import (
	"cmp"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// stableSort sorts s by cmp, keeping equal elements in their order, by
// merging runs through a buffer: the form stableSortWeighted and
// stableSortBy write out with their comparisons inline, kept here as their
// reference (and itself checked against slices.SortStableFunc).
func stableSort[E any](s []E, cmp func(a, b E) int) {
	n := len(s)
	const run = 16
	for lo := 0; lo < n; lo += run {
		hi := min(lo+run, n)
		for i := lo + 1; i < hi; i++ {
			for j := i; j > lo && cmp(s[j], s[j-1]) < 0; j-- {
				s[j], s[j-1] = s[j-1], s[j]
			}
		}
	}
	if n <= run {
		return
	}
	src, dst := s, make([]E, n)
	for width := run; width < n; width *= 2 {
		for lo := 0; lo < n; lo += 2 * width {
			mid, hi := min(lo+width, n), min(lo+2*width, n)
			i, j, k := lo, mid, lo
			for i < mid && j < hi {
				// The right run's element goes first only when it is
				// strictly less: equal elements keep their order.
				if cmp(src[j], src[i]) < 0 {
					dst[k] = src[j]
					j++
				} else {
					dst[k] = src[i]
					i++
				}
				k++
			}
			k += copy(dst[k:], src[i:mid])
			copy(dst[k:], src[j:hi])
		}
		src, dst = dst, src
	}
	if &src[0] != &s[0] {
		copy(s, src)
	}
}

// floatsFor draws n values from a few distinct ones (ties), with NaN, −0
// and +0 and infinities among them when odd is set.
func floatsFor(rng *rand.Rand, n, distinct int, odd bool) []float64 {
	specials := []float64{math.NaN(), math.Copysign(0, -1), 0, math.Inf(1), math.Inf(-1)}
	out := make([]float64, n)
	for i := range out {
		if odd && rng.IntN(8) == 0 {
			out[i] = specials[rng.IntN(len(specials))]
		} else {
			out[i] = float64(rng.IntN(distinct)) - float64(distinct)/2
		}
	}
	return out
}

func TestInlineStableSortsMatchReference(t *testing.T) {
	// The reference is the standard library's stable sort
	// (slices.SortStableFunc by cmp.Compare) and stableSort, which the
	// section order used: the same order for every input, element by
	// element (ties told apart by their original position).
	rng := rand.New(rand.NewPCG(5, 11))
	for _, n := range []int{0, 1, 2, 15, 16, 17, 31, 33, 100, 1000, 10007} {
		for _, distinct := range []int{2, 50, 1 << 30} {
			for _, odd := range []bool{false, true} {
				vals := floatsFor(rng, n, distinct, odd)
				ws := make([]weighted, n)
				idx := make([]int, n)
				for i, v := range vals {
					ws[i] = weighted{v: v, w: float64(i), x: -float64(i)}
					idx[i] = i
				}
				rng.Shuffle(n, func(a, b int) { idx[a], idx[b] = idx[b], idx[a] })

				wantW := slices.Clone(ws)
				slices.SortStableFunc(wantW, func(a, b weighted) int { return cmp.Compare(a.v, b.v) })
				refW := slices.Clone(ws)
				stableSort(refW, func(a, b weighted) int { return cmp.Compare(a.v, b.v) })
				gotW := slices.Clone(ws)
				stableSortWeighted(gotW)
				same := func(a, b []weighted) bool {
					for i := range a {
						// by position tag: NaN values are not == each other
						if a[i].w != b[i].w || a[i].x != b[i].x {
							return false
						}
					}
					return len(a) == len(b)
				}
				if !same(refW, wantW) || !same(gotW, wantW) {
					t.Errorf("weighted, n %d, %d distinct, odd %v: stableSortWeighted differs from slices.SortStableFunc", n, distinct, odd)
				}

				byKey := func(a, b int) int { return cmp.Compare(vals[a], vals[b]) }
				wantI := slices.Clone(idx)
				slices.SortStableFunc(wantI, byKey)
				refI := slices.Clone(idx)
				stableSort(refI, byKey)
				gotI := slices.Clone(idx)
				stableSortBy(gotI, vals)
				if !slices.Equal(refI, wantI) || !slices.Equal(gotI, wantI) {
					t.Errorf("indices, n %d, %d distinct, odd %v: stableSortBy differs from slices.SortStableFunc", n, distinct, odd)
				}
			}
		}
	}
}
