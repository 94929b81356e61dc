package align

import (
	"math"
	"math/rand/v2"
	"sort"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// polygon is a closed counter-clockwise polygon: an outline whose nearest
// points are exact, for testing the fits.
type polygon []geometry.Point

func (pg polygon) Nearest(p geometry.Point) Foot {
	best := Foot{Distance: math.Inf(1)}
	bestAbs := math.Inf(1)
	n := len(pg)
	for i := range n {
		a, b := pg[i], pg[(i+1)%n]
		e := b.Sub(a)
		t := p.Sub(a).Dot(e) / e.Dot(e)
		corner := t <= 0 || t >= 1
		t = min(max(t, 0), 1)
		q := a.Add(e.Scale(t))
		d := p.Dist(q)
		if d >= bestAbs {
			continue
		}
		out := geometry.Point{X: e.Y, Y: -e.X}.Scale(1 / e.Norm())
		nrm := out
		if corner && d > 0 {
			nrm = p.Sub(q).Scale(1 / d)
		}
		sign := 1.0
		if !inside(pg, p) {
			sign = 1
		} else {
			sign = -1
		}
		if corner && d > 0 && sign < 0 {
			nrm = nrm.Scale(-1)
		}
		bestAbs = d
		best = Foot{Point: q, Normal: nrm, Distance: sign * d, Position: float64(i) + t}
	}
	return best
}

// inside reports whether p is inside the polygon (even-odd rule).
func inside(pg polygon, p geometry.Point) bool {
	in := false
	n := len(pg)
	for i, j := 0, n-1; i < n; j, i = i, i+1 {
		a, b := pg[i], pg[j]
		if (a.Y > p.Y) != (b.Y > p.Y) && p.X < (b.X-a.X)*(p.Y-a.Y)/(b.Y-a.Y)+a.X {
			in = !in
		}
	}
	return in
}

// lens is an irregular, lens-like polygon about 1 long: no symmetry, so
// every motion shows.
func lens() polygon {
	var pg polygon
	const n = 36
	for k := range n {
		th := 2 * math.Pi * float64(k) / n
		r := 0.5 + 0.08*math.Cos(3*th+0.4)
		pg = append(pg, geometry.Point{X: 0.5 + r*math.Cos(th), Y: 0.12*math.Sin(th) + 0.03*math.Sin(2*th) + 0.01*r*math.Cos(th)})
	}
	return pg
}

// samples returns n points spread along the polygon's edges.
func samples(pg polygon, n int, rng *rand.Rand) []geometry.Point {
	var out []geometry.Point
	for range n {
		i := rng.IntN(len(pg))
		t := 0.05 + 0.9*rng.Float64()
		a, b := pg[i], pg[(i+1)%len(pg)]
		out = append(out, a.Add(b.Sub(a).Scale(t)))
	}
	return out
}

// TestLeastSquaresRecoversMotion: points on a moved copy of the outline
// come back by the exact inverse motion (an exact statement: the sum of
// squares is zero there and nowhere else near).
func TestLeastSquaresRecoversMotion(t *testing.T) {
	pg := lens()
	rng := rand.New(rand.NewPCG(1, 2))
	pts := samples(pg, 80, rng)
	for _, tc := range []struct {
		name  string
		truth Motion
		scale bool
	}{
		{"rigid", Motion{Angle: 0.07, Scale: 1, Shift: geometry.Point{X: 0.03, Y: -0.02}}, false},
		{"scaled", Motion{Angle: -0.05, Scale: 1.02, Shift: geometry.Point{X: -0.01, Y: 0.015}}, true},
		{"mirrored", Motion{Angle: 3.1, Scale: 1, Shift: geometry.Point{X: 1.2, Y: 0.1}, Mirror: true}, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			// Measured points: the truth's inverse applied to points of
			// the outline, so that the truth maps them back on it.
			inv := inverse(tc.truth)
			meas := make([]geometry.Point, len(pts))
			for i, p := range pts {
				meas[i] = inv.Apply(p)
			}
			start := Motion{Scale: 1, Mirror: tc.truth.Mirror, Angle: tc.truth.Angle + 0.02, Shift: tc.truth.Shift.Add(geometry.Point{X: 0.01})}
			if tc.scale {
				start.Scale = 1
			}
			res, err := LeastSquares(pg, meas, start, Options{Scale: tc.scale})
			if err != nil {
				t.Fatal(err)
			}
			if !res.Converged || res.Objective > 1e-12 {
				t.Errorf("converged %v after %d, rms %g", res.Converged, res.Iterations, res.Objective)
			}
			if d := math.Abs(res.Motion.Angle - tc.truth.Angle); d > 1e-11 {
				t.Errorf("angle off by %g rad", d)
			}
			if d := res.Motion.Shift.Dist(tc.truth.Shift); d > 1e-11 {
				t.Errorf("shift off by %g", d)
			}
			if d := math.Abs(res.Motion.Scale - tc.truth.Scale); d > 1e-11 {
				t.Errorf("scale %.15g, want %.15g", res.Motion.Scale, tc.truth.Scale)
			}
		})
	}
}

func inverse(m Motion) Motion {
	a := m.Matrix()
	det := a[0][0]*a[1][1] - a[0][1]*a[1][0]
	inv := [2][2]float64{{a[1][1] / det, -a[0][1] / det}, {-a[1][0] / det, a[0][0] / det}}
	b := geometry.Point{X: -(inv[0][0]*m.Shift.X + inv[0][1]*m.Shift.Y), Y: -(inv[1][0]*m.Shift.X + inv[1][1]*m.Shift.Y)}
	return FromMatrix(inv, b)
}

