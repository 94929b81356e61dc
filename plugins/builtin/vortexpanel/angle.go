package vortexpanel

import "math"

// Constants of the angle (Cephes' atan, as in Go's math.Atan).
const (
	atanP0       = -8.750608600031904122785e-01
	atanP1       = -1.615753718733365076637e+01
	atanP2       = -7.500855792314704667340e+01
	atanP3       = -1.228866684490136173410e+02
	atanP4       = -6.485021904942025371773e+01
	atanQ0       = +2.485846490142306297962e+01
	atanQ1       = +1.650270098316988542046e+02
	atanQ2       = +4.328810604912902668951e+02
	atanQ3       = +4.853903996359136964868e+02
	atanQ4       = +1.945506571482613964425e+02
	atanMorebits = 6.123233995736765886130e-17 // π/2 = Pi/2 + Morebits
	atanTan3pio8 = 2.41421356237309504880      // tan(3π/8)
)

// angle returns atan2(y, x) with one division for the range reduction:
// the reduced argument of Cephes' atan (|y|/|x| up to 0.66, (|y| − |x|)/
// (|y| + |x|) up to tan 3π/8, |x|/|y| beyond) is formed from |y| and |x|
// directly, where math.Atan2 first divides y by x and reduces the rounded
// quotient. The same polynomial, within a unit in the last place of
// math.Atan2 (TestAngleAgainstMath). The assembly build (ATAN24 in
// influence_amd64.s) does these operations in this order, unfused, so that
// both give the same matrix. Both arguments zero or infinite, or a NaN,
// give NaN; |x| + |y| must not overflow.
func angle(y, x float64) float64 {
	a, b := math.Abs(y), math.Abs(x)
	hi := a > b*atanTan3pio8
	lo := a <= b*0.66
	num, den := a-b, a+b
	if lo {
		num, den = a, b
	}
	if hi {
		num, den = b, a
	}
	t := num / den
	z := t * t
	r := z * ((((atanP0*z+atanP1)*z+atanP2)*z+atanP3)*z + atanP4) / (((((z+atanQ0)*z+atanQ1)*z+atanQ2)*z+atanQ3)*z + atanQ4)
	r = t*r + t
	switch {
	case lo:
	case hi:
		r = (math.Pi/2 - r) + atanMorebits
	default:
		r = (math.Pi/4 + r) + 0.5*atanMorebits
	}
	if math.Signbit(x) {
		r = math.Pi - r
	}
	if math.Signbit(y) {
		r = -r
	}
	return r
}
