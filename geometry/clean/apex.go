package clean

import (
	"math"
	"slices"

	"github.com/foilwright/foilwright/geometry"
)

// The apex test. A fixture beside the part (a clamp's jaw face, a vice, a
// stop block) leaves a short straight run of points off the outline, and
// so does a probe that slid off the part along it. The outlier tests drop
// most of such a run, but one or two of its points can stay in the loop:
// the one nearest the outline's own line, say the middle point of a jaw
// face square to the chord a few per cent beyond the trailing edge, which
// the loop then reaches in a spike, lengthening the chord by the jaw's
// distance. Such a point is known by what surrounds it: the outliers lie
// close about it, closer than either of its neighbours along the loop,
// which it reaches in long steps, out of line with them. A point of the
// outline, even at a sharp trailing edge or on a coarsely sampled
// stretch, has its closest company on the outline.
//
// A run of one to apexRun points of the loop, between the loop points a
// and b, is an apex among outliers when
//
//   - each of its points lies off the segment ab by more than half the
//     shorter step (it stands out of the outline's line, like a spike);
//   - it lies outside the loop without it (a fixture stands outside the
//     part; see inside);
//   - and either the steps are both at least apexStep times the loop's
//     median step and at least apexCompany dropped points (outliers or
//     strays) lie nearer to one of its points than the shorter of them,
//     or each of its points lies on a straight face with the dropped
//     points (see onFace).
//
// The run is dropped with the outliers, its neighbours close up, and the
// test runs again on the loop without it (a run of three may hide behind
// one of two), its company still the outliers only. When it would drop more
// than apexMost points in all, the loop itself runs astray among its
// outliers (an ordering that zigzags between the surfaces at a thin nose,
// say), and the test drops none: that is for the gates to judge.

// Constants of the apex test (common practice: a fixture's run is a few
// points, its company the rest of the run).
const (
	apexRun     = 3
	apexStep    = 3.0
	apexCompany = 2
	apexMost    = 2 * apexRun
)

// apexes returns the loop seq without the runs of points that stand among
// the dropped points hits as apexes (see the apex test), and those points
// as hits, in the order found. It leaves seq unchanged and returns no hits
// when the loop has fewer than 4·minPoints points.
func apexes(pts []geometry.Point, seq []int32, hits []hit, scale float64) ([]int32, []hit) {
	if len(seq) < 4*minPoints || len(hits) < apexCompany {
		return seq, nil
	}
	dropped := make([]geometry.Point, 0, len(hits))
	for _, h := range hits {
		if !h.kept {
			dropped = append(dropped, pts[h.idx])
		}
	}
	if len(dropped) < apexCompany {
		return seq, nil
	}
	steps := make([]float64, len(seq))
	for k := range seq {
		steps[k] = pts[seq[k]].Dist(pts[seq[(k+1)%len(seq)]])
	}
	step := median(steps)
	if !(step > 0) {
		return seq, nil
	}
	var out []hit
	orig := seq
	seq = slices.Clone(seq)
	var buf [apexRun]int32
	for changed := true; changed && len(seq) > 4*minPoints; {
		changed = false
		n := len(seq)
		for k := 0; k < n && !changed; k++ {
			for r := 1; r <= apexRun; r++ {
				run := buf[:r]
				for j := range r {
					run[j] = seq[(k+j)%n]
				}
				a, b := pts[seq[(k-1+n)%n]], pts[seq[(k+r)%n]]
				in, outStep := a.Dist(pts[run[0]]), pts[run[r-1]].Dist(b)
				short := math.Min(in, outStep)
				if !standsOut(pts, run, a, b, short/2) {
					continue
				}
				crowded := short >= apexStep*step && company(pts, run, dropped, short) >= apexCompany
				if !crowded && !onFace(pts, run, a, b, dropped, scale) {
					continue
				}
				if inside(pts, seq, k, r) {
					continue
				}
				for _, i := range run {
					d := segmentDist(pts[i], a, b)
					sg := 0.0
					if scale > 0 {
						sg = d / scale
					}
					out = append(out, hit{idx: i, reason: "outlier", dist: d, sigmas: sg})
				}
				gone := make(map[int32]bool, r)
				for _, i := range run {
					gone[i] = true
				}
				seq = slices.DeleteFunc(seq, func(i int32) bool { return gone[i] })
				changed = true
				break
			}
		}
	}
	if len(out) > apexMost {
		// More than a fixture's few: the loop itself runs astray among
		// its outliers, which is for the gates to judge, not this test.
		return orig, nil
	}
	return seq, out
}

// standsOut reports whether every point of run lies farther than d from
// the segment ab.
func standsOut(pts []geometry.Point, run []int32, a, b geometry.Point, d float64) bool {
	for _, i := range run {
		if segmentDist(pts[i], a, b) <= d {
			return false
		}
	}
	return true
}

// inside reports whether a point of the run of r points of the loop seq
// from position k lies inside the loop without the run (crossing
// number): a fixture stands outside the part, so a run the loop reaches
// inwards is the part's own, taken for a fixture where the loop has run
// astray along one.
func inside(pts []geometry.Point, seq []int32, k, r int) bool {
	n := len(seq)
	for j := range r {
		p := pts[seq[(k+j)%n]]
		in := false
		prev := pts[seq[(k-1+n)%n]]
		for m := r; m < n; m++ {
			q := pts[seq[(k+m)%n]]
			if (q.Y > p.Y) != (prev.Y > p.Y) && p.X < prev.X+(q.X-prev.X)*(p.Y-prev.Y)/(q.Y-prev.Y) {
				in = !in
			}
			prev = q
		}
		if in {
			return true
		}
	}
	return false
}

// onFace reports whether every point p of run lies between two others of
// the dropped points and the run, on the line through them: within a tenth
// of p's distance h from the segment ab (and at least 3 robust scales,
// when that is below a third of h), the two within 2h of p and on either
// side of it. Such points are a straight face of the fixture, across
// which the loop reaches for p.
func onFace(pts []geometry.Point, run []int32, a, b geometry.Point, dropped []geometry.Point, scale float64) bool {
	for _, i := range run {
		p := pts[i]
		h := segmentDist(p, a, b)
		tol := max(h/10, 3*scale)
		if tol >= h/3 {
			return false
		}
		var near []geometry.Point
		for _, q := range dropped {
			if d := q.Dist(p); d > 0 && d <= 2*h {
				near = append(near, q)
			}
		}
		for _, j := range run {
			if j != i && pts[j].Dist(p) <= 2*h {
				near = append(near, pts[j])
			}
		}
		if !straddled(p, near, tol) {
			return false
		}
	}
	return true
}

// straddled reports whether two points of near lie on either side of p
// with p within tol of the line through them.
func straddled(p geometry.Point, near []geometry.Point, tol float64) bool {
	for x, q1 := range near {
		for _, q2 := range near[x+1:] {
			u, v := q1.Sub(p), q2.Sub(p)
			if u.Dot(v) >= 0 {
				continue
			}
			d := q2.Sub(q1)
			l := math.Hypot(d.X, d.Y)
			if l > 0 && math.Abs(d.X*u.Y-d.Y*u.X)/l <= tol {
				return true
			}
		}
	}
	return false
}

// company counts the points of dropped within d of a point of run.
func company(pts []geometry.Point, run []int32, dropped []geometry.Point, d float64) int {
	c := 0
	for _, q := range dropped {
		for _, i := range run {
			if pts[i].Dist(q) < d {
				c++
				break
			}
		}
	}
	return c
}
