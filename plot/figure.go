package plot

import (
	"math"
	"slices"

	gplot "gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Figure is one picture: gonum plots (panels) laid out in rows. Panels in a
// row share the row's height and have their data areas aligned top and
// bottom; rows with the same number of panels have their data areas aligned
// left and right, column by column. A panel may keep equal axis scales (see
// the package documentation).
//
// Width and Height are the natural size of the figure, used by Write and
// Save when they are given a zero size. They are chosen by the function that
// made the figure; a caller may change them.
type Figure struct {
	Width, Height vg.Length
	rows          []figRow
}

type figRow struct {
	weight float64 // share of the figure's height
	panels []*panel
}

type panel struct {
	plot  *gplot.Plot
	equal bool   // keep one unit of x as long as one unit of y
	want  box    // the data that must stay visible when equal
	xFrom *panel // when set, take the x range of this panel
}

// Layout constants.
const (
	figMargin = vg.Length(6)  // around the whole figure, points
	rowGap    = vg.Length(10) // between rows
	colGap    = vg.Length(14) // between panels of a row
)

// addRow appends a row of panels of relative height weight.
func (f *Figure) addRow(weight float64, ps ...*panel) {
	f.rows = append(f.rows, figRow{weight: weight, panels: ps})
}

// freePanel returns a panel whose axes follow its data.
func freePanel(p *gplot.Plot) *panel { return &panel{plot: p} }

// equalPanel returns a panel that shows at least want with equal axis
// scales.
func equalPanel(p *gplot.Plot, want box) *panel {
	pn := &panel{plot: p, equal: true, want: want}
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = want.x0, want.x1, want.y0, want.y1
	return pn
}

// Panels returns the plots of f row by row, left to right, for callers
// that want to retitle or restyle them.
func (f *Figure) Panels() []*gplot.Plot {
	var ps []*gplot.Plot
	for _, r := range f.rows {
		for _, p := range r.panels {
			ps = append(ps, p.plot)
		}
	}
	return ps
}

// Draw draws f onto c, filling it.
func (f *Figure) Draw(c draw.Canvas) {
	c.SetColor(colorWhite)
	c.Fill(c.Rectangle.Path())
	canvases, titles := f.layout(c)
	for i, r := range canvases {
		for j, pc := range r {
			p := f.rows[i].panels[j].plot
			// The figure sets the titles, so that the titles of a row
			// line up whatever the tick labels of each panel.
			title := p.Title.Text
			p.Title.Text = ""
			p.Draw(pc)
			p.Title.Text = title
			if title != "" {
				d := p.DataCanvas(pc)
				sty := p.Title.TextStyle
				sty.XAlign, sty.YAlign = draw.XCenter, draw.YTop
				c.FillText(sty, vg.Point{X: (d.Min.X + d.Max.X) / 2, Y: titles[i]}, title)
			}
		}
	}
}

// layout returns the canvas of every panel, row by row, when f is drawn on
// c without its titles, and the top of each row's titles; it fixes the axis
// ranges of equal-scale panels for those canvases.
func (f *Figure) layout(c draw.Canvas) (canvases [][]draw.Canvas, titleTops []vg.Length) {
	// The figure draws the titles: measure them, and lay the panels out
	// without them.
	saved := make([][]string, len(f.rows))
	titleH := make([]vg.Length, len(f.rows))
	for i, r := range f.rows {
		saved[i] = make([]string, len(r.panels))
		for j, p := range r.panels {
			saved[i][j] = p.plot.Title.Text
			if t := p.plot.Title.Text; t != "" {
				sty := p.plot.Title.TextStyle
				titleH[i] = max(titleH[i], sty.Rectangle(t).Size().Y+p.plot.Title.Padding)
			}
			p.plot.Title.Text = ""
		}
	}
	defer func() {
		for i, r := range f.rows {
			for j, p := range r.panels {
				p.plot.Title.Text = saved[i][j]
			}
		}
	}()

	c = draw.Crop(c, figMargin, -figMargin, figMargin, -figMargin)
	var total float64
	for _, r := range f.rows {
		total += r.weight
	}
	height := c.Max.Y - c.Min.Y - rowGap*vg.Length(len(f.rows)-1)

	// Tiles: rows top to bottom, panels of a row side by side, below the
	// row's titles.
	tiles := make([][]draw.Canvas, len(f.rows))
	titleTops = make([]vg.Length, len(f.rows))
	top := c.Max.Y
	for i, r := range f.rows {
		h := height * vg.Length(r.weight/total)
		n := len(r.panels)
		w := (c.Max.X - c.Min.X - colGap*vg.Length(n-1)) / vg.Length(n)
		tiles[i] = make([]draw.Canvas, n)
		titleTops[i] = top
		for j := range r.panels {
			x0 := c.Min.X + vg.Length(j)*(w+colGap)
			tiles[i][j] = draw.Canvas{Canvas: c.Canvas, Rectangle: vg.Rectangle{
				Min: vg.Point{X: x0, Y: top - h},
				Max: vg.Point{X: x0 + w, Y: top - titleH[i]},
			}}
		}
		top -= h + rowGap
	}

	// Align: the data areas of a row share their bottom and top, and the
	// data areas in a column of rows with as many panels share their left
	// and right. Equal-scale panels change their ranges, and so perhaps
	// their tick labels and insets, with their canvas: repeat until that
	// settles.
	out := make([][]draw.Canvas, len(f.rows))
	for i, r := range f.rows {
		out[i] = slices.Clone(tiles[i])
		for j, p := range r.panels {
			// Start from the same state whatever an earlier layout left.
			autoTicks(p.plot, draw.Canvas{Rectangle: vg.Rectangle{Max: vg.Point{X: 6 * xTickSpacing, Y: 6 * yTickSpacing}}})
			if p.equal {
				out[i][j] = p.fitEqual(out[i][j])
			}
		}
	}
	type insets struct{ l, r, b, t vg.Length }
	for range 3 {
		for i, r := range f.rows {
			for j, p := range r.panels {
				autoTicks(p.plot, p.plot.DataCanvas(out[i][j]))
			}
		}
		in := make([][]insets, len(f.rows))
		rowMax := make([]insets, len(f.rows))
		colMax := map[[2]int]insets{} // key: panels in row, column
		for i, r := range f.rows {
			in[i] = make([]insets, len(r.panels))
			for j, p := range r.panels {
				t := tiles[i][j]
				d := p.plot.DataCanvas(t)
				s := insets{d.Min.X - t.Min.X, t.Max.X - d.Max.X, d.Min.Y - t.Min.Y, t.Max.Y - d.Max.Y}
				in[i][j] = s
				rm := &rowMax[i]
				rm.b, rm.t = max(rm.b, s.b), max(rm.t, s.t)
				k := [2]int{len(r.panels), j}
				cm := colMax[k]
				cm.l, cm.r = max(cm.l, s.l), max(cm.r, s.r)
				colMax[k] = cm
			}
		}
		for i, r := range f.rows {
			for j, p := range r.panels {
				s, rm, cm := in[i][j], rowMax[i], colMax[[2]int{len(r.panels), j}]
				out[i][j] = draw.Crop(tiles[i][j], cm.l-s.l, -(cm.r - s.r), rm.b-s.b, -(rm.t - s.t))
				if p.equal {
					out[i][j] = p.fitEqual(out[i][j])
				}
			}
		}
		for _, r := range f.rows {
			for _, p := range r.panels {
				if p.xFrom != nil {
					p.plot.X.Min, p.plot.X.Max = p.xFrom.plot.X.Min, p.xFrom.plot.X.Max
				}
			}
		}
	}
	return out, titleTops
}

// fitEqual sets the axis ranges of p so that its data area on c shows at
// least p.want with one data unit as long in x as in y, and returns the
// canvas to draw p on: c, or c trimmed a little. The ranges grow about the
// centre of p.want. Tick labels change with the ranges and can change the
// data area, so it repeats a few times; should the labels keep flipping, it
// trims the canvas so that the scales agree for the ranges it settled on.
func (p *panel) fitEqual(c draw.Canvas) draw.Canvas {
	w := p.want
	cx, cy := (w.x0+w.x1)/2, (w.y0+w.y1)/2
	for range 4 {
		d := p.plot.DataCanvas(c)
		dw, dh := float64(d.Max.X-d.Min.X), float64(d.Max.Y-d.Min.Y)
		if dw <= 0 || dh <= 0 {
			return c
		}
		s := math.Max((w.x1-w.x0)/dw, (w.y1-w.y0)/dh) // data units per point
		hx, hy := s*dw/2, s*dh/2
		p.plot.X.Min, p.plot.X.Max = cx-hx, cx+hx
		p.plot.Y.Min, p.plot.Y.Max = cy-hy, cy+hy
	}
	for range 3 {
		d := p.plot.DataCanvas(c)
		dw, dh := float64(d.Max.X-d.Min.X), float64(d.Max.Y-d.Min.Y)
		xr, yr := p.plot.X.Max-p.plot.X.Min, p.plot.Y.Max-p.plot.Y.Min
		if dw <= 0 || dh <= 0 {
			return c
		}
		if xr/dw < yr/dh { // too wide: trim x
			cut := vg.Length(dw-xr*dh/yr) / 2
			c = draw.Crop(c, cut, -cut, 0, 0)
		} else {
			cut := vg.Length(dh-yr*dw/xr) / 2
			c = draw.Crop(c, 0, 0, cut, -cut)
		}
	}
	return c
}

// equalHeight returns the height of a tile width wide (a figure's width
// less margins) in which p, alone in its row, shows its wanted box at equal
// scales without growing the ranges.
func (p *panel) equalHeight(width vg.Length) vg.Length {
	p.plot.X.Min, p.plot.X.Max, p.plot.Y.Min, p.plot.Y.Max = p.want.x0, p.want.x1, p.want.y0, p.want.y1
	// The insets depend a little on the tile's height: start from a guess
	// and measure again on the result.
	h := vg.Length(4 * 72)
	for range 4 {
		t := draw.Canvas{Rectangle: vg.Rectangle{Max: vg.Point{X: width, Y: h}}}
		d := p.plot.DataCanvas(t)
		dw := float64(d.Max.X - d.Min.X)
		dh := dw * (p.want.y1 - p.want.y0) / (p.want.x1 - p.want.x0)
		h = vg.Length(dh) + (h - (d.Max.Y - d.Min.Y))
	}
	return h
}

// Tick spacing, points between labelled ticks, that autoTicks aims for.
const (
	xTickSpacing = 80
	yTickSpacing = 25
)

// autoTicks sets the number of ticks of p's axes from the size of its data
// area d, where the axes use niceTicks.
func autoTicks(p *gplot.Plot, d draw.Canvas) {
	if _, ok := p.X.Tick.Marker.(niceTicks); ok {
		p.X.Tick.Marker = niceTicks{min(max(int(float64(d.Max.X-d.Min.X)/xTickSpacing), 3), 8)}
	}
	if _, ok := p.Y.Tick.Marker.(niceTicks); ok {
		p.Y.Tick.Marker = niceTicks{min(max(int(float64(d.Max.Y-d.Min.Y)/yTickSpacing), 3), 8)}
	}
}
