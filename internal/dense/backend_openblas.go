//go:build openblas && cgo

package dense

import "github.com/foilwright/foilwright/internal/dense/openblas"

// With the openblas build tag, Factorize calls OpenBLAS (useBackend); Use
// switches to the pure-Go paths for comparison.
const haveBackend = true

var useBackend = true

// backendFactor factors the row-major n×n a with OpenBLAS's dgetrf, which
// sees the buffer as the column-major Aᵀ: Aᵀ = P·L·U.
func backendFactor(n int, a []float64, ipiv []int) bool {
	return openblas.Dgetrf(n, a, ipiv)
}
