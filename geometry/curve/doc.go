// Package curve fits a smooth curve to an ordered contour and measures it.
//
// Fit fits a parametric cubic smoothing spline (Reinsch 1967) in arc
// length to a contour of package geometry, closed or open at a cornered
// trailing edge, with the smoothing chosen by generalised cross-validation,
// from a given noise, or none at all, and reports how far the curve departs
// from every point (FitReport). Curve is the result: a piecewise cubic with
// an arc-length table, which implements geometry.Path and answers points,
// tangents, curvature, projections, the farthest point, sub-curves,
// transforms and the integrals of the area it encloses. The local scatter
// of the points (a noise estimate made before fitting) and the curve
// through a section's nodes (NodeCurve) live here too.
//
// The spline system (banded and cyclic LDLᵀ solves, the trace of the hat
// matrix) is in spline.go; its types keep the spline… prefix that names
// them.
package curve
