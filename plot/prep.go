package plot

import (
	"fmt"
	"image/color"
	"math"
	"slices"
	"strings"

	gplot "gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/foilwright/foilwright/geometry"
)

// PrepData is what the preparation of a section (points → section) has to
// show: the points it kept and dropped, the curve it fitted and how far each
// kept point lies from it. Coordinates and distances are in the input's
// units, named by Units.
type PrepData struct {
	Name     string           // section name, for titles; may be empty
	Units    string           // "mm", "in", "m", "chord"; empty reads "input units"
	Measured []geometry.Point // the kept input points
	Dropped  []DroppedPoint   // the input points that were left out
	Curve    []geometry.Point // the fitted curve, densely sampled, in order

	// S and Residual hold, for every kept point (same length as Measured,
	// or both empty), its arc-length position on the curve and its signed
	// normal distance from it.
	S, Residual []float64
	Tolerance   float64 // half-width of the band drawn on the deviation plot; 0 draws none

	LE, TE geometry.Point // leading and trailing edge (TE: trailing-edge midpoint)

	// CurveLabel names Curve in the legend and title; empty means "fitted
	// curve" (a caller drawing the ordered points before any fit says so).
	CurveLabel string
}

// DroppedPoint is one input point that was left out, with where it came
// from (for example "scan.csv:212") and why (for example "outlier").
type DroppedPoint struct {
	At     geometry.Point
	Label  string
	Reason string
}

// units returns the unit label of d.
func (d *PrepData) units() string {
	if d.Units == "" {
		return "input units"
	}
	return d.Units
}

// check validates d for PrepPlot and DeviationPlot.
func (d *PrepData) check() error {
	if len(d.Measured) == 0 && len(d.Curve) == 0 {
		return fmt.Errorf("%w: no measured points and no curve", ErrNoData)
	}
	var dropped []geometry.Point
	for _, p := range d.Dropped {
		dropped = append(dropped, p.At)
	}
	return firstErr(
		checkPoints("Measured", d.Measured),
		checkPoints("Curve", d.Curve),
		checkPoints("Dropped", dropped),
		checkPoints("LE", []geometry.Point{d.LE}),
		checkPoints("TE", []geometry.Point{d.TE}),
		checkValues("S", d.S),
		checkValues("Residual", d.Residual),
		checkValues("Tolerance", []float64{d.Tolerance}),
	)
}

