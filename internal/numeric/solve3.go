package numeric

import "math"

// Solve3 solves the 3×3 system a·x = b by Cramer's rule. It returns false
// when |det a| < 1e-300 (a singular or nearly singular system).
func Solve3(a [3][3]float64, b [3]float64) ([3]float64, bool) {
	return Cramer3(a, b, 1e-300)
}

// Cramer3 solves the 3×3 system a·x = b by Cramer's rule. It returns false
// when |det a| < minDet, which the caller sets from the scale of a.
func Cramer3(a [3][3]float64, b [3]float64, minDet float64) ([3]float64, bool) {
	det := func(m [3][3]float64) float64 {
		return m[0][0]*(m[1][1]*m[2][2]-m[1][2]*m[2][1]) - m[0][1]*(m[1][0]*m[2][2]-m[1][2]*m[2][0]) + m[0][2]*(m[1][0]*m[2][1]-m[1][1]*m[2][0])
	}
	d := det(a)
	if math.Abs(d) < minDet {
		return [3]float64{}, false
	}
	var x [3]float64
	for k := 0; k < 3; k++ {
		m := a
		for r := 0; r < 3; r++ {
			m[r][k] = b[r]
		}
		x[k] = det(m) / d
	}
	return x, true
}
