package clean

import "slices"

// keyed is a point index with the key it is ordered by: a grid cell
// (newGrid) or a place along a Morton curve (localise).
type keyed struct {
	k uint64
	i int32
}

// keyedCmp orders by key, then by index.
func keyedCmp(a, b keyed) int {
	switch {
	case a.k < b.k:
		return -1
	case a.k > b.k:
		return 1
	}
	return int(a.i - b.i)
}

// radixFrom is the least number of entries sortKeyed sorts by digits:
// below it the comparison sort is as quick.
const radixFrom = 256

// radixUpTo is the most entries sortKeyed sorts by digits, whose buffer
// is as large as the entries: a dense scan's million points sorted so
// raised the peak memory of prep by 50 MiB (334 -> 385 MiB), where the
// comparison sort works in place. Such clouds are cleaned on a subset
// (cleanDense), whose grids stay below it.
const radixUpTo = 1 << 17

// sortKeyed sorts kvs by key, ties by index, into the order
// slices.SortFunc(kvs, keyedCmp) gives. The indices of kvs are distinct.
// When they come in increasing order, as the grid and the Morton order
// build them, a stable sort by the key alone keeps them increasing within
// a key: it sorts least significant byte first, skipping the bytes that are
// the same throughout (the high bytes of a cell's coordinates, on a
// section smaller than 2²⁴ cells a side), in a few passes over the entries
// where the comparison sort of a 10 000-point cloud made some 14.
func sortKeyed(kvs []keyed) {
	n := len(kvs)
	if n < radixFrom || n > radixUpTo || !slices.IsSortedFunc(kvs, func(a, b keyed) int { return int(a.i - b.i) }) {
		slices.SortFunc(kvs, keyedCmp)
		return
	}
	// The counts of every byte at once: a byte's counts do not depend on
	// the order the passes leave the entries in.
	var count [8][256]int
	for _, e := range kvs {
		k := e.k
		for d := range 8 {
			count[d][byte(k>>(8*d))]++
		}
	}
	src, dst := kvs, make([]keyed, n)
	for d := range 8 {
		c := &count[d]
		if c[byte(src[0].k>>(8*d))] == n {
			continue // one value throughout: the pass would change nothing
		}
		at := 0
		for b, m := range c {
			c[b] = at
			at += m
		}
		for _, e := range src {
			b := byte(e.k >> (8 * d))
			dst[c[b]] = e
			c[b]++
		}
		src, dst = dst, src
	}
	if &src[0] != &kvs[0] {
		copy(kvs, src)
	}
}

// sortByInput sorts the point indices idx by their input indices src[i],
// into the order slices.SortFunc(idx, func(a, b int32) int { return
// int(src[a] - src[b]) }) gives. Distinct points have distinct input
// indices, so each has its own slot in a table by input index, which is
// read back in order: linear, where the comparison sort of a 10 000-point
// loop took half a millisecond. Input indices that repeat, or that spread
// far beyond the number of points, keep the comparison sort.
func sortByInput(idx, src []int32) {
	bySrc := func(a, b int32) int { return int(src[a] - src[b]) }
	if len(idx) < radixFrom {
		slices.SortFunc(idx, bySrc)
		return
	}
	hi := int32(-1)
	for _, i := range idx {
		if src[i] < 0 {
			slices.SortFunc(idx, bySrc)
			return
		}
		hi = max(hi, src[i])
	}
	if int(hi) >= 16*len(idx) {
		slices.SortFunc(idx, bySrc)
		return
	}
	at := make([]int32, hi+1) // point index + 1; 0 for none
	for _, i := range idx {
		if at[src[i]] != 0 {
			slices.SortFunc(idx, bySrc)
			return
		}
		at[src[i]] = i + 1
	}
	j := 0
	for _, v := range at {
		if v != 0 {
			idx[j] = v - 1
			j++
		}
	}
}
