//go:build !amd64 || purego

package dense

// haveAVX2 is false where the assembly micro-kernel is not built.
const haveAVX2 = false

// haveAVX512 is false where the assembly micro-kernels are not built.
const haveAVX512 = false

func kern12x16AVX512(k int, a, b, c *float64, ldc int) { panic("dense: no assembly") }

func kern6x16AVX512(k int, a, b, c *float64, ldc int) { panic("dense: no assembly") }

func kernU12x16AVX512(k int, a *float64, lda int, b, c *float64, ldc int) {
	panic("dense: no assembly")
}

func kernU6x16AVX512(k int, a *float64, lda int, b, c *float64, ldc int) {
	panic("dense: no assembly")
}

func kernU12x8AVX512(k int, a *float64, lda int, b, c *float64, ldc int) {
	panic("dense: no assembly")
}

func kernU6x8AVX512(k int, a *float64, lda int, b, c *float64, ldc int) {
	panic("dense: no assembly")
}

func swapAVX512(x, y *float64, n int) { panic("dense: no assembly") }

func trsmLeafAVX512(m, nc int, l *float64, ldl int, b *float64, ldb int) {
	panic("dense: no assembly")
}

func kern12x8AVX512(k int, a, b, c *float64, ldc int) { panic("dense: no assembly") }

func kern6x8AVX512(k int, a, b, c *float64, ldc int) { panic("dense: no assembly") }

func kernFast(k int, a, b, c []float64, ldc int) { kernGo(k, a, b, c, ldc) }

func axpyAVX2(alpha float64, x, y *float64, n int) { panic("dense: no assembly") }

func dotAVX2(x, y *float64, n int) float64 { panic("dense: no assembly") }

func rank1AVX512(a *float64, lda, rows, w int, inv float64) (pivot int) {
	panic("dense: no assembly")
}

func rank1AVX2(a *float64, lda, rows, w int, inv float64) (pivot int) { panic("dense: no assembly") }

func asumAVX2(x *float64, n int) float64 { panic("dense: no assembly") }

func dot2AVX2(r, x *float64, n int) (s0, s1 float64) { panic("dense: no assembly") }

func axpy2AVX2(v0, v1 float64, r, x *float64, n int) { panic("dense: no assembly") }
