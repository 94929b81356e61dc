package curve

import (
	"math"
	"math/rand/v2"
	"slices"
	"sort"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// farthestEvery and projectScanEvery are the sample scans of Farthest and
// Project as they were before the squared-distance prefilter: every
// sample's distance by Hypot.
func farthestEvery(cv *Curve, p geometry.Point) (int, float64, float64) {
	bestI, bestU, bestD := -1, 0.0, -1.0
	for i := 0; i < cv.Pieces(); i++ {
		for _, f := range [...]float64{0, 0.25, 0.5, 0.75} {
			u := f * cv.Span(i)
			q, _, _ := cv.Eval(i, u)
			if d := q.Dist(p); d > bestD {
				bestI, bestU, bestD = i, u, d
			}
		}
	}
	return bestI, bestU, bestD
}

func projectScanEvery(c *Curve, p geometry.Point) (int, float64, float64) {
	bi, bu, bd := 0, 0.0, math.Inf(1)
	for i := range c.xs {
		for _, f := range [...]float64{0, 0.5} {
			u := f * c.Span(i)
			q, _, _ := c.Eval(i, u)
			if d := q.Dist(p); d < bd {
				bi, bu, bd = i, u, d
			}
		}
	}
	return bi, bu, bd
}

// TestPrefilterKeepsChoice checks that PointAt is Eval's point to the bit
// and that the squared-distance tests (nearerThan, fartherThan) never
// skip a sample that would have been taken: the prefiltered scans pick
// the same sample, at the same distance, as scans measuring every
// sample, on closed and open curves through noisy points, at coordinates
// offset far from zero, from points near the curve, far from it and on a
// knot.
func TestPrefilterKeepsChoice(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	for trial := range 40 {
		n := 20 + rng.IntN(300)
		off := []float64{0, 1e3, 1e7}[trial%3]
		pts := make([]geometry.Point, n)
		for k := range pts {
			a := 2 * math.Pi * float64(k) / float64(n)
			pts[k] = geometry.Point{X: off + math.Cos(a) + 1e-3*rng.NormFloat64(), Y: -off + 0.2*math.Sin(a) + 1e-3*rng.NormFloat64()}
		}
		cv := Interpolate(pts, trial%2 == 0)
		for i := 0; i < cv.Pieces(); i++ {
			u := rng.Float64() * cv.Span(i)
			p, _, _ := cv.Eval(i, u)
			if q := cv.PointAt(i, u); math.Float64bits(q.X) != math.Float64bits(p.X) || math.Float64bits(q.Y) != math.Float64bits(p.Y) {
				t.Fatalf("PointAt(%d, %g) = %v, Eval's point %v", i, u, q, p)
			}
		}
		for k := range 60 {
			var p geometry.Point
			switch k % 3 {
			case 0:
				p = pts[rng.IntN(n)]
			case 1:
				p = pts[rng.IntN(n)].Add(geometry.Point{X: 1e-6 * rng.NormFloat64(), Y: 1e-6 * rng.NormFloat64()})
			default:
				p = geometry.Point{X: off + 3*rng.NormFloat64(), Y: -off + 3*rng.NormFloat64()}
			}
			// Farthest over the whole curve measures arc length only for
			// the best sample: the same sample gives the same answer.
			wi, wu, wd := farthestEvery(cv, p)
			s, d := cv.Farthest(p, 0, cv.Length())
			q, _, _ := cv.Eval(wi, wu)
			if !(d >= wd) || (d == wd && s != cv.arc(wi, wu)) || q.Dist(p) != wd {
				t.Fatalf("trial %d: Farthest from %v: s %v d %v; every sample: piece %d u %v d %v", trial, p, s, d, wi, wu, wd)
			}
			bi, bu, bd := projectScanEvery(cv, p)
			gs, gd := cv.Project(p)
			ws, wdist := projectFrom(cv, p, bi, bu, bd)
			if gs != ws || gd != wdist {
				t.Fatalf("trial %d: Project(%v) = %v, %v; from every sample %v, %v", trial, p, gs, gd, ws, wdist)
			}
		}
	}
}

// projectFrom is the refinement of Project from the scan's best sample
// (bi, bu) at distance bd.
func projectFrom(c *Curve, p geometry.Point, bi int, bu, bd float64) (float64, float64) {
	np := len(c.xs)
	if e := c.End(); e.Dist(p) < bd {
		bi, bu, bd = np-1, c.Span(np-1), e.Dist(p)
	}
	starts := [][2]float64{{float64(bi), bu}, {float64(bi), 0}, {float64(bi), c.Span(bi)}}
	if bi > 0 {
		starts = append(starts, [2]float64{float64(bi - 1), c.Span(bi-1) / 2})
	}
	if bi < np-1 {
		starts = append(starts, [2]float64{float64(bi + 1), c.Span(bi+1) / 2})
	}
	fi, fu, fd := bi, bu, bd
	for _, st := range starts {
		if i, u, d := c.ProjectFrom(p, int(st[0]), st[1]); d < fd {
			fi, fu, fd = i, u, d
		}
	}
	return c.arc(fi, fu), fd
}

// TestSearchesMatchSort checks searchAtLeast and searchAfter against the
// sort package's searches they stand for, on sorted tables with repeats,
// at and between their values, beyond both ends and at NaN.
func TestSearchesMatchSort(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := range 200 {
		a := make([]float64, trial%37)
		for k := range a {
			a[k] = math.Floor(rng.Float64() * 20)
		}
		slices.Sort(a)
		for _, x := range []float64{-1, 0, 0.5, 3, 7.25, 19, 20, 25, math.NaN(), math.Inf(1)} {
			if got, want := searchAtLeast(a, x), sort.SearchFloat64s(a, x); got != want {
				t.Fatalf("searchAtLeast(%v, %v) = %d, sort gives %d", a, x, got, want)
			}
			if got, want := searchAfter(a, x), sort.Search(len(a), func(j int) bool { return a[j] > x }); got != want {
				t.Fatalf("searchAfter(%v, %v) = %d, sort gives %d", a, x, got, want)
			}
		}
	}
}
