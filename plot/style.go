package plot

import (
	"image/color"
	"math"

	gplot "gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/foilwright/foilwright/geometry"
)

// Colours of the palette. Series take them in the order of seriesColours.
var (
	colInk     = color.RGBA{0x21, 0x21, 0x21, 0xff} // curves and outlines
	colBlue    = color.RGBA{0x1f, 0x5f, 0xa6, 0xff}
	colOrange  = color.RGBA{0xe0, 0x7b, 0x10, 0xff}
	colSky     = color.RGBA{0x5e, 0xb1, 0xe0, 0xff}
	colPurple  = color.RGBA{0x8e, 0x3f, 0x9e, 0xff}
	colGrey    = color.RGBA{0x6e, 0x6e, 0x6e, 0xff}
	colGold    = color.RGBA{0xb8, 0x8a, 0x00, 0xff}
	colRed     = color.RGBA{0xb4, 0x1e, 0x2a, 0xff} // dropped points, warnings
	colBand    = color.RGBA{0xd6, 0xe6, 0xf4, 0xff} // tolerance band
	colBody    = color.RGBA{0xc8, 0xc8, 0xc8, 0xff} // solid body
	colFill    = color.RGBA{0xee, 0xf2, 0xf7, 0xff} // section interior
	colGuide   = color.RGBA{0x9a, 0x9a, 0x9a, 0xff} // chord line, windows, zero lines
	colGrid    = color.RGBA{0xe4, 0xe4, 0xe4, 0xff}
	colorWhite = color.White
)

// seriesColours are the colours given to the i-th series of a chart.
var seriesColours = []color.Color{colBlue, colOrange, colSky, colPurple, colGrey, colGold}

// seriesColour returns the colour of series i.
func seriesColour(i int) color.Color { return seriesColours[i%len(seriesColours)] }

// seriesGlyphs are the marker shapes given to the i-th series, so that
// series differ by more than colour.
var seriesGlyphs = []draw.GlyphDrawer{
	draw.CircleGlyph{}, draw.BoxGlyph{}, draw.PyramidGlyph{},
	draw.RingGlyph{}, draw.SquareGlyph{}, draw.TriangleGlyph{},
}

// seriesDashes are the line dashes given to the i-th series.
var seriesDashes = [][]vg.Length{
	nil,
	{vg.Points(6), vg.Points(3)},
	{vg.Points(2), vg.Points(2)},
	{vg.Points(8), vg.Points(2), vg.Points(2), vg.Points(2)},
}

// Font sizes at the natural size of a figure.
const (
	titleSize = 12
	labelSize = 11
	tickSize  = 10
	noteSize  = 10
)

// sans is the typeface of all text.
var sans = font.Font{Typeface: "Liberation", Variant: "Sans"}

// textFont returns the sans font at size points.
func textFont(size float64) font.Font { return font.From(sans, vg.Points(size)) }

// newPlot returns a gonum plot with our fonts, a light grid and the given
// title and axis labels.
func newPlot(title, xLabel, yLabel string) *gplot.Plot {
	p := gplot.New()
	p.Title.Text = title
	p.Title.TextStyle.Font = textFont(titleSize)
	p.Title.Padding = vg.Points(6)
	for _, a := range []*gplot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle.Font = textFont(labelSize)
		a.Tick.Label.Font = textFont(tickSize)
		a.Padding = vg.Points(3)
		a.Tick.Marker = niceTicks{6}
	}
	p.X.Label.Text = xLabel
	p.Y.Label.Text = yLabel
	p.Legend.TextStyle.Font = textFont(noteSize)
	p.Legend.ThumbnailWidth = vg.Points(22)
	p.Legend.Padding = vg.Points(2)
	g := plotter.NewGrid()
	g.Vertical.Color, g.Horizontal.Color = colGrid, colGrid
	g.Vertical.Width, g.Horizontal.Width = vg.Points(0.5), vg.Points(0.5)
	p.Add(g)
	return p
}

