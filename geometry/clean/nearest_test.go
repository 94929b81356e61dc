package clean

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// nearestClosure is nearest as it was written before nearestIn: each
// cell visited by a closure over the count. The reference of
// TestNearestMatchesClosure.
func nearestClosure(g *grid, pts []geometry.Point, self int32, nbr []int32, d2s []float64) {
	k := len(nbr)
	cnt := 0
	p := pts[self]
	ix, iy := g.cell(p)
	visit := func(cx, cy int64) {
		for _, q := range g.at(cx, cy) {
			if q == self {
				continue
			}
			dx, dy := pts[q].X-p.X, pts[q].Y-p.Y
			d2 := dx*dx + dy*dy
			if cnt == k && d2 >= d2s[k-1] {
				continue
			}
			j := min(cnt, k-1)
			for j > 0 && d2s[j-1] > d2 {
				d2s[j], nbr[j] = d2s[j-1], nbr[j-1]
				j--
			}
			d2s[j], nbr[j] = d2, q
			if cnt < k {
				cnt++
			}
		}
	}
	for r := int64(0); r <= maxRing; r++ {
		if r == 0 {
			visit(ix, iy)
		} else {
			for dx := -r; dx <= r; dx++ {
				visit(ix+dx, iy-r)
				visit(ix+dx, iy+r)
			}
			for dy := -r + 1; dy <= r-1; dy++ {
				visit(ix-r, iy+dy)
				visit(ix+r, iy+dy)
			}
		}
		if reach := float64(r) * g.h; cnt == k && d2s[k-1] <= reach*reach {
			break
		}
	}
	for j := cnt; j < k; j++ {
		nbr[j] = -1
	}
}

func TestNearestMatchesClosure(t *testing.T) {
	// A noisy outline with duplicates (ties), a far outlier (beyond the
	// rings: fewer than k found) and a few stragglers: nearest finds the
	// same neighbours in the same order as the closure form it replaced,
	// and on the dense outline the k truly nearest (brute force).
	rng := rand.New(rand.NewPCG(3, 9))
	var pts []geometry.Point
	for i := range 3000 {
		th := 2 * math.Pi * float64(i) / 3000
		pts = append(pts, geometry.Point{X: math.Cos(th) + 1e-3*rng.NormFloat64(), Y: 0.12*math.Sin(th) + 1e-3*rng.NormFloat64()})
	}
	pts = append(pts, pts[10], pts[10], pts[2000]) // exact duplicates
	pts = append(pts, geometry.Point{X: 40, Y: 40}, geometry.Point{X: 0, Y: 0.5}, geometry.Point{X: 0.01, Y: 0.52})
	// A lattice, whose points have neighbours at equal distances in
	// different cells: the order of ties is the order cells are visited.
	for a := range 12 {
		for b := range 12 {
			pts = append(pts, geometry.Point{X: 2 + 0.0025*float64(a), Y: 0.25 * float64(b) / 64})
		}
	}
	lo, hi := bounds(pts)
	const k = knnK
	for _, h := range []float64{0.002, 0.01, 0.5} {
		g := newGrid(pts, nil, h, lo, hi)
		got, want := make([]int32, k), make([]int32, k)
		d2a, d2b := make([]float64, k), make([]float64, k)
		short := 0
		for i := range pts {
			nearest(g, pts, int32(i), got, d2a)
			nearestClosure(g, pts, int32(i), want, d2b)
			if !slices.Equal(got, want) || !slices.Equal(d2a, d2b) {
				t.Fatalf("cell %g, point %d: nearest %v, the closure form %v", h, i, got, want)
			}
			if slices.Contains(got, -1) {
				short++
			}
		}
		if h == 0.01 {
			// The dense outline's points: the k nearest by brute force
			// (distances compared, as ties may come in either order).
			for i := 0; i < 3000; i += 7 {
				nearest(g, pts, int32(i), got, d2a)
				var all []float64
				for j, q := range pts {
					if j != i {
						dx, dy := q.X-pts[i].X, q.Y-pts[i].Y
						all = append(all, dx*dx+dy*dy)
					}
				}
				slices.Sort(all)
				if !slices.Equal(d2a, all[:k]) {
					t.Fatalf("point %d: squared distances %v, brute force %v", i, d2a, all[:k])
				}
			}
		}
		if h == 0.002 && short == 0 {
			t.Errorf("cell %g: no query fell short of %d neighbours; the far outlier should", h, k)
		}
	}
}
