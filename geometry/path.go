package geometry

// Path is a smooth curve in the plane parametrised by arc length s in
// [0, Length()], running in the package node order (trailing edge, upper
// surface, leading edge, lower surface). The fitted Curve implements it; the
// repanel package distributes nodes along any Path.
type Path interface {
	// Length returns the total arc length.
	Length() float64
	// At returns the point at arc length s; s is clamped to [0, Length()].
	At(s float64) Point
	// Curvature returns the signed curvature dθ/ds at s (positive where the
	// path turns counter-clockwise).
	Curvature(s float64) float64
}
