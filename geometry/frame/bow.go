package frame

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
)

// Stations of the mean-line bow, in chord units: clear of the nose, where
// the leading edge's place along a blunt nose tilts the chord line, and of
// the trailing edge's reconstruction.
const (
	bowFrom     = 0.05
	bowTo       = 0.9
	bowStations = 18
	// EdgeMirrorBow is the smallest curvature of the mean line (the
	// coefficient of x² of a parabola fitted to it, chord units) that counts
	// as camber for the mirror decision: 4e-3 is a parabolic camber of
	// 0.1 % of the chord.
	EdgeMirrorBow = 4e-3
)

// meanLineBow returns the coefficient of x² of the least-squares parabola
// through the mean line of path, a section in the normalised frame starting
// at the trailing edge with its leading edge at arc length sLE, at
// bowStations even stations from bowFrom to bowTo. A section with positive
// camber bows up (a negative coefficient); a mirrored one bows down. Unlike
// the centroid, the coefficient does not change when the chord line tilts
// (a tilt adds a + b·x to the mean line, which the parabola takes up), so
// the uncertain place of the leading edge on a thick, blunt nose cannot
// make a symmetric section look mirrored. ok is false when the surfaces do
// not both span the stations once each way.
func meanLineBow(path *curve.Curve, sLE float64) (bow float64, ok bool) {
	const n = 400
	upper := sampleArc(path, 0, sLE, n)
	lower := sampleArc(path, sLE, path.Length(), n)
	// The upper run goes from the trailing edge to the nose (x falling),
	// the lower from the nose back (x rising).
	var sx, sy [5]float64 // Σxᵏ for k ≤ 4, Σxᵏ·m for k ≤ 2
	for k := range bowStations {
		x := bowFrom + (bowTo-bowFrom)*float64(k)/float64(bowStations-1)
		yu, oku := crossing(upper, x, true)
		yl, okl := crossing(lower, x, false)
		if !oku || !okl {
			return 0, false
		}
		m := (yu + yl) / 2
		p := 1.0
		for j := range 5 {
			sx[j] += p
			if j < 3 {
				sy[j] += p * m
			}
			p *= x
		}
	}
	// Normal equations of m ≈ a + b·x + c·x².
	a := [3][4]float64{
		{sx[0], sx[1], sx[2], sy[0]},
		{sx[1], sx[2], sx[3], sy[1]},
		{sx[2], sx[3], sx[4], sy[2]},
	}
	for i := range 3 {
		piv := i
		for r := i + 1; r < 3; r++ {
			if math.Abs(a[r][i]) > math.Abs(a[piv][i]) {
				piv = r
			}
		}
		a[i], a[piv] = a[piv], a[i]
		if a[i][i] == 0 {
			return 0, false
		}
		for r := i + 1; r < 3; r++ {
			f := a[r][i] / a[i][i]
			for c := i; c < 4; c++ {
				a[r][c] -= f * a[i][c]
			}
		}
	}
	var sol [3]float64
	for i := 2; i >= 0; i-- {
		v := a[i][3]
		for c := i + 1; c < 3; c++ {
			v -= a[i][c] * sol[c]
		}
		sol[i] = v / a[i][i]
	}
	return sol[2], !math.IsNaN(sol[2]) && !math.IsInf(sol[2], 0)
}

// sampleArc returns n+1 points of path from arc length s0 to s1.
func sampleArc(path *curve.Curve, s0, s1 float64, n int) []geometry.Point {
	out := make([]geometry.Point, n+1)
	for k := range out {
		out[k] = path.At(s0 + (s1-s0)*float64(k)/float64(n))
	}
	return out
}

// crossing returns y where the polyline ps first crosses x, walking it
// with x falling (falling true) or rising, and whether it does so exactly
// once in that direction.
func crossing(ps []geometry.Point, x float64, falling bool) (y float64, ok bool) {
	found := 0
	for i := 1; i < len(ps); i++ {
		a, b := ps[i-1], ps[i]
		var hit bool
		if falling {
			hit = a.X >= x && b.X < x
		} else {
			hit = a.X < x && b.X >= x
		}
		if !hit {
			continue
		}
		found++
		if found == 1 {
			t := (x - a.X) / (b.X - a.X)
			y = a.Y + t*(b.Y-a.Y)
		}
	}
	return y, found == 1
}
