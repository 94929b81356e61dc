package dense

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// setting is one way of running the factorisation: kernel, goroutines,
// backend.
type setting struct {
	name    string
	asm     bool
	workers int
	backend bool
	asm512  bool // with asm, the AVX-512 products
}

// kernelSet is a choice of micro-kernels: Go, AVX2, AVX2 with AVX-512.
type kernelSet struct{ asm, asm512 bool }

// kernelSets returns the choices this CPU runs.
func kernelSets() []kernelSet {
	s := []kernelSet{{false, false}}
	if haveAVX2 {
		s = append(s, kernelSet{true, false})
	}
	if haveAVX512 {
		s = append(s, kernelSet{true, true})
	}
	return s
}

// settings returns every way this build can factor.
func settings() []setting {
	var s []setting
	for _, k := range kernelSets() {
		for _, w := range []int{1, 2} {
			s = append(s, setting{fmt.Sprintf("asm=%v,avx512=%v,workers=%d", k.asm, k.asm512, w), k.asm, w, false, k.asm512})
		}
	}
	if haveBackend {
		s = append(s, setting{"openblas", false, 0, true, false})
	}
	return s
}

// with runs f under the setting s and restores the defaults.
func with(s setting, f func()) {
	asm, asm512, workers, backend := useAsm, useAVX512, maxWorkers, useBackend
	defer func() { useAsm, useAVX512, maxWorkers, useBackend = asm, asm512, workers, backend }()
	useAsm, useAVX512, maxWorkers, useBackend = s.asm, s.asm512, s.workers, s.backend
	f()
}

// sizes cover every path: tiny, the unblocked limit, the recursive range,
// the blocked look-ahead range, with remainders of every tile and block.
var sizes = []int{1, 2, 3, 5, 7, 8, 9, 13, 16, 17, 31, 64, 65, unblockedMax, unblockedMax + 1,
	blockMin - 1, blockMin, blockMin + 1, 200, 257, 333, 520, blockWideMin + 3}

func randomMatrix(rng *rand.Rand, n int) []float64 {
	a := make([]float64, n*n)
	for i := range a {
		a[i] = rng.NormFloat64()
	}
	return a
}

// panelMatrix is the collocation matrix of the logarithmic (constant
// source) kernel on an ellipse of aspect 10 with nodes clustered at its
// ends by cosine spacing, as a panel method makes: entry (i, j) is
// ln|pᵢ − qⱼ| with pᵢ the midpoints and qⱼ the nodes, and ln(sᵢ/(2e)) (the
// panel's own average) on the diagonal.
func panelMatrix(n int) []float64 {
	q := make([][2]float64, n+1)
	for j := range q {
		t := math.Pi * (1 - math.Cos(math.Pi*float64(j)/float64(n)))
		q[j] = [2]float64{math.Cos(t), 0.1 * math.Sin(t)}
	}
	a := make([]float64, n*n)
	for i := range n {
		px, py := (q[i][0]+q[i+1][0])/2, (q[i][1]+q[i+1][1])/2
		for j := range n {
			if i == j {
				s := math.Hypot(q[i+1][0]-q[i][0], q[i+1][1]-q[i][1])
				a[i*n+j] = math.Log(s / (2 * math.E))
				continue
			}
			a[i*n+j] = math.Log(math.Hypot(px-q[j][0], py-q[j][1]))
		}
	}
	return a
}

// gonumSolve solves A·X = B with gonum's mat.LU (the reference) and returns
// X row-major, its condition estimate and SolveTo's error.
func gonumSolve(n int, a, b []float64, nrhs int) ([]float64, float64, error) {
	var lu mat.LU
	lu.Factorize(mat.NewDense(n, n, append([]float64(nil), a...)))
	var x mat.Dense
	err := lu.SolveTo(&x, false, mat.NewDense(n, nrhs, append([]float64(nil), b...)))
	return x.RawMatrix().Data, lu.Cond(), err
}

