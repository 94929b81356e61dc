package plot

import (
	"fmt"
	"math"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
)

// SectionData is a normalised section with the lines drawn on it, all in
// chord units of the normalised frame.
type SectionData struct {
	Name      string           // for the title; may be empty
	Nodes     []geometry.Point // the section, node order
	Camber    []geometry.Point // camber line (x, yc) in x order; nil draws none
	Thickness []geometry.Point // thickness distribution (x, t(x)) in x order; nil draws none
	LECentre  geometry.Point   // centre of the inscribed leading-edge circle
	LERadius  float64          // its radius; 0 draws no circle
	// MaxThickness and MaxCamber, when their value is not zero, mark the
	// maxima the section document reports (x, value) instead of the largest
	// sample of the drawn lines, so the picture and the report agree.
	MaxThickness, MaxCamber geometry.Point
}

// SectionFrom returns the drawing data of a section document: its name,
// nodes and, when it records its properties, the leading-edge circle. The
// circle's centre is taken at (r, 0), on the chord line: that holds when the
// leading edge is the point of the section farthest from the trailing edge
// (common practice), for the section's normal there, which holds the
// centre, then runs along the chord. The camber line and thickness
// distribution are left for the caller to fill.
func SectionFrom(s *section.Section) SectionData {
	d := SectionData{Name: s.Name, Nodes: s.Nodes}
	if s.Properties != nil && s.Properties.LERadius > 0 {
		d.LERadius = s.Properties.LERadius
		d.LECentre = geometry.Point{X: s.Properties.LERadius}
	}
	return d
}

// SectionPlot draws a normalised section, shaded, with its chord line,
// camber line and inscribed leading-edge circle at equal axis scales, and,
// below it on the same x range, the thickness distribution and camber line
// against x/c, with their maxima marked. It returns an error wrapping
// ErrNoData for fewer than 3 nodes, and an error naming the field for
// non-finite values or a negative radius.
func SectionPlot(d SectionData) (*Figure, error) {
	if len(d.Nodes) < 3 {
		return nil, fmt.Errorf("%w: %d node(s), want at least 3", ErrNoData, len(d.Nodes))
	}
	if err := firstErr(
		checkPoints("Nodes", d.Nodes),
		checkPoints("Camber", d.Camber),
		checkPoints("Thickness", d.Thickness),
		checkPoints("LECentre", []geometry.Point{d.LECentre}),
		checkValues("LERadius", []float64{d.LERadius}),
	); err != nil {
		return nil, err
	}
	if d.LERadius < 0 {
		return nil, fmt.Errorf("plot: LERadius %g is negative", d.LERadius)
	}
	nodes := xys(d.Nodes)
	title := "Section"
	if d.Name != "" {
		title = d.Name
	}
	top := newPlot(title, "x/c", "y/c")
	top.Add(newPolygon(nodes, colFill, draw.LineStyle{}))
	top.Add(newLine(plotter.XYs{{X: 0, Y: 0}, {X: 1, Y: 0}}, lineStyle(colGuide, 0.8, []vg.Length{vg.Points(2), vg.Points(2)})))
	outline := newLine(nodes, lineStyle(colInk, 1.2, nil))
	top.Add(outline)
	top.Legend.Add("section", outline)
	if len(d.Camber) >= 2 {
		cl := newLine(xys(d.Camber), lineStyle(colOrange, 1.2, seriesDashes[1]))
		top.Add(cl)
		top.Legend.Add("camber line", cl)
	}
	if d.LERadius > 0 {
		const k = 96
		circle := make(plotter.XYs, k+1)
		for i := range circle {
			s, c := math.Sincos(2 * math.Pi * float64(i) / k)
			circle[i] = plotter.XY{X: d.LECentre.X + d.LERadius*c, Y: d.LECentre.Y + d.LERadius*s}
		}
		lc := newLine(circle, lineStyle(colBlue, 1, nil))
		top.Add(lc)
		top.Legend.Add(fmt.Sprintf("LE circle, r = %.4g", d.LERadius), lc)
	}
	top.Legend.Top = true
	top.Legend.XOffs = vg.Points(-4)
	b := bounds(nodes)
	want := b.grow(0.02)
	want.y1 += 0.9 * (b.y1 - b.y0) // room for the legend above the section

	bottom := newPlot("", "x/c", "t/c, yc/c")
	bottom.Add(newLine(plotter.XYs{{X: b.x0, Y: 0}, {X: b.x1, Y: 0}}, lineStyle(colGuide, 0.8, nil)))
	var ranged []float64
	for _, s := range []struct {
		pts   []geometry.Point
		max   geometry.Point
		name  string
		col   int
		dash  []vg.Length
		glyph draw.GlyphDrawer
	}{
		{d.Thickness, d.MaxThickness, "thickness", 0, nil, draw.CircleGlyph{}},
		{d.Camber, d.MaxCamber, "camber", 1, seriesDashes[1], draw.SquareGlyph{}},
	} {
		if len(s.pts) < 2 {
			continue
		}
		pts := xys(s.pts)
		l := newLine(pts, lineStyle(seriesColour(s.col), 1.2, s.dash))
		bottom.Add(l)
		im := 0
		for i, q := range pts {
			ranged = append(ranged, q.Y)
			if q.Y > pts[im].Y {
				im = i
			}
		}
		m := plotter.XYs{pts[im]}
		if s.max.Y != 0 && s.max.IsFinite() {
			m = plotter.XYs{{X: s.max.X, Y: s.max.Y}}
		}
		sc := newScatter(m, glyphStyle(seriesColour(s.col), s.glyph, 3))
		bottom.Add(sc)
		bottom.Legend.Add(fmt.Sprintf("%s, max %.4g at x/c %.3g", s.name, m[0].Y, m[0].X), l, sc)
	}
	bottom.Legend.Top = true
	bottom.Legend.XOffs = vg.Points(-4)
	lo, hi := rangePad(0.08, ranged, []float64{0})
	hi += 0.55 * (hi - lo) // room for the legend
	setYRange(bottom, lo, hi)
	setXRange(bottom, want.x0, want.x1)

	f := &Figure{Width: 8 * vg.Inch}
	tp := equalPanel(top, want)
	inner := f.Width - 2*figMargin
	h1 := tp.equalHeight(inner)
	f.addRow(float64(h1), tp)
	f.Height = h1 + 2*figMargin
	if len(ranged) > 0 {
		h2 := 2.2 * vg.Inch
		bp := freePanel(bottom)
		bp.xFrom = tp
		f.addRow(float64(h2), bp)
		f.Height += h2 + rowGap
	}
	return f, nil
}
