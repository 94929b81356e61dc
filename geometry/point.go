package geometry

import (
	"encoding/json"
	"fmt"
	"math"
)

// Point is a point or vector in a plane.
type Point struct{ X, Y float64 }

// Add returns p + q.
func (p Point) Add(q Point) Point { return Point{p.X + q.X, p.Y + q.Y} }

// Sub returns p − q.
func (p Point) Sub(q Point) Point { return Point{p.X - q.X, p.Y - q.Y} }

// Scale returns f·p.
func (p Point) Scale(f float64) Point { return Point{f * p.X, f * p.Y} }

// Dot returns the scalar product p·q.
func (p Point) Dot(q Point) float64 { return p.X*q.X + p.Y*q.Y }

// Cross returns the z component of p × q.
func (p Point) Cross(q Point) float64 { return p.X*q.Y - p.Y*q.X }

// Norm returns the length of p.
func (p Point) Norm() float64 { return math.Hypot(p.X, p.Y) }

// Dist returns the distance between p and q.
func (p Point) Dist(q Point) float64 { return math.Hypot(p.X-q.X, p.Y-q.Y) }

// SegmentFoot returns the point of the segment from a to b nearest to p (a
// when the segment has no length).
func SegmentFoot(p, a, b Point) Point {
	d := b.Sub(a)
	l2 := d.Dot(d)
	if l2 == 0 {
		return a
	}
	t := min(1, max(0, p.Sub(a).Dot(d)/l2))
	return a.Add(d.Scale(t))
}

// SegmentDist returns the distance of p from the segment from a to b.
func SegmentDist(p, a, b Point) float64 { return p.Dist(SegmentFoot(p, a, b)) }

// Rotate returns p rotated counter-clockwise by angle (radians) about the origin.
func (p Point) Rotate(angle float64) Point {
	s, c := math.Sincos(angle)
	return Point{c*p.X - s*p.Y, s*p.X + c*p.Y}
}

// IsFinite reports whether both coordinates are finite.
func (p Point) IsFinite() bool {
	return !math.IsNaN(p.X) && !math.IsInf(p.X, 0) && !math.IsNaN(p.Y) && !math.IsInf(p.Y, 0)
}

// MajorAxis returns the centroid of pts and the unit direction of their
// major principal axis: the line through them that least squares of the
// distances normal to it (total least squares) fits.
func MajorAxis(pts []Point) (c, dir Point) {
	for _, p := range pts {
		c = c.Add(p)
	}
	c = c.Scale(1 / float64(len(pts)))
	var sxx, sxy, syy float64
	for _, p := range pts {
		d := p.Sub(c)
		sxx, sxy, syy = sxx+d.X*d.X, sxy+d.X*d.Y, syy+d.Y*d.Y
	}
	th := 0.5 * math.Atan2(2*sxy, sxx-syy)
	return c, Point{X: math.Cos(th), Y: math.Sin(th)}
}

// Turn returns the signed angle (radians) from direction a to b.
func Turn(a, b Point) float64 { return math.Atan2(a.Cross(b), a.Dot(b)) }

// Vec3 is a point or vector in space.
type Vec3 struct{ X, Y, Z float64 }

// Add returns p + q.
func (p Vec3) Add(q Vec3) Vec3 { return Vec3{p.X + q.X, p.Y + q.Y, p.Z + q.Z} }

// Sub returns p − q.
func (p Vec3) Sub(q Vec3) Vec3 { return Vec3{p.X - q.X, p.Y - q.Y, p.Z - q.Z} }

// Scale returns f·p.
func (p Vec3) Scale(f float64) Vec3 { return Vec3{f * p.X, f * p.Y, f * p.Z} }

// Dot returns the scalar product p·q.
func (p Vec3) Dot(q Vec3) float64 { return p.X*q.X + p.Y*q.Y + p.Z*q.Z }

// Cross returns the vector product p × q.
func (p Vec3) Cross(q Vec3) Vec3 {
	return Vec3{p.Y*q.Z - p.Z*q.Y, p.Z*q.X - p.X*q.Z, p.X*q.Y - p.Y*q.X}
}

// Norm returns the length of p.
func (p Vec3) Norm() float64 { return math.Sqrt(p.Dot(p)) }

// IsFinite reports whether all three coordinates are finite.
func (p Vec3) IsFinite() bool {
	return !math.IsNaN(p.X+p.Y+p.Z) && !math.IsInf(p.X, 0) && !math.IsInf(p.Y, 0) && !math.IsInf(p.Z, 0)
}

// Unit returns p scaled to unit length. It returns the zero vector for the
// zero vector.
func (p Vec3) Unit() Vec3 {
	n := p.Norm()
	if n == 0 {
		return Vec3{}
	}
	return p.Scale(1 / n)
}

// Plane is a plane in space with an orthonormal in-plane basis U, V and unit
// normal N = U × V, in input units.
type Plane struct {
	Origin [3]float64 `json:"origin"`
	U      [3]float64 `json:"u"`
	V      [3]float64 `json:"v"`
	N      [3]float64 `json:"normal"`
}

// SignedArea returns the shoelace area of the closed polygon pts (the last
// point joins the first): positive when the points run counter-clockwise.
func SignedArea(pts []Point) float64 {
	var a float64
	n := len(pts)
	for i := range n {
		p, q := pts[i], pts[(i+1)%n]
		a += p.X*q.Y - q.X*p.Y
	}
	return a / 2
}

// MarshalJSON writes p as [x, y].
func (p Point) MarshalJSON() ([]byte, error) {
	if !p.IsFinite() {
		return nil, fmt.Errorf("geometry: cannot write non-finite point (%g, %g)", p.X, p.Y)
	}
	return json.Marshal([2]float64{p.X, p.Y})
}

// UnmarshalJSON reads p from [x, y].
func (p *Point) UnmarshalJSON(b []byte) error {
	var a []float64
	if err := json.Unmarshal(b, &a); err != nil {
		return err
	}
	if len(a) != 2 {
		return fmt.Errorf("want [x, y], got %d number(s)", len(a))
	}
	p.X, p.Y = a[0], a[1]
	return nil
}
