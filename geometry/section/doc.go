// Package section is the section document of foilwright (format
// foilwright.section/1): the nodes of a clean, normalised, repanelled
// section with the record of how it was made (source files, frame, fit,
// trailing edge, panels, properties, warnings), its JSON encoding and
// decoding, and the checks a set of nodes must pass before a panel method
// may use it (CheckNodes).
//
// It imports only the geometry core, so that stage authors and the solvers
// read and check sections without compiling the geometry chain. Nodes and
// lengths follow the conventions of package geometry: normalised frame,
// node order trailing edge → upper surface → leading edge → lower surface →
// trailing edge, chord units except where a field says "input units".
//
// The record types here (Frame, TrailingEdge, Properties, ...) are the
// document's own: the packages that compute them (frame, props, curve)
// have types of the same fields, which package prep converts.
package section
