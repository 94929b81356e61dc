package planar

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"
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
	// Band > 0, else the default: DefaultFlatTolerance × the diagonal of
	// the kept points' bounding box, widened by the measured scatter (see
	// Flatten).
	Tolerance float64
}

// DefaultFlatTolerance is the default out-of-plane tolerance of Flatten, as
// a fraction of the extent (bounding-box diagonal) of the points: 1e-3,
// about 0.1 mm on a 100 mm part (common practice for a "flat" CMM scan).
const DefaultFlatTolerance = 1e-3

// scatterSample is the number of points whose neighbours the scatter
// estimate of Flatten looks at.
const scatterSample = 4000

// scatterMargin is added to √(2 ln 2n), in units of the scatter, to make
// the allowance for the noise of n points: a Gaussian scatter exceeds
// (√(2 ln 2n) + 2)σ anywhere among n points with a probability below 1e-5.
const scatterMargin = 2

// Flatness reports how far the kept points lie from the plane, in input
// units, how many were kept and how many fell outside the band.
type Flatness struct {
	RMS, Max      float64
	Kept, Outside int
	// Strays are the points dropped, under the default tolerance, as
	// lying off the plane alone (see Flatten), with their signed
	// distances from it; they are noted too.
	Strays []Stray
	Plane  geometry.Plane
	// Scatter is the out-of-plane noise of the points: the robust spread
	// of the difference between the distances of neighbouring points from
	// the plane, divided by √2 (input units). A systematic departure (a
	// warped or twisted set) moves neighbours alike and does not count.
	Scatter float64
	// Tolerance is the out-of-plane distance Flatten accepted (the
	// allowance for the scatter included).
	Tolerance float64
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
	pending := false   // a run has started and none of its points is kept yet
	var offs []float64 // the kept points' signed distances from the plane
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
		offs = append(offs, d)
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
	allowance := ""
	if tol <= 0 {
		// The default: a fixed share of the extent for the departure of
		// the part from a plane, plus what the noise of this many points
		// reaches.
		fl.Scatter = outOfPlaneScatter(c, pl)
		base := DefaultFlatTolerance * hi.Dist(lo)
		k := math.Sqrt(2*math.Log(2*float64(fl.Kept))) + scatterMargin
		// The scatter sees a grid whose levels the points share about
		// equally; when nearly all lie on one level and a few on the
		// next, the step is the allowance instead.
		step := gridAllowance(c.Points, pl)
		tol = base + max(k*fl.Scatter, step)
		allowance = fmt.Sprintf(" (%.4g for the part's size plus %.3g for the scatter %.3g of neighbouring points; a warp moves neighbours alike, noise does not)", base, k*fl.Scatter, fl.Scatter)
		if step > k*fl.Scatter {
			allowance = fmt.Sprintf(" (%.4g for the part's size plus %.3g for the step of the grid the coordinates are written on; a warp moves neighbours alike, noise does not)", base, step)
		}
	}
	fl.Tolerance = tol
	if fl.Max > tol && allowance != "" {
		// Under the default tolerance, a few points beyond it whose
		// neighbours in the plane lie well inside are strays (a speck
		// the beam caught, noise that grows where the beam grazes), not
		// a part that departs from its plane: they are dropped and noted
		// and the rest flattened. A warp carries the neighbours out too.
		if drop := strays(out.Points, offs, tol); drop != nil {
			out, fl = dropStrays(out, fl, drop, offs, tol)
		}
	}
	if fl.Max > tol {
		where := ""
		if worst < len(c.Origins) {
			where = " at " + c.Origins[worst].String()
		}
		return nil, fl, fmt.Errorf("geometry: flatten: %w: max out-of-plane distance %.4g%s, rms %.4g, exceeds the tolerance %.4g%s; cut the section out with --cut and --band, or give --flat-tol if the part may be that far from flat",
			ErrNotPlanar, fl.Max, where, fl.RMS, tol, allowance)
	}
	return out, fl, nil
}