// checkAgainstGonum factors a in every setting and compares the solution
// of three right-hand sides (as one, two and three columns) and the
// condition estimate with gonum's mat.LU.
func checkAgainstGonum(t *testing.T, name string, n int, a []float64, rng *rand.Rand) {
	t.Helper()
	for _, nrhs := range []int{1, 2, 3} {
		b := make([]float64, n*nrhs)
		for i := range b {
			b[i] = rng.NormFloat64()
		}
		want, wantCond, err := gonumSolve(n, a, b, nrhs)
		if err != nil {
			t.Fatalf("%s n=%d: gonum: %v", name, n, err)
		}
		// The solutions of two backward-stable factorisations differ by
		// about cond·ε relative to the solution.
		tol := max(1e-13, 50*float64(n)*wantCond*0x1p-52)
		scale := 0.0
		for _, v := range want {
			scale = max(scale, math.Abs(v))
		}
		for _, s := range settings() {
			with(s, func() {
				var lu LU
				lu.Factorize(n, append([]float64(nil), a...))
				x := append([]float64(nil), b...)
				if err := lu.Solve(x, nrhs); err != nil {
					t.Fatalf("%s n=%d %s: %v", name, n, s.name, err)
				}
				worst := 0.0
				for i := range x {
					worst = max(worst, math.Abs(x[i]-want[i])/scale)
				}
				if worst > tol {
					t.Errorf("%s n=%d nrhs=%d %s: solution differs from gonum's by %.3g (tolerance %.3g)", name, n, nrhs, s.name, worst, tol)
				}
				// The same estimator on the same matrix: equal but for the
				// rounding of the solves it runs.
				if c := lu.Cond(); math.Abs(c-wantCond) > 1e-6*wantCond {
					t.Errorf("%s n=%d %s: Cond %.10g, gonum %.10g", name, n, s.name, c, wantCond)
				}
			})
		}
	}
}

func TestRandomAgainstGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for _, n := range sizes {
		checkAgainstGonum(t, "random", n, randomMatrix(rng, n), rng)
	}
}

func TestPanelMatrixAgainstGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for _, n := range []int{8, 40, unblockedMax + 3, blockMin + 7, 300} {
		checkAgainstGonum(t, "panel", n, panelMatrix(n), rng)
	}
}

// TestFactorsAgainstGonum compares the factors and interchanges themselves
// with gonum's (the same partial pivoting): P·L·U reproduces A, and L, U
// and the pivots match.
func TestFactorsAgainstGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for _, n := range []int{5, 70, 150, 300} {
		a := randomMatrix(rng, n)
		var ref mat.LU
		ref.Factorize(mat.NewDense(n, n, append([]float64(nil), a...)))
		var l, u mat.TriDense
		ref.LTo(&l)
		ref.UTo(&u)
		refPiv := ref.RowPivots(nil)
		for _, s := range settings() {
			if s.backend {
				continue // column interchanges: other factors, same solutions
			}
			with(s, func() {
				var lu LU
				lu.Factorize(n, append([]float64(nil), a...))
				// The row permutation of A = P·L·U, built from the
				// interchanges as gonum builds its own.
				piv := make([]int, n)
				for i := range piv {
					piv[i] = i
				}
				for i := n - 1; i >= 0; i-- {
					p := lu.ipiv[i]
					piv[i], piv[p] = piv[p], piv[i]
				}
				for i := range n {
					if piv[i] != refPiv[i] {
						t.Fatalf("n=%d %s: row pivot %d is %d, gonum %d", n, s.name, i, piv[i], refPiv[i])
					}
				}
				worst := 0.0
				for i := range n {
					for j := range n {
						var want float64
						switch {
						case i > j:
							want = l.At(i, j)
						default:
							want = u.At(i, j)
						}
						worst = max(worst, math.Abs(lu.a[i*n+j]-want))
					}
				}
				if worst > 1e-11 {
					t.Errorf("n=%d %s: factors differ from gonum's by %.3g", n, s.name, worst)
				}
			})
		}
	}
}

