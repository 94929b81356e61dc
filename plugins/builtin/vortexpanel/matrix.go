package vortexpanel

import "sync"

// The influence matrix of a few hundred panels or more is megabytes: a
// fresh one costs page faults and zeroing, measured at 400 panels as twice
// the build time when the garbage collector was kept from reusing memory.
// New needs it only until it has solved for α = 0 and 90°, so it gives it
// back to the pool of its size, and the build writes every entry, so a
// recycled matrix need not be cleared. The pools are kept by size, so that
// a program that solves at several panel counts reuses a matrix of each.
var matrixPools sync.Map // size → *sync.Pool of *[]float64

func matrixPool(size int) *sync.Pool {
	if p, ok := matrixPools.Load(size); ok {
		return p.(*sync.Pool)
	}
	p, _ := matrixPools.LoadOrStore(size, new(sync.Pool))
	return p.(*sync.Pool)
}

// getMatrix returns a slice of size entries, recycled if one is at hand,
// with arbitrary contents.
func getMatrix(size int) []float64 {
	if p, ok := matrixPool(size).Get().(*[]float64); ok {
		return *p
	}
	return make([]float64, size)
}

// putMatrix gives a matrix no one uses any more back for reuse.
func putMatrix(p *[]float64) { matrixPool(len(*p)).Put(p) }
