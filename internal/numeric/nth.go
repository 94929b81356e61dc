package numeric

import (
	"cmp"
	"math/bits"
	"slices"
)

// Nth reorders xs so that xs[k] holds the value slices.Sort would put
// there, none before it greater and none after it smaller (cmp.Less's
// order: NaN first), and returns it: Hoare's selection (Find, Comm. ACM 4
// (1961) 321) with a median-of-three pivot, at linear expected cost, and a
// full sort of what is left when the partitions keep coming out lopsided.
// A median or another order statistic of many values costs a sort of
// them otherwise.
func Nth(xs []float64, k int) float64 {
	lo, hi := 0, len(xs)-1
	budget := 2 * bits.Len(uint(len(xs)))
	for hi > lo {
		if budget == 0 {
			slices.Sort(xs[lo : hi+1])
			return xs[k]
		}
		budget--
		mid := lo + (hi-lo)/2
		if cmp.Less(xs[mid], xs[lo]) {
			xs[mid], xs[lo] = xs[lo], xs[mid]
		}
		if cmp.Less(xs[hi], xs[lo]) {
			xs[hi], xs[lo] = xs[lo], xs[hi]
		}
		if cmp.Less(xs[hi], xs[mid]) {
			xs[hi], xs[mid] = xs[mid], xs[hi]
		}
		pivot := xs[mid]
		i, j := lo, hi
		for i <= j {
			for cmp.Less(xs[i], pivot) {
				i++
			}
			for cmp.Less(pivot, xs[j]) {
				j--
			}
			if i <= j {
				xs[i], xs[j] = xs[j], xs[i]
				i++
				j--
			}
		}
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return xs[k]
		}
	}
	return xs[k]
}
