package clean

import (
	"math"
	"slices"

	"github.com/foilwright/foilwright/geometry"
)

// Reseat is a file of two whole passes round the section, one after the
// other, whose second pass lies moved (and turned) from the first as a
// part re-clamped between them does. Clean moves each pass half the way
// towards the other before anything else, so that the passes no longer
// weave two outlines into one, and reports it: where the passes start, and
// the rigid move that takes the first pass onto the second.
type Reseat struct {
	// First and Second are where the two passes start in the file.
	First, Second geometry.Origin
	// Shift is the move of the second pass from the first, input units,
	// at Centre; Turn its rotation about Centre, radians (counter-clockwise).
	Shift  geometry.Point
	Turn   float64
	Centre geometry.Point
	// Spread is the standard error of Shift's length, input units.
	Spread float64
	// Points counts the points of both passes.
	Points int
}

// Sizes of the two-pass analysis.
const (
	// reseatShare is the least share of the points each pass holds.
	reseatShare = 0.3
	// reseatCover is the least share of the whole cloud's bounding-box
	// diagonal each pass's own box spans: each pass goes all round (a
	// few outliers of the other may widen the whole box).
	reseatCover = 0.9
	// reseatWalk is the longest path, in diagonals, each pass walks in
	// the file's order, every step counted as at most reseatStepCap median
	// steps (an outlier's excursion is one step out and one back): a
	// section's perimeter is about two diagonals, a shuffled pass walks
	// about reseatStepCap perimeters.
	reseatWalk    = 3.0
	reseatStepCap = 3.0
	// reseatClose is the farthest apart a pass's first and last points may
	// lie, in the largest of the steps of the pass (95th percentile): a
	// pass closes on itself.
	reseatClose = 4.0
	// reseatJump is the longest step, in diagonals, within a pass in
	// order: a stretch a clamp hid may leave a quarter of the chord
	// unsampled, a jump across the section is no pass.
	reseatJump = 0.3
	// reseatSigmas is how many standard errors the move must stand out by.
	reseatSigmas = 5.0
	// reseatFloor is the least move, in diagonals, worth a correction: the
	// passes of a file written twice from the same numbers differ by
	// rounding alone.
	reseatFloor = 1e-5
)

// reseat finds two whole passes in the file's order of the points all
// (each at least reseatShare of them, each closing on itself and spanning
// the whole cloud, each walking at most reseatWalk diagonals without a
// jump), measures the
// rigid move between them (a shift and a small turn fitted to the normal
// distances of each pass's points from the other's polyline, taken both
// ways and halved so that the chords' sagitta cancels) and, when it stands
// out by reseatSigmas standard errors and exceeds reseatFloor diagonals, moves the points of each pass half
// of it towards the other in place. It returns nil when the file is not two
// such passes or they agree.
func reseat(all []geometry.Point, origins []geometry.Origin, diag float64) *Reseat {
	n := len(all)
	if n < 4*minPoints || !(diag > 0) {
		return nil
	}
	steps := make([]float64, n-1)
	for i := range steps {
		steps[i] = all[i+1].Dist(all[i])
	}
	// The split k (the second pass starts at all[k]) whose passes close
	// best on themselves.
	lo := int(math.Ceil(reseatShare * float64(n)))
	k, best := -1, math.Inf(1)
	for j := lo; j <= n-lo; j++ {
		g := all[j-1].Dist(all[0]) + all[n-1].Dist(all[j])
		if g < best {
			k, best = j, g
		}
	}
	if k < 0 {
		return nil
	}
	a, b := all[:k], all[k:]
	for _, p := range [][]geometry.Point{a, b} {
		if !wholePass(p, diag) {
			return nil
		}
	}
	c := centroid(all)
	s1, t1, e1, ok1 := registerPass(b, a, c)
	s2, t2, e2, ok2 := registerPass(a, b, c)
	if !ok1 || !ok2 {
		return nil
	}
	// b lies s1, t1 from a; a lies s2, t2 from b.
	shift := s1.Sub(s2).Scale(0.5)
	turn := (t1 - t2) / 2
	spread := math.Hypot(e1, e2) / 2
	if !(shift.Norm() > reseatSigmas*spread) || !(shift.Norm() > reseatFloor*diag) {
		return nil
	}
	move := func(p []geometry.Point, sh geometry.Point, tu float64) {
		for i, q := range p {
			p[i] = c.Add(q.Sub(c).Rotate(tu)).Add(sh)
		}
	}
	move(a, shift.Scale(0.5), turn/2)
	move(b, shift.Scale(-0.5), -turn/2)
	return &Reseat{First: origins[0], Second: origins[k], Shift: shift, Turn: turn, Centre: c, Spread: spread, Points: n}
}

