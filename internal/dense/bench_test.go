package dense

import (
	"fmt"
	"math/rand/v2"
	"testing"
)

var benchSizes = []int{100, 200, 400, 800, 1600}

func randMatrix(n int, seed uint64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 7))
	a := make([]float64, n*n)
	for i := range a {
		a[i] = rng.NormFloat64()
	}
	return a
}

// BenchmarkKernel times the micro-kernel on packed slivers in L1.
func BenchmarkKernel(b *testing.B) {
	const k = 128
	a, bp, c := randMatrix(mr*k, 1)[:mr*k], randMatrix(nr*k, 2)[:nr*k], make([]float64, mr*nr)
	a = a[:mr*k]
	for b.Loop() {
		kern(k, a, bp, c, nr)
	}
	b.ReportMetric(float64(2*mr*nr*k)*float64(b.N)/b.Elapsed().Seconds()/1e9, "GFLOP/s")
}

// BenchmarkGemm times the trailing update C −= A·B of a blocked LU step,
// on each path of the build.
func BenchmarkGemm(b *testing.B) {
	for _, p := range Paths() {
		if p == OpenBLASPath {
			continue
		}
		for _, n := range []int{400, 1600} {
			const k = 64
			b.Run(fmt.Sprintf("%s/n=%d", pathTag(p), n), func(b *testing.B) {
				defer Use(p)()
				a, bb, c := randMatrix(n, 1), randMatrix(n, 2), randMatrix(n, 3)
				ws := new(workspace)
				for b.Loop() {
					gemmSub(n, n, k, a, n, bb, n, c, n, ws)
				}
				b.ReportMetric(float64(2*n*n*k)*float64(b.N)/b.Elapsed().Seconds()/1e9, "GFLOP/s")
			})
		}
	}
}

// pathTag is a short name of a path for benchmark names.
func pathTag(p Path) string {
	switch p {
	case GoPath:
		return "go"
	case AVX2Path:
		return "avx2"
	case AVX512Path:
		return "avx512"
	}
	return "openblas"
}

// BenchmarkFactorize times Factorize (with the condition estimate) on a
// random matrix.
func BenchmarkFactorize(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			orig := randMatrix(n, 1)
			a := make([]float64, len(orig))
			var lu LU
			for b.Loop() {
				copy(a, orig)
				lu.Factorize(n, a)
			}
			b.ReportMetric(2.0/3*float64(n*n*n)*float64(b.N)/b.Elapsed().Seconds()/1e9, "GFLOP/s")
		})
	}
}

// BenchmarkFactor times the factorisation alone, on the assembly paths
// of the build.
func BenchmarkFactor(b *testing.B) {
	for _, p := range Paths() {
		if p == GoPath || p == OpenBLASPath {
			continue
		}
		for _, n := range benchSizes {
			b.Run(fmt.Sprintf("%s/n=%d", pathTag(p), n), func(b *testing.B) {
				defer Use(p)()
				orig := randMatrix(n, 1)
				a := make([]float64, len(orig))
				ipiv := make([]int, n)
				for b.Loop() {
					copy(a, orig)
					f := factorizer{n: n, a: a, ipiv: ipiv, workers: workersFor(n)}
					f.run()
				}
				b.ReportMetric(2.0/3*float64(n*n*n)*float64(b.N)/b.Elapsed().Seconds()/1e9, "GFLOP/s")
			})
		}
	}
}

// BenchmarkCond times the condition estimate of a factored matrix.
func BenchmarkCond(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			var lu LU
			lu.Factorize(n, randMatrix(n, 1))
			for b.Loop() {
				lu.condEst()
			}
		})
	}
}

// BenchmarkSmall compares the unblocked and the recursive factorisation
// of small matrices, to place unblockedMax.
func BenchmarkSmall(b *testing.B) {
	for _, n := range []int{40, 80, 120, 160, 200, 300} {
		for _, alg := range []string{"unblocked", "recursive"} {
			b.Run(fmt.Sprintf("%s/n=%d", alg, n), func(b *testing.B) {
				orig := randMatrix(n, 1)
				a := make([]float64, len(orig))
				ipiv := make([]int, n)
				ws := new(workspace)
				for b.Loop() {
					copy(a, orig)
					f := factorizer{n: n, a: a, ipiv: ipiv, workers: 1}
					if alg == "unblocked" {
						f.unblocked()
					} else {
						f.panel(0, n, ws)
					}
				}
				b.ReportMetric(2.0/3*float64(n*n*n)*float64(b.N)/b.Elapsed().Seconds()/1e9, "GFLOP/s")
			})
		}
	}
}
