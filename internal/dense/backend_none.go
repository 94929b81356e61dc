//go:build !openblas || !cgo

package dense

// useBackend is false without the openblas build tag: Factorize runs the
// pure-Go factorisation.
var useBackend = false

func backendFactor(n int, a []float64, ipiv []int) bool {
	panic("dense: built without the openblas tag")
}
