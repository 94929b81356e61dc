// Package clean turns a planar cloud of measured points into the contour
// of one section: it merges duplicates (a spatial hash), orders the points
// into loops (tangent-guided neighbour linking, or projection onto a
// thinned curve for a dense, noisy band), picks the section loop, drops
// gross outliers against a local fit along the loop, and starts the loop
// at the trailing edge running counter-clockwise. Clean does all of it and
// reports every point it merged or dropped, with its origin.
package clean
