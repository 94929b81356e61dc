//go:build !purego

package dense

import "golang.org/x/sys/cpu"

// haveAVX2 reports whether the CPU runs the AVX2/FMA micro-kernel.
var haveAVX2 = cpu.X86.HasAVX2 && cpu.X86.HasFMA

// haveAVX512 reports whether the CPU (and the system, which must save the
// registers) runs the AVX-512 micro-kernels of kernel512_amd64.s.
var haveAVX512 = haveAVX2 && cpu.X86.HasAVX512F

// kernAVX2 is the micro-kernel in assembly (kernel_amd64.s).
//
//go:noescape
func kernAVX2(k int, a, b, c *float64, ldc int)

// kernFast runs the assembly micro-kernel; the caller has checked the
// lengths (see kern).
func kernFast(k int, a, b, c []float64, ldc int) {
	kernAVX2(k, &a[0], &b[0], &c[0], ldc)
}

// kern12x16AVX512 and kern6x16AVX512 are the micro-kernels on tiles of 16
// columns (kernel512_amd64.s): b points at two packed slivers of B, k·nr
// apart, and a at two packed slivers of A, k·mr apart (one for kern6x16).
//
//go:noescape
func kern12x16AVX512(k int, a, b, c *float64, ldc int)

//go:noescape
func kern6x16AVX512(k int, a, b, c *float64, ldc int)

// kern12x8AVX512 and kern6x8AVX512 are the micro-kernels on tiles of one
// sliver of B in AVX-512 registers.
//
//go:noescape
func kern12x8AVX512(k int, a, b, c *float64, ldc int)

//go:noescape
func kern6x8AVX512(k int, a, b, c *float64, ldc int)

// kernU12x16AVX512, kernU6x16AVX512, kernU12x8AVX512 and kernU6x8AVX512
// are the AVX-512 micro-kernels with A read in place, rows lda apart
// (kernelu_amd64.s).
//
//go:noescape
func kernU12x16AVX512(k int, a *float64, lda int, b, c *float64, ldc int)

//go:noescape
func kernU6x16AVX512(k int, a *float64, lda int, b, c *float64, ldc int)

//go:noescape
func kernU12x8AVX512(k int, a *float64, lda int, b, c *float64, ldc int)

//go:noescape
func kernU6x8AVX512(k int, a *float64, lda int, b, c *float64, ldc int)

// trsmLeafAVX512 overwrites the m×nc block at b (rows ldb apart) with
// L⁻¹B, L the unit lower triangle at l (rows ldl apart), as trsmLower's
// row-by-row axpys do, bit for bit (kernel512_amd64.s). m, nc ≥ 1.
//
//go:noescape
func trsmLeafAVX512(m, nc int, l *float64, ldl int, b *float64, ldb int)

// swapAVX512 exchanges x[i] and y[i] for i < n, n ≥ 1 (kernel512_amd64.s).
//
//go:noescape
func swapAVX512(x, y *float64, n int)

//go:noescape
func axpyAVX2(alpha float64, x, y *float64, n int)

//go:noescape
func dotAVX2(x, y *float64, n int) float64

// rank1AVX512 is rank1AVX2 for 2 ≤ w ≤ 9 (kernel512_amd64.s).
//
//go:noescape
func rank1AVX512(a *float64, lda, rows, w int, inv float64) (pivot int)

//go:noescape
func rank1AVX2(a *float64, lda, rows, w int, inv float64) (pivot int)

//go:noescape
func asumAVX2(x *float64, n int) float64

//go:noescape
func dot2AVX2(r, x *float64, n int) (s0, s1 float64)

//go:noescape
func axpy2AVX2(v0, v1 float64, r, x *float64, n int)
