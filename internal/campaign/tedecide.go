package campaign

import (
	"math"
	"sort"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/scangen"
)

// teUndecidable reports whether the good points of a case cannot tell
// the true kind of its trailing edge from another at their sampling, and
// how many of them lie on the true end piece (a blunt base or a rounded
// end; 0 for a sharp edge). The generator labels an end by how it built
// it, whatever the sampling; these cases are counted apart rather than
// as right or wrong:
//
//   - a rounded end with fewer than three good points on its arc: a
//     circle tangent to both surfaces and a straight base through one or
//     two points fit them alike (an arc whose radius is below the spacing
//     there holds at most two);
//   - a blunt end with no good point on its base whose sharp rival (the
//     surfaces carried on along their end tangents to where they meet)
//     leaves no gap round the end that the spacing of the points rules
//     out (teGapPlausible), or one of whose surfaces stops short of its
//     end corner by more than such a gap (the end lies in a stretch the
//     measurement missed: no sample of the end at all).
//
// A sharp edge is never undecidable: its corner follows from the surfaces
// and needs no point of its own, so a base or an arc is one more thing
// the points do not show. A blunt base thinner than four times the
// scatter of the points is not judged here: teRight takes either kind
// for it.
//
// Why the gap and not the base's thickness alone: the surfaces of a
// section's open edge meet at about the same distance behind the base
// whatever its thickness (NACA Report 824's thickness: the half-thickness
// 0.0105 t and the slope 1.17 t at the edge both scale with t, so the
// corner lies some 0.009 c behind the base for every t). What separates
// the two ends is therefore the stretch of outline the sharp one adds
// beyond the last points, against how far apart the points lie there.
// The spacing is measured over the last teGapSpan gaps of each surface,
// and so is its irregularity: the rule this replaces took the last gap
// alone, and one gap may be a tenth of its neighbour on an irregularly
// spaced scan, which called such an edge decidable wherever the last two
// points happened to lie close together.
func teUndecidable(tr *scangen.Truth) (undecidable bool, onEnd int) {
	sec := tr.Section
	if sec == nil || sec.Shape == nil || sec.TEKind == scangen.TESharp || sec.Shape.Pieces() < 3 {
		return false, 0
	}
	sh := sec.Shape
	upper, lower, onEnd := goodArcs(tr, sh)
	if sec.TEKind == scangen.TERounded {
		return onEnd < 3, onEnd
	}
	if onEnd > 0 || len(upper) < 2 || len(lower) < 2 {
		return false, onEnd
	}
	sort.Float64s(upper)
	sort.Float64s(lower)
	sLo := sh.ArcAt(2) // the lower end corner
	// The last point of each surface and its distance along the outline
	// from the end corner; the gaps before it, from the end on.
	n := len(lower)
	du, dl := upper[0], sLo-lower[n-1]
	var gu, gl []float64
	for k := 1; k < len(upper) && k <= teGapSpan; k++ {
		gu = append(gu, upper[k]-upper[k-1])
	}
	for k := 1; k < n && k <= teGapSpan; k++ {
		gl = append(gl, lower[n-k]-lower[n-k-1])
	}
	a, b, ok := sharpRival(sh)
	if !ok {
		return false, onEnd
	}
	h, sigma := gapStats(gu, gl)
	// The gap round the rival corner, and whether either surface's last
	// point already stops short of the end by more than a gap.
	sharp := du + a + dl + b
	return teGapPlausible(sharp, h, sigma) || !teGapPlausible(max(du, dl), h, sigma), onEnd
}

// teGapSpan is the number of gaps of each surface, from its end on, that
// give the spacing near the end.
const teGapSpan = 8

// teGapSigma is the least irregularity (σ of the log of the gaps) the
// judgement allows: the points' own noise and a spacing that changes
// along the outline make even a drawing's steps vary by some 10 %
// (common practice).
const teGapSigma = 0.1