// wholePass reports whether the points p, in order, walk once round the
// whole cloud: a box spanning reseatCover of diag, a walk of at most
// reseatWalk diagonals (steps capped) with no step beyond reseatJump
// diagonals, the last point within reseatClose large steps of
// the first.
func wholePass(p []geometry.Point, diag float64) bool {
	lo, hi := bounds(p)
	if hi.Dist(lo) < reseatCover*diag {
		return false
	}
	st := make([]float64, len(p)-1)
	for i := range st {
		st[i] = p[i+1].Dist(p[i])
	}
	slices.Sort(st)
	h := st[len(st)/2]
	walk := 0.0
	for _, s := range st {
		walk += math.Min(s, reseatStepCap*h)
	}
	if walk > reseatWalk*diag || st[len(st)-1] > reseatJump*diag {
		return false
	}
	big := st[int(0.95*float64(len(st)-1))]
	return p[len(p)-1].Dist(p[0]) <= reseatClose*big
}

// registerPass fits the rigid move (a shift at c and a turn about c) that
// takes the closed polyline ref onto the points p, by least squares on the
// signed normal distances of p from ref's nearest segments, twice, the
// second time without the points beyond 4 robust sigmas of the first's
// residuals. It returns the shift, the turn, the shift's standard error
// and whether the fit is determined.
func registerPass(p, ref []geometry.Point, c geometry.Point) (geometry.Point, float64, float64, bool) {
	m := len(ref)
	lo, hi := bounds(ref)
	st := make([]float64, m)
	for i := range ref {
		st[i] = ref[(i+1)%m].Dist(ref[i])
	}
	h := median(slices.Clone(st))
	if !(h > 0) {
		return geometry.Point{}, 0, 0, false
	}
	cell := 4 * h
	g := newGrid(ref, nil, cell, lo, hi)
	type obs struct {
		nrm  geometry.Point
		arm  float64 // the turn's normal displacement per radian
		dist float64
	}
	var os []obs
	for _, q := range p {
		ix, iy := g.cell(q)
		near, nd := int32(-1), math.Inf(1)
		for dx := int64(-1); dx <= 1; dx++ {
			for dy := int64(-1); dy <= 1; dy++ {
				for _, j := range g.at(ix+dx, iy+dy) {
					if d := ref[j].Dist(q); d < nd {
						near, nd = j, d
					}
				}
			}
		}
		if near < 0 {
			continue
		}
		// The nearer of the two segments at the nearest vertex.
		bestD, bestN, found := math.Inf(1), geometry.Point{}, false
		for _, s := range [2][2]int32{{(near - 1 + int32(m)) % int32(m), near}, {near, (near + 1) % int32(m)}} {
			u, v := ref[s[0]], ref[s[1]]
			d := v.Sub(u)
			L := d.Norm()
			if !(L > 0) {
				continue
			}
			t := q.Sub(u).Dot(d) / (L * L)
			if t < 0 || t > 1 {
				continue
			}
			nrm := geometry.Point{X: d.Y / L, Y: -d.X / L}
			sd := q.Sub(u).Dot(nrm)
			if math.Abs(sd) < math.Abs(bestD) {
				bestD, bestN, found = sd, nrm, true
			}
		}
		if !found {
			continue
		}
		r := q.Sub(c)
		// A turn w about c moves q by w·(−r.Y, r.X).
		os = append(os, obs{nrm: bestN, arm: bestN.X*-r.Y + bestN.Y*r.X, dist: bestD})
	}
	if len(os) < 4*minPoints {
		return geometry.Point{}, 0, 0, false
	}
	var sol [3]float64
	var se float64
	keep := make([]bool, len(os))
	for i := range keep {
		keep[i] = true
	}
	for round := 0; round < 2; round++ {
		var A [3][3]float64
		var y [3]float64
		cnt := 0
		for i, o := range os {
			if !keep[i] {
				continue
			}
			row := [3]float64{o.nrm.X, o.nrm.Y, o.arm}
			for r := 0; r < 3; r++ {
				for s := 0; s < 3; s++ {
					A[r][s] += row[r] * row[s]
				}
				y[r] += row[r] * o.dist
			}
			cnt++
		}
		inv, ok := invert3(A)
		if !ok || cnt < 4*minPoints {
			return geometry.Point{}, 0, 0, false
		}
		for r := 0; r < 3; r++ {
			sol[r] = inv[r][0]*y[0] + inv[r][1]*y[1] + inv[r][2]*y[2]
		}
		res := make([]float64, 0, len(os))
		ss := 0.0
		for i, o := range os {
			e := o.dist - (o.nrm.X*sol[0] + o.nrm.Y*sol[1] + o.arm*sol[2])
			if keep[i] {
				ss += e * e
			}
			res = append(res, math.Abs(e))
		}
		s2 := ss / float64(cnt-3)
		se = math.Sqrt(s2 * (inv[0][0] + inv[1][1]))
		cut := 4 * 1.4826 * median(slices.Clone(res))
		for i, e := range res {
			keep[i] = e <= cut
		}
	}
	return geometry.Point{X: sol[0], Y: sol[1]}, sol[2], se, true
}

