package plot

import (
	"fmt"
	"math"
	"slices"
	"strconv"

	gplot "gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/foilwright/foilwright/geometry"
)

// CompareData is a measured section held against its design, in the
// design's part frame and the measurement's units (named by Units): the
// design's outline and, for every measured point, the foot of its
// deviation on the design, the direction in which it is measured and its
// signed size (> 0: material outside the design), whether it lies within
// its tolerance, where its foot lies along the outline and the limits of
// its band.
type CompareData struct {
	Name   string           // section name, for titles; may be empty
	Units  string           // "mm", "in", "m", "chord"; empty reads "input units"
	Design []geometry.Point // the design's outline, densely sampled, closed
	LE, TE geometry.Point   // the design's leading edge and trailing-edge point

	Feet      []geometry.Point // foot of each point's deviation on the design
	Normals   []geometry.Point // unit direction of each deviation
	Deviation []float64
	In        []bool
	// Magnify is the factor the deviations are drawn at on the outline; 0
	// chooses one that draws the largest at about 6 % of the chord.
	Magnify float64

	// S is the arc length of each foot along the outline from the upper
	// trailing edge; SLE that of the leading edge. Lower and Upper are the
	// limits of each point's band (NaN where none applies).
	S            []float64
	SLE          float64
	Lower, Upper []float64
}

func (d *CompareData) units() string {
	if d.Units == "" {
		return "input units"
	}
	return d.Units
}

// check validates d.
func (d *CompareData) check() error {
	n := len(d.Feet)
	if n == 0 || len(d.Design) < 3 {
		return fmt.Errorf("%w: %d point(s), %d design point(s)", ErrNoData, n, len(d.Design))
	}
	return firstErr(
		checkPoints("Design", d.Design), checkPoints("Feet", d.Feet), checkPoints("Normals", d.Normals),
		checkPoints("LE", []geometry.Point{d.LE}), checkPoints("TE", []geometry.Point{d.TE}),
		checkValues("Deviation", d.Deviation), checkValues("S", d.S),
		checkValues("Magnify", []float64{d.Magnify}), checkValues("SLE", []float64{d.SLE}),
		checkLen("Normals", len(d.Normals), "Feet", n), checkLen("Deviation", len(d.Deviation), "Feet", n),
		checkLen("In", len(d.In), "Feet", n),
	)
}

// Magnification returns the factor CompareOutlinePlot draws the
// deviations at: d.Magnify, or a round factor (1, 2 or 5 times a power of
// ten) that draws the largest deviation at about 6 % of the chord.
func (d *CompareData) Magnification() float64 {
	if d.Magnify > 0 {
		return d.Magnify
	}
	var worst float64
	for _, v := range d.Deviation {
		worst = math.Max(worst, math.Abs(v))
	}
	chord := d.LE.Dist(d.TE)
	if !(worst > 0) || !(chord > 0) {
		return 1
	}
	raw := 0.06 * chord / worst
	p := math.Pow(10, math.Floor(math.Log10(raw)))
	for _, m := range []float64{5, 2, 1} {
		if m*p <= raw {
			return m * p
		}
	}
	return p
}

