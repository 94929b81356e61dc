// Package align fits measured points to a nominal outline by a motion of
// the plane (rotation and translation, optionally a uniform scale and a
// mirror), the way a part is aligned to its design before its deviations
// are read.
//
// Two fits are offered, both over the signed normal distance of each point
// from the outline (positive outside):
//
//   - LeastSquares minimises the sum of squared distances (the best fit of
//     common practice), by Gauss–Newton steps with a Levenberg–Marquardt
//     safeguard, each point's foot found anew at every step;
//   - MinimumZone minimises the largest distance, or, when each point has
//     a tolerance band of its own, the largest use of a band: the
//     Chebyshev fit that a profile-of-a-line tolerance of ISO 1101 implies
//     (the feature conforms when some placement puts every point in its
//     zone). It is solved as a sequence of linear programs over the
//     small-motion linearisation of the distances, in a trust region,
//     re-linearised until the motion no longer changes; each linear
//     program is solved exactly by a simplex walk over the vertices of the
//     feasible set (lp.go).
//
// The outline is anything that answers the nearest-point question
// (Outline); the motions are Motion values. Lengths are in the units of the
// points, angles in radians.
package align
