package dense

import (
	"math"
	"runtime"
	"sync"
	"sync/atomic"

	"github.com/foilwright/foilwright/internal/par"
)

// Blocking of the factorisation, placed by measurement on the two cores
// of the development machine (AVX2 kernels; BenchmarkSmall, BenchmarkFactor).
const (
	// unblockedMax is the order up to which the factorisation goes column
	// by column over whole rows: at 64 rows 27 µs against 35 µs by halving,
	// at 101 rows 90 µs against 82 µs.
	unblockedMax = 80
	// panelBase is the width below which a panel is factored column by
	// column; wider panels split in two (recursive LU).
	panelBase = 8
	// trsmBase is the height below which a triangular solve goes row by row.
	trsmBase = 16
	// blockMin is the order from which the factorisation is blocked with a
	// look-ahead panel; smaller matrices are factored by recursive halving.
	blockMin = 160
	// parallelMin is the order from which the blocks are shared between
	// goroutines: at 200 rows one goroutine took 0.51–0.61 ms and two
	// 0.59–0.67 ms, at 400 rows 2.06 ms and 1.62–1.72 ms.
	parallelMin = 300
	// blockSize is the width of the blocks with the AVX2 or Go kernels.
	blockSize = 64
	// blockWideMin is the order from which the AVX-512 path takes blocks of
	// 128 columns (96 below it): with the products at twice the AVX2 rate,
	// wider blocks pay for their longer panels. Two goroutines, chrt,
	// medians of 15: 401 rows 1.44 ms at 64 columns, 1.33 at 96, 1.41 at
	// 128; 801 rows 6.25 / 5.97 / 5.74; 1601 rows 39.9 / 36.5 / 34.9.
	blockWideMin = 700
)

// wideBlocks lets the AVX-512 path take its wider blocks; a test turns it
// off to compare the kernels on the same blocking.
var wideBlocks = true

// blockFor returns the width of the blocks of a factorisation of order n.
func blockFor(n int) int {
	switch {
	case !useAsm || !useAVX512 || !wideBlocks:
		return blockSize
	case n < blockWideMin:
		return 96
	}
	return 128
}

// chunkCols returns the width of the pieces of a trailing update of rest
// columns that the goroutines take in turn: about eight, so that a
// goroutine that is held up (the machine is shared) delays the step
// little, in multiples of the micro-kernel's width. It depends on rest
// alone, so that the factors do not depend on the number of goroutines.
func chunkCols(rest int) int {
	return min(max(roundUp(rest/8, nr), 32), 256)
}

// maxWorkers caps the goroutines of one factorisation; 0 means GOMAXPROCS.
var maxWorkers = 0

func workersFor(n int) int {
	w := runtime.GOMAXPROCS(0)
	if maxWorkers > 0 {
		w = min(w, maxWorkers)
	}
	if n < parallelMin {
		return 1
	}
	return max(w, 1)
}

var wsPool = sync.Pool{New: func() any { return new(workspace) }}

// sharedPool recycles the buffers of the packed blocks of L (up to a
// megabyte), which cost page faults and zeroing when fresh.
var sharedPool sync.Pool // of *[]float64

func getShared(size int) *[]float64 {
	if p, ok := sharedPool.Get().(*[]float64); ok && cap(*p) >= size {
		*p = (*p)[:size]
		return p
	}
	b := make([]float64, size)
	return &b
}

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
	ws := make([]*workspace, max(f.workers, 1))
	for i := range ws {
		ws[i] = wsPool.Get().(*workspace)
	}
	defer func() {
		for _, w := range ws {
			wsPool.Put(w)
		}
	}()
	if n < blockMin {
		f.panel(0, n, ws[0])
		return
	}
	nb := blockFor(n)
	team := par.NewTeam(f.workers)
	defer team.Close()
	f.panel(0, min(nb, n), ws[0])
	sp := getShared(roundUp(n, mr) * nb)
	defer sharedPool.Put(sp)
	shared := *sp
	last := 0
	for k := 0; k < n; k += nb {
		last = k
		next := k + nb
		if next >= n {
			break
		}
		f.step(team, k, nb, next, min(nb, n-next), shared, ws)
	}
	// The pivots of the last block on the columns to its left.
	f.swapRows(last, n, 0, last)
}

// packedL is the block of L below a block of pivots, packed once for all
// the pieces of a step's trailing update: each mc rows by whichever
// goroutine needs them first.
type packedL struct {
	a        []float64 // the matrix
	n        int
	r0, k    int // first row and column of the block
	rows, jb int
	buf      []float64
	once     []sync.Once
}