// CompareOutlinePlot draws the design's outline with every deviation as a
// whisker along its direction from its foot, magnified (the factor is in
// the title and legend), blue within tolerance and red outside, and below,
// the leading- and trailing-edge regions at the same magnification. All
// panels keep equal axis scales. It returns an error wrapping ErrNoData
// when d has no points, and an error naming the field for non-finite or
// mismatched data.
func CompareOutlinePlot(d CompareData) (*Figure, error) {
	if err := d.check(); err != nil {
		return nil, err
	}
	k := d.Magnification()
	u8 := d.units()
	design := xys(d.Design)
	var inW, outW []plotter.XYs
	var tips plotter.XYs
	for i, f := range d.Feet {
		tip := f.Add(d.Normals[i].Scale(k * d.Deviation[i]))
		seg := plotter.XYs{{X: f.X, Y: f.Y}, {X: tip.X, Y: tip.Y}}
		tips = append(tips, plotter.XY{X: tip.X, Y: tip.Y})
		if d.In[i] {
			inW = append(inW, seg)
		} else {
			outW = append(outW, seg)
		}
	}
	chord := d.LE.Dist(d.TE)
	if !(chord > 0) {
		b := bounds(design)
		chord = math.Max(b.x1-b.x0, b.y1-b.y0)
	}
	u := geometry.Point{X: 1}
	if d.LE.Dist(d.TE) > 0 {
		u = d.TE.Sub(d.LE).Scale(1 / d.LE.Dist(d.TE))
	}
	h := 0.07 * chord
	leC, teC := d.LE.Add(u.Scale(0.5*h)), d.TE.Sub(u.Scale(0.5*h))
	leWin := box{leC.X - h, leC.X + h, leC.Y - h, leC.Y + h}
	teWin := box{teC.X - h, teC.X + h, teC.Y - h, teC.Y + h}

	factor := "×" + strconv.FormatFloat(k, 'g', 4, 64)
	title := "Deviation from the design, drawn " + factor
	if d.Name != "" {
		title = d.Name + ": " + title
	}
	layers := func(p *gplot.Plot, legend bool) {
		l := newLine(design, lineStyle(colInk, 1.1, nil))
		p.Add(l)
		if legend {
			p.Legend.Add("design", l)
		}
		for k, set := range [][]plotter.XYs{inW, outW} {
			col := colBlue
			label := fmt.Sprintf("within tolerance (%d)", len(set))
			if k == 1 {
				col, label = colRed, fmt.Sprintf("out of tolerance (%d)", len(set))
			}
			var first *plotter.Line
			for _, seg := range set {
				w := newLine(seg, lineStyle(col, 0.9, nil))
				if first == nil {
					first = w
				}
				p.Add(w)
			}
			if legend && first != nil {
				p.Legend.Add(label, first)
			}
		}
		p.Add(newLine(tips, lineStyle(colGrey, 0.5, seriesDashes[2])))
		p.Add(newScatter(plotter.XYs{{X: d.LE.X, Y: d.LE.Y}, {X: d.TE.X, Y: d.TE.Y}}, glyphStyle(colInk, boldPlus{}, 5)))
	}
	mainP := newPlot(title, "x ("+u8+")", "y ("+u8+")")
	layers(mainP, true)
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
	want := bounds(design, tips).grow(0.03)
	want.y1 += 0.5 * (want.y1 - want.y0)
	want = unionBox(want, leWin.grow(0.02), teWin.grow(0.02))
	leP := newPlot("leading edge", "x ("+u8+")", "y ("+u8+")")
	teP := newPlot("trailing edge", "x ("+u8+")", "y ("+u8+")")
	layers(leP, false)
	layers(teP, false)

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

// CompareDeviationPlot draws every point's deviation against the arc
// length of its foot along the design's outline (from the upper trailing
// edge over the nose), the limits of the tolerance bands as steps, the
// points outside them in red, and the leading edge as a vertical line. It
// returns an error wrapping ErrNoData when d has no points, and an error
// for non-finite or mismatched data.
func CompareDeviationPlot(d CompareData) (*Figure, error) {
	if err := d.check(); err != nil {
		return nil, err
	}
	n := len(d.Feet)
	if err := firstErr(checkLen("S", len(d.S), "Feet", n), checkLen("Lower", len(d.Lower), "Feet", n), checkLen("Upper", len(d.Upper), "Feet", n)); err != nil {
		return nil, err
	}
	u8 := d.units()
	idx := make([]int, n)
	for i := range idx {
		idx[i] = i
	}
	slices.SortStableFunc(idx, func(a, b int) int {
		switch {
		case d.S[a] < d.S[b]:
			return -1
		case d.S[a] > d.S[b]:
			return 1
		}
		return 0
	})
	var pts, outs, lo, hi plotter.XYs
	lim := 0.0
	for _, i := range idx {
		q := plotter.XY{X: d.S[i], Y: d.Deviation[i]}
		pts = append(pts, q)
		if !d.In[i] {
			outs = append(outs, q)
		}
		lim = math.Max(lim, math.Abs(q.Y))
		if !math.IsNaN(d.Lower[i]) && !math.IsNaN(d.Upper[i]) {
			lo = append(lo, plotter.XY{X: d.S[i], Y: d.Lower[i]})
			hi = append(hi, plotter.XY{X: d.S[i], Y: d.Upper[i]})
			lim = math.Max(lim, math.Max(math.Abs(d.Lower[i]), math.Abs(d.Upper[i])))
		}
	}
	if lim == 0 {
		lim = 1
	}
	title := "Deviation from the design along its outline"
	if d.Name != "" {
		title = d.Name + ": " + title
	}
	p := newPlot(title, "arc length from the upper trailing edge ("+u8+")", "normal deviation ("+u8+")")
	s0, s1 := pts[0].X, pts[len(pts)-1].X
	if s1 == s0 {
		s0, s1 = s0-1, s1+1
	}
	if len(lo) > 0 {
		band := newPolygon(append(append(plotter.XYs{}, hi...), reversed(lo)...), colBand, draw.LineStyle{})
		p.Add(band)
		edge := lineStyle(colSky, 0.8, nil)
		p.Add(newLine(lo, edge), newLine(hi, edge))
		p.Legend.Add("tolerance band", band)
	}
	p.Add(newLine(plotter.XYs{{X: s0, Y: 0}, {X: s1, Y: 0}}, lineStyle(colGuide, 0.8, nil)))
	p.Add(newLine(plotter.XYs{{X: d.SLE, Y: -1.2 * lim}, {X: d.SLE, Y: 1.2 * lim}}, lineStyle(colGrey, 0.8, []vg.Length{vg.Points(4), vg.Points(3)})))
	lb, err := plotter.NewLabels(plotter.XYLabels{XYs: plotter.XYs{{X: d.SLE, Y: 1.2 * lim}}, Labels: []string{"LE"}})
	if err != nil {
		return nil, fmt.Errorf("plot: LE label: %w", err)
	}
	lb.TextStyle[0] = noteStyle(colGrey)
	lb.Offset = vg.Point{X: vg.Points(3), Y: vg.Points(-12)}
	p.Add(lb)
	l := newLine(pts, lineStyle(colBlue, 0.6, nil))
	sc := newScatter(pts, glyphStyle(colBlue, draw.CircleGlyph{}, 1.5))
	p.Add(l, sc)
	p.Legend.Add(fmt.Sprintf("measured points (%d)", n), l, sc)
	if len(outs) > 0 {
		so := newScatter(outs, glyphStyle(colRed, draw.CircleGlyph{}, 2.4))
		p.Add(so)
		p.Legend.Add(fmt.Sprintf("out of tolerance (%d)", len(outs)), so)
	}
	p.Legend.Top = true
	p.Legend.XOffs = vg.Points(-6)
	setXRange(p, s0-0.01*(s1-s0), s1+0.01*(s1-s0))
	setYRange(p, -1.35*lim, 1.8*lim)
	f := &Figure{Width: 8 * vg.Inch, Height: 3.6 * vg.Inch}
	f.addRow(1, freePanel(p))
	return f, nil
}

func reversed(pts plotter.XYs) plotter.XYs {
	out := make(plotter.XYs, len(pts))
	for i, q := range pts {
		out[len(pts)-1-i] = q
	}
	return out
}

// DeltaCpData is the pressure distribution of a measured section and its
// design at one angle of attack (each in its own chord frame, node order),
// and the difference along the chord on each surface: (x/c, ΔCp) with ΔCp
// the measured Cp less the design's, upper and lower, in x order.
type DeltaCpData struct {
	Name             string
	Method           string           // the stage, e.g. "vortex-panel"
	AlphaDeg         float64          // the design's angle of attack, degrees
	Design, Measured []geometry.Point // (x, Cp) in node order
	Upper, Lower     []geometry.Point // (x, ΔCp) in x order
}

// DeltaCpPlot draws, above, Cp of the design (solid) and of the measured
// section (dashed) against x/c, Cp axis inverted (suction up, as is the
// custom of the trade: common practice), and below, on the same x range,
// ΔCp on the upper (solid) and lower (dashed) surface. The vertical ranges
// follow the values between x/c = 0.002 and 0.99, so that the corners of a
// blunt trailing edge, where the Cp of a panel method runs off, do not
// squash the rest; values beyond are cut off. It returns an error
// wrapping ErrNoData when there is no difference to draw, and an error
// for non-finite values.
func DeltaCpPlot(d DeltaCpData) (*Figure, error) {
	if len(d.Upper)+len(d.Lower) == 0 {
		return nil, fmt.Errorf("%w: no ΔCp", ErrNoData)
	}
	if err := firstErr(checkPoints("Design", d.Design), checkPoints("Measured", d.Measured),
		checkPoints("Upper", d.Upper), checkPoints("Lower", d.Lower), checkValues("AlphaDeg", []float64{d.AlphaDeg})); err != nil {
		return nil, err
	}
	title := fmt.Sprintf("Pressure, measured against design, α = %g°", d.AlphaDeg)
	if d.Method != "" {
		title += ", " + d.Method
	}
	if d.Name != "" {
		title = d.Name + ": " + title
	}
	cp := newPlot(title, "", "Cp")
	cp.Y.Scale = gplot.InvertedScale{Normalizer: gplot.LinearScale{}}
	var cps []float64
	for k, s := range []struct {
		pts  []geometry.Point
		name string
	}{{d.Design, "design"}, {d.Measured, "measured"}} {
		if len(s.pts) < 2 {
			continue
		}
		l := newLine(xys(s.pts), lineStyle(seriesColour(k), 1.1, seriesDashes[k]))
		cp.Add(l)
		cp.Legend.Add(s.name, l)
		for _, q := range s.pts {
			if q.X > 0.002 && q.X < 0.99 {
				cps = append(cps, q.Y)
			}
		}
	}
	dp := newPlot("", "x/c", "ΔCp, measured − design")
	var ds []float64
	for k, s := range []struct {
		pts  []geometry.Point
		name string
	}{{d.Upper, "upper surface"}, {d.Lower, "lower surface"}} {
		if len(s.pts) < 1 {
			continue
		}
		l := newLine(xys(s.pts), lineStyle(seriesColour(k), 1.1, seriesDashes[k]))
		sc := newScatter(xys(s.pts), glyphStyle(seriesColour(k), seriesGlyphs[k], 1.3))
		dp.Add(l, sc)
		dp.Legend.Add(s.name, l, sc)
		for _, q := range s.pts {
			if q.X > 0.002 && q.X < 0.99 {
				ds = append(ds, q.Y)
			}
		}
	}
	for _, p := range []*gplot.Plot{cp, dp} {
		p.Add(newLine(plotter.XYs{{X: -0.02, Y: 0}, {X: 1.02, Y: 0}}, lineStyle(colGuide, 0.8, nil)))
		setXRange(p, -0.02, 1.02)
	}
	lo, hi := rangePad(0.05, cps, []float64{0})
	setYRange(cp, lo-0.15*(hi-lo), math.Max(hi, 1.05))
	cp.Legend.Top = true
	cp.Legend.XOffs = vg.Points(-6)
	lo, hi = rangePad(0.1, ds, []float64{0})
	setYRange(dp, lo, hi+0.25*(hi-lo))
	dp.Legend.Top = true
	dp.Legend.XOffs = vg.Points(-6)
	f := &Figure{Width: 7 * vg.Inch, Height: 6 * vg.Inch}
	f.addRow(3, freePanel(cp))
	f.addRow(2, freePanel(dp))
	return f, nil
}
