// Package frame finds the leading and trailing edge of a fitted section
// curve, classifies and treats the trailing edge (sharp, blunt, rounded or
// open; keep, sharpen, or reshape to a thickness) and maps the section into the normalised
// frame of package geometry: leading edge at (0, 0), trailing-edge
// midpoint at (1, 0). Normalize does all of it and returns the Frame that
// maps the normalised section back to the part (chord, twist, leading
// edge, mirroring).
//
// The rounded-end analysis (AnalyseRounded) is exported for package props,
// which measures the trailing-edge angle of a kept rounded edge with it.
package frame
