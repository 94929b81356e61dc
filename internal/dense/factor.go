package dense

import (
	"math"
	"runtime"
	"sync"
	"sync/atomic"
)

// Blocking of the factorisation.
const (
	// panelBase is the width below which a panel is factored column by
	// column; wider panels split in two (recursive LU).
	panelBase = 8
	// trsmBase is the height below which a triangular solve goes row by row.
	trsmBase = 16
	// chunkCols is the width of the pieces of the trailing update that
	// goroutines take in turn.
	chunkCols = 192
)

// blockMin is the order from which the factorisation is blocked with a
// look-ahead panel on a second goroutine; smaller matrices are factored by
// recursive halving on one goroutine. blockSize is the width of the blocks.
var (
	blockMin  = 160
	blockSize = 64
)

// unblockedMax is the order up to which the factorisation goes column by
// column over whole rows (unblocked).
var unblockedMax = 120

// maxWorkers caps the goroutines of one factorisation; 0 means GOMAXPROCS.
var maxWorkers = 0

func workersFor(n int) int {
	w := runtime.GOMAXPROCS(0)
	if maxWorkers > 0 {
		w = min(w, maxWorkers)
	}
	if n < blockMin {
		return 1
	}
	return max(w, 1)
}

var wsPool = sync.Pool{New: func() any { return new(workspace) }}

// factorizer holds the state of one factorisation.
type factorizer struct {
	n        int
	a        []float64
	ipiv     []int
	workers  int
	singular atomic.Bool
}

func (f *factorizer) run() {
	n := f.n
	if n <= unblockedMax {
		f.unblocked()
		return
	}
	ws := wsPool.Get().(*workspace)
	defer wsPool.Put(ws)
	if n < blockMin {
		f.panel(0, n, ws)
		return
	}
	nb := blockSize
	f.panel(0, min(nb, n), ws)
	for k := 0; k < n; k += nb {
		next := k + nb
		if next >= n {
			break
		}
		f.step(k, nb, next, min(nb, n-next), ws)
	}
	// The pivots of each block, deferred, on the columns to its left.
	for k := nb; k < n; k += nb {
		f.swapRows(k, min(k+nb, n), 0, k)
	}
}

// step applies the pivots of block [k, next) to the columns right of it,
// solves for its rows of U and updates the trailing matrix; the columns of
// the next block first, which are then factored while the other goroutines
// update the rest.
func (f *factorizer) step(k, jb, next, jb2 int, ws *workspace) {
	n := f.n
	rest := n - next - jb2
	chunks := (rest + chunkCols - 1) / chunkCols
	var taken atomic.Int64
	work := func(ws *workspace) {
		for {
			c := int(taken.Add(1)) - 1
			if c >= chunks {
				return
			}
			c0 := next + jb2 + c*chunkCols
			f.update(k, jb, c0, min(c0+chunkCols, n), ws)
		}
	}
	var wg sync.WaitGroup
	for range min(f.workers-1, chunks) {
		wg.Go(func() {
			w := wsPool.Get().(*workspace)
			work(w)
			wsPool.Put(w)
		})
	}
	f.update(k, jb, next, next+jb2, ws)
	f.panel(next, jb2, ws)
	work(ws)
	wg.Wait()
}

// update brings columns [c0, c1) up to date with block [k, k+jb): row
// swaps, triangular solve for the block's rows of U, and the product
// update of the rows below.
func (f *factorizer) update(k, jb, c0, c1 int, ws *workspace) {
	n, a := f.n, f.a
	f.swapRows(k, k+jb, c0, c1)
	w := c1 - c0
	trsmLower(jb, w, a[k*n+k:], n, a[k*n+c0:], n, ws)
	gemmSub(n-k-jb, w, jb, a[(k+jb)*n+k:], n, a[k*n+c0:], n, a[(k+jb)*n+c0:], n, ws)
}

// swapRows applies the row swaps of pivots [p0, p1) to columns [c0, c1).
func (f *factorizer) swapRows(p0, p1, c0, c1 int) {
	if c0 >= c1 {
		return
	}
	n, a := f.n, f.a
	for i := p0; i < p1; i++ {
		if p := f.ipiv[i]; p != i {
			ri, rp := a[i*n+c0:i*n+c1], a[p*n+c0:p*n+c1]
			for j := range ri {
				ri[j], rp[j] = rp[j], ri[j]
			}
		}
	}
}

