//go:build openblas && cgo

// Package openblas binds the one routine package dense takes from
// OpenBLAS when built with the tag openblas: LAPACK dgetrf, the LU
// factorisation with partial pivoting of a column-major matrix. It needs
// the OpenBLAS library and its linker name (Debian: libopenblas-dev).
package openblas

// #cgo LDFLAGS: -lopenblas
// extern void dgetrf_(const int *m, const int *n, double *a, const int *lda, int *ipiv, int *info);
import "C"

import (
	"fmt"
	"math"
)

// Dgetrf factors the n×n column-major matrix a (leading dimension n) in
// place as P·L·U, fills ipiv with the 0-based interchanges (row i swapped
// with ipiv[i], in order) and reports whether no pivot was exactly zero.
// It panics if a or ipiv is too short or n does not fit LAPACK's integers.
func Dgetrf(n int, a []float64, ipiv []int) bool {
	if n < 1 || n > math.MaxInt32 || len(a) < n*n || len(ipiv) < n {
		panic(fmt.Sprintf("openblas: Dgetrf of order %d with %d entries and %d pivots", n, len(a), len(ipiv)))
	}
	cn := C.int(n)
	piv := make([]C.int, n)
	var info C.int
	C.dgetrf_(&cn, &cn, (*C.double)(&a[0]), &cn, &piv[0], &info)
	if info < 0 {
		panic(fmt.Sprintf("openblas: dgetrf rejected argument %d", -info))
	}
	for i, p := range piv {
		ipiv[i] = int(p) - 1
	}
	return info == 0
}
