package vortexpanel

import (
	"math"
	"math/rand/v2"
	"testing"
)

// ulps returns the distance between a and b in units in the last place of
// the larger; 0 for equal values or two NaNs, +Inf for one NaN.
func ulps(a, b float64) float64 {
	if a == b || a != a && b != b {
		return 0
	}
	if a != a || b != b {
		return math.Inf(1)
	}
	m := math.Max(math.Abs(a), math.Abs(b))
	return math.Abs(a-b) / (math.Nextafter(m, math.Inf(1)) - m)
}

// The assembly angle and logarithm of the build against Go's math package
// (math.Atan2, math.Log), a general-purpose library whose algorithms they
// follow: within a unit in the last place, and NaN, left to the caller,
// outside their domain. The logarithm does math.Log's operations in its
// order (the same results unless the compiler fuses multiply-adds,
// GOAMD64=v3); the angle reduces its argument with one division (see
// angle) and must give angle's results bit for bit.
func TestAsmAtan2AgainstMath(t *testing.T) {
	if !haveAVX2 {
		t.Skip("no AVX2/FMA on this machine: the build uses the math package")
	}
	y, x, outside := angleInputs()
	dst := make([]float64, len(y))
	if got := atan2Asm(dst, y, x); got != outside {
		t.Errorf("%d entries outside the domain, want %d", got, outside)
	}
	for i := range dst {
		if want := angle(y[i], x[i]); math.Float64bits(dst[i]) != math.Float64bits(want) && !(math.IsNaN(dst[i]) && math.IsNaN(want)) {
			t.Fatalf("atan2(%g, %g) = %.17g, angle %.17g", y[i], x[i], dst[i], want)
		}
	}
	checkAngles(t, y, x, dst)
}

// TestAngleAgainstMath checks angle, the build's atan2, against math.Atan2
// (a general-purpose library): within a unit in the last place over many
// decades and all quadrants, and NaN for both arguments zero or infinite
// or a NaN.
func TestAngleAgainstMath(t *testing.T) {
	y, x, outside := angleInputs()
	dst := make([]float64, len(y))
	nan := 0
	for i := range dst {
		dst[i] = angle(y[i], x[i])
		if math.IsNaN(dst[i]) {
			nan++
		}
	}
	if nan != outside {
		t.Errorf("%d NaN results, want %d", nan, outside)
	}
	checkAngles(t, y, x, dst)
}

// angleInputs returns arguments of atan2 over many decades, all quadrants,
// ratios near the reduction's bounds, special values, and the number of
// those outside the domain (NaN results).
func angleInputs() (y, x []float64, outside int) {
	rng := rand.New(rand.NewPCG(1, 2))
	const n = 1 << 16
	y, x = make([]float64, n), make([]float64, n)
	for i := range y {
		// magnitudes over many decades, all quadrants, ratios near 0.66 and 1
		y[i] = rng.NormFloat64() * math.Pow(10, rng.Float64()*12-6)
		x[i] = rng.NormFloat64() * math.Pow(10, rng.Float64()*12-6)
		switch i % 7 {
		case 1:
			x[i] = y[i] * (0.66 + 1e-3*rng.NormFloat64())
		case 2:
			x[i] = -y[i] * (1 + 1e-9*rng.NormFloat64())
		case 3:
			x[i] = y[i] / (0.66 + 1e-3*rng.NormFloat64())
		}
	}
	inDomain := [][2]float64{
		{0, 1}, {math.Copysign(0, -1), 1}, {0, -1}, {math.Copysign(0, -1), -1}, {0, math.Copysign(0, -1) - 1},
		{1, 0}, {-1, 0}, {1, math.Copysign(0, -1)}, {3, 3}, {-2, 2}, {1e-310, 1}, {1, 1e-310},
		{math.MaxFloat64, 1}, {1, -math.MaxFloat64}, {math.Inf(1), 1}, {1, math.Inf(-1)}, {-1, math.Inf(1)},
		{2.41421356237309504880, 1}, {0.66, 1}, {-0.66, -1},
	}
	nan := [][2]float64{
		{0, 0}, {0, math.Copysign(0, -1)}, {math.Inf(1), math.Inf(-1)}, {math.NaN(), 1}, {1, math.NaN()},
	}
	for k, s := range inDomain {
		y[k*5], x[k*5] = s[0], s[1]
	}
	for k, s := range nan {
		y[k*5+1], x[k*5+1] = s[0], s[1]
	}
	return y, x, len(nan)
}

// checkAngles compares dst[i] = atan2(y[i], x[i]) with math.Atan2: NaN
// where angleInputs puts the arguments outside the domain, else within a
// unit in the last place and of the same sign.
func checkAngles(t *testing.T, y, x, dst []float64) {
	t.Helper()
	_, _, outside := angleInputs()
	differ := 0
	for i := range dst {
		want := math.Atan2(y[i], x[i])
		if i%5 == 1 && i/5 < outside {
			if !math.IsNaN(dst[i]) {
				t.Errorf("atan2(%g, %g) = %g, want NaN (left to the caller)", y[i], x[i], dst[i])
			}
			continue
		}
		if dst[i] != want || math.Signbit(dst[i]) != math.Signbit(want) {
			differ++
			if u := ulps(dst[i], want); u > 1 || math.Signbit(dst[i]) != math.Signbit(want) {
				t.Fatalf("atan2(%g, %g) = %.17g, math.Atan2 %.17g (%g ulp)", y[i], x[i], dst[i], want, u)
			}
		}
	}
	t.Logf("%d of %d differ from math.Atan2 (by 1 ulp)", differ, len(dst))
}

func TestAsmLogAgainstMath(t *testing.T) {
	if !haveAVX2 {
		t.Skip("no AVX2/FMA on this machine: the build uses the math package")
	}
	rng := rand.New(rand.NewPCG(3, 4))
	const n = 1 << 16
	x := make([]float64, n)
	for i := range x {
		x[i] = math.Exp(rng.Float64()*1400 - 700)
		switch i % 5 {
		case 1:
			x[i] = 1 + 1e-6*rng.NormFloat64() // ln x small
		case 2:
			x[i] = math.Sqrt2 * (1 + 1e-12*rng.NormFloat64()) // the edge of the reduction
		}
	}
	inDomain := []float64{1, 2, 0.5, math.Sqrt2, 2.2250738585072014e-308, math.MaxFloat64}
	outside := []float64{0, math.Copysign(0, -1), -1, math.Inf(1), math.Inf(-1), math.NaN(), 5e-324, 1e-310}
	for k, s := range inDomain {
		x[k*3] = s
	}
	for k, s := range outside {
		x[k*3+1] = s
	}
	dst := make([]float64, n)
	if got := logAsm(dst, x); got != len(outside) {
		t.Errorf("%d entries outside the domain, want %d", got, len(outside))
	}
	differ := 0
	for i := range dst {
		if i%3 == 1 && i/3 < len(outside) {
			if !math.IsNaN(dst[i]) {
				t.Errorf("log(%g) = %g, want NaN (left to the caller)", x[i], dst[i])
			}
			continue
		}
		want := math.Log(x[i])
		if dst[i] != want {
			differ++
			if u := ulps(dst[i], want); u > 1 {
				t.Fatalf("log(%g) = %.17g, math.Log %.17g (%g ulp)", x[i], dst[i], want, u)
			}
		}
	}
	t.Logf("%d of %d differ from math.Log (by 1 ulp)", differ, n)
}
