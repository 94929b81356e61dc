// Package prep is the chain from point files to a section, in order: read
// the files (pointfile), bring 3D points into their plane (planar), merge,
// order and clean them into a contour (clean), fit the smoothing spline
// (curve), find and treat the edges and normalise (frame), repanel
// (repanel), check the nodes and compute the properties (section, props),
// and write the section document. Prepare runs all of it, ReadAndClean the
// first half; Settings are its options, named as the prep command's flags
// and the "prepare" keys of a pipeline file.
//
// It also makes what a person reads of a preparation: the summaries
// (WriteSummary, OneLine, WriteSectionReport), the contour document of the
// points command, the section documents of the analytic shapes with their
// properties, and the pictures (PrepFigures, named by PlotNames and placed
// by SiblingPath). It reads no file by name and prints only to the writer
// it is given.
package prep
