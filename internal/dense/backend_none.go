//go:build !openblas || !cgo

package dense

// Without the openblas build tag (or without cgo) there is no OpenBLAS
// path: Factorize runs the pure-Go factorisation.
const haveBackend = false

var useBackend = false

func backendFactor(n int, a []float64, ipiv []int) bool {
	panic("dense: built without the openblas tag")
}
