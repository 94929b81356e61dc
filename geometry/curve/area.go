package curve

// AreaIntegrals are the integrals over the area a curve encloses, closed by
// a straight segment from its end back to its start when it is open:
// A = ∫∫ dA, Sx = ∫∫ x dA, Sy = ∫∫ y dA, Ixx = ∫∫ y² dA, Iyy = ∫∫ x² dA and
// Ixy = ∫∫ xy dA, about the origin. They are positive (A > 0) for a
// counter-clockwise curve.
type AreaIntegrals struct {
	A, Sx, Sy, Ixx, Iyy, Ixy float64
}

// AreaIntegrals integrates over every piece of c by Gauss–Legendre
// quadrature (exact for cubic pieces) and over the straight closing segment
// from the end back to the start, by Green's theorem:
//
//	A = ½∮(x dy − y dx),  ∫∫x dA = ∮ x²/2 dy,  ∫∫y dA = −∮ y²/2 dx,
//	∫∫y² dA = −∮ y³/3 dx, ∫∫x² dA = ∮ x³/3 dy, ∫∫xy dA = ∮ x²y/2 dy.
func (c *Curve) AreaIntegrals() AreaIntegrals {
	gl := glRule()
	var g AreaIntegrals
	add := func(x, y, dx, dy, w float64) {
		g.A += w * (x*dy - y*dx) / 2
		g.Sx += w * x * x * dy / 2
		g.Sy -= w * y * y * dx / 2
		g.Ixx -= w * y * y * y * dx / 3
		g.Iyy += w * x * x * x * dy / 3
		g.Ixy += w * x * x * y * dy / 2
	}
	for i := 0; i < c.Pieces(); i++ {
		h := c.Span(i)
		for k, t := range gl[0] {
			x, dx, _ := poly(c.xs[i], t*h)
			y, dy, _ := poly(c.ys[i], t*h)
			add(x, y, dx, dy, gl[1][k]*h)
		}
	}
	p, q := c.End(), c.Start()
	if d := q.Sub(p); d.Norm() > 0 {
		for k, t := range gl[0] {
			r := p.Add(d.Scale(t))
			add(r.X, r.Y, d.X, d.Y, gl[1][k])
		}
	}
	return g
}

// Centroid returns the centroid of the area c encloses (closed by a straight
// segment if open).
func (c *Curve) Centroid() (x, y float64) {
	g := c.AreaIntegrals()
	return g.Sx / g.A, g.Sy / g.A
}