// gapStats returns the spacing near the end, the larger of the two
// surfaces' mean gaps (a surface probed more coarsely than the other
// sets how long a gap round the end may be), and the σ of the log of
// the gaps, each surface's taken about its own median: from their
// interquartile range (a robust estimate; two passes that overlap or a
// point measured twice leave gaps near zero whose logs would swamp a
// standard deviation).
func gapStats(gu, gl []float64) (h, sigma float64) {
	var logs []float64
	for _, g := range [][]float64{gu, gl} {
		var s float64
		ls := make([]float64, len(g))
		for k, x := range g {
			s += x
			ls[k] = math.Log(max(x, 1e-12))
		}
		h = max(h, s/float64(len(g)))
		sort.Float64s(ls)
		med := ls[len(ls)/2]
		if len(ls)%2 == 0 {
			med = (ls[len(ls)/2-1] + med) / 2
		}
		for _, l := range ls {
			logs = append(logs, l-med)
		}
	}
	sigma = teGapSigma
	if len(logs) >= 4 {
		sort.Float64s(logs)
		q := func(p float64) float64 {
			x := p * float64(len(logs)-1)
			k := int(x)
			if k+1 >= len(logs) {
				return logs[k]
			}
			return logs[k] + (x-float64(k))*(logs[k+1]-logs[k])
		}
		sigma = max(sigma, (q(0.75)-q(0.25))/1.349)
	}
	return h, sigma
}

// teGapPlausible reports whether a gap of length g may hold a given spot
// of the outline (the end) among log-normal gaps of mean h and σ sigma
// (the generator's spacing and a fair model of a measurement's): g is
// within the 95th percentile of the gaps that hold a given spot, which
// are drawn in proportion to their length (so their log has mean
// ln h + σ²/2 rather than ln h − σ²/2).
func teGapPlausible(g, h, sigma float64) bool {
	return g <= h*math.Exp(sigma*sigma/2+1.645*sigma)
}

// sharpRival returns how far the upper and the lower surface of sh run
// on along their end tangents, beyond their end corners, to where they
// meet; ok is false when they do not meet aft of the corners.
func sharpRival(sh *scangen.Shape) (a, b float64, ok bool) {
	sLo := sh.ArcAt(2)
	cu, cl := sh.At(0), sh.At(2)
	const step = 1e-3 // chord units of arc for the end tangents
	tu := unit(cu.Sub(sh.At(sh.ParamAt(step))))
	tl := unit(cl.Sub(sh.At(sh.ParamAt(sLo - step))))
	// cu + a·tu = cl + b·tl.
	det := tu.X*(-tl.Y) - tu.Y*(-tl.X)
	if math.Abs(det) < 1e-12 {
		return 0, 0, false
	}
	d := cl.Sub(cu)
	a = (d.X*(-tl.Y) - d.Y*(-tl.X)) / det
	b = (tu.X*d.Y - tu.Y*d.X) / det
	return a, b, a >= 0 && b >= 0
}

// sq returns x².
func sq(x float64) float64 { return x * x }

// unit returns p scaled to unit length.
func unit(p geometry.Point) geometry.Point {
	return p.Scale(1 / p.Norm())
}

// goodArcs returns the arc lengths from t = 0 (the upper end corner) of
// the good points of tr on the upper and on the lower surface of sh, and
// how many good points lie on the end between them (a base or an arc).
func goodArcs(tr *scangen.Truth, sh *scangen.Shape) (upper, lower []float64, onEnd int) {
	for _, l := range tr.Lines {
		if l.Kind != scangen.LineGood {
			continue
		}
		switch sh.Kind(l.T) {
		case scangen.Upper:
			upper = append(upper, sh.ArcAt(l.T))
		case scangen.Lower:
			lower = append(lower, sh.ArcAt(l.T))
		default:
			onEnd++
		}
	}
	return upper, lower, onEnd
}
