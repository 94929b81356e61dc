package vortexpanel

import (
	"runtime"
	"sync"
)

// The influence matrix of a few hundred panels or more is megabytes: a
// fresh one costs page faults and zeroing, measured at 400 panels as twice
// the build time when the garbage collector was kept from reusing memory.
// So the matrices of Solvers that have been collected are recycled: New
// registers a cleanup that puts the matrix back into matrixPool, and the
// build writes every entry, so a recycled matrix need not be cleared.
var matrixPool sync.Pool // of *[]float64

// getMatrix returns a slice of size entries, recycled if one of a
// similar size is at hand, with arbitrary contents.
func getMatrix(size int) []float64 {
	if p, ok := matrixPool.Get().(*[]float64); ok {
		if c := cap(*p); c >= size && c <= 2*size {
			return (*p)[:size]
		}
		matrixPool.Put(p)
	}
	return make([]float64, size)
}

// putMatrix gives a matrix no one uses any more back for reuse.
func putMatrix(p *[]float64) { matrixPool.Put(p) }

// recycleWith arranges for the matrix a to be reused once sv has been
// collected: sv's factorisation holds it, and the Cases of Solve hold sv.
func recycleWith(sv *Solver, a []float64) {
	runtime.AddCleanup(sv, putMatrix, &a)
}
