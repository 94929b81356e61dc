// Package props computes the geometric properties of a normalised section
// (chord units, node order of package geometry): maximum thickness and
// camber and where they lie, the camber line, the leading-edge radius, the
// trailing-edge thickness and included angle, and the area, centroid,
// second moments and perimeter by Green's theorem on the curve.
//
// It works on any geometry.Path; the fitted curve of package curve is used
// as it is, anything else through an interpolating spline. A rounded
// trailing edge is measured with the rounded-end analysis of package frame.
package props
