// Package curve fits a smooth curve to an ordered contour and measures it.
//
// Fit fits a parametric cubic smoothing spline (Reinsch 1967) in arc
// length to a contour of package geometry, closed or open at a cornered
// trailing edge, and reports how far the curve departs from every point
// (FitReport). The smoothing follows the outline's own scale: the sampling
// test (sampling.go) tells exact samples, which are interpolated, from
// noisy points; the smoothing length grows with the local feature scale,
// with a factor chosen by the unbiased risk estimate for the noise given
// or measured (smoothing.go); dense scans are fitted through bins
// (bins.go); and the curve's fairness, the wiggles noise leaves in its
// curvature, is measured and guarded (fairness.go). Curve is the result:
// a piecewise cubic with an arc-length table, which implements
// geometry.Path and answers points, tangents, curvature, projections, the
// farthest point, sub-curves, transforms and the integrals of the area it
// encloses. The local scatter of the points and the curve through a
// section's nodes (NodeCurve) live here too.
//
// The spline system (banded and cyclic LDLᵀ solves, the trace of the hat
// matrix) is in spline.go; its types keep the spline… prefix that names
// them.
package curve
