package dense

// Block sizes of the matrix product, for caches of 32 KiB (L1) and 512 KiB
// (L2) per core: a packed sliver of B (kc × nr) stays in L1 while the
// micro-kernel runs down a packed block of A (mc × kc) in L2.
const (
	mc    = 96  // rows of A packed at a time, a multiple of mr
	kcMax = 256 // depth of one pass
	ncMax = 512 // columns of B packed at a time, a multiple of nr
)

// workspace holds the packing buffers of one goroutine.
type workspace struct {
	a, b []float64
}

func (w *workspace) bufA(n int) []float64 {
	if cap(w.a) < n {
		w.a = make([]float64, n)
	}
	return w.a[:n]
}

func (w *workspace) bufB(n int) []float64 {
	if cap(w.b) < n {
		w.b = make([]float64, n)
	}
	return w.b[:n]
}

// gemmSub computes C −= A·B for row-major C (m×n, row stride ldc), A (m×k,
// lda) and B (k×n, ldb); each slice starts at its matrix's first entry.
func gemmSub(m, n, k int, a []float64, lda int, b []float64, ldb int, c []float64, ldc int, ws *workspace) {
	if m <= 0 || n <= 0 || k <= 0 {
		return
	}
	if n < nr || m < mr || k < 4 {
		gemmSubSmall(m, n, k, a, lda, b, ldb, c, ldc)
		return
	}
	for pc := 0; pc < k; pc += kcMax {
		kc := min(kcMax, k-pc)
		for jc := 0; jc < n; jc += ncMax {
			ncur := min(ncMax, n-jc)
			bp := ws.bufB(kc * roundUp(ncur, nr))
			packB(bp, b[pc*ldb+jc:], ldb, kc, ncur)
			if useAsm && useAVX512 {
				gemmInPlace(m, ncur, kc, a[pc:], lda, bp, c[jc:], ldc, ws)
				continue
			}
			for ic := 0; ic < m; ic += mc {
				mcur := min(mc, m-ic)
				ap := ws.bufA(kc * roundUp(mcur, mr))
				packA(ap, a[ic*lda+pc:], lda, mcur, kc)
				gemmPacked(mcur, ncur, kc, ap, bp, c[ic*ldc+jc:], ldc)
			}
		}
	}
}

// gemmSubSmall is C −= A·B by rows, for shapes too thin to pack.
func gemmSubSmall(m, n, k int, a []float64, lda int, b []float64, ldb int, c []float64, ldc int) {
	for i := range m {
		ci := c[i*ldc : i*ldc+n]
		ai := a[i*lda : i*lda+k]
		for p, v := range ai {
			if v == 0 {
				continue
			}
			axpy(-v, b[p*ldb:p*ldb+n], ci)
		}
	}
}

func roundUp(x, m int) int { return (x + m - 1) / m * m }

// packA copies rows [0, m) and columns [0, k) of the row-major A into
// slivers of mr rows: entry (s·mr + r, p) goes to dst[s·mr·k + p·mr + r].
// Rows past m are zero.
func packA(dst, a []float64, lda, m, k int) {
	for s := 0; s*mr < m; s++ {
		d := dst[s*mr*k : (s+1)*mr*k]
		r0 := s * mr
		if r0+mr <= m {
			a0 := a[r0*lda : r0*lda+k]
			a1 := a[(r0+1)*lda : (r0+1)*lda+k]
			a2 := a[(r0+2)*lda : (r0+2)*lda+k]
			a3 := a[(r0+3)*lda : (r0+3)*lda+k]
			a4 := a[(r0+4)*lda : (r0+4)*lda+k]
			a5 := a[(r0+5)*lda : (r0+5)*lda+k]
			for p := range k {
				q := d[p*mr : p*mr+mr]
				q[0], q[1], q[2], q[3], q[4], q[5] = a0[p], a1[p], a2[p], a3[p], a4[p], a5[p]
			}
			continue
		}
		clear(d)
		for r := r0; r < m; r++ {
			ar := a[r*lda : r*lda+k]
			for p, v := range ar {
				d[p*mr+r-r0] = v
			}
		}
	}
}

// packB copies rows [0, k) and columns [0, n) of the row-major B into
// slivers of nr columns: entry (p, s·nr + j) goes to dst[s·nr·k + p·nr + j].
// Columns past n are zero.
func packB(dst, b []float64, ldb, k, n int) {
	for s := 0; s*nr < n; s++ {
		d := dst[s*nr*k : (s+1)*nr*k]
		j0 := s * nr
		w := min(nr, n-j0)
		if w == nr {
			for p := range k {
				// Through a local array, which the compiler moves in
				// registers; copy, or an assignment between the two
				// arrays (which might overlap), calls memmove for the
				// 64 bytes.
				v := *(*[nr]float64)(b[p*ldb+j0:])
				*(*[nr]float64)(d[p*nr:]) = v
			}
			continue
		}
		for p := range k {
			q := d[p*nr : p*nr+nr]
			copy(q, b[p*ldb+j0:p*ldb+j0+w])
			clear(q[w:])
		}
	}
}

