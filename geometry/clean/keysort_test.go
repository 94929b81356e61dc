package clean

import (
	"math/rand/v2"
	"slices"
	"testing"
)

func TestSortKeyedAsComparisonSort(t *testing.T) {
	// The reference is the standard library's comparison sort
	// (slices.SortFunc with keyedCmp), the order sortKeyed promises.
	rng := rand.New(rand.NewPCG(3, 7))
	for _, c := range []struct {
		name     string
		n        int
		key      func(i int) uint64
		shuffled bool // indices not in increasing order: the comparison sort's path
	}{
		{"grid cells, few per cell", 10000, func(int) uint64 { return uint64(rng.IntN(300))<<32 | uint64(rng.IntN(300)) }, false},
		{"many equal keys", 5000, func(int) uint64 { return uint64(rng.IntN(7)) << 40 }, false},
		{"every byte varies", 3000, func(int) uint64 { return rng.Uint64() }, false},
		{"one key", 1000, func(int) uint64 { return 42 }, false},
		{"below the radix size", radixFrom - 1, func(int) uint64 { return uint64(rng.IntN(50)) }, false},
		{"indices shuffled", 4000, func(int) uint64 { return uint64(rng.IntN(100)) }, true},
	} {
		kvs := make([]keyed, c.n)
		for j := range kvs {
			kvs[j] = keyed{c.key(j), int32(j)}
		}
		if c.shuffled {
			rng.Shuffle(len(kvs), func(a, b int) { kvs[a].i, kvs[b].i = kvs[b].i, kvs[a].i })
		}
		want := slices.Clone(kvs)
		slices.SortFunc(want, keyedCmp)
		sortKeyed(kvs)
		if !slices.Equal(kvs, want) {
			k := 0
			for k < len(kvs) && kvs[k] == want[k] {
				k++
			}
			t.Errorf("%s: first difference at %d: %+v, want %+v", c.name, k, kvs[k], want[k])
		}
	}
}

func TestStableSortAsStandard(t *testing.T) {
	// The reference is the standard library's stable sort
	// (slices.SortStableFunc): with many equal keys the order of equal
	// elements shows, and it must be theirs.
	rng := rand.New(rand.NewPCG(5, 11))
	type item struct {
		v   float64
		pos int
	}
	byV := func(a, b item) int {
		switch {
		case a.v < b.v:
			return -1
		case a.v > b.v:
			return 1
		}
		return 0
	}
	for _, n := range []int{0, 1, 15, 16, 17, 33, 100, 1000, 10007} {
		for _, distinct := range []int{3, 50, 1 << 30} {
			s := make([]item, n)
			for i := range s {
				s[i] = item{float64(rng.IntN(distinct)), i}
			}
			want := slices.Clone(s)
			slices.SortStableFunc(want, byV)
			stableSort(s, byV)
			if !slices.Equal(s, want) {
				t.Errorf("n %d, %d distinct values: differs from slices.SortStableFunc", n, distinct)
			}
		}
	}
}

func TestSortByInputAsComparisonSort(t *testing.T) {
	// The reference is the standard library's comparison sort
	// (slices.SortFunc by input index), the order sortByInput promises.
	rng := rand.New(rand.NewPCG(13, 17))
	for _, c := range []struct {
		name      string
		n, inputs int  // points, and the input indices they are drawn from
		repeat    bool // input indices may repeat
		picks     int  // how many point indices are sorted (a loop leaves some out)
	}{
		{"a merged cloud", 10000, 15000, false, 9000},
		{"every point", 5000, 5000, false, 5000},
		{"inputs spread far", 1000, 100000, false, 1000},
		{"inputs repeated", 2000, 1000, true, 2000},
		{"short", 100, 100, false, 100},
	} {
		src := make([]int32, c.n)
		perm := rng.Perm(c.inputs)
		for i := range src {
			if c.repeat {
				src[i] = int32(rng.IntN(c.inputs))
			} else {
				src[i] = int32(perm[i])
			}
		}
		idx := make([]int32, c.n)
		for i := range idx {
			idx[i] = int32(i)
		}
		rng.Shuffle(len(idx), func(a, b int) { idx[a], idx[b] = idx[b], idx[a] })
		idx = idx[:c.picks]
		want := slices.Clone(idx)
		slices.SortFunc(want, func(a, b int32) int { return int(src[a] - src[b]) })
		sortByInput(idx, src)
		if c.repeat {
			// Points of one input index may come in either order:
			// compare the input indices.
			for k := range idx {
				if src[idx[k]] != src[want[k]] {
					t.Errorf("%s: input index %d at %d, want %d", c.name, src[idx[k]], k, src[want[k]])
					break
				}
			}
			continue
		}
		if !slices.Equal(idx, want) {
			t.Errorf("%s: differs from slices.SortFunc", c.name)
		}
	}
}