// TestPivoting covers matrices that need interchanges: a zero in the first
// pivot position, a permutation matrix, a matrix whose pivots grow only
// when rows are exchanged, and rows scaled over many decades.
func TestPivoting(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	cases := map[string]func(n int) []float64{
		"zero first pivot": func(n int) []float64 {
			a := randomMatrix(rng, n)
			a[0] = 0
			return a
		},
		"permutation": func(n int) []float64 {
			a := make([]float64, n*n)
			for i, p := range rng.Perm(n) {
				a[i*n+p] = 1 + float64(i)
			}
			return a
		},
		"zero diagonal": func(n int) []float64 {
			a := randomMatrix(rng, n)
			for i := range n {
				a[i*n+i] = 0
			}
			return a
		},
		"graded rows": func(n int) []float64 {
			a := randomMatrix(rng, n)
			for i := range n {
				s := math.Pow(10, float64(i%13)-6)
				for j := range n {
					a[i*n+j] *= s
				}
			}
			return a
		},
	}
	for name, make := range cases {
		for _, n := range []int{3, 9, 64, unblockedMax + 5, 250} {
			checkAgainstGonum(t, name, n, make(n), rng)
		}
	}
}

// TestSingular checks that exactly singular matrices give a Condition
// error like gonum's: +Inf with a zero pivot, and a huge estimate where
// rounding leaves a tiny pivot; and that Solve then leaves no garbage
// claimed as a solution.
func TestSingular(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	// exact: the elimination meets an exactly zero pivot in any order of
	// operations, so the condition number is +Inf as gonum's is; otherwise
	// rounding may leave a tiny pivot and a huge finite estimate.
	type singular struct {
		exact bool
		make  func(n int) []float64
	}
	cases := map[string]singular{
		"zero column": {true, func(n int) []float64 {
			a := randomMatrix(rng, n)
			for i := range n {
				a[i*n+n/2] = 0
			}
			return a
		}},
		"zero matrix": {true, func(n int) []float64 { return make([]float64, n*n) }},
		"repeated row": {false, func(n int) []float64 {
			a := randomMatrix(rng, n)
			copy(a[(n-1)*n:], a[:n])
			return a
		}},
		"rank one": {false, func(n int) []float64 {
			a := make([]float64, n*n)
			for i := range n {
				for j := range n {
					a[i*n+j] = float64(i+1) * float64(j+2)
				}
			}
			return a
		}},
	}
	for name, c := range cases {
		for _, n := range []int{2, 9, unblockedMax + 3, 230} {
			a := c.make(n)
			b := randomMatrix(rng, n)[:n:n]
			_, _, refErr := gonumSolve(n, a, b, 1)
			var refCond mat.Condition
			if !errors.As(refErr, &refCond) {
				t.Fatalf("%s n=%d: gonum gives %v, want a Condition error", name, n, refErr)
			}
			for _, s := range settings() {
				with(s, func() {
					var lu LU
					lu.Factorize(n, append([]float64(nil), a...))
					x := append([]float64(nil), b...)
					err := lu.Solve(x, 1)
					var cond Condition
					if !errors.As(err, &cond) || !(float64(cond) > ConditionTolerance) {
						t.Errorf("%s n=%d %s: Solve gives %v, want a Condition error (gonum: %v)", name, n, s.name, err, refErr)
					}
					if c.exact && !math.IsInf(float64(cond), 1) {
						t.Errorf("%s n=%d %s: condition %g, want +Inf (gonum %g)", name, n, s.name, float64(cond), float64(refCond))
					}
					if math.IsInf(float64(cond), 1) && !equalSlices(x, b) {
						t.Errorf("%s n=%d %s: Solve changed b for a matrix with a zero pivot", name, n, s.name)
					}
				})
			}
		}
	}
}

