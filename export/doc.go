// Package export implements the writers that hand a clean section on to
// other programs: CAD (DXF), cutting and checking templates (SVG at 1:1),
// spreadsheets and CAD scripts (CSV), meshers (Gmsh .geo), and the stacked
// stations of a blade in 3D for a CAD loft (DXF 3D polylines, CSV), plus
// the results of the analysis stages as tables (polars and Cp, CSV).
//
// # Frames
//
// Place puts a section document into the coordinates of an export: the
// part frame (FramePart, the default), where the normalised nodes are
// mapped back through the section's frame (chord, twist, leading edge,
// mirroring) into the part's own coordinates and units, exactly as they
// were measured; or the chord frame (FrameChord), the normalised nodes as
// they are, in chord units. A section made without a frame (an analytic
// shape) can be scaled to a chord of any length (PlaceOptions.Chord).
// The exports of one section are drawn in the coordinates of its plane:
// the input's x and y for 2D input, the plane's u and v (recorded in the
// section document's frame.plane) for points cut from or fitted to 3D.
// The stations of a blade are placed in space: each in the plane it was
// cut at, or at z = its station.
//
// # Formats
//
// DXF is ASCII, declared as release 12 (AC1009), whose entities every CAD
// program reads: the section as a closed POLYLINE through the nodes on
// layer SECTION; the same nodes as the fit points of a cubic SPLINE
// (with its control points and knots, an interpolating B-spline) on
// layer SPLINE, closed across a blunt trailing edge by a LINE; the chord
// line on layer CHORD; and datum marks (crosses and POINTs at the leading
// edge, the trailing-edge midpoint and the quarter-chord point, with
// labels) on layer DATUM. SPLINE entities came with release 13: a reader
// that knows only release 12 skips that layer and keeps the polyline. The
// unit is declared in $INSUNITS.
//
// SVG is drawn at 1:1 in the section's unit (width and height in mm or
// inches), for printing as a cutting or checking template: the outline,
// the chord line, the datum marks, a scale bar to check the print scale
// against, and a title block.
//
// CSV files start with comment lines (#) naming the section, the frame and
// the unit ("# units: mm", which foilwright's reader understands), then a
// header line and one row per node. Numbers are written with as many
// digits as it takes to read them back exactly.
//
// The Gmsh geometry script (.geo, Gmsh's open text format) holds the nodes
// as points, the upper and lower surfaces as splines through them (and a
// line across a blunt trailing edge), a circular far-field boundary at a
// chosen distance, the surface between them, mesh sizes at the points and
// physical groups "section", "farfield" and "fluid".
//
// Every geometric export reads back, through foilwright's own readers
// (DXF, CSV) or by parsing (SVG, .geo), to the nodes it was made from
// within 1e-9 of the chord; the tests check it.
package export
