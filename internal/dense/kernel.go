package dense

// The micro-kernel updates one mr×nr tile of a row-major matrix C by the
// product of a packed sliver of mr rows of A and a packed sliver of nr
// columns of B, both k long:
//
//	C[r][j] −= Σₚ a[mr·p + r] · b[nr·p + j],  0 ≤ r < mr, 0 ≤ j < nr.
//
// On amd64 with AVX2 and FMA it is written in assembly (kernel_amd64.s:
// twelve 4-wide accumulators hold the tile, one 8-wide row of b and one
// broadcast entry of a feed them); elsewhere, or with the purego build tag,
// kernGo does the same in Go.
const (
	mr = 6 // rows of a tile
	nr = 8 // columns of a tile
)

// useAsm selects the assembly micro-kernel where the CPU has it; tests turn
// it off to check the Go kernel.
var useAsm = haveAVX2

// useAVX512 selects, with useAsm, the AVX-512 micro-kernels on tiles of
// 16 columns where the CPU has them; tests turn it off to check the AVX2
// path.
var useAVX512 = haveAVX512

// kern checks the slice lengths and runs the micro-kernel.
func kern(k int, a, b, c []float64, ldc int) {
	_ = a[mr*k-1]
	_ = b[nr*k-1]
	_ = c[(mr-1)*ldc+nr-1]
	if useAsm {
		kernFast(k, a, b, c, ldc)
		return
	}
	kernGo(k, a, b, c, ldc)
}

// kernGo is the micro-kernel in Go: the tile in six 2×4 blocks, each with
// its eight sums in registers.
func kernGo(k int, a, b, c []float64, ldc int) {
	for r := 0; r < mr; r += 2 {
		for h := 0; h < nr; h += 4 {
			var s00, s01, s02, s03, s10, s11, s12, s13 float64
			for p := range k {
				ap := a[p*mr+r:][:2]
				bp := b[p*nr+h:][:4]
				a0, a1 := ap[0], ap[1]
				b0, b1, b2, b3 := bp[0], bp[1], bp[2], bp[3]
				s00 += a0 * b0
				s01 += a0 * b1
				s02 += a0 * b2
				s03 += a0 * b3
				s10 += a1 * b0
				s11 += a1 * b1
				s12 += a1 * b2
				s13 += a1 * b3
			}
			c0 := c[r*ldc+h : r*ldc+h+4]
			c1 := c[(r+1)*ldc+h : (r+1)*ldc+h+4]
			c0[0] -= s00
			c0[1] -= s01
			c0[2] -= s02
			c0[3] -= s03
			c1[0] -= s10
			c1[1] -= s11
			c1[2] -= s12
			c1[3] -= s13
		}
	}
}