// panel factors columns [d, d+w) of rows [d, n), with row swaps confined
// to those columns, by splitting it into halves down to panelBase columns.
func (f *factorizer) panel(d, w int, ws *workspace) {
	if w <= panelBase {
		f.factorColumns(d, w)
		return
	}
	n, a := f.n, f.a
	w1 := w / 2
	if w1 > nr {
		w1 = w1 / nr * nr
	}
	f.panel(d, w1, ws)
	f.swapRows(d, d+w1, d+w1, d+w)
	trsmLower(w1, w-w1, a[d*n+d:], n, a[d*n+d+w1:], n, ws)
	gemmSub(n-d-w1, w-w1, w1, a[(d+w1)*n+d:], n, a[d*n+d+w1:], n, a[(d+w1)*n+d+w1:], n, ws)
	f.panel(d+w1, w-w1, ws)
	f.swapRows(d+w1, d+w, d, d+w1)
}

// sfmin is the smallest normal float64: below it, a pivot is divided by
// rather than multiplied with its reciprocal (as LAPACK dgetf2 does).
const sfmin = 0x1p-1022

// factorColumns factors columns [d, d+w) of rows [d, n) column by column; each
// column's update of the rows below also finds the next column's pivot.
func (f *factorizer) factorColumns(d, w int) {
	n, a := f.n, f.a
	e := d + w // end column
	p := d
	best := -1.0
	for r := d; r < n; r++ {
		if v := math.Abs(a[r*n+d]); v > best {
			best, p = v, r
		}
	}
	for j := d; j < e; j++ {
		f.ipiv[j] = p
		piv := a[p*n+j]
		if p != j {
			rj, rp := a[j*n+d:j*n+e], a[p*n+d:p*n+e]
			for c := range rj {
				rj[c], rp[c] = rp[c], rj[c]
			}
		}
		next := j + 1
		if piv == 0 {
			f.singular.Store(true)
			if next < e {
				p, best = next, -1
				for r := next; r < n; r++ {
					if v := math.Abs(a[r*n+next]); v > best {
						best, p = v, r
					}
				}
			}
			continue
		}
		uj := a[j*n+next : j*n+e]
		small := math.Abs(piv) < sfmin
		inv := 1 / piv
		p, best = next, -1
		for r := next; r < n; r++ {
			row := a[r*n+j : r*n+e]
			l := row[0]
			if small {
				l /= piv
			} else {
				l *= inv
			}
			row[0] = l
			rest := row[1:]
			if len(rest) == 0 {
				continue
			}
			rest = rest[:len(uj)]
			for c, u := range uj {
				rest[c] -= l * u
			}
			if v := math.Abs(rest[0]); v > best {
				best, p = v, r
			}
		}
	}
}

// unblocked factors the whole matrix column by column: whole-row swaps,
// and each row below the pivot updated by one axpy, which also finds the
// next column's pivot.
func (f *factorizer) unblocked() {
	n, a := f.n, f.a
	p, best := 0, -1.0
	for r := range n {
		if v := math.Abs(a[r*n]); v > best {
			best, p = v, r
		}
	}
	for k := range n {
		f.ipiv[k] = p
		if p != k {
			rk, rp := a[k*n:(k+1)*n], a[p*n:(p+1)*n]
			for c := range rk {
				rk[c], rp[c] = rp[c], rk[c]
			}
		}
		next := k + 1
		if next == n {
			if a[k*n+k] == 0 {
				f.singular.Store(true)
			}
			return
		}
		piv := a[k*n+k]
		if piv == 0 {
			f.singular.Store(true)
			p, best = next, -1
			for r := next; r < n; r++ {
				if v := math.Abs(a[r*n+next]); v > best {
					best, p = v, r
				}
			}
			continue
		}
		uk := a[k*n+next : (k+1)*n]
		small := math.Abs(piv) < sfmin
		inv := 1 / piv
		p, best = next, -1
		for r := next; r < n; r++ {
			row := a[r*n+k : (r+1)*n]
			l := row[0]
			if small {
				l /= piv
			} else {
				l *= inv
			}
			row[0] = l
			axpy(-l, uk, row[1:])
			if v := math.Abs(row[1]); v > best {
				best, p = v, r
			}
		}
	}
}

// trsmLower overwrites the m×nc block B (row-major, ldb) with L⁻¹B, where
// L is the unit lower triangle of the m×m block at l (ldl).
func trsmLower(m, nc int, l []float64, ldl int, b []float64, ldb int, ws *workspace) {
	if m <= trsmBase {
		for i := 1; i < m; i++ {
			bi := b[i*ldb : i*ldb+nc]
			for j, v := range l[i*ldl : i*ldl+i] {
				if v != 0 {
					axpy(-v, b[j*ldb:j*ldb+nc], bi)
				}
			}
		}
		return
	}
	h := m / 2
	trsmLower(h, nc, l, ldl, b, ldb, ws)
	gemmSub(m-h, nc, h, l[h*ldl:], ldl, b, ldb, b[h*ldb:], ldb, ws)
	trsmLower(m-h, nc, l[h*ldl+h:], ldl, b[h*ldb:], ldb, ws)
}
