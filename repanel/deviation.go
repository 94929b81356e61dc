package repanel

import (
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/par"
)

// The automatic panel count. A panel replaces the arc of the curve between
// its two nodes by a straight line; the largest distance between the two
// (the chordal deviation of machining, about κh²/8 for a panel of length h
// where the curvature is κ) says how faithfully the panels trace the
// section. When Options.Panels is 0, Stations takes the fewest panels, in
// [AutoMinPanels, AutoMaxPanels], whose deviation is at most
// Options.Tolerance (DefaultTolerance when 0).
const (
	// DefaultTolerance is the deviation an automatic panel count meets, in
	// the units of the path: chord units for a normalised section, so
	// 0.02 mm on a 200 mm chord. Cosine spacing meets it with 150 to 250
	// panels on the sections of the examples.
	DefaultTolerance = 1e-4
	// AutoMinPanels and AutoMaxPanels clamp the automatic panel count.
	AutoMinPanels = 40
	AutoMaxPanels = 1000
	// DeviationSamples is the number of parts each panel's arc is divided
	// into when its deviation is measured: the arc is sampled at the
	// DeviationSamples−1 interior points f = k/DeviationSamples of its
	// parameter, the midpoint among them.
	DeviationSamples = 8
)

// PolygonDeviation returns the largest distance between the panels joining
// consecutive nodes and the curve they replace, and the panel where it
// occurs (the first, on a tie): at(i, f) is the point of the curve between
// nodes[i] (f = 0) and nodes[i+1] (f = 1), sampled at f = k/DeviationSamples.
// It returns 0, -1 for fewer than two nodes. Many panels are measured on
// two cores in runs of consecutive panels, so at must be safe to call from
// two goroutines at once.
func PolygonDeviation(nodes []geometry.Point, at func(panel int, f float64) geometry.Point) (dev float64, panel int) {
	np := len(nodes) - 1
	runs := min(8, np/deviationRun)
	if runs < 2 {
		return runDeviation(nodes, at, 0, np)
	}
	devs := make([]float64, runs)
	panels := make([]int, runs)
	par.For(runs, 2, func(_, r int) {
		devs[r], panels[r] = runDeviation(nodes, at, r*np/runs, (r+1)*np/runs)
	})
	// The panels in order, as one pass over them all takes them: a run's
	// largest replaces the one before only when larger.
	dev, panel = devs[0], panels[0]
	for r := 1; r < runs; r++ {
		if panels[r] >= 0 && devs[r] > dev {
			dev, panel = devs[r], panels[r]
		}
	}
	return dev, panel
}

// deviationRun is the least number of panels a run of PolygonDeviation
// takes on its own.
const deviationRun = 64

// runDeviation is PolygonDeviation over the panels lo ≤ i < hi. The first
// run (lo = 0) takes its first sample whatever it is, as one pass does;
// a later run takes only samples larger than the ones before it, since
// the pass reaches it with a sample taken.
func runDeviation(nodes []geometry.Point, at func(panel int, f float64) geometry.Point, lo, hi int) (dev float64, panel int) {
	panel = -1
	if lo > 0 {
		dev = math.Inf(-1)
	}
	for i := lo; i < hi; i++ {
		for k := 1; k < DeviationSamples; k++ {
			d := geometry.SegmentDist(at(i, float64(k)/DeviationSamples), nodes[i], nodes[i+1])
			if d > dev || panel < 0 && lo == 0 {
				dev, panel = d, i
			}
		}
	}
	return dev, panel
}

// Deviation returns the largest distance between the panels joining the
// points p.At(ss[i]) and the path between them (see PolygonDeviation), and
// the panel where it occurs. ss must increase; p.At must be safe to call
// from two goroutines at once (a curve's is).
func Deviation(p geometry.Path, ss []float64) (dev float64, panel int) {
	nodes := make([]geometry.Point, len(ss))
	for i, s := range ss {
		nodes[i] = p.At(s)
	}
	return PolygonDeviation(nodes, func(i int, f float64) geometry.Point {
		return p.At(ss[i] + f*(ss[i+1]-ss[i]))
	})
}

// Count returns the smallest panel count n in [lo, hi] whose deviation
// dev(n) is at most tol, and that deviation. The deviation of a smooth
// curve falls about as 1/n², so the count is found by bisection; should it
// not fall monotonically, the count returned still meets tol. When even hi
// panels do not meet tol, Count returns hi, its deviation and met false.
// It returns the first error of dev, and an error for lo < 1, hi < lo or a
// tol that is not positive.
func Count(lo, hi int, tol float64, dev func(n int) (float64, error)) (n int, d float64, met bool, err error) {
	if lo < 1 || hi < lo || !(tol > 0) || math.IsInf(tol, 0) {
		return 0, 0, false, fmt.Errorf("%w: panel range %d..%d, tolerance %g", ErrOptionRange, lo, hi, tol)
	}
	dHi, err := dev(hi)
	if err != nil {
		return 0, 0, false, err
	}
	if dHi > tol {
		return hi, dHi, false, nil
	}
	dLo, err := dev(lo)
	if err != nil {
		return 0, 0, false, err
	}
	if dLo <= tol {
		return lo, dLo, true, nil
	}
	// dev(lo) > tol ≥ dev(hi).
	for hi-lo > 1 {
		mid := lo + (hi-lo)/2
		dm, err := dev(mid)
		if err != nil {
			return 0, 0, false, err
		}
		if dm <= tol {
			hi, dHi = mid, dm
		} else {
			lo = mid
		}
	}
	return hi, dHi, true, nil
}