func TestMotionMatrixRoundTrip(t *testing.T) {
	for _, m := range []Motion{
		{Angle: 0.3, Scale: 2, Shift: geometry.Point{X: 1, Y: -2}},
		{Angle: -2.9, Scale: 0.5, Shift: geometry.Point{X: 3}, Mirror: true},
	} {
		got := FromMatrix(m.Matrix(), m.Shift)
		q := geometry.Point{X: 0.7, Y: -0.4}
		if d := got.Apply(q).Dist(m.Apply(q)); d > 1e-14 || got.Mirror != m.Mirror {
			t.Errorf("%+v: round trip %+v moves points by %g", m, got, d)
		}
	}
}

// zoneBrute returns the least largest band use over rigid motions in a box
// about m by exhaustive search: a grid of (angle, shift x, shift y) over
// the box, then grids about each of the best few nodes, five times over at
// finer spacing. A brute-force check.
func zoneBrute(o Outline, pts []geometry.Point, bands []Band, m Motion, half [3]float64) float64 {
	type node struct {
		m Motion
		f float64
	}
	use := func(c Motion, cut float64) float64 {
		f := 0.0
		for i, p := range pts {
			f = max(f, bands[i].Use(o.Nearest(c.Apply(p)).Distance))
			if f >= cut {
				break
			}
		}
		return f
	}
	cands := []node{{m, use(m, math.Inf(1))}}
	steps := 16
	for range 6 {
		var next []node
		for _, cand := range cands {
			for a := -steps; a <= steps; a++ {
				for x := -steps; x <= steps; x++ {
					for y := -steps; y <= steps; y++ {
						c := cand.m
						c.Angle += half[0] * float64(a) / float64(steps)
						c.Shift.X += half[1] * float64(x) / float64(steps)
						c.Shift.Y += half[2] * float64(y) / float64(steps)
						// Keep the best few: a node only counts if it beats
						// the worst of them.
						cut := math.Inf(1)
						if len(next) == 4 {
							cut = next[3].f
						}
						if f := use(c, cut); f < cut {
							next = append(next, node{c, f})
							sort.Slice(next, func(i, j int) bool { return next[i].f < next[j].f })
							if len(next) > 4 {
								next = next[:4]
							}
						}
					}
				}
			}
		}
		cands = next
		for k := range half {
			half[k] *= 2.0 / float64(steps)
		}
		steps = 6
	}
	return cands[0].f
}

// TestMinimumZoneAgainstBruteForce compares the zone fit with a
// brute-force grid search over rigid motions on small cases: the search
// must not find a placement with a smaller largest use (to 1e-9), and
// comes within 0.1 % of the fit's value (the grid cannot follow the narrow
// valleys of a largest-value objective further).
func TestMinimumZoneAgainstBruteForce(t *testing.T) {
	pg := lens()
	rng := rand.New(rand.NewPCG(7, 11))
	trials := 3
	if testing.Short() {
		trials = 1
	}
	for trial := range trials {
		pts := samples(pg, 12, rng)
		bands := make([]Band, len(pts))
		for i := range pts {
			// Points pushed off the outline by up to 0.01 along y, with a
			// tighter band on the first few (a zone of their own).
			pts[i].Y += 0.01 * (2*rng.Float64() - 1)
			bands[i] = Band{Half: 0.01}
			if i < 3 {
				bands[i] = Band{Centre: 0.002, Half: 0.004}
			}
		}
		ls, err := LeastSquares(pg, pts, Identity(), Options{})
		if err != nil {
			t.Fatal(err)
		}
		mz, err := MinimumZone(pg, pts, bands, ls.Motion, Options{})
		if err != nil {
			t.Fatal(err)
		}
		brute := zoneBrute(pg, pts, bands, ls.Motion, [3]float64{0.02, 0.01, 0.01})
		fls := 0.0
		for i, f := range ls.Feet {
			fls = max(fls, bands[i].Use(f.Distance))
		}
		t.Logf("trial %d: least squares %.6f, zone fit %.9f (%d steps), brute force %.9f", trial, fls, mz.Objective, mz.Iterations, brute)
		if !mz.Converged {
			t.Errorf("trial %d: zone fit did not converge", trial)
		}
		if brute < mz.Objective-1e-9 {
			t.Errorf("trial %d: brute force found %.9f below the zone fit's %.9f", trial, brute, mz.Objective)
		}
		if brute > mz.Objective*(1+1e-3) {
			t.Errorf("trial %d: brute force %.9f, zone fit %.9f: too far apart for the grid", trial, brute, mz.Objective)
		}
		if mz.Objective > fls+1e-12 {
			t.Errorf("trial %d: zone fit %.9f worse than its least-squares start %.9f", trial, mz.Objective, fls)
		}
	}
}

func TestMinimumZoneExactFit(t *testing.T) {
	// Points on the outline: the zone is empty (F = 0) at once.
	pg := lens()
	pts := samples(pg, 30, rand.New(rand.NewPCG(3, 3)))
	res, err := MinimumZone(pg, pts, nil, Identity(), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if res.Objective > 1e-15 || !res.Converged {
		t.Errorf("F = %g, converged %v", res.Objective, res.Converged)
	}
}
