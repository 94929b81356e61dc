package plot

import (
	"fmt"
	"image/color"
	"math"

	gplot "gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/foilwright/foilwright/geometry"
)

// CpCase is the pressure distribution of one case: Cp at the points (X, Y)
// (chord units, normalised frame) in node order, trailing edge → upper
// surface → leading edge → lower surface. The point of least x splits the
// upper from the lower surface.
type CpCase struct {
	AlphaDeg float64 // angle of attack, degrees
	Method   string  // the stage or method that computed it, e.g. "vortex-panel"
	X, Y, Cp []float64
}

// CpOptions add to a Cp chart.
type CpOptions struct {
	// Note, when set, is added to the title: what the chart leaves out,
	// e.g. "5 of 9 angles".
	Note string
	// Outline, when it has 3 or more points, is the section (chord units,
	// normalised frame) drawn in a strip below the chart, on its x axis,
	// so that each feature of Cp sits over the part of the section it
	// belongs to.
	Outline []geometry.Point
}

// CpPlot draws Cp against x/c for one or more cases on one chart, with the
// Cp axis inverted (suction up) as is the custom of the trade (common
// practice). The upper surface is drawn solid and the lower dashed; with one
// case the surfaces also differ in colour, with several each case has its
// colour and the keys of the two line styles are drawn in black. It returns
// an error wrapping ErrNoData for no cases or a case with fewer than 3
// points, and an error for lengths that differ or non-finite values.
func CpPlot(cases []CpCase, o CpOptions) (*Figure, error) {
	if len(cases) == 0 {
		return nil, fmt.Errorf("%w: no Cp cases", ErrNoData)
	}
	if err := checkPoints("Outline", o.Outline); err != nil {
		return nil, err
	}
	title := "Pressure distribution"
	sameMethod := true
	for _, c := range cases {
		sameMethod = sameMethod && c.Method == cases[0].Method
	}
	if sameMethod && cases[0].Method != "" {
		title += ", " + cases[0].Method
	}
	if len(cases) == 1 {
		title += fmt.Sprintf(", α = %g°", cases[0].AlphaDeg)
	}
	if o.Note != "" {
		title += " (" + o.Note + ")"
	}
	p := newPlot(title, "x/c", "Cp")
	p.Y.Scale = gplot.InvertedScale{Normalizer: gplot.LinearScale{}}
	var xs, cps []float64
	for k, c := range cases {
		field := fmt.Sprintf("cases[%d]", k)
		if len(c.X) < 3 {
			return nil, fmt.Errorf("%w: %s has %d point(s), want at least 3", ErrNoData, field, len(c.X))
		}
		if err := firstErr(
			checkLen(field+".Y", len(c.Y), field+".X", len(c.X)),
			checkLen(field+".Cp", len(c.Cp), field+".X", len(c.X)),
			checkValues(field+".X", c.X), checkValues(field+".Y", c.Y), checkValues(field+".Cp", c.Cp),
			checkValues(field+".AlphaDeg", []float64{c.AlphaDeg}),
		); err != nil {
			return nil, err
		}
		le := 0
		for i, x := range c.X {
			if x < c.X[le] {
				le = i
			}
		}
		pts := pairs(c.X, c.Cp)
		surfaces := []struct {
			pts  plotter.XYs
			name string
			col  color.Color
			dash []vg.Length
		}{
			{pts[:le+1], "upper surface", seriesColour(k), nil},
			{pts[le:], "lower surface", seriesColour(k), seriesDashes[1]},
		}
		if len(cases) == 1 {
			surfaces[0].col, surfaces[1].col = colBlue, colOrange
		}
		shape := seriesGlyphs[k%len(seriesGlyphs)]
		for si, s := range surfaces {
			l := newLine(s.pts, lineStyle(s.col, 1.2, s.dash))
			p.Add(l)
			thumbs := []gplot.Thumbnailer{l}
			if len(pts) <= 80 {
				// Few points: show where they are.
				sc := newScatter(s.pts, glyphStyle(s.col, shape, 1.8))
				p.Add(sc)
				thumbs = append(thumbs, sc)
			}
			switch {
			case len(cases) == 1:
				p.Legend.Add(s.name, thumbs...)
			case si == 0:
				name := fmt.Sprintf("α = %g°", c.AlphaDeg)
				if !sameMethod && c.Method != "" {
					name = c.Method + ", " + name
				}
				p.Legend.Add(name, thumbs...)
			}
		}
		xs = append(xs, c.X...)
		cps = append(cps, c.Cp...)
	}
	if len(cases) > 1 {
		upper, lower := cpStyleKeys()
		p.Legend.Add("upper surface", newLine(nil, upper))
		p.Legend.Add("lower surface", newLine(nil, lower))
	}
	entries := len(cases) + 2
	if len(cases) == 1 {
		entries = 2
	}
	x0, x1 := rangePad(0.02, xs)
	p.Add(newLine(plotter.XYs{{X: x0, Y: 0}, {X: x1, Y: 0}}, lineStyle(colGuide, 0.8, nil)))
	lo, hi := rangePad(0.05, cps, []float64{0})
	lo -= 0.045 * float64(entries) * (hi - lo) // room for the legend above the suction peak
	setXRange(p, x0, x1)
	setYRange(p, lo, math.Max(hi, 1.05))
	p.Legend.Top = true
	p.Legend.XOffs = vg.Points(-6)
	f := &Figure{Width: 7 * vg.Inch, Height: 4.5 * vg.Inch}
	cp := freePanel(p)
	f.addRow(4.5, cp)
	if len(o.Outline) >= 3 {
		p.X.Label.Text = ""
		sp := newPlot("", "x/c", "y/c")
		pts := xys(o.Outline)
		sp.Add(newPolygon(pts, colFill, draw.LineStyle{}))
		sp.Add(newLine(plotter.XYs{{X: 0, Y: 0}, {X: 1, Y: 0}}, lineStyle(colGuide, 0.8, []vg.Length{vg.Points(2), vg.Points(2)})))
		sp.Add(newLine(pts, lineStyle(colInk, 1, nil)))
		var ys []float64
		for _, q := range o.Outline {
			ys = append(ys, q.Y)
		}
		lo, hi := rangePad(0.15, ys)
		setYRange(sp, lo, hi)
		setXRange(sp, x0, x1)
		strip := freePanel(sp)
		strip.xFrom = cp
		f.addRow(1.3, strip)
		f.Height += 1.3*vg.Inch + rowGap
	}
	return f, nil
}

