package clean

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestRadixSortCands checks the radix sort of join's candidates against
// slices.SortFunc with candCmp (the reference) on sets of every size
// around its threshold: distinct costs, costs shared by different ends
// (then ordered by end), first ends beyond 16 bits, and the cases it must
// refuse (a cost and first end both shared, a NaN or negative cost).
func TestRadixSortCands(t *testing.T) {
	rng := rand.New(rand.NewPCG(18, 11))
	for trial := range 60 {
		n := []int{10, 255, 256, 1000, 20000}[trial%5]
		cs := make([]cand, n)
		for i := range cs {
			cs[i] = cand{e: int32(rng.IntN(3 * n)), f: int32(rng.IntN(n)), cost: rng.ExpFloat64() * math.Pow(10, float64(rng.IntN(8)-4))}
			if trial%3 == 1 {
				cs[i].e += 1 << 17 // past the first 16-bit digit
			}
			if trial%3 == 2 && i > 0 && rng.IntN(4) == 0 {
				cs[i].cost = cs[i-1].cost // a shared cost, ends apart
				if cs[i].e == cs[i-1].e {
					cs[i].e++
				}
			}
		}
		want := slices.Clone(cs)
		slices.SortFunc(want, candCmp)
		got := slices.Clone(cs)
		// A shared cost with the same first end could only come from
		// another draw: make sure there is none.
		tie := false
		for k := 1; k < len(want); k++ {
			tie = tie || want[k].cost == want[k-1].cost && want[k].e == want[k-1].e
		}
		if ok := radixSortCands(got); ok == tie && n >= 256 || ok && !slices.Equal(got, want) {
			t.Fatalf("trial %d (%d candidates, tie %v): radix sort %v, equal %v", trial, n, tie, ok, slices.Equal(got, want))
		}
	}
	base := make([]cand, 300)
	for i := range base {
		base[i] = cand{e: int32(i), f: 0, cost: float64(300 - i)}
	}
	for name, spoil := range map[string]func([]cand){
		"shared cost and end": func(cs []cand) { cs[7] = cand{e: cs[9].e, f: 1, cost: cs[9].cost} },
		"NaN cost":            func(cs []cand) { cs[7].cost = math.NaN() },
		"negative cost":       func(cs []cand) { cs[7].cost = -1 },
	} {
		cs := slices.Clone(base)
		spoil(cs)
		if radixSortCands(cs) {
			t.Errorf("%s: sorted, want refused", name)
		}
	}
}