// lineStyle returns a solid or dashed line style.
func lineStyle(c color.Color, width float64, dashes []vg.Length) draw.LineStyle {
	return draw.LineStyle{Color: c, Width: vg.Points(width), Dashes: dashes}
}

// glyphStyle returns a marker style.
func glyphStyle(c color.Color, shape draw.GlyphDrawer, radius float64) draw.GlyphStyle {
	return draw.GlyphStyle{Color: c, Shape: shape, Radius: vg.Points(radius)}
}

// newLine returns a line through pts in the given style. pts must be
// finite; the callers check.
func newLine(pts plotter.XYs, sty draw.LineStyle) *plotter.Line {
	l := &plotter.Line{XYs: pts, LineStyle: sty}
	return l
}

// newScatter returns markers at pts.
func newScatter(pts plotter.XYs, sty draw.GlyphStyle) *plotter.Scatter {
	return &plotter.Scatter{XYs: pts, GlyphStyle: sty}
}

// newPolygon returns a filled polygon with an optional outline.
func newPolygon(pts plotter.XYs, fill color.Color, outline draw.LineStyle) *plotter.Polygon {
	return &plotter.Polygon{XYs: []plotter.XYs{pts}, Color: fill, LineStyle: outline}
}

// xys converts points to gonum's XYs.
func xys(pts []geometry.Point) plotter.XYs {
	out := make(plotter.XYs, len(pts))
	for i, p := range pts {
		out[i].X, out[i].Y = p.X, p.Y
	}
	return out
}

// pairs zips two equally long slices into XYs.
func pairs(xs, ys []float64) plotter.XYs {
	out := make(plotter.XYs, len(xs))
	for i := range xs {
		out[i].X, out[i].Y = xs[i], ys[i]
	}
	return out
}

// bounds returns the bounding box of pts as xmin, xmax, ymin, ymax. It
// returns an empty (inverted) box for no points.
func bounds(pts ...plotter.XYs) box {
	b := box{math.Inf(1), math.Inf(-1), math.Inf(1), math.Inf(-1)}
	for _, ps := range pts {
		for _, p := range ps {
			b.x0, b.x1 = math.Min(b.x0, p.X), math.Max(b.x1, p.X)
			b.y0, b.y1 = math.Min(b.y0, p.Y), math.Max(b.y1, p.Y)
		}
	}
	return b
}

// box is a rectangle in data coordinates.
type box struct{ x0, x1, y0, y1 float64 }

// empty reports whether b holds no point.
func (b box) empty() bool { return !(b.x0 <= b.x1 && b.y0 <= b.y1) }

// grow returns b enlarged by frac of its larger side on every side, and by
// at least a tiny amount so that a single point still gives a box.
func (b box) grow(frac float64) box {
	d := frac * math.Max(b.x1-b.x0, b.y1-b.y0)
	if d == 0 {
		d = 1e-9 + 1e-9*math.Max(math.Abs(b.x0), math.Abs(b.y0))
	}
	return box{b.x0 - d, b.x1 + d, b.y0 - d, b.y1 + d}
}

// rangePad returns min and max of vs widened by frac of their span (or by
// a unit fraction of their size when they are all equal), ignoring NaN.
func rangePad(frac float64, vss ...[]float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, vs := range vss {
		for _, v := range vs {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	if lo > hi {
		return 0, 1
	}
	d := frac * (hi - lo)
	if d == 0 {
		d = 0.05*math.Abs(lo) + 1e-3
	}
	return lo - d, hi + d
}

// setRange fixes the visible y range of p.
func setYRange(p *gplot.Plot, lo, hi float64) { p.Y.Min, p.Y.Max = lo, hi }

// setXRange fixes the visible x range of p.
func setXRange(p *gplot.Plot, lo, hi float64) { p.X.Min, p.X.Max = lo, hi }