// invert3 inverts a symmetric 3×3 matrix; false when it is singular.
func invert3(a [3][3]float64) ([3][3]float64, bool) {
	var inv [3][3]float64
	det := a[0][0]*(a[1][1]*a[2][2]-a[1][2]*a[2][1]) - a[0][1]*(a[1][0]*a[2][2]-a[1][2]*a[2][0]) + a[0][2]*(a[1][0]*a[2][1]-a[1][1]*a[2][0])
	scale := math.Abs(a[0][0]*a[1][1]*a[2][2]) + 1e-300
	if !(math.Abs(det) > 1e-12*scale) {
		return inv, false
	}
	inv[0][0] = (a[1][1]*a[2][2] - a[1][2]*a[2][1]) / det
	inv[0][1] = (a[0][2]*a[2][1] - a[0][1]*a[2][2]) / det
	inv[0][2] = (a[0][1]*a[1][2] - a[0][2]*a[1][1]) / det
	inv[1][0] = (a[1][2]*a[2][0] - a[1][0]*a[2][2]) / det
	inv[1][1] = (a[0][0]*a[2][2] - a[0][2]*a[2][0]) / det
	inv[1][2] = (a[0][2]*a[1][0] - a[0][0]*a[1][2]) / det
	inv[2][0] = (a[1][0]*a[2][1] - a[1][1]*a[2][0]) / det
	inv[2][1] = (a[0][1]*a[2][0] - a[0][0]*a[2][1]) / det
	inv[2][2] = (a[0][0]*a[1][1] - a[0][1]*a[1][0]) / det
	return inv, true
}

// centroid is the mean of the points.
func centroid(p []geometry.Point) geometry.Point {
	var c geometry.Point
	for _, q := range p {
		c = c.Add(q)
	}
	return c.Scale(1 / float64(len(p)))
}
