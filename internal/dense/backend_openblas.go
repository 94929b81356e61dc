//go:build openblas && cgo

package dense

import "github.com/foilwright/foilwright/internal/dense/openblas"

// useBackend makes Factorize call OpenBLAS (build tag openblas); the tests
// turn it off to compare with the pure-Go factorisation.
var useBackend = true

// backendFactor factors the row-major n×n a with OpenBLAS's dgetrf, which
// sees the buffer as the column-major Aᵀ: Aᵀ = P·L·U.
func backendFactor(n int, a []float64, ipiv []int) bool {
	return openblas.Dgetrf(n, a, ipiv)
}