// rowBlock returns the packed rows [ic, ic+mc) (ic a multiple of mc).
func (p *packedL) rowBlock(ic int) []float64 {
	b := p.buf[ic*p.jb : roundUp(min(ic+mc, p.rows), mr)*p.jb]
	p.once[ic/mc].Do(func() {
		packA(b, p.a[(p.r0+ic)*p.n+p.k:], p.n, min(mc, p.rows-ic), p.jb)
	})
	return b
}

// leftCols is the width of the pieces in which the pivots of a block are
// applied to the columns left of it.
const leftCols = 512

// step applies the pivots of block [k, next) to the columns right of it,
// solves for its rows of U and updates the trailing matrix: the columns of
// the next block first, which are then factored while the other goroutines
// update the rest in pieces and apply the block's pivots to the columns
// left of it.
func (f *factorizer) step(team *par.Team, k, jb, next, jb2 int, shared []float64, ws []*workspace) {
	n := f.n
	rows := n - next
	l := &packedL{a: f.a, n: n, r0: next, k: k, rows: rows, jb: jb, buf: shared,
		once: make([]sync.Once, (rows+mc-1)/mc)}
	rest := n - next - jb2
	width := chunkCols(rest)
	chunks := (rest + width - 1) / width
	lefts := (k + leftCols - 1) / leftCols
	// Task 0, the next block, is the first taken.
	body := func(w, t int) {
		switch {
		case t == 0:
			f.update(k, jb, next, next+jb2, l, ws[w])
			f.panel(next, jb2, ws[w])
		case t <= chunks:
			c0 := next + jb2 + (t-1)*width
			f.update(k, jb, c0, min(c0+width, n), l, ws[w])
		default:
			c0 := (t - 1 - chunks) * leftCols
			f.swapRows(k, next, c0, min(c0+leftCols, k))
		}
	}
	team.For(1+chunks+lefts, body)
}

// update brings columns [c0, c1) up to date with block [k, k+jb): row
// swaps, triangular solve for the block's rows of U, and the product
// update of the rows below with the packed block of L.
func (f *factorizer) update(k, jb, c0, c1 int, l *packedL, ws *workspace) {
	n, a := f.n, f.a
	f.swapRows(k, k+jb, c0, c1)
	w := c1 - c0
	trsmLower(jb, w, a[k*n+k:], n, a[k*n+c0:], n, ws)
	bp := ws.bufB(jb * roundUp(w, nr))
	packB(bp, a[k*n+c0:], n, jb, w)
	for ic := 0; ic < l.rows; ic += mc {
		gemmPacked(min(mc, l.rows-ic), w, jb, l.rowBlock(ic), bp, a[(l.r0+ic)*n+c0:], n)
	}
}

// swapRows applies the row swaps of pivots [p0, p1) to columns [c0, c1).
func (f *factorizer) swapRows(p0, p1, c0, c1 int) {
	if c0 >= c1 {
		return
	}
	n, a := f.n, f.a
	for i := p0; i < p1; i++ {
		if p := f.ipiv[i]; p != i {
			swap(a[i*n+c0:i*n+c1], a[p*n+c0:p*n+c1])
		}
	}
}

// swap exchanges the entries of x and y, of the same length.
func swap(x, y []float64) {
	y = y[:len(x)]
	if useAsm && useAVX512 && len(x) > 0 {
		swapAVX512(&x[0], &y[0], len(x))
		return
	}
	for j := range x {
		x[j], y[j] = y[j], x[j]
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
		if useAsm && !small {
			_ = a[(n-1)*n+e-1] // the last row the kernel touches
			p = j + rank1(&a[j*n+j], n, n-1-j, e-j, inv)
			continue
		}
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

// rank1 runs the assembly elimination step (rank1AVX2), with AVX-512 for
// the narrow rows of a panel's columns where the CPU has it.
func rank1(a *float64, lda, rows, w int, inv float64) int {
	if useAVX512 && w >= 2 && w <= 9 {
		return rank1AVX512(a, lda, rows, w, inv)
	}
	return rank1AVX2(a, lda, rows, w, inv)
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
		if useAsm && !small {
			_ = a[(n-1)*n+n-1] // the last row the kernel touches
			p = k + rank1(&a[k*n+k], n, n-1-k, n-k, inv)
			continue
		}
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
		if useAsm && useAVX512 && nc >= 8 && m > 1 {
			// The same axpys, a strip of columns at a time with its row
			// in a register (axpy below takes axpyAVX2 from 8 columns on,
			// whose operations the leaf does).
			_, _ = l[(m-1)*ldl+m-2], b[(m-1)*ldb+nc-1]
			trsmLeafAVX512(m, nc, &l[0], ldl, &b[0], ldb)
			return
		}
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