// gemmPacked computes C −= A·B for packed A (m rows) and B (n columns),
// both of depth k, tile by tile; tiles that stick out of C go through a
// scratch tile.
func gemmPacked(m, n, k int, ap, bp []float64, c []float64, ldc int) {
	j0 := 0
	if useAsm && useAVX512 {
		j0 = gemmPacked16(m, n, k, ap, bp, c, ldc)
	}
	var tmp [mr * nr]float64
	for jr := j0; jr < n; jr += nr {
		bs := bp[jr*k : jr*k+nr*k]
		for ir := 0; ir < m; ir += mr {
			as := ap[ir*k : ir*k+mr*k]
			if ir+mr <= m && jr+nr <= n {
				kern(k, as, bs, c[ir*ldc+jr:], ldc)
				continue
			}
			tmp = [mr * nr]float64{}
			kern(k, as, bs, tmp[:], nr)
			for r := range min(mr, m-ir) {
				cr := c[(ir+r)*ldc+jr : (ir+r)*ldc+jr+min(nr, n-jr)]
				for j := range cr {
					cr[j] += tmp[r*nr+j]
				}
			}
		}
	}
}

// gemmPacked16 is gemmPacked on the AVX-512 micro-kernels, for the columns
// [0, n − n%8) that fill whole slivers of B, of which it returns the end:
// tiles of 16 columns (two slivers), then one of 8; in each, tiles of 12
// rows, then one of 6, then the last rows through a scratch tile. The
// entries are the same, bit for bit, as the 6×8 kernel's.
func gemmPacked16(m, n, k int, ap, bp []float64, c []float64, ldc int) int {
	var tmp [mr * 2 * nr]float64
	end := n - n%nr
	for jr := 0; jr < end; {
		nw := 2 * nr
		k12, k6 := kern12x16AVX512, kern6x16AVX512
		if jr+nw > end {
			nw = nr
			k12, k6 = kern12x8AVX512, kern6x8AVX512
		}
		bs := bp[jr*k : jr*k+nw*k]
		ir := 0
		for ; ir+2*mr <= m; ir += 2 * mr {
			as := ap[ir*k : ir*k+2*mr*k]
			_ = c[(ir+2*mr-1)*ldc+jr+nw-1]
			k12(k, &as[0], &bs[0], &c[ir*ldc+jr], ldc)
		}
		if ir+mr <= m {
			as := ap[ir*k : ir*k+mr*k]
			_ = c[(ir+mr-1)*ldc+jr+nw-1]
			k6(k, &as[0], &bs[0], &c[ir*ldc+jr], ldc)
			ir += mr
		}
		if ir < m {
			as := ap[ir*k : ir*k+mr*k]
			t := tmp[:mr*nw]
			clear(t)
			k6(k, &as[0], &bs[0], &t[0], nw)
			for r := range m - ir {
				cr := c[(ir+r)*ldc+jr : (ir+r)*ldc+jr+nw]
				for j := range cr {
					cr[j] += t[r*nw+j]
				}
			}
		}
		jr += nw
	}
	return end
}

// gemmInPlace computes C −= A·B for the row-major A (m×k, lda) and the
// packed B (n columns), with the AVX-512 kernels that read A in place:
// the products of gemmSub (a panel's, a triangular solve's) use each row
// of A once, so packing it cost about as much as the product. The rows
// past the last whole tile of 6, and the columns past the last whole
// sliver, go packed through gemmPacked. The entries are the same, bit for
// bit, as with A packed.
func gemmInPlace(m, n, k int, a []float64, lda int, bp []float64, c []float64, ldc int, ws *workspace) {
	end := n - n%nr
	rows := m - m%mr
	for jr := 0; jr < end; {
		nw := 2 * nr
		k12, k6 := kernU12x16AVX512, kernU6x16AVX512
		if jr+nw > end {
			nw = nr
			k12, k6 = kernU12x8AVX512, kernU6x8AVX512
		}
		bs := bp[jr*k : jr*k+nw*k]
		ir := 0
		for ; ir+2*mr <= m; ir += 2 * mr {
			_ = a[(ir+2*mr-1)*lda+k-1]
			_ = c[(ir+2*mr-1)*ldc+jr+nw-1]
			k12(k, &a[ir*lda], lda, &bs[0], &c[ir*ldc+jr], ldc)
		}
		if ir+mr <= m {
			_ = a[(ir+mr-1)*lda+k-1]
			_ = c[(ir+mr-1)*ldc+jr+nw-1]
			k6(k, &a[ir*lda], lda, &bs[0], &c[ir*ldc+jr], ldc)
		}
		jr += nw
	}
	if rows < m {
		ap := ws.bufA(k * mr)
		packA(ap, a[rows*lda:], lda, m-rows, k)
		gemmPacked(m-rows, n, k, ap, bp, c[rows*ldc:], ldc)
	}
	if end < n {
		for ic := 0; ic < rows; ic += mc {
			mcur := min(mc, rows-ic)
			ap := ws.bufA(k * roundUp(mcur, mr))
			packA(ap, a[ic*lda:], lda, mcur, k)
			gemmPacked(mcur, n-end, k, ap, bp[end*k:], c[ic*ldc+end:], ldc)
		}
	}
}
