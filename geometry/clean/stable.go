package clean

import "cmp"

// The section order sorts by floating-point values some 30 000 times on a
// 10 000-point scan (the camber line's bins, the surfaces, the places
// along the loop); through stableSort each comparison is a call through a
// function value. The two forms below are stableSort, merge for merge,
// with the comparison written inline: they make the same comparisons with
// the same outcomes, so they leave the same order.

// stableSortWeighted sorts vs by value, keeping equal values in their
// order: stableSort(vs, func(x, y weighted) int { return cmp.Compare(x.v,
// y.v) }), NaN first.
func stableSortWeighted(s []weighted) {
	n := len(s)
	const run = 16
	for lo := 0; lo < n; lo += run {
		hi := min(lo+run, n)
		for i := lo + 1; i < hi; i++ {
			for j := i; j > lo && cmp.Less(s[j].v, s[j-1].v); j-- {
				s[j], s[j-1] = s[j-1], s[j]
			}
		}
	}
	if n <= run {
		return
	}
	src, dst := s, make([]weighted, n)
	for width := run; width < n; width *= 2 {
		for lo := 0; lo < n; lo += 2 * width {
			mid, hi := min(lo+width, n), min(lo+2*width, n)
			i, j, k := lo, mid, lo
			for i < mid && j < hi {
				if cmp.Less(src[j].v, src[i].v) {
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

// stableSortBy sorts the indices idx by key[idx], keeping indices of equal
// keys in their order: stableSort(idx, func(a, b int) int { return
// cmp.Compare(key[a], key[b]) }), NaN first.
func stableSortBy(idx []int, key []float64) {
	n := len(idx)
	const run = 16
	for lo := 0; lo < n; lo += run {
		hi := min(lo+run, n)
		for i := lo + 1; i < hi; i++ {
			for j := i; j > lo && cmp.Less(key[idx[j]], key[idx[j-1]]); j-- {
				idx[j], idx[j-1] = idx[j-1], idx[j]
			}
		}
	}
	if n <= run {
		return
	}
	src, dst := idx, make([]int, n)
	for width := run; width < n; width *= 2 {
		for lo := 0; lo < n; lo += 2 * width {
			mid, hi := min(lo+width, n), min(lo+2*width, n)
			i, j, k := lo, mid, lo
			for i < mid && j < hi {
				if cmp.Less(key[src[j]], key[src[i]]) {
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
	if &src[0] != &idx[0] {
		copy(idx, src)
	}
}
