// Package numeric holds the small numerical helpers that several geometry
// packages share: golden-section search, a 3×3 linear solve, a 4×4
// symmetric positive definite solve and circle fits. They are plain
// functions of float64 values (and of geometry.Point for the circle fits),
// with no state, each a few lines of a published method.
package numeric
