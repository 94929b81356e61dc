// Package geometry is the core of foilwright's geometry: points and vectors
// (Point, Vec3, Plane), the clouds read from files and the contours made of
// them (Cloud, Contour), where every point came from (Origin), length units
// (Unit), notes on what a reader skipped (Note, Notes), the Path a section
// curve offers, a few loop predicates, and the errors the chain shares
// (ParseError and its sentinels). It imports nothing of foilwright's; the
// chain is built on it, one concept a package, along the data flow:
//
//	pointfile  read and write point files (delimited, listings, DXF, STL)
//	planar     plane specs and fits, flatness, cutting meshes at a plane
//	clean      merge duplicates, order into loops, pick the section, drop outliers
//	curve      smoothing spline, Curve, arc length, fit report, scatter
//	frame      leading and trailing edge, edge treatment, normalisation
//	props      section properties
//	shape      NACA 4-digit and Kármán–Trefftz reference sections
//	section    the section document and its node checks
//
// Nothing in these packages reads a file by name or prints; readers take
// bytes or an io.Reader and a display name, writers take an io.Writer.
//
// # Conventions
//
// Written once, here; the other packages and the solvers refer to them.
//
// Normalised frame: leading edge at (0, 0), trailing-edge midpoint at (1, 0),
// x along the chord towards the trailing edge, y towards the upper (suction)
// side.
//
// Node order: trailing edge, over the upper surface to the leading edge, back
// along the lower surface to the trailing edge. In the normalised frame this
// walk is counter-clockwise: its signed (shoelace) area is positive. N panels
// have N+1 nodes; for a sharp trailing edge the first and last node coincide.
//
// Lengths are in the input's units (Unit) until a section is normalised, and
// in chord units afterwards. Angles are radians inside the packages; degrees
// appear only in field names that say so (TwistDeg). Twist is positive
// nose-up.
//
// Every point read from a file keeps an Origin (file, line, entity), so that
// every later report can point back into the user's file.
package geometry