// TestFactorizeSolve checks that FactorizeSolve gives what Factorize and
// Solve give, bit for bit (the same operations, the condition estimate
// beside the solve from parallelMin rows), with the same error: on
// regular matrices, a matrix with an exactly zero pivot (b unchanged) and
// a near-singular one (b solved, a Condition error).
func TestFactorizeSolve(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 22))
	matrices := map[string]func(n int) []float64{
		"random": func(n int) []float64 { return randomMatrix(rng, n) },
		"zero column": func(n int) []float64 {
			a := randomMatrix(rng, n)
			for i := range n {
				a[i*n+n/3] = 0
			}
			return a
		},
		"repeated row": func(n int) []float64 {
			a := randomMatrix(rng, n)
			copy(a[(n-1)*n:], a[:n])
			return a
		},
	}
	for name, make := range matrices {
		for _, n := range []int{7, parallelMin + 5} {
			a := make(n)
			for _, nrhs := range []int{2, 3} {
				b := randomMatrix(rng, n*nrhs)[: n*nrhs : n*nrhs]
				for _, s := range settings() {
					if n > unblockedMax && haveAVX2 && !s.asm && !s.backend {
						continue // the Go kernels are checked on the small size; slow under -race
					}
					with(s, func() {
						var want LU
						wantX := append([]float64(nil), b...)
						want.Factorize(n, append([]float64(nil), a...))
						wantErr := want.Solve(wantX, nrhs)
						var got LU
						x := append([]float64(nil), b...)
						err := got.FactorizeSolve(n, append([]float64(nil), a...), x, nrhs)
						if fmt.Sprint(err) != fmt.Sprint(wantErr) {
							t.Errorf("%s n=%d nrhs=%d %s: error %v, want %v", name, n, nrhs, s.name, err, wantErr)
						}
						if !equalSlices(x, wantX) || got.Cond() != want.Cond() && !(math.IsNaN(got.Cond()) && math.IsNaN(want.Cond())) {
							t.Errorf("%s n=%d nrhs=%d %s: solution or condition (%g, want %g) differs", name, n, nrhs, s.name, got.Cond(), want.Cond())
						}
					})
				}
			}
		}
	}
}

// TestWorkersGiveSameFactors checks the claim of the package documentation:
// the factors do not depend on the number of goroutines.
func TestWorkersGiveSameFactors(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	for _, n := range []int{blockMin, 411, 700} {
		a := randomMatrix(rng, n)
		var first []float64
		for _, w := range []int{1, 2, 3} {
			with(setting{asm: useAsm, asm512: useAVX512, workers: w}, func() {
				var lu LU
				lu.Factorize(n, append([]float64(nil), a...))
				if first == nil {
					first = lu.a
				} else if !equalSlices(first, lu.a) {
					t.Errorf("n=%d: the factors on %d goroutines differ from those on one", n, w)
				}
			})
		}
	}
}

// TestAVX512SameFactors checks the claim of kernel512_amd64.s: the AVX-512
// micro-kernels give the AVX2 path's factors bit for bit (each entry is
// summed in the same order by fused multiply-adds), on every kind of step,
// with the blocks of the same width (the AVX-512 path takes wider ones,
// which round differently; TestRandomAgainstGonum checks those).
func TestAVX512SameFactors(t *testing.T) {
	if !haveAVX512 {
		t.Skip("no AVX-512 on this machine")
	}
	defer func(w bool) { wideBlocks = w }(wideBlocks)
	wideBlocks = false
	rng := rand.New(rand.NewPCG(21, 22))
	for _, n := range []int{unblockedMax + 1, blockMin - 1, 257, 401, 520} {
		a := randomMatrix(rng, n)
		var got [2][]float64
		for i, on := range []bool{false, true} {
			with(setting{asm: true, asm512: on, workers: 2}, func() {
				var lu LU
				lu.Factorize(n, append([]float64(nil), a...))
				got[i] = lu.a
			})
		}
		if !equalSlices(got[0], got[1]) {
			t.Errorf("n=%d: the factors with AVX-512 differ from those with AVX2 alone", n)
		}
	}
}

