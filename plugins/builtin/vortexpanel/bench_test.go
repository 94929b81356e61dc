package vortexpanel

import (
	"fmt"
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/dense"
)

var benchPanels = []int{100, 200, 400, 800}

func benchNodes(panels int) []geometry.Point {
	return shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}.Loop(panels / 2)
}

func benchSolver(b testing.TB, panels int) *Solver {
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
// parallel build pays, with the assembly rows (where the CPU has them) and
// with the Go formulas.
func BenchmarkBuildSerial(b *testing.B) {
	for _, asm := range []string{"avx512", "avx2", "go"} {
		if asm == "avx512" && !haveAVX512 || asm == "avx2" && !haveAVX2 {
			continue
		}
		for _, n := range benchPanels {
			b.Run(fmt.Sprintf("asm=%v/n=%d", asm, n), func(b *testing.B) {
				defer func(a, a512 bool) { useAsm, use512 = a, a512 }(useAsm, use512)
				useAsm, use512 = asm != "go", asm == "avx512"
				sv := benchSolver(b, n)
				for b.Loop() {
					sv.build(1)
				}
				b.ReportMetric(b.Elapsed().Seconds()*1e9/float64(b.N)/float64(n*n), "ns/eval")
			})
		}
	}
}

// BenchmarkFactor times the LU factorisation (package dense) with its
// condition estimate.
func BenchmarkFactor(b *testing.B) {
	for _, n := range benchPanels {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			sv := benchSolver(b, n)
			orig := sv.build(1)
			a := make([]float64, len(orig))
			var lu dense.LU
			for b.Loop() {
				copy(a, orig)
				lu.Factorize(sv.size(), a)
			}
		})
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