// cpStyleKeys returns the legend keys of the two line styles of a chart of
// several cases: solid and dashed, in ink, a colour no case takes.
func cpStyleKeys() (upper, lower draw.LineStyle) {
	return lineStyle(colInk, 1.2, nil), lineStyle(colInk, 1.2, seriesDashes[1])
}

// TrailingEdgeCorners returns the indexes of the Cp points of a blunt
// trailing edge to leave out of a chart: the points within one base
// length (the distance between the first and last node) of either corner,
// where inviscid flow turns round a sharp corner and Cp is singular
// (common practice). nodes are the section's nodes, pts the points Cp is
// given at; none is left out of a sharp section.
func TrailingEdgeCorners(nodes []geometry.Point, pts []geometry.Point) map[int]bool {
	out := map[int]bool{}
	if len(nodes) < 2 {
		return out
	}
	u, l := nodes[0], nodes[len(nodes)-1]
	base := u.Dist(l)
	if base <= 1e-12 {
		return out
	}
	for i, q := range pts {
		if q.Dist(u) <= base*(1+1e-9) || q.Dist(l) <= base*(1+1e-9) {
			out[i] = true
		}
	}
	return out
}

// PolarSeries is a polar computed by one method: lift and moment
// coefficients (moment about the quarter chord, positive nose-up) against
// the angle of attack. Cm may be nil.
type PolarSeries struct {
	Method   string
	AlphaDeg []float64
	Cl, Cm   []float64
}

// PolarPlot draws Cl against α (top) and Cm against α (bottom, sharing the
// α axis) for several methods, each with its colour, line dash and marker.
// It returns an error wrapping ErrNoData for no series or an empty series,
// and an error for lengths that differ or non-finite values.
func PolarPlot(series []PolarSeries) (*Figure, error) {
	if len(series) == 0 {
		return nil, fmt.Errorf("%w: no polar series", ErrNoData)
	}
	cl := newPlot("Lift and moment", "", "Cl")
	cm := newPlot("", "α (deg)", "Cm, c/4")
	var as, cls, cms []float64
	for k, s := range series {
		field := fmt.Sprintf("series[%d]", k)
		if len(s.AlphaDeg) == 0 {
			return nil, fmt.Errorf("%w: %s has no angles", ErrNoData, field)
		}
		if err := firstErr(
			checkLen(field+".Cl", len(s.Cl), field+".AlphaDeg", len(s.AlphaDeg)),
			checkValues(field+".AlphaDeg", s.AlphaDeg), checkValues(field+".Cl", s.Cl), checkValues(field+".Cm", s.Cm),
		); err != nil {
			return nil, err
		}
		if s.Cm != nil {
			if err := checkLen(field+".Cm", len(s.Cm), field+".AlphaDeg", len(s.AlphaDeg)); err != nil {
				return nil, err
			}
		}
		name := s.Method
		if name == "" {
			name = fmt.Sprintf("series %d", k+1)
		}
		col, dash, shape := seriesColour(k), seriesDashes[k%len(seriesDashes)], seriesGlyphs[k%len(seriesGlyphs)]
		pts := pairs(s.AlphaDeg, s.Cl)
		l, sc := newLine(pts, lineStyle(col, 1.2, dash)), newScatter(pts, glyphStyle(col, shape, 2.5))
		cl.Add(l, sc)
		cl.Legend.Add(name, l, sc)
		as, cls = append(as, s.AlphaDeg...), append(cls, s.Cl...)
		if s.Cm != nil {
			pts := pairs(s.AlphaDeg, s.Cm)
			cm.Add(newLine(pts, lineStyle(col, 1.2, dash)), newScatter(pts, glyphStyle(col, shape, 2.5)))
			cms = append(cms, s.Cm...)
		}
	}
	a0, a1 := rangePad(0.04, as)
	for _, p := range []*gplot.Plot{cl, cm} {
		p.Add(newLine(plotter.XYs{{X: a0, Y: 0}, {X: a1, Y: 0}}, lineStyle(colGuide, 0.8, nil)))
		setXRange(p, a0, a1)
	}
	lo, hi := rangePad(0.06, cls, []float64{0})
	setYRange(cl, lo, hi+0.08*float64(len(series))*(hi-lo))
	cl.Legend.Top, cl.Legend.Left = true, true
	cl.Legend.XOffs = vg.Points(6)
	lo, hi = rangePad(0.25, cms, []float64{0})
	setYRange(cm, lo, hi)
	f := &Figure{Width: 7 * vg.Inch, Height: 5.5 * vg.Inch}
	f.addRow(3, freePanel(cl))
	f.addRow(2, freePanel(cm))
	return f, nil
}
