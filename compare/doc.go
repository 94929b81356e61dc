// Package compare holds a measured section against its design: it reads
// and places the design (NewDesign: a reference shape, a section document
// or a point file, in chord units placed by chord, twist and offset, or in
// part units), aligns the measured points with it (best fit, minimum zone,
// a datum or as they are; the fits are package align's), measures the
// signed normal deviation of every point, sorts the points into their
// tolerance zones, gives the verdict and the differences of the section's
// figures (Compare), and, through stages it is handed, the differences in
// lift and moment (Comparison.Aero). It writes the report (format
// foilwright.compare/1), a CSV of every point and a summary, and gives the
// data of its pictures.
//
// # Conventions
//
// Lengths are in the measurement's units; the design is placed in the
// measurement's frame and the measured points are moved onto it. A
// deviation is the signed distance of a point from the design's outline
// along the design's normal, positive where there is material outside
// the design. A point's chord station x/c and surface are those of its
// foot on the design, in the design's frame. The design's frame follows
// the tool's convention for a measured section (the leading edge is the
// point farthest from the trailing edge), so that chord, twist and the
// aerodynamic coefficients compare like with like.
//
// A design's outline is the interpolating spline through its points
// (for a reference shape, through ShapeNodes panels), closed by a straight
// base across a blunt trailing edge.
//
// It reads no file by name and prints only to the writers it is given.
package compare