// outOfPlaneScatter returns the out-of-plane noise of the points of c
// about the plane pl. For up to scatterSample evenly chosen points, the
// distance from the plane is predicted from the two nearest neighbours in
// the plane: linearly between them when they lie on either side of it,
// else the nearest one's distance. The scatter is 1.4826 × the median
// absolute prediction error (a robust standard deviation, common
// practice), each error divided by its own noise factor (√(1 + w² + (1−w)²)
// for weights w, 1 − w; √2 for one neighbour), or, when larger (points on
// a grid), their RMS over the lowest 90 % / 0.7893. A smooth warp is
// predicted well by neighbours and does not count; noise does.
func outOfPlaneScatter(c *geometry.Cloud, pl geometry.Plane) float64 {
	n := len(c.Points)
	if n < 3 {
		return 0
	}
	uv := make([]geometry.Point, n)
	d := make([]float64, n)
	for i, p := range c.Points {
		uv[i], d[i] = mapTo(pl, p)
	}
	lo, hi := geometry.Point{X: math.Inf(1), Y: math.Inf(1)}, geometry.Point{X: math.Inf(-1), Y: math.Inf(-1)}
	for _, p := range uv {
		lo = geometry.Point{X: math.Min(lo.X, p.X), Y: math.Min(lo.Y, p.Y)}
		hi = geometry.Point{X: math.Max(hi.X, p.X), Y: math.Max(hi.Y, p.Y)}
	}
	// Cells of about one point each for points along a curve whose length
	// is about the bounding box's perimeter.
	h := 2 * ((hi.X - lo.X) + (hi.Y - lo.Y)) / float64(n)
	if !(h > 0) {
		return 0
	}
	type key struct{ x, y int64 }
	cellOf := func(p geometry.Point) key {
		return key{int64(math.Floor((p.X - lo.X) / h)), int64(math.Floor((p.Y - lo.Y) / h))}
	}
	cells := make(map[key][]int32, n)
	for i, p := range uv {
		k := cellOf(p)
		cells[k] = append(cells[k], int32(i))
	}
	step := max(1, n/scatterSample)
	var diffs []float64
	for i := 0; i < n; i += step {
		p, k := uv[i], cellOf(uv[i])
		a, b := -1, -1 // the nearest and the second nearest
		da, db := math.Inf(1), math.Inf(1)
		for dy := int64(-1); dy <= 1; dy++ {
			for dx := int64(-1); dx <= 1; dx++ {
				for _, j := range cells[key{k.x + dx, k.y + dy}] {
					if int(j) == i {
						continue
					}
					switch e := p.Dist(uv[j]); {
					case e < da:
						b, db = a, da
						a, da = int(j), e
					case e < db:
						b, db = int(j), e
					}
				}
			}
		}
		switch {
		case a >= 0 && b >= 0 && uv[a].Sub(p).Dot(uv[b].Sub(p)) < 0 && da+db > 0:
			w := da / (da + db) // weight of b
			r := d[i] - ((1-w)*d[a] + w*d[b])
			diffs = append(diffs, math.Abs(r)/math.Sqrt(1+w*w+(1-w)*(1-w)))
		case a >= 0:
			diffs = append(diffs, math.Abs(d[i]-d[a])/math.Sqrt2)
		}
	}
	if len(diffs) == 0 {
		return 0
	}
	slices.Sort(diffs)
	med := 1.4826 * diffs[len(diffs)/2]
	// Coordinates written on a grid (a voxelised scan's stair steps, few
	// decimals) make most neighbours' distances equal and the median
	// error 0 while the points scatter by up to the step. The RMS of the
	// lowest 90 % of the errors sees that scatter; for a Gaussian it is
	// 0.7893 σ (the truncated second moment, (0.9 − 2·1.6449·φ(1.6449))/0.9
	// = 0.6230, common practice), so it is divided by that. The larger of
	// the two estimates is taken.
	keep := diffs[:max(1, len(diffs)*9/10)]
	var sum2 float64
	for _, e := range keep {
		sum2 += e * e
	}
	return max(med, math.Sqrt(sum2/float64(len(keep)))/0.7893)
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

// Stray is a point dropped as lying off the plane alone.
type Stray struct {
	Origin   geometry.Origin
	Distance float64 // signed distance from the plane, input units
}

// Limits of strays.
const (
	// strayShare is the largest share of the points, beyond the default
	// tolerance, that may be dropped as strays (with strayMin at least).
	strayShare = 0.01
	strayMin   = 3
	// strayNeighbours is how many nearest neighbours in the plane judge a
	// point beyond the tolerance; their median distance from the plane
	// must lie within half the tolerance.
	strayNeighbours = 6
)

// strays returns the indices of the kept points (in plane coordinates,
// with their signed distances d from the plane) farther than tol from it
// when they are few (at most strayShare of them, or strayMin) and each
// one's strayNeighbours nearest neighbours in the plane lie, by their
// median, within tol/2 of it; nil otherwise.
func strays(kept []geometry.Vec3, d []float64, tol float64) []int {
	n := len(kept)
	var over []int
	for i := range d {
		if math.Abs(d[i]) > tol {
			over = append(over, i)
		}
	}
	if len(over) == 0 || len(over) > max(strayMin, int(strayShare*float64(n))) {
		return nil
	}
	for _, i := range over {
		p := kept[i]
		type nb struct{ dist, off float64 }
		var near []nb
		for k := range kept {
			if k == i {
				continue
			}
			e := math.Hypot(kept[k].X-p.X, kept[k].Y-p.Y)
			if len(near) < strayNeighbours || e < near[len(near)-1].dist {
				near = append(near, nb{e, math.Abs(d[k])})
				slices.SortFunc(near, func(a, b nb) int { return cmp.Compare(a.dist, b.dist) })
				if len(near) > strayNeighbours {
					near = near[:strayNeighbours]
				}
			}
		}
		offs := make([]float64, len(near))
		for k, q := range near {
			offs[k] = q.off
		}
		slices.Sort(offs)
		if len(offs) == 0 || offs[len(offs)/2] > tol/2 {
			return nil
		}
	}
	return over
}

// dropStrays returns out without the points at indices drop (ascending),
// each noted with its distance from the plane (d, by kept point), and fl
// with the RMS, the largest distance and the count of kept points measured
// again.
func dropStrays(out *geometry.Cloud, fl Flatness, drop []int, d []float64, tol float64) (*geometry.Cloud, Flatness) {
	gone := make(map[int]bool, len(drop))
	for _, i := range drop {
		gone[i] = true
	}
	res := *out
	res.Points = make([]geometry.Vec3, 0, len(out.Points)-len(drop))
	res.Origins = make([]geometry.Origin, 0, len(out.Points)-len(drop))
	var notes geometry.Notes
	res.Segments = nil
	seg := map[int]bool{}
	for _, s := range out.Segments {
		seg[s] = true
	}
	var sum2 float64
	fl.Max = 0
	for i, p := range out.Points {
		o := out.Origins[i]
		if gone[i] {
			notes.AddAt(o, fmt.Sprintf("out of the plane: %.4g from it, beyond the tolerance %.4g, with its neighbours within half of it (a stray point)", d[i], tol), "")
			fl.Strays = append(fl.Strays, Stray{Origin: o, Distance: d[i]})
			if seg[i] && i+1 < len(out.Points) {
				seg[i+1] = true
			}
			continue
		}
		if seg[i] {
			res.Segments = append(res.Segments, len(res.Points))
		}
		res.Points = append(res.Points, p)
		res.Origins = append(res.Origins, o)
		sum2 += d[i] * d[i]
		fl.Max = max(fl.Max, math.Abs(d[i]))
	}
	if len(res.Segments) <= 1 {
		res.Segments = nil
	}
	res.Notes = append(append([]geometry.Note(nil), out.Notes...), notes.Kept()...)
	fl.Kept = len(res.Points)

	if fl.Kept > 0 {
		fl.RMS = math.Sqrt(sum2 / float64(fl.Kept))
	}
	return &res, fl
}

// gridAllowance returns how far from the plane pl rounding to the grid the
// coordinates of pts are written on can move a point: Σ|N_i|·q_i over the
// axes, for the step q_i of each axis whose values repeat (a voxelised
// scan, coordinates written with few decimals). A point rounded up on one
// level and its neighbour rounded down lie a whole step apart across the
// plane, and the plane fitted through the levels lies between them: a
// scan at constant z with 0.04 mm of noise written on a 0.19 mm grid puts
// most points on one level and a few on the next, a step off the plane.
func gridAllowance(pts []geometry.Vec3, pl geometry.Plane) float64 {
	n := len(pts)
	if n < 8 {
		return 0
	}
	vals := make([]float64, n)
	var sum float64
	for axis := range 3 {
		for i, p := range pts {
			vals[i] = [3]float64{p.X, p.Y, p.Z}[axis]
		}
		if q := gridStep(vals); q > 0 {
			sum += math.Abs(pl.N[axis]) * q
		}
	}
	return sum
}

// gridStep returns the step of the grid the values are written on when
// they repeat (at most half as many distinct values as values): the
// smallest gap between neighbouring distinct values; 0 when they do not
// repeat. vals is sorted in place.
func gridStep(vals []float64) float64 {
	slices.Sort(vals)
	distinct, step := 1, math.Inf(1)
	for i := 1; i < len(vals); i++ {
		if d := vals[i] - vals[i-1]; d > 0 {
			distinct++
			step = min(step, d)
		}
	}
	if distinct == 1 || 2*distinct > len(vals) {
		return 0
	}
	return step
}
