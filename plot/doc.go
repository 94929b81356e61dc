// Package plot draws the steps and results of foilwright as pictures: the
// input points against the fitted curve, the deviation of every kept point,
// the repanelled nodes and their panel quality, the normalised section, the
// pressure distribution, lift and moment polars, streamlines and the
// spanwise stations of a blade. It draws with gonum.org/v1/plot and writes
// SVG or PNG.
//
// Each drawing function takes a plain input struct of this package (PrepData,
// SectionData, CpCase, PolarSeries, FlowField, Station) that a caller fills
// from its own data, and returns a *Figure: one or more gonum plots laid out
// in rows, with their data areas aligned. Write renders a figure to an
// io.Writer, so that a caller can write atomically; Save writes a file and
// picks the format from its extension.
//
// # Conventions
//
// Input coordinates (PrepData) are in the input's units, named by
// PrepData.Units; section, Cp and flow-field coordinates are in chord units
// of the normalised frame (leading edge at (0, 0), trailing edge at (1, 0)),
// and nodes come in the node order of package geometry: trailing edge, upper
// surface, leading edge, lower surface, trailing edge. Angles are degrees.
//
// Pictures of shapes (PrepPlot, NodesPlot, SectionPlot, StreamlinePlot) keep
// equal scales on both axes at any output size: the figure's natural size is
// computed from the data ranges, and when it is drawn at another size the
// visible ranges grow so that one unit of x and one unit of y have the same
// length on the page.
//
// # Style
//
// Colours come from a small palette chosen for colour-vision deficiency:
// series are told apart by a blue/orange opposition first, then by lightness
// (sky blue, purple, grey, gold), and always also by line dash or marker
// shape, so that a picture stays readable in grey scale. Text is set in
// Liberation Sans, 10 pt for tick labels and legends and 11–12 pt for axis
// labels and titles at the natural size.
//
// Output is deterministic: the same figure gives the same SVG and PNG bytes.
package plot
