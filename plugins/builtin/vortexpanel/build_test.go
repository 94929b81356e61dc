package vortexpanel

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// fillRowScalar is the influence row one panel at a time, through local
// (angle and math.Log): the reference of the chunked build.
func (sv *Solver) fillRowScalar(row []float64, i int) {
	const inv2pi = 1 / (2 * math.Pi)
	px, py := sv.mid(i)
	nx, ny := sv.ty[i], -sv.tx[i]
	for j := range sv.n {
		x, y, beta, lnr := sv.local(j, px, py, i == j)
		s := sv.s[j]
		i1u := x*beta - y*lnr
		i1v := x*lnr - s + y*beta
		u1, v1 := i1u*sv.inv[j], i1v*sv.inv[j]
		ua, ub := -(beta-u1)*inv2pi, -u1*inv2pi
		va, vb := (lnr-v1)*inv2pi, v1*inv2pi
		tn := sv.tx[j]*nx + sv.ty[j]*ny
		ln := -sv.ty[j]*nx + sv.tx[j]*ny
		row[j] += ua*tn + va*ln
		row[j+1] += ub*tn + vb*ln
	}
	if sv.blunt {
		j := sv.n
		if i == j {
			row[sv.n+1] = 0.5
			return
		}
		_, _, beta, lnr := sv.local(j, px, py, false)
		u, v := lnr*inv2pi, beta*inv2pi
		tn := sv.tx[j]*nx + sv.ty[j]*ny
		ln := -sv.ty[j]*nx + sv.tx[j]*ny
		row[sv.n+1] = u*tn + v*ln
	}
}

// TestBuildMatchesScalar checks the build (the assembly rows where the CPU
// has them) against the panel-by-panel formulas with angle (within a unit
// in the last place of math.Atan2) and math.Log, on a sharp, a blunt and a cusped section, with panel counts
// that are and are not multiples of 4: the same matrix, bit for bit.
func TestBuildMatchesScalar(t *testing.T) {
	kt, err := shape.KarmanTrefftz{Centre: geometry.Point{X: -0.08, Y: 0.06}}.Normalized(300)
	if err != nil {
		t.Fatal(err)
	}
	for name, nodes := range map[string][]geometry.Point{
		"sharp":  shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}.Nodes(293),
		"sharp4": shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}.Nodes(64),
		"blunt":  shape.NACA4{Camber: 0.04, CamberPos: 0.4, Thickness: 0.15}.Nodes(523),
		"small":  shape.NACA4{Camber: 0.04, CamberPos: 0.4, Thickness: 0.15}.Nodes(9),
		"cusp":   kt,
	} {
		sv, err := New(nodes)
		if err != nil {
			t.Fatal(err)
		}
		got := sv.build(1)
		m := sv.size()
		worst := 0.0
		for i := range sv.size() - 1 {
			want := make([]float64, m)
			sv.fillRowScalar(want, i)
			r := i
			if i == sv.n {
				r = sv.n + 1
			}
			if sv.cusp && (i == 0 || i == sv.n-1) {
				continue // rows the build replaces
			}
			// ln(r₁/r₂) from the rounded ratio of the squared distances
			// carries an absolute error of about 1e-16 in either
			// evaluation (the assembly fuses its multiply-adds), which the
			// formulas multiply by x/s: up to 1e5 for the short
			// trailing-edge panels seen from mid-chord at 500 panels. So
			// the difference is measured on the scale of the row.
			scale := 0.0
			for _, w := range want {
				scale = max(scale, math.Abs(w))
			}
			for j, w := range want {
				worst = max(worst, math.Abs(got[r*m+j]-w)/scale)
			}
		}
		// The assembly does the operations of the Go formulas in their
		// order, unfused, and its angle and logarithm are those of the
		// math package: the same matrix, unless the compiler fuses the Go
		// code's multiply-adds.
		if worst > 1e-10 || worst != 0 && haveAVX2 && !fusedMath {
			t.Errorf("%s: the build differs from the scalar formulas by %.3g of the largest entry of a row", name, worst)
		}
		if par := sv.build(2); !equal(par, got) {
			t.Errorf("%s: the build on two goroutines differs from one", name)
		}
	}
}

// TestBuild512MatchesAVX2 checks the eight-lane row against the four-lane
// row on panel counts with no, four and other remainders of eight: the
// same matrix, bit for bit.
func TestBuild512MatchesAVX2(t *testing.T) {
	if !haveAVX512 {
		t.Skip("no AVX-512 on this machine")
	}
	defer func(u bool) { use512 = u }(use512)
	for _, n := range []int{8, 12, 15, 64, 101, 203, 400} {
		sv, err := New(shape.NACA4{Camber: 0.04, CamberPos: 0.4, Thickness: 0.12, SharpTE: n%2 == 0}.Nodes(n))
		if err != nil {
			t.Fatal(err)
		}
		use512 = true
		got := sv.build(1)
		use512 = false
		if want := sv.build(1); !equal(got, want) {
			t.Errorf("%d panels: the eight-lane build differs from the four-lane one", n)
		}
	}
}

func equal(a, b []float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// TestBuildOverwritesRecycledMatrix checks that a recycled matrix (see
// matrixPool), whatever it held, gives the same build as a fresh one, on
// a sharp and a blunt section.
func TestBuildOverwritesRecycledMatrix(t *testing.T) {
	for _, nodes := range [][]geometry.Point{
		shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}.Nodes(101),
		shape.NACA4{Camber: 0.04, CamberPos: 0.4, Thickness: 0.15}.Nodes(102),
	} {
		sv, err := New(nodes)
		if err != nil {
			t.Fatal(err)
		}
		want := append([]float64(nil), sv.build(1)...)
		reused := false
		for range 20 { // sync.Pool may drop an item (a quarter of them under -race)
			poison := make([]float64, len(want))
			for i := range poison {
				poison[i] = math.NaN()
			}
			for matrixPool(len(want)).Get() != nil { // empty the pool, so that the poison comes next
			}
			putMatrix(&poison)
			got := sv.build(1)
			reused = reused || &got[0] == &poison[0]
			if !equal(got, want) {
				t.Fatalf("%d nodes: the build on a recycled matrix differs from a fresh one", len(nodes))
			}
		}
		if !reused {
			t.Errorf("%d nodes: the pool never handed the poisoned matrix back", len(nodes))
		}
	}
}
