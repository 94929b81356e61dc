// Package dense factors and solves dense square linear systems: LU with
// partial pivoting, the condition number estimate that comes with it, and
// solves with one or more right-hand sides, on row-major []float64
// matrices.
//
// The factorisation is blocked: a panel of columns is factored by
// recursive halving, the rows of U to its right by a triangular solve, and
// the trailing matrix is updated by a matrix product whose inner kernel
// computes a 6×8 tile from packed slivers of its factors (in assembly with
// AVX2 and FMA on amd64, as are the elimination step, axpy, dot, their
// two-column forms that solve for two right-hand sides at once, and the
// absolute sum; in Go elsewhere or with the purego build tag). Where the
// CPU has AVX-512 the products run on tiles of 12×16 and 12×8 from the same
// packed slivers, and the panel's elimination step, the row swaps and the
// leaves of the triangular solves (a strip of 8 columns of a row held in
// a register) use it too: the same factors, bit for bit, at the same
// block width, and blocks of 96 columns (128 from 700 rows) instead of
// 64. Blocks are
// used from 160 rows; from 300 rows one goroutine factors the next panel
// while the others update the rest of the trailing matrix in column
// pieces (look-ahead), so that both cores stay busy. Up to 80 rows the
// factorisation goes column by column. The factors do not depend on the
// number of goroutines.
//
// Built with the tag openblas (and cgo, and the OpenBLAS library: Debian's
// libopenblas-dev), Factorize calls OpenBLAS's LAPACK dgetrf instead; the
// default build is pure Go and needs nothing installed. Both give the same
// solutions to within the rounding the condition number allows.
//
// The results are checked against gonum's mat.LU, a general-purpose
// reference library, in the tests.
package dense