// PrepPlot draws the kept points against the fitted curve, the dropped
// points marked and labelled with their source and reason, and, below, the
// leading- and trailing-edge regions magnified. All three panels keep equal
// axis scales. It returns an error wrapping ErrNoData when d has neither
// points nor curve, and an error naming the field for non-finite values.
func PrepPlot(d PrepData) (*Figure, error) {
	if err := d.check(); err != nil {
		return nil, err
	}
	measured, curve := xys(d.Measured), xys(d.Curve)
	dropped := make(plotter.XYs, len(d.Dropped))
	labels := make([]string, len(d.Dropped))
	for i, p := range d.Dropped {
		dropped[i].X, dropped[i].Y = p.At.X, p.At.Y
		labels[i] = p.Label
		if p.Reason != "" {
			labels[i] += " " + p.Reason
		}
	}
	all := bounds(measured, curve, dropped)
	span := math.Max(all.x1-all.x0, all.y1-all.y0)
	chord := d.LE.Dist(d.TE)
	if !(chord > 0) {
		chord = span
	}
	u := geometry.Point{X: 1}
	if d.LE.Dist(d.TE) > 0 {
		u = d.TE.Sub(d.LE).Scale(1 / d.LE.Dist(d.TE))
	}
	h := 0.06 * chord // half-size of the magnified windows
	leC, teC := d.LE.Add(u.Scale(0.55*h)), d.TE.Sub(u.Scale(0.55*h))
	leWin := box{leC.X - h, leC.X + h, leC.Y - h, leC.Y + h}
	teWin := box{teC.X - h, teC.X + h, teC.Y - h, teC.Y + h}

	u8 := d.units()
	curveLabel := d.CurveLabel
	if curveLabel == "" {
		curveLabel = "fitted curve"
	}
	title := strings.ToUpper(curveLabel[:1]) + curveLabel[1:] + " and input points"
	if d.Name != "" {
		title = d.Name + ": " + title
	}
	mainP := newPlot(title, "x ("+u8+")", "y ("+u8+")")
	edges := plotter.XYs{{X: d.LE.X, Y: d.LE.Y}, {X: d.TE.X, Y: d.TE.Y}}
	addPrepLayers := func(p *gplot.Plot, win *box, legend bool) error {
		if len(curve) >= 2 {
			l := newLine(curve, lineStyle(colInk, 1.2, nil))
			p.Add(l)
			if legend {
				p.Legend.Add(curveLabel, l)
			}
		}
		if len(measured) > 0 {
			shown, stride := thin(measured, maxDrawn)
			s := newScatter(shown, glyphStyle(colBlue, draw.CircleGlyph{}, 1.6))
			p.Add(s)
			if legend {
				p.Legend.Add(fmt.Sprintf("kept points (%d%s)", len(measured), strideNote(stride)), s)
			}
		}
		p.Add(newScatter(edges, glyphStyle(colInk, boldPlus{}, 5)))
		if len(dropped) > 0 {
			shown, stride := thin(dropped, maxDrawn)
			s := newScatter(shown, glyphStyle(colRed, boldCross{}, 4))
			p.Add(s)
			var in plotter.XYs
			var inLabels []string
			for i, q := range dropped {
				if win == nil || (q.X >= win.x0 && q.X <= win.x1 && q.Y >= win.y0 && q.Y <= win.y1) {
					in = append(in, q)
					inLabels = append(inLabels, labels[i])
				}
			}
			// Past maxLabels the labels cover the picture: label an even
			// share of them (the section document lists every one).
			if k := len(in); k > maxLabels {
				var sel plotter.XYs
				var selLabels []string
				for j := range maxLabels {
					i := j * k / maxLabels
					sel = append(sel, in[i])
					selLabels = append(selLabels, inLabels[i])
				}
				in, inLabels = sel, selLabels
			}
			if legend {
				note := strideNote(stride)
				if len(dropped) > maxLabels {
					note += fmt.Sprintf("; %d labelled", min(len(in), maxLabels))
				}
				p.Legend.Add(fmt.Sprintf("dropped points (%d%s)", len(dropped), note), s)
			}
			for i, q := range in {
				lb, err := plotter.NewLabels(plotter.XYLabels{XYs: plotter.XYs{q}, Labels: []string{inLabels[i]}})
				if err != nil {
					return fmt.Errorf("plot: dropped point labels: %w", err)
				}
				lb.TextStyle[0] = noteStyle(colRed)
				lb.Offset = vg.Point{X: vg.Points(5), Y: labelRise(q, curve)}
				p.Add(lb)
			}
		}
		return nil
	}
	if err := addPrepLayers(mainP, nil, true); err != nil {
		return nil, err
	}
	for _, w := range []struct {
		b    box
		name string
	}{{leWin, "LE"}, {teWin, "TE"}} {
		mainP.Add(newLine(boxOutline(w.b), lineStyle(colGuide, 0.8, []vg.Length{vg.Points(3), vg.Points(2)})))
		lb, err := plotter.NewLabels(plotter.XYLabels{XYs: plotter.XYs{{X: w.b.x0, Y: w.b.y1}}, Labels: []string{w.name}})
		if err != nil {
			return nil, fmt.Errorf("plot: window label: %w", err)
		}
		lb.TextStyle[0] = noteStyle(colGrey)
		lb.Offset = vg.Point{X: vg.Points(2), Y: vg.Points(2)}
		mainP.Add(lb)
	}
	mainP.Legend.Top, mainP.Legend.Left = true, true
	mainP.Legend.XOffs, mainP.Legend.YOffs = vg.Points(6), vg.Points(-4)
	want := all.grow(0.03)
	want.y1 += 0.45 * (want.y1 - want.y0) // room for the legend above the section
	want = unionBox(want, leWin.grow(0.02), teWin.grow(0.02))

	leP := newPlot("leading edge", "x ("+u8+")", "y ("+u8+")")
	teP := newPlot("trailing edge", "x ("+u8+")", "y ("+u8+")")
	if err := addPrepLayers(leP, &leWin, false); err != nil {
		return nil, err
	}
	if err := addPrepLayers(teP, &teWin, false); err != nil {
		return nil, err
	}

	f := &Figure{Width: 8 * vg.Inch}
	top := equalPanel(mainP, want)
	le, te := equalPanel(leP, leWin), equalPanel(teP, teWin)
	inner := f.Width - 2*figMargin
	h1 := top.equalHeight(inner)
	h2 := max(le.equalHeight((inner-colGap)/2), te.equalHeight((inner-colGap)/2))
	f.addRow(float64(h1), top)
	f.addRow(float64(h2), le, te)
	f.Height = h1 + h2 + rowGap + 2*figMargin
	return f, nil
}

