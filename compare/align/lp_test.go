package align

import (
	"math"
	"math/rand/v2"
	"sort"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/optimize/convex/lp"
)

// TestLinProgAgainstGonum solves random bounded programs with the vertex
// walk and with gonum's simplex (gonum.org/v1/gonum/optimize/convex/lp, a
// general-purpose reference library) on the standard form of the same
// program, and compares the optimal values.
func TestLinProgAgainstGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(15, 1101))
	for trial := range 200 {
		n := 2 + trial%4
		m := 3 + rng.IntN(25)
		const box = 2.0
		c := make([]float64, n)
		for j := range c {
			c[j] = rng.NormFloat64()
		}
		p := newLinProg(n, c)
		row := make([]float64, n)
		// Box rows first, so that the corner x = −box is a vertex.
		for j := range n {
			clear(row)
			row[j] = -1
			p.add(row, box)
		}
		for j := range n {
			clear(row)
			row[j] = 1
			p.add(row, box)
		}
		x0 := make([]float64, n)
		for j := range x0 {
			x0[j] = -box
		}
		var rowsA [][]float64
		var rhs []float64
		for range m {
			r := make([]float64, n)
			for j := range r {
				r[j] = rng.NormFloat64()
			}
			// Feasible at the corner, with a slack that is sometimes zero
			// (degenerate vertices).
			s := 0.0
			if rng.IntN(3) > 0 {
				s = rng.Float64()
			}
			b := dot(r, x0) + s
			p.add(r, b)
			rowsA = append(rowsA, r)
			rhs = append(rhs, b)
		}
		work := make([]int, n)
		for j := range work {
			work[j] = j
		}
		// With zero-slack rows the corner may be a degenerate vertex; the
		// box rows are still independent, so it is a valid start.
		x := append([]float64(nil), x0...)
		if _, err := p.solve(x, work); err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		got := dot(c, x)
		for i := 0; i < p.rows(); i++ {
			if v := dot(p.row(i), x) - p.b[i]; v > 1e-9 {
				t.Fatalf("trial %d: row %d violated by %g", trial, i, v)
			}
		}

		// Standard form for gonum: x = x⁺ − x⁻ ≥ −box is x = y − box with
		// y ≥ 0; rows G·y ≤ h and y ≤ 2·box get slacks.
		var G [][]float64
		var h []float64
		for i, r := range rowsA {
			G = append(G, r)
			h = append(h, rhs[i]+box*sumOf(r))
		}
		for j := range n {
			r := make([]float64, n)
			r[j] = 1
			G = append(G, r)
			h = append(h, 2*box)
		}
		rowsN := len(G)
		A := mat.NewDense(rowsN, n+rowsN, nil)
		for i, r := range G {
			for j, v := range r {
				A.Set(i, j, v)
			}
			A.Set(i, n+i, 1)
		}
		cs := make([]float64, n+rowsN)
		copy(cs, c)
		want, _, err := lp.Simplex(cs, A, h, 1e-12, nil)
		if err != nil {
			t.Fatalf("trial %d: gonum: %v", trial, err)
		}
		want -= box * sumOf(c)
		if math.Abs(got-want) > 1e-9*(1+math.Abs(want)) {
			t.Errorf("trial %d (n=%d, m=%d): optimum %.12g, gonum %.12g", trial, n, m, got, want)
		}
	}
}

func sumOf(v []float64) float64 {
	var s float64
	for _, x := range v {
		s += x
	}
	return s
}

func TestSolveSmall(t *testing.T) {
	a := []float64{0, 2, 1, 1, 1, 0, 3, 0, 1}
	b := []float64{5, 3, 7}
	// x = (1, 2, 1)... checked by substitution.
	if !solveSmall(append([]float64(nil), a...), b, 3) {
		t.Fatal("singular")
	}
	x := b
	for r := range 3 {
		got := a[r*3]*x[0] + a[r*3+1]*x[1] + a[r*3+2]*x[2]
		want := []float64{5, 3, 7}[r]
		if math.Abs(got-want) > 1e-12 {
			t.Errorf("row %d: %g, want %g", r, got, want)
		}
	}
	if solveSmall([]float64{1, 2, 2, 4}, []float64{1, 1}, 2) {
		t.Error("singular matrix solved")
	}
}

func TestLargest(t *testing.T) {
	rng := rand.New(rand.NewPCG(2, 9))
	vs := make([]float64, 1000)
	for i := range vs {
		vs[i] = float64(rng.IntN(50)) // many ties
	}
	got := largest(vs, 30)
	// Reference: a full stable sort, largest first, ties by index.
	idx := make([]int, len(vs))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return vs[idx[a]] > vs[idx[b]] })
	for k := range got {
		if got[k] != idx[k] {
			t.Fatalf("rank %d: %d, want %d", k, got[k], idx[k])
		}
	}
	if n := len(largest(vs[:10], 30)); n != 10 {
		t.Errorf("%d of 10", n)
	}
}
