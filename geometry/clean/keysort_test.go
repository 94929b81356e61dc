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