// labelRise returns the vertical offset of the label of a point q off
// the curve: above q when q lies above the nearest point of the curve,
// below it (by the height of the text) otherwise, so that the label reads
// away from the curve and is not crossed by it.
func labelRise(q plotter.XY, curve plotter.XYs) vg.Length {
	best, above := math.Inf(1), true
	for _, c := range curve {
		if d := math.Hypot(q.X-c.X, q.Y-c.Y); d < best {
			best, above = d, q.Y >= c.Y
		}
	}
	if above {
		return vg.Points(4)
	}
	return -vg.Points(noteSize + 4)
}

// DeviationPlot draws the signed normal distance of every kept point from
// the fitted curve against its arc-length position, with the tolerance band
// shaded, the largest deviation marked and the leading edge's position
// (the kept point nearest d.LE) drawn as a vertical line. It returns an
// error wrapping ErrNoData when d has no residuals, and an error when S and
// Residual differ in length or hold non-finite values.
func DeviationPlot(d PrepData) (*Figure, error) {
	if err := d.check(); err != nil {
		return nil, err
	}
	if len(d.Residual) == 0 {
		return nil, fmt.Errorf("%w: no residuals", ErrNoData)
	}
	if err := checkLen("Residual", len(d.Residual), "S", len(d.S)); err != nil {
		return nil, err
	}
	u8 := d.units()
	pts := pairs(d.S, d.Residual)
	slices.SortStableFunc(pts, func(a, b plotter.XY) int {
		switch {
		case a.X < b.X:
			return -1
		case a.X > b.X:
			return 1
		}
		return 0
	})
	var sum2, worst float64
	iw := 0
	for i, q := range pts {
		sum2 += q.Y * q.Y
		if math.Abs(q.Y) > worst {
			worst, iw = math.Abs(q.Y), i
		}
	}
	rms := math.Sqrt(sum2 / float64(len(pts)))

	title := "Deviation from the fitted curve"
	if d.Name != "" {
		title = d.Name + ": " + title
	}
	p := newPlot(title, "arc length ("+u8+")", "normal deviation ("+u8+")")
	s0, s1 := pts[0].X, pts[len(pts)-1].X
	if s1 == s0 {
		s0, s1 = s0-1, s1+1
	}
	lim := math.Max(worst, d.Tolerance)
	if lim == 0 {
		lim = 1
	}
	if d.Tolerance > 0 {
		t := d.Tolerance
		band := newPolygon(plotter.XYs{{X: s0, Y: -t}, {X: s1, Y: -t}, {X: s1, Y: t}, {X: s0, Y: t}}, colBand, draw.LineStyle{})
		p.Add(band)
		p.Legend.Add(fmt.Sprintf("tolerance ±%.3g %s", t, u8), band)
	}
	p.Add(newLine(plotter.XYs{{X: s0, Y: 0}, {X: s1, Y: 0}}, lineStyle(colGuide, 0.8, nil)))
	if len(d.Measured) == len(d.S) && len(d.S) > 0 {
		best, sLE := math.Inf(1), 0.0
		for i, m := range d.Measured {
			if dist := m.Dist(d.LE); dist < best {
				best, sLE = dist, d.S[i]
			}
		}
		p.Add(newLine(plotter.XYs{{X: sLE, Y: -1.2 * lim}, {X: sLE, Y: 1.2 * lim}}, lineStyle(colGrey, 0.8, []vg.Length{vg.Points(4), vg.Points(3)})))
		// The label goes at the end of the line away from the largest
		// deviation, whose own label it would otherwise cover.
		at, rise := leLabelEnd(pts[iw].Y, lim)
		lb, err := plotter.NewLabels(plotter.XYLabels{XYs: plotter.XYs{{X: sLE, Y: at}}, Labels: []string{"LE"}})
		if err != nil {
			return nil, fmt.Errorf("plot: LE label: %w", err)
		}
		lb.TextStyle[0] = noteStyle(colGrey)
		lb.Offset = vg.Point{X: vg.Points(3), Y: rise}
		p.Add(lb)
	}
	drawn, stride := thin(pts, maxDrawn)
	l := newLine(drawn, lineStyle(colBlue, 0.6, nil))
	sc := newScatter(drawn, glyphStyle(colBlue, draw.CircleGlyph{}, 1.5))
	p.Add(l, sc)
	p.Legend.Add(fmt.Sprintf("kept points (rms %.3g %s%s)", rms, u8, strideNote(stride)), l, sc)
	if d.Tolerance > 0 {
		var out plotter.XYs
		for _, q := range pts {
			if math.Abs(q.Y) > d.Tolerance {
				out = append(out, q)
			}
		}
		if len(out) > 0 {
			shown, _ := thin(out, maxDrawn)
			so := newScatter(shown, glyphStyle(colRed, draw.CircleGlyph{}, 2.4))
			p.Add(so)
			p.Legend.Add(fmt.Sprintf("outside tolerance (%d)", len(out)), so)
		}
	}
	wp := plotter.XYs{pts[iw]}
	p.Add(newScatter(wp, glyphStyle(colRed, draw.RingGlyph{}, 4.5)))
	lb, err := plotter.NewLabels(plotter.XYLabels{XYs: wp, Labels: []string{fmt.Sprintf("max %.3g %s", worst, u8)}})
	if err != nil {
		return nil, fmt.Errorf("plot: max label: %w", err)
	}
	lb.TextStyle[0] = noteStyle(colRed)
	lb.Offset = vg.Point{X: vg.Points(6), Y: vg.Points(-4)}
	p.Add(lb)
	p.Legend.Top = true
	setXRange(p, s0-0.01*(s1-s0), s1+0.01*(s1-s0))
	setYRange(p, -1.35*lim, 1.75*lim)
	f := &Figure{Width: 8 * vg.Inch, Height: 3.6 * vg.Inch}
	f.addRow(1, freePanel(p))
	return f, nil
}

