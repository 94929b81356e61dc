package clean

import (
	"math"
	"math/rand/v2"
	"testing"
)

// solve3Loops is Gaussian elimination with partial pivoting as loops, the
// reference solve3 is written out from: solve3 must give its answers bit
// for bit.
func solve3Loops(a [3][3]float64, b [3]float64) ([3]float64, bool) {
	scale := 0.0
	for r := range 3 {
		for c := range 3 {
			scale = max(scale, math.Abs(a[r][c]))
		}
	}
	if scale == 0 {
		return [3]float64{}, false
	}
	for col := range 3 {
		p := col
		for r := col + 1; r < 3; r++ {
			if math.Abs(a[r][col]) > math.Abs(a[p][col]) {
				p = r
			}
		}
		if math.Abs(a[p][col]) <= 1e-13*scale {
			return [3]float64{}, false
		}
		a[col], a[p] = a[p], a[col]
		b[col], b[p] = b[p], b[col]
		for r := col + 1; r < 3; r++ {
			f := a[r][col] / a[col][col]
			for c := col; c < 3; c++ {
				a[r][c] -= f * a[col][c]
			}
			b[r] -= f * b[col]
		}
	}
	var x [3]float64
	for r := 2; r >= 0; r-- {
		s := b[r]
		for c := r + 1; c < 3; c++ {
			s -= a[r][c] * x[c]
		}
		x[r] = s / a[r][r]
	}
	return x, true
}

// TestSolve3AsLoops checks solve3 against solve3Loops, bit for bit, on
// random systems: general, with every pivot order, nearly singular,
// singular, with ties of magnitude and with zero rows.
func TestSolve3AsLoops(t *testing.T) {
	rng := rand.New(rand.NewPCG(18, 7))
	same := func(x, y [3]float64) bool {
		for i := range x {
			if math.Float64bits(x[i]) != math.Float64bits(y[i]) {
				return false
			}
		}
		return true
	}
	refused := 0
	for trial := range 50000 {
		var a [3][3]float64
		var b [3]float64
		for r := range 3 {
			for c := range 3 {
				a[r][c] = rng.NormFloat64() * math.Pow(10, float64(rng.IntN(6)-3))
			}
			b[r] = rng.NormFloat64()
		}
		switch trial % 5 {
		case 1: // a row nearly a multiple of another
			k := rng.Float64()
			for c := range 3 {
				a[2][c] = k*a[0][c] + 1e-14*rng.NormFloat64()
			}
		case 2: // ties of magnitude in a column
			a[1][0], a[2][0] = -a[0][0], a[0][0]
		case 3: // small integers: exact ties and singular systems
			for r := range 3 {
				for c := range 3 {
					a[r][c] = float64(rng.IntN(3) - 1)
				}
			}
		case 4: // a zero row
			a[rng.IntN(3)] = [3]float64{}
		}
		x, ok := solve3(a, b)
		w, wok := solve3Loops(a, b)
		if ok != wok || !same(x, w) {
			t.Fatalf("trial %d: a %v b %v: solve3 %v %v, as loops %v %v", trial, a, b, x, ok, w, wok)
		}
		if !ok {
			refused++
		}
	}
	if refused == 0 {
		t.Error("no system was refused: the singular cases were not tested")
	}
}
