// Package geometry implements the geometry chain of foilwright: reading point
// files, cleaning and ordering measured points into a contour, fitting a smooth
// curve, locating the leading and trailing edge, normalising, and computing the
// geometric properties of a section.
//
// Nothing in this package reads a file by name or prints; readers take an
// io.Reader and a display name, writers take an io.Writer. It imports only the
// Go standard library and gonum.
//
// # Conventions
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
// in chord units afterwards. Angles are radians inside the package; degrees
// appear only in field names that say so (TwistDeg). Twist is positive
// nose-up.
//
// Every point read from a file keeps an Origin (file, line, entity), so that
// every later report can point back into the user's file.
package geometry