// leLabelEnd returns where the label of the leading-edge line of the
// deviation chart goes (its y, and the offset of the text from it): at the
// lower end of the line when the largest deviation worst is positive (its
// label is near the top), at the upper end otherwise. lim is the half
// height of the line.
func leLabelEnd(worst, lim float64) (y float64, rise vg.Length) {
	if worst >= 0 {
		return -1.2 * lim, vg.Points(2)
	}
	return 1.2 * lim, -vg.Points(12)
}

// NodesPlot draws repanelled nodes (normalised frame, node order) and the
// quality of their panels: panel length against panel index, the length
// ratio of each panel to the one before, and the turning angle at each
// interior node. It returns an error wrapping ErrNoData for fewer than 3
// nodes, and an error for non-finite nodes.
func NodesPlot(nodes []geometry.Point) (*Figure, error) {
	if len(nodes) < 3 {
		return nil, fmt.Errorf("%w: %d node(s), want at least 3", ErrNoData, len(nodes))
	}
	if err := checkPoints("nodes", nodes); err != nil {
		return nil, err
	}
	n := len(nodes) - 1 // panels
	var lengths, ratios, turns plotter.XYs
	for i := range n {
		lengths = append(lengths, plotter.XY{X: float64(i), Y: nodes[i].Dist(nodes[i+1])})
	}
	for i := 1; i < n; i++ {
		a, b := lengths[i-1].Y, lengths[i].Y
		if a > 0 && b > 0 {
			ratios = append(ratios, plotter.XY{X: float64(i), Y: b / a})
		}
		e, g := nodes[i].Sub(nodes[i-1]), nodes[i+1].Sub(nodes[i])
		if e.Norm() > 0 && g.Norm() > 0 {
			turn := math.Atan2(e.Cross(g), e.Dot(g)) * 180 / math.Pi
			turns = append(turns, plotter.XY{X: float64(i), Y: turn})
		}
	}
	pts := xys(nodes)
	top := newPlot(fmt.Sprintf("Repanelled nodes (%d panels)", n), "x/c", "y/c")
	top.Add(newLine(pts, lineStyle(colInk, 0.8, nil)), newScatter(pts, glyphStyle(colBlue, draw.CircleGlyph{}, 1.6)))
	ile := 0
	for i, p := range nodes {
		if p.X < nodes[ile].X {
			ile = i
		}
	}
	top.Add(newScatter(plotter.XYs{pts[ile]}, glyphStyle(colInk, boldPlus{}, 5)))
	want := bounds(pts).grow(0.03)

	quality := func(title, xl, yl string, q plotter.XYs, c int, ref float64) *gplot.Plot {
		p := newPlot(title, xl, yl)
		if len(q) > 0 {
			p.Add(newLine(plotter.XYs{{X: 0, Y: ref}, {X: float64(n), Y: ref}}, lineStyle(colGuide, 0.8, nil)))
			p.Add(newLine(q, lineStyle(seriesColour(c), 0.8, nil)), newScatter(q, glyphStyle(seriesColour(c), seriesGlyphs[c], 1.4)))
		}
		setXRange(p, 0, float64(n))
		return p
	}
	pl := quality("panel length", "panel index", "length (chord)", lengths, 0, 0)
	pl.Y.Min = 0
	pr := quality("length ratio to previous panel", "node index", "ratio", ratios, 1, 1)
	pt := quality("turning angle", "node index", "angle (deg)", turns, 3, 0)

	f := &Figure{Width: 8 * vg.Inch}
	tp := equalPanel(top, want)
	inner := f.Width - 2*figMargin
	h1 := tp.equalHeight(inner)
	h2 := 2.1 * vg.Inch
	f.addRow(float64(h1), tp)
	f.addRow(float64(h2), freePanel(pl), freePanel(pr), freePanel(pt))
	f.Height = h1 + h2 + rowGap + 2*figMargin
	return f, nil
}