// TestKernels checks the micro-kernel in Go, and in assembly where the CPU
// has it, against a plain triple loop, and gemmSub on every edge shape.
func TestKernels(t *testing.T) {
	rng := rand.New(rand.NewPCG(13, 14))
	for _, ks := range kernelSets() {
		asm := ks
		with(setting{asm: ks.asm, asm512: ks.asm512, workers: 1}, func() {
			for _, d := range [][3]int{{1, 1, 1}, {5, 7, 3}, {6, 8, 4}, {13, 17, 5}, {19, 48, 7}, {18, 16, 9}, {97, 33, 64}, {200, 530, 300}} {
				m, n, k := d[0], d[1], d[2]
				lda, ldb, ldc := k+3, n+1, n+5
				a, b, c := randomMatrix(rng, max(m, k)+3), randomMatrix(rng, max(k, n)+5), randomMatrix(rng, max(m, n)+5)
				want := append([]float64(nil), c...)
				for i := range m {
					for j := range n {
						s := 0.0
						for p := range k {
							s += a[i*lda+p] * b[p*ldb+j]
						}
						want[i*ldc+j] -= s
					}
				}
				gemmSub(m, n, k, a, lda, b, ldb, c, ldc, new(workspace))
				for i := range c {
					if math.Abs(c[i]-want[i]) > 1e-12*float64(k+1) {
						t.Fatalf("asm=%v gemm %v: entry %d is %g, want %g", asm, d, i, c[i], want[i])
					}
				}
			}
		})
	}
}

// TestRank1 checks the elimination step (assembly where the CPU has it)
// against the same arithmetic in Go, with sentinels around the rows it may
// touch, for every small width and row count.
func TestRank1(t *testing.T) {
	if !haveAVX2 {
		t.Skip("no AVX2/FMA on this machine: the Go loop runs")
	}
	rng := rand.New(rand.NewPCG(15, 16))
	type impl struct {
		name       string
		f          func(a *float64, lda, rows, w int, inv float64) int
		wMin, wMax int
	}
	impls := []impl{{"AVX2", rank1AVX2, 1, 39}}
	if haveAVX512 {
		impls = append(impls, impl{"AVX-512", rank1AVX512, 2, 9})
	}
	for _, im := range impls {
		for rows := 0; rows < 7; rows++ {
			for w := im.wMin; w <= im.wMax; w++ {
				lda := w + 3
				buf := make([]float64, (rows+3)*lda)
				for i := range buf {
					buf[i] = rng.NormFloat64()
				}
				a := buf[lda : lda+(rows+1)*lda] // the pivot row and rows below, with sentinel rows around
				want := append([]float64(nil), buf...)
				inv := 1 / a[0]
				wantPiv, best := 1, -1.0
				for r := 1; r <= rows; r++ {
					row := want[lda+r*lda : lda+r*lda+w]
					l := row[0] * inv
					row[0] = l
					for c := 1; c < w; c++ {
						row[c] = math.FMA(-l, want[lda+c], row[c])
					}
					if w > 1 && math.Abs(row[1]) > best {
						best, wantPiv = math.Abs(row[1]), r
					}
				}
				piv := im.f(&a[0], lda, rows, w, inv)
				if piv != wantPiv {
					t.Errorf("%s rows %d w %d: pivot %d, want %d", im.name, rows, w, piv, wantPiv)
				}
				for i := range buf {
					if buf[i] != want[i] {
						t.Fatalf("%s rows %d w %d: entry %d (row %d) is %g, want %g", im.name, rows, w, i, i/lda-1, buf[i], want[i])
					}
				}
			}
		}
	}
}

