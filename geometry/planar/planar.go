package planar

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/foilwright/foilwright/geometry"
	"gonum.org/v1/gonum/mat"
)

// ErrNotPlanar means a 3D point set departs from its plane by more than
// the tolerance.
var ErrNotPlanar = errors.New("points are not planar")

// Spec is a plane given by a point on it and a normal (any non-zero
// length), in input units.
type Spec struct{ Point, Normal geometry.Vec3 }

// ParseSpec parses a plane written as "z=240" (also "x=-3.5", "y=0": the
// plane where that coordinate has that value, normal along the axis) or
// "px,py,pz:nx,ny,nz" (a point and a normal). Blanks are allowed around the
// numbers. It returns an error for anything else, for non-finite numbers
// and for a zero normal.
func ParseSpec(s string) (Spec, error) {
	bad := func(why string) (Spec, error) {
		return Spec{}, fmt.Errorf("geometry: plane %q: %s (want e.g. \"z=240\" or \"0,0,240:0,0,1\")", s, why)
	}
	t := strings.TrimSpace(s)
	if axis, val, ok := strings.Cut(t, "="); ok {
		v, err := strconv.ParseFloat(strings.TrimSpace(val), 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			return bad("the value is not a finite number")
		}
		switch strings.ToLower(strings.TrimSpace(axis)) {
		case "x":
			return Spec{Point: geometry.Vec3{X: v}, Normal: geometry.Vec3{X: 1}}, nil
		case "y":
			return Spec{Point: geometry.Vec3{Y: v}, Normal: geometry.Vec3{Y: 1}}, nil
		case "z":
			return Spec{Point: geometry.Vec3{Z: v}, Normal: geometry.Vec3{Z: 1}}, nil
		}
		return bad("the axis must be x, y or z")
	}
	ps, ns, ok := strings.Cut(t, ":")
	if !ok {
		return bad("no \"=\" or \":\"")
	}
	var p, n geometry.Vec3
	for _, part := range []struct {
		text string
		dst  *geometry.Vec3
	}{{ps, &p}, {ns, &n}} {
		f := strings.Split(part.text, ",")
		if len(f) != 3 {
			return bad("a point and a normal need 3 numbers each")
		}
		var v [3]float64
		for i := range f {
			x, err := strconv.ParseFloat(strings.TrimSpace(f[i]), 64)
			if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
				return bad(fmt.Sprintf("%q is not a finite number", strings.TrimSpace(f[i])))
			}
			v[i] = x
		}
		*part.dst = geometry.Vec3{X: v[0], Y: v[1], Z: v[2]}
	}
	if n.Unit() == (geometry.Vec3{}) {
		return bad("the normal is zero")
	}
	return Spec{Point: p, Normal: n}, nil
}