// noteStyle returns the text style of annotations.
func noteStyle(c color.Color) text.Style {
	return text.Style{Color: c, Font: textFont(noteSize), Handler: gplot.DefaultTextHandler}
}

// boxOutline returns the closed outline of b.
func boxOutline(b box) plotter.XYs {
	return plotter.XYs{{X: b.x0, Y: b.y0}, {X: b.x1, Y: b.y0}, {X: b.x1, Y: b.y1}, {X: b.x0, Y: b.y1}, {X: b.x0, Y: b.y0}}
}

// unionBox returns the smallest box holding all of bs.
func unionBox(bs ...box) box {
	u := box{math.Inf(1), math.Inf(-1), math.Inf(1), math.Inf(-1)}
	for _, b := range bs {
		u = box{math.Min(u.x0, b.x0), math.Max(u.x1, b.x1), math.Min(u.y0, b.y0), math.Max(u.y1, b.y1)}
	}
	return u
}

// boldCross is a diagonal cross drawn with a heavy line, for dropped points.
type boldCross struct{}

// DrawGlyph implements draw.GlyphDrawer.
func (boldCross) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	c.SetLineStyle(draw.LineStyle{Color: sty.Color, Width: vg.Points(1.6)})
	r := sty.Radius
	var p vg.Path
	p.Move(vg.Point{X: pt.X - r, Y: pt.Y - r})
	p.Line(vg.Point{X: pt.X + r, Y: pt.Y + r})
	p.Move(vg.Point{X: pt.X - r, Y: pt.Y + r})
	p.Line(vg.Point{X: pt.X + r, Y: pt.Y - r})
	c.Stroke(p)
}

// boldPlus is an upright plus drawn with a medium line, for the leading and
// trailing edge.
type boldPlus struct{}

// DrawGlyph implements draw.GlyphDrawer.
func (boldPlus) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	c.SetLineStyle(draw.LineStyle{Color: sty.Color, Width: vg.Points(1.2)})
	r := sty.Radius
	var p vg.Path
	p.Move(vg.Point{X: pt.X - r, Y: pt.Y})
	p.Line(vg.Point{X: pt.X + r, Y: pt.Y})
	p.Move(vg.Point{X: pt.X, Y: pt.Y - r})
	p.Line(vg.Point{X: pt.X, Y: pt.Y + r})
	c.Stroke(p)
}

// maxDrawn is the most points of one set a picture draws: a scan of a
// million points draws as a band either way, and every marker costs
// (a picture of 1e5 points took 15 s of processor time); maxLabels is the
// most dropped points labelled in one panel.
const (
	maxDrawn  = 20000
	maxLabels = 30
)

// thin returns every k-th point of pts, k the least stride that leaves at
// most limit, keeping the point of largest |Y| (the worst deviation) and
// the last point; and k.
func thin(pts plotter.XYs, limit int) (plotter.XYs, int) {
	if len(pts) <= limit {
		return pts, 1
	}
	k := (len(pts) + limit - 1) / limit
	worst := 0
	for i, q := range pts {
		if math.Abs(q.Y) > math.Abs(pts[worst].Y) {
			worst = i
		}
	}
	out := make(plotter.XYs, 0, limit+2)
	for i := 0; i < len(pts); i += k {
		if worst > i-k && worst < i && worst != i {
			out = append(out, pts[worst])
		}
		out = append(out, pts[i])
	}
	if last := len(pts) - 1; last%k != 0 {
		if worst > last-last%k && worst < last {
			out = append(out, pts[worst])
		}
		out = append(out, pts[last])
	}
	return out, k
}

// strideNote says which share of a set a picture draws.
func strideNote(k int) string {
	if k <= 1 {
		return ""
	}
	return fmt.Sprintf("; every %s drawn", ordinal(k))
}

// ordinal returns "2nd", "3rd", "4th", ... for k ≥ 2.
func ordinal(k int) string {
	suffix := "th"
	switch {
	case k%100 >= 11 && k%100 <= 13:
	case k%10 == 1:
		suffix = "st"
	case k%10 == 2:
		suffix = "nd"
	case k%10 == 3:
		suffix = "rd"
	}
	return fmt.Sprintf("%d%s", k, suffix)
}
