package dense

import "math"

// axpy computes y += alpha·x over len(y) entries.
func axpy(alpha float64, x, y []float64) {
	x = x[:len(y)]
	if useAsm && len(y) >= 8 {
		axpyAVX2(alpha, &x[0], &y[0], len(y))
		return
	}
	i := 0
	for ; i+4 <= len(y); i += 4 {
		xs, ys := x[i:i+4:i+4], y[i:i+4:i+4]
		ys[0] += alpha * xs[0]
		ys[1] += alpha * xs[1]
		ys[2] += alpha * xs[2]
		ys[3] += alpha * xs[3]
	}
	for ; i < len(y); i++ {
		y[i] += alpha * x[i]
	}
}

// dot returns Σ x[i]·y[i] over len(x) entries.
func dot(x, y []float64) float64 {
	y = y[:len(x)]
	if useAsm && len(x) >= 8 {
		return dotAVX2(&x[0], &y[0], len(x))
	}
	var s0, s1, s2, s3 float64
	i := 0
	for ; i+4 <= len(x); i += 4 {
		xs, ys := x[i:i+4:i+4], y[i:i+4:i+4]
		s0 += xs[0] * ys[0]
		s1 += xs[1] * ys[1]
		s2 += xs[2] * ys[2]
		s3 += xs[3] * ys[3]
	}
	for ; i < len(x); i++ {
		s0 += x[i] * y[i]
	}
	return (s0 + s1) + (s2 + s3)
}

// asum returns Σ |x[i]|.
func asum(x []float64) float64 {
	if useAsm && len(x) >= 8 {
		return asumAVX2(&x[0], len(x))
	}
	s := 0.0
	for _, v := range x {
		s += math.Abs(v)
	}
	return s
}

// dot2 returns Σ r[j]·x[2j] and Σ r[j]·x[2j+1] over len(r) entries.
func dot2(r, x []float64) (s0, s1 float64) {
	x = x[:2*len(r)]
	if useAsm && len(r) >= 4 {
		return dot2AVX2(&r[0], &x[0], len(r))
	}
	var t0, t1 float64
	j := 0
	for ; j+2 <= len(r); j += 2 {
		rs, xs := r[j:j+2:j+2], x[2*j:2*j+4:2*j+4]
		s0 += rs[0] * xs[0]
		s1 += rs[0] * xs[1]
		t0 += rs[1] * xs[2]
		t1 += rs[1] * xs[3]
	}
	if j < len(r) {
		s0 += r[j] * x[2*j]
		s1 += r[j] * x[2*j+1]
	}
	return s0 + t0, s1 + t1
}

// axpy2 computes x[2j] −= v0·r[j] and x[2j+1] −= v1·r[j] over len(r) entries.
func axpy2(v0, v1 float64, r, x []float64) {
	x = x[:2*len(r)]
	if useAsm && len(r) >= 4 {
		axpy2AVX2(v0, v1, &r[0], &x[0], len(r))
		return
	}
	for j, u := range r {
		xs := x[2*j : 2*j+2 : 2*j+2]
		xs[0] -= v0 * u
		xs[1] -= v1 * u
	}
}
