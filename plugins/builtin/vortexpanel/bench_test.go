package vortexpanel

import (
	"fmt"
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
	"gonum.org/v1/gonum/mat"
)

var benchPanels = []int{100, 200, 400, 800}

func benchNodes(panels int) []geometry.Point {
	return shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}.Loop(panels / 2)
}

func benchSolver(b *testing.B, panels int) *Solver {
	sv, err := New(benchNodes(panels))
	if err != nil {
		b.Fatal(err)
	}
	return sv
}

// BenchmarkBuild times the influence-matrix build alone.
func BenchmarkBuild(b *testing.B) {
	for _, n := range benchPanels {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			sv := benchSolver(b, n)
			for b.Loop() {
				sv.build(buildWorkers(n))
			}
		})
	}
}

// BenchmarkBuildSerial times the build on one goroutine, to show where the
// parallel build pays.
func BenchmarkBuildSerial(b *testing.B) {
	for _, n := range benchPanels {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			sv := benchSolver(b, n)
			for b.Loop() {
				sv.build(1)
			}
		})
	}
}

// BenchmarkFactor times the LU factorisation (gonum mat.LU) with its
// condition estimate.
func BenchmarkFactor(b *testing.B) {
	for _, n := range benchPanels {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			sv := benchSolver(b, n)
			a := sv.build(1)
			var lu mat.LU
			for b.Loop() {
				lu.Factorize(a)
				_ = lu.Cond()
			}
		})
	}
}

// BenchmarkFactorHand times a plain row-major LU with partial pivoting, the
// alternative to gonum that was measured.
func BenchmarkFactorHand(b *testing.B) {
	for _, n := range benchPanels {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			sv := benchSolver(b, n)
			a := sv.build(1)
			m := sv.size()
			orig := mat.DenseCopyOf(a).RawMatrix().Data
			w := make([]float64, len(orig))
			for b.Loop() {
				copy(w, orig)
				handLU(w, m)
			}
		})
	}
}

func handLU(a []float64, m int) {
	for k := range m {
		p := k
		for i := k + 1; i < m; i++ {
			if math.Abs(a[i*m+k]) > math.Abs(a[p*m+k]) {
				p = i
			}
		}
		if p != k {
			for j := range m {
				a[k*m+j], a[p*m+j] = a[p*m+j], a[k*m+j]
			}
		}
		rk := a[k*m : (k+1)*m]
		inv := 1 / rk[k]
		for i := k + 1; i < m; i++ {
			ri := a[i*m : (i+1)*m]
			f := ri[k] * inv
			ri[k] = f
			for j := k + 1; j < m; j++ {
				ri[j] -= f * rk[j]
			}
		}
	}
}

// BenchmarkSolve times Solve for one angle on a factored system.
func BenchmarkSolve(b *testing.B) {
	for _, n := range benchPanels {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			sv := benchSolver(b, n)
			for b.Loop() {
				if _, err := sv.Solve([]float64{0.05}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func benchSweep(b *testing.B, panels, angles int) {
	nodes := benchNodes(panels)
	alphas := make([]float64, angles)
	for i := range alphas {
		alphas[i] = (-10 + 20*float64(i)/float64(max(angles-1, 1))) * math.Pi / 180
	}
	for b.Loop() {
		sv, err := New(nodes)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := sv.Solve(alphas); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkSweep41 and BenchmarkSweep1 time the whole solver (build, factor,
// solve) for 41 angles and for one, at 200 panels.
func BenchmarkSweep41(b *testing.B) { benchSweep(b, 200, 41) }
func BenchmarkSweep1(b *testing.B)  { benchSweep(b, 200, 1) }
