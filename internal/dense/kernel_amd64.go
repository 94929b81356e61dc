//go:build !purego

package dense

import "golang.org/x/sys/cpu"

// haveAVX2 reports whether the CPU runs the AVX2/FMA micro-kernel.
var haveAVX2 = cpu.X86.HasAVX2 && cpu.X86.HasFMA

// kernAVX2 is the micro-kernel in assembly (kernel_amd64.s).
//
//go:noescape
func kernAVX2(k int, a, b, c *float64, ldc int)

// kernFast runs the assembly micro-kernel; the caller has checked the
// lengths (see kern).
func kernFast(k int, a, b, c []float64, ldc int) {
	kernAVX2(k, &a[0], &b[0], &c[0], ldc)
}

//go:noescape
func axpyAVX2(alpha float64, x, y *float64, n int)

//go:noescape
func dotAVX2(x, y *float64, n int) float64

//go:noescape
func rank1AVX2(a *float64, lda, rows, w int, inv float64) (pivot int)

//go:noescape
func asumAVX2(x *float64, n int) float64

//go:noescape
func dot2AVX2(r, x *float64, n int) (s0, s1 float64)

//go:noescape
func axpy2AVX2(v0, v1 float64, r, x *float64, n int)