// TestVectorKernels checks axpy, dot and asum (assembly where the CPU has
// them) against plain loops, for lengths around the unrolling, with a
// sentinel after y.
func TestVectorKernels(t *testing.T) {
	rng := rand.New(rand.NewPCG(17, 18))
	for _, asm := range []bool{false, true} {
		if asm && !haveAVX2 {
			continue
		}
		with(setting{asm: asm, workers: 1}, func() {
			for n := range 70 {
				x := make([]float64, n+1)
				for i := range x {
					x[i] = rng.NormFloat64()
				}
				y := make([]float64, n+1)
				for i := range y {
					y[i] = rng.NormFloat64()
				}
				wantDot, wantAsum := 0.0, 0.0
				for i := range n {
					wantDot += x[i] * y[i]
					wantAsum += math.Abs(x[i])
				}
				if d := dot(x[:n], y[:n]); math.Abs(d-wantDot) > 1e-13*float64(n+1) {
					t.Errorf("asm %v n %d: dot %g, want %g", asm, n, d, wantDot)
				}
				if s := asum(x[:n]); math.Abs(s-wantAsum) > 1e-13*float64(n+1) {
					t.Errorf("asm %v n %d: asum %g, want %g", asm, n, s, wantAsum)
				}
				want := append([]float64(nil), y...)
				for i := range n {
					want[i] += 0.75 * x[i]
				}
				axpy(0.75, x[:n], y[:n])
				for i := range y {
					if math.Abs(y[i]-want[i]) > 1e-15 {
						t.Errorf("asm %v n %d: axpy entry %d is %g, want %g", asm, n, i, y[i], want[i])
					}
				}
				// The two-column forms, on the row-major n×2 matrix z (one
				// entry past it, which must stay).
				z := make([]float64, 2*n+1)
				for i := range z {
					z[i] = rng.NormFloat64()
				}
				want0, want1 := 0.0, 0.0
				for i := range n {
					want0 += x[i] * z[2*i]
					want1 += x[i] * z[2*i+1]
				}
				if s0, s1 := dot2(x[:n], z[:2*n]); math.Abs(s0-want0) > 1e-13*float64(n+1) || math.Abs(s1-want1) > 1e-13*float64(n+1) {
					t.Errorf("asm %v n %d: dot2 %g %g, want %g %g", asm, n, s0, s1, want0, want1)
				}
				wantZ := append([]float64(nil), z...)
				for i := range n {
					wantZ[2*i] -= 0.75 * x[i]
					wantZ[2*i+1] -= -1.25 * x[i]
				}
				axpy2(0.75, -1.25, x[:n], z[:2*n])
				for i := range z {
					if math.Abs(z[i]-wantZ[i]) > 1e-15 {
						t.Errorf("asm %v n %d: axpy2 entry %d is %g, want %g", asm, n, i, z[i], wantZ[i])
					}
				}
			}
		})
	}
}

func TestPanics(t *testing.T) {
	for name, f := range map[string]func(){
		"zero order":       func() { new(LU).Factorize(0, nil) },
		"short matrix":     func() { new(LU).Factorize(3, make([]float64, 8)) },
		"solve unfactored": func() { _ = new(LU).Solve(make([]float64, 3), 1) },
		"short rhs": func() {
			var lu LU
			lu.Factorize(2, []float64{1, 2, 3, 4})
			_ = lu.Solve(make([]float64, 3), 2)
		},
	} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("%s did not panic", name)
				}
			}()
			f()
		}()
	}
}

func TestConditionMessage(t *testing.T) {
	var lu LU
	lu.Factorize(2, []float64{1, 2, 2, 4})
	err := lu.Solve([]float64{1, 1}, 1)
	if err == nil || err.Error() != "dense: matrix singular or near-singular with condition number +Inf" {
		t.Errorf("error %v", err)
	}
}

func equalSlices(a, b []float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] && !(a[i] != a[i] && b[i] != b[i]) {
			return false
		}
	}
	return true
}

