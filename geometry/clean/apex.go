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
//     or it is one point on a straight face with the dropped points
//     (see onFace).
//
// The run is dropped with the outliers, its neighbours close up, and the
// test runs again on the loop without it (a run of three may hide behind
// one of two), its company still the outliers only. When it would drop more
// than apexMost points in all, the loop itself runs astray among its
// outliers (an ordering that zigzags between the surfaces at a thin nose,
// say), and the test drops none: that is for the gates to judge.
//
// Clean runs the test twice: on the loop of the ordering, among its
// outliers, and on the loop after the end model's outliers, among those
// too, with faceOnly (see apexes). A face below the section that the
// loop follows instead of the surface (the surface's own points dropped
// as the outliers) is not caught: such a loop often fails a gate.

// Constants of the apex test (common practice: a fixture's run is a few
// points, its company the rest of the run).
const (
	apexRun     = 3
	apexStep    = 3.0
	apexCompany = 2
	apexMost    = 2 * apexRun
	// apexApart is the least step, in diagonals of the loop's bounding
	// box (about a chord), from a point on a face to its loop neighbours
	// after the end model's outliers: a face nearer the edge than that
	// cannot be told from the edge's own base.
	apexApart = 0.01
)

// apexes returns the loop seq without the runs of points that stand among
// the dropped points hits as apexes (see the apex test), and those points
// as hits, in the order found. It leaves seq unchanged and returns no hits
// when the loop has fewer than 4·minPoints points.
//
// With faceOnly, only single points on a face (onFace) at least apexApart
// of the loop's size from their neighbours count: the end model's
// outliers, which the test then runs among, can be good points of the
// edge itself (a tip or a base it took for glitches), round which the
// edge's other points stand as closely as a fixture's do.
func apexes(pts []geometry.Point, seq []int32, hits []hit, scale float64, faceOnly bool) ([]int32, []hit) {
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
	lo, hi := bounds(loopPoints(pts, seq))
	size := hi.Dist(lo)
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
				if faceOnly && short < apexApart*size {
					continue
				}
				crowded := !faceOnly && short >= apexStep*step && company(pts, run, dropped, short) >= apexCompany
				if !crowded && !onFace(pts, seq, run, a, b, dropped, scale) {
					continue
				}
				if inside(pts, seq, k, r) {
					continue
				}
				for _, i := range run {
					d := geometry.SegmentDist(pts[i], a, b)
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
		if geometry.SegmentDist(pts[i], a, b) <= d {
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

// onFace reports whether the run is one point p that lies between two of
// the dropped points, or ends the face they make, on the line through
// them: within a tenth of p's distance h from the segment ab (and at least
// 3 robust scales, when that is below a third of h), the two within 2h of
// p, their line across the spike from the middle of ab to p with none of
// the other such points behind it (see straddled), and each at least half
// p's shorter step from every other loop point (see detached). Such points
// are a straight face of the fixture, standing apart, across which the
// loop reaches for p. A longer run is no face by this test: a few
// stations of a sparsely probed nose, between two outliers, lie as nearly
// on a line.
func onFace(pts []geometry.Point, seq, run []int32, a, b geometry.Point, dropped []geometry.Point, scale float64) bool {
	if len(run) != 1 {
		return false
	}
	p := pts[run[0]]
	h := geometry.SegmentDist(p, a, b)
	tol := max(h/10, 3*scale)
	if tol >= h/3 {
		return false
	}
	// The face stands apart from the loop, as p does: each of its points
	// at least half p's shorter step from every other loop point. The
	// dropped points of a blunt base, which the end model took for
	// outliers, reach the surfaces' ends.
	apart := math.Min(p.Dist(a), p.Dist(b)) / 2
	var near []geometry.Point
	for _, q := range dropped {
		if d := q.Dist(p); d > 0 && d <= 2*h && detached(pts, seq, run[0], q, apart) {
			near = append(near, q)
		}
	}
	return straddled(p, a, b, near, tol)
}

// loopPoints returns the points of the loop seq.
func loopPoints(pts []geometry.Point, seq []int32) []geometry.Point {
	out := make([]geometry.Point, len(seq))
	for k, i := range seq {
		out[k] = pts[i]
	}
	return out
}

// detached reports whether q lies at least d from every point of the loop
// seq but skip.
func detached(pts []geometry.Point, seq []int32, skip int32, q geometry.Point, d float64) bool {
	for _, j := range seq {
		if j != skip && pts[j].Dist(q) < d {
			return false
		}
	}
	return true
}

// straddled reports whether two points of near lie on either side of p,
// or on one side within their own distance of it (p ends the face), with
// p within tol of the line through them, that line across the spike from
// the middle of the segment ab to p (at more than 60° to it), and no other
// point of near behind that line (see behind): a face the loop reaches
// across for p, not points of a section that runs on along the spike (a
// thin edge's own points, say, about its tip).
func straddled(p, a, b geometry.Point, near []geometry.Point, tol float64) bool {
	spike := p.Sub(a.Add(b).Scale(0.5))
	ls := math.Hypot(spike.X, spike.Y)
	for x, q1 := range near {
		for y, q2 := range near[x+1:] {
			u, v := q1.Sub(p), q2.Sub(p)
			d := q2.Sub(q1)
			l := math.Hypot(d.X, d.Y)
			if u.Dot(v) >= 0 && min(u.Dot(u), v.Dot(v)) > l*l {
				continue // not between them, nor one of their steps beyond
			}
			if l == 0 || math.Abs(d.X*u.Y-d.Y*u.X)/l > tol {
				continue
			}
			if ls > 0 && math.Abs(d.Dot(spike)) > 0.5*l*ls {
				continue
			}
			if behind(p, a, b, q1, q2, near, x, x+1+y, tol) {
				continue
			}
			return true
		}
	}
	return false
}

// behind reports whether a point of near but the face's own two (at
// positions i and j) lies behind the face line through q1 and q2, between
// it and the loop's segment ab, more than tol from both: in the gap that
// parts a fixture from the part. A fixture's face stands off the part
// across that gap, which holds none of its points; a rounded tip's apex,
// which the loop reaches in a spike where the end model took the tip's
// other points for outliers, has those points there, on the curve from the
// loop's ends to the apex, curving away from its tangent (campaign 1455,
// 5569: tips of radius 0.7–0.9 % of the chord).
func behind(p, a, b, q1, q2 geometry.Point, near []geometry.Point, i, j int, tol float64) bool {
	face := q2.Sub(q1)
	lf := math.Hypot(face.X, face.Y)
	base := b.Sub(a)
	lb := math.Hypot(base.X, base.Y)
	if lf == 0 || lb == 0 {
		return false
	}
	// Signed distances: from the face line, positive towards the middle of
	// ab (the part's side); from ab, positive towards p.
	mid := a.Add(b).Scale(0.5)
	side := face.Cross(mid.Sub(q1))
	if side == 0 {
		return false
	}
	up := base.Cross(p.Sub(a))
	if up == 0 {
		return false
	}
	for k, q := range near {
		if k == i || k == j {
			continue
		}
		df := face.Cross(q.Sub(q1)) / lf
		db := base.Cross(q.Sub(a)) / lb
		if side < 0 {
			df = -df
		}
		if up < 0 {
			db = -db
		}
		if df > tol && db > tol {
			return true
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