// String formats p the way ParseSpec reads it: "z=240" when the normal is
// a unit axis and the point lies on that axis, else "px,py,pz:nx,ny,nz".
func (p Spec) String() string {
	g := func(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
	n := p.Normal
	switch n {
	case geometry.Vec3{X: 1}:
		if p.Point.Y != 0 || p.Point.Z != 0 {
			break
		}
		return "x=" + g(p.Point.X)
	case geometry.Vec3{Y: 1}:
		if p.Point.X != 0 || p.Point.Z != 0 {
			break
		}
		return "y=" + g(p.Point.Y)
	case geometry.Vec3{Z: 1}:
		if p.Point.X != 0 || p.Point.Y != 0 {
			break
		}
		return "z=" + g(p.Point.Z)
	}
	return fmt.Sprintf("%s,%s,%s:%s,%s,%s", g(p.Point.X), g(p.Point.Y), g(p.Point.Z), g(n.X), g(n.Y), g(n.Z))
}

// Through returns the plane through o with normal n and the in-plane axes
// foilwright uses for it, chosen to keep the user's own axes:
//
//   - k is the global axis n is closest to (largest |n_k|; ties go to x,
//     then y);
//   - U is the projection onto the plane of the first other axis: x when k
//     is z or y, y when k is x;
//   - V = N × U, with the sign of N chosen so that V points along the
//     remaining axis (y when k is z, z when k is x or y).
//
// So for a plane z = z0 through (x0, y0, z0), (u, v) = (x − x0, y − y0)
// exactly; for x = x0 it is (y, z); for y = y0 it is (x, z). This is the rule
// "U is the projection of the global axis most perpendicular to N", with
// ties and near-ties (as in the normal of a noisy fit) resolved by the axis
// the plane faces, so that the choice does not flip with the noise. A point
// p maps to u = (p − O)·U, v = (p − O)·V. It panics if n is zero.
func Through(o, n geometry.Vec3) geometry.Plane {
	n = n.Unit()
	if n == (geometry.Vec3{}) {
		panic("geometry: Through with a zero normal")
	}
	axes := [3]geometry.Vec3{{X: 1}, {Y: 1}, {Z: 1}}
	comp := [3]float64{math.Abs(n.X), math.Abs(n.Y), math.Abs(n.Z)}
	k := 0
	for i := 1; i < 3; i++ {
		if comp[i] > comp[k] {
			k = i
		}
	}
	pair := [3][2]int{{1, 2}, {0, 2}, {0, 1}}[k]
	a, b := axes[pair[0]], axes[pair[1]]
	u := a.Sub(n.Scale(a.Dot(n))).Unit()
	v := n.Cross(u)
	if v.Dot(b) < 0 {
		n, v = n.Scale(-1), v.Scale(-1)
	}
	return geometry.Plane{Origin: [3]float64{o.X, o.Y, o.Z}, U: [3]float64{u.X, u.Y, u.Z}, V: [3]float64{v.X, v.Y, v.Z}, N: [3]float64{n.X, n.Y, n.Z}}
}

// vec turns a [3]float64 of a Plane into a Vec3.
func vec(a [3]float64) geometry.Vec3 { return geometry.Vec3{X: a[0], Y: a[1], Z: a[2]} }

// mapTo returns the plane coordinates (u, v) of p and its signed
// distance d from the plane pl.
func mapTo(pl geometry.Plane, p geometry.Vec3) (uv geometry.Point, d float64) {
	q := p.Sub(vec(pl.Origin))
	return geometry.Point{X: q.Dot(vec(pl.U)), Y: q.Dot(vec(pl.V))}, q.Dot(vec(pl.N))
}

// FlattenOptions control how Flatten maps a 3D cloud onto a plane.
type FlattenOptions struct {
	// Plane is the plane to map onto; nil fits one: the least-squares plane
	// through the centroid, whose normal is the right singular vector of
	// the smallest singular value of the centred points (gonum/mat SVD).
	// The fitted plane's origin is the foot of the perpendicular from the
	// global origin, so an axis-aligned section keeps its coordinates.
	Plane *Spec
	// Band, when > 0, keeps only the points within ±Band of the plane (given
	// or fitted); the others are dropped and noted. 0 keeps all points.
	Band float64
	// Tolerance is the largest out-of-plane distance of a kept point that
	// Flatten accepts; beyond it returns ErrNotPlanar. 0 means Band when
	// Band > 0, else DefaultFlatTolerance × the diagonal of the kept
	// points' bounding box.
	Tolerance float64
}

// DefaultFlatTolerance is the default out-of-plane tolerance of Flatten, as
// a fraction of the extent (bounding-box diagonal) of the points: 1e-3,
// about 0.1 mm on a 100 mm part (common practice for a "flat" CMM scan).
const DefaultFlatTolerance = 1e-3

// Flatness reports how far the kept points lie from the plane, in input
// units, how many were kept and how many fell outside the band.
type Flatness struct {
	RMS, Max      float64
	Kept, Outside int
	Plane         geometry.Plane
}

// Flatten maps the 3D cloud c onto a plane and returns a 2D cloud (Dim 2,
// Z = 0) of plane coordinates (u, v) as Through defines them, with the
// Origins, Segments (renumbered when points are dropped), Ordered flag,
// name, units and notes of c. A 2D cloud with no plane given is returned as
// a copy, on the plane z = 0.
//
// It returns an error wrapping ErrNotPlanar, whose message gives the RMS
// and maximum distances and the worst point, when a kept point lies farther
// than the tolerance from the plane (the Flatness is returned as well);
// ErrTooFewPoints when a fit has fewer than 3 points or the band keeps
// none; ErrCollinear when the points fix no plane.
func Flatten(c *geometry.Cloud, opts FlattenOptions) (*geometry.Cloud, Flatness, error) {
	var pl geometry.Plane
	switch {
	case opts.Plane != nil:
		if n := opts.Plane.Normal.Unit(); n == (geometry.Vec3{}) || !n.IsFinite() || !opts.Plane.Point.IsFinite() {
			return nil, Flatness{}, fmt.Errorf("geometry: flatten: plane %s: normal must be finite and non-zero", *opts.Plane)
		}
		pl = Through(opts.Plane.Point, opts.Plane.Normal)
	case c.Dim != 3:
		pl = Through(geometry.Vec3{}, geometry.Vec3{Z: 1})
	default:
		var err error
		if pl, err = fitPlane(c.Points); err != nil {
			return nil, Flatness{}, err
		}
	}
	out := &geometry.Cloud{Dim: 2, Units: c.Units, Format: c.Format, Name: c.Name, Ordered: c.Ordered,
		Points: make([]geometry.Vec3, 0, len(c.Points)), Origins: make([]geometry.Origin, 0, len(c.Points))}
	out.Notes = append(out.Notes, c.Notes...)
	var notes geometry.Notes
	var fl Flatness
	fl.Plane = pl
	segStart := map[int]bool{}
	for _, s := range c.Segments {
		segStart[s] = true
	}
	pending := false // a run has started and none of its points is kept yet
	var sum2 float64
	worst := -1
	lo, hi := geometry.Point{X: math.Inf(1), Y: math.Inf(1)}, geometry.Point{X: math.Inf(-1), Y: math.Inf(-1)}
	for i, p := range c.Points {
		uv, d := mapTo(pl, p)
		var o geometry.Origin
		if i < len(c.Origins) {
			o = c.Origins[i]
		}
		if segStart[i] {
			pending = true
		}
		if opts.Band > 0 && math.Abs(d) > opts.Band {
			fl.Outside++
			notes.AddAt(o, fmt.Sprintf("point %.6g from the plane, outside the band ±%g", d, opts.Band), "")
			continue
		}
		if pending {
			out.Segments = append(out.Segments, len(out.Points))
			pending = false
		}
		out.Points = append(out.Points, geometry.Vec3{X: uv.X, Y: uv.Y, Z: 0})
		out.Origins = append(out.Origins, o)
		sum2 += d * d
		if math.Abs(d) > fl.Max || worst < 0 {
			fl.Max, worst = math.Abs(d), i
		}
		lo = geometry.Point{X: math.Min(lo.X, uv.X), Y: math.Min(lo.Y, uv.Y)}
		hi = geometry.Point{X: math.Max(hi.X, uv.X), Y: math.Max(hi.Y, uv.Y)}
	}
	fl.Kept = len(out.Points)
	kept := notes.Kept()
	if n := len(kept); n > 0 && notes.Extra() > 0 {
		kept = append(kept, geometry.Note{Reason: fmt.Sprintf("%d more point(s) outside the band not listed", notes.Extra())})
	}
	out.Notes = append(out.Notes, kept...)
	if len(out.Segments) > 0 && out.Segments[0] != 0 {
		out.Segments = append([]int{0}, out.Segments...)
	}
	if len(out.Segments) <= 1 {
		out.Segments = nil
	}
	if fl.Kept == 0 {
		return nil, fl, fmt.Errorf("geometry: flatten: %w: no point lies within ±%g of the plane", geometry.ErrTooFewPoints, opts.Band)
	}
	fl.RMS = math.Sqrt(sum2 / float64(fl.Kept))
	tol := opts.Tolerance
	if tol <= 0 {
		tol = opts.Band
	}
	if tol <= 0 {
		tol = DefaultFlatTolerance * hi.Dist(lo)
	}
	if fl.Max > tol {
		where := ""
		if worst < len(c.Origins) {
			where = " at " + c.Origins[worst].String()
		}
		return nil, fl, fmt.Errorf("geometry: flatten: %w: max out-of-plane distance %.4g%s, rms %.4g, exceeds the tolerance %.4g",
			ErrNotPlanar, fl.Max, where, fl.RMS, tol)
	}
	return out, fl, nil
}

// fitPlane returns the least-squares plane through pts (see FlattenOptions).
func fitPlane(pts []geometry.Vec3) (geometry.Plane, error) {
	if len(pts) < 3 {
		return geometry.Plane{}, fmt.Errorf("geometry: flatten: %w: %d point(s), a plane needs 3", geometry.ErrTooFewPoints, len(pts))
	}
	var c geometry.Vec3
	for _, p := range pts {
		c = c.Add(p)
	}
	c = c.Scale(1 / float64(len(pts)))
	a := mat.NewDense(len(pts), 3, nil)
	for i, p := range pts {
		q := p.Sub(c)
		a.Set(i, 0, q.X)
		a.Set(i, 1, q.Y)
		a.Set(i, 2, q.Z)
	}
	var svd mat.SVD
	if !svd.Factorize(a, mat.SVDThinV) {
		return geometry.Plane{}, fmt.Errorf("geometry: flatten: the plane fit failed to converge")
	}
	s := svd.Values(nil)
	if s[0] == 0 || s[1] <= 1e-12*s[0] {
		return geometry.Plane{}, fmt.Errorf("geometry: flatten: %w: the points fix no plane", geometry.ErrCollinear)
	}
	var v mat.Dense
	svd.VTo(&v)
	n := geometry.Vec3{X: v.At(0, 2), Y: v.At(1, 2), Z: v.At(2, 2)}.Unit()
	return Through(n.Scale(c.Dot(n)), n), nil
}