func TestPaths(t *testing.T) {
	paths := Paths()
	if paths[0] != GoPath || paths[len(paths)-1] != Current() {
		t.Errorf("Paths %v, Current %v", paths, Current())
	}
	a := panelMatrix(50)
	var want []float64
	for _, p := range paths {
		restore := Use(p)
		if Current() != p {
			t.Errorf("Use(%v): Current is %v", p, Current())
		}
		var lu LU
		lu.Factorize(50, append([]float64(nil), a...))
		x := make([]float64, 50)
		x[7] = 1
		if err := lu.Solve(x, 1); err != nil {
			t.Fatal(err)
		}
		if want == nil {
			want = x
		}
		for i := range x {
			if math.Abs(x[i]-want[i]) > 1e-12*math.Abs(want[i])+1e-14 {
				t.Errorf("path %v: x[%d] = %g, path %v: %g", p, i, x[i], paths[0], want[i])
			}
		}
		restore()
	}
	if Current() != paths[len(paths)-1] {
		t.Errorf("restored to %v", Current())
	}
}

// TestSwap checks the exchange of two row pieces (assembly where the CPU
// has AVX-512) for lengths around its unrolling, with sentinels after them.
func TestSwap(t *testing.T) {
	for _, ks := range kernelSets() {
		with(setting{asm: ks.asm, asm512: ks.asm512, workers: 1}, func() {
			for n := range 40 {
				x, y := make([]float64, n+1), make([]float64, n+1)
				for i := range x {
					x[i], y[i] = float64(i), -float64(i)-0.5
				}
				swap(x[:n], y[:n])
				for i := range n {
					if x[i] != -float64(i)-0.5 || y[i] != float64(i) {
						t.Fatalf("%+v n %d: entry %d is %g, %g", ks, n, i, x[i], y[i])
					}
				}
				if x[n] != float64(n) || y[n] != -float64(n)-0.5 {
					t.Fatalf("%+v n %d: the sentinels changed", ks, n)
				}
			}
		})
	}
}

// TestTrsmLeaf checks the AVX-512 leaf of the triangular solve against the
// AVX2 path's row-by-row axpys: the same block, bit for bit, on heights 2
// to trsmBase and widths that are and are not multiples of 8, with zero,
// NaN and infinite multipliers in L, and no entry written outside the
// block (sentinels in the rows' padding and below the last row); a NaN
// matches a NaN.
func TestTrsmLeaf(t *testing.T) {
	if !haveAVX512 {
		t.Skip("no AVX-512 on this machine")
	}
	rng := rand.New(rand.NewPCG(31, 32))
	sentinel := math.Float64frombits(0x7ff8dead0000beef)
	for m := 2; m <= trsmBase; m++ {
		for _, nc := range []int{8, 9, 13, 16, 21, 32, 45} {
			ldl, ldb := m+3, nc+5
			l := make([]float64, m*ldl)
			for i := range l {
				switch r := rng.IntN(20); {
				case r < 3:
					l[i] = 0
				case r == 3 && m == 5:
					l[i] = math.NaN()
				case r == 4 && m == 6:
					l[i] = math.Inf(-1)
				default:
					l[i] = rng.NormFloat64()
				}
			}
			b := make([]float64, (m+1)*ldb)
			for i := range b {
				b[i] = sentinel
			}
			for i := range m {
				for j := range nc {
					b[i*ldb+j] = rng.NormFloat64()
				}
			}
			var got, want []float64
			with(setting{asm: true, asm512: false, workers: 1}, func() {
				want = append([]float64(nil), b...)
				trsmLower(m, nc, l, ldl, want, ldb, new(workspace))
			})
			with(setting{asm: true, asm512: true, workers: 1}, func() {
				got = append([]float64(nil), b...)
				trsmLower(m, nc, l, ldl, got, ldb, new(workspace))
			})
			for i := range got {
				// NaNs match as NaNs (their payloads and signs may differ).
				if math.Float64bits(got[i]) != math.Float64bits(want[i]) && !(math.IsNaN(got[i]) && math.IsNaN(want[i])) {
					t.Fatalf("m=%d nc=%d: entry (%d, %d) is %v, the axpys give %v", m, nc, i/ldb, i%ldb, got[i], want[i])
				}
			}
		}
	}
}
