package plot

import (
	"cmp"
	"fmt"
	"slices"

	gplot "gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
)

// Station is one section of a blade or wing at a spanwise position: its
// chord and fit RMS in the input's units, its twist in degrees (positive
// nose-up) and its thickness in chord fractions.
type Station struct {
	Position  float64 // spanwise position, input units
	Chord     float64
	TwistDeg  float64
	Thickness float64 // maximum thickness / chord
	FitRMS    float64 // RMS deviation of the fitted curve from the kept points
}

// StationsPlot draws chord, twist, thickness (in % chord) and fit RMS
// against the spanwise position of the stations, in four panels. units
// names the input's units ("mm"; empty reads "input units"). It returns an
// error wrapping ErrNoData for no stations and an error for non-finite
// values.
func StationsPlot(units string, stations []Station) (*Figure, error) {
	if len(stations) == 0 {
		return nil, fmt.Errorf("%w: no stations", ErrNoData)
	}
	for i, s := range stations {
		if err := checkValues(fmt.Sprintf("stations[%d]", i), []float64{s.Position, s.Chord, s.TwistDeg, s.Thickness, s.FitRMS}); err != nil {
			return nil, err
		}
	}
	if units == "" {
		units = "input units"
	}
	st := slices.Clone(stations)
	slices.SortStableFunc(st, func(a, b Station) int { return cmp.Compare(a.Position, b.Position) })
	pos := make([]float64, len(st))
	for i, s := range st {
		pos[i] = s.Position
	}
	p0, p1 := rangePad(0.05, pos)
	panel := func(k int, title, yl string, v func(Station) float64, fromZero bool) *gplot.Plot {
		p := newPlot(title, "position ("+units+")", yl)
		ys := make([]float64, len(st))
		for i, s := range st {
			ys[i] = v(s)
		}
		pts := pairs(pos, ys)
		col := seriesColour(k)
		p.Add(newLine(pts, lineStyle(col, 1.2, nil)), newScatter(pts, glyphStyle(col, seriesGlyphs[k], 2.8)))
		setXRange(p, p0, p1)
		lo, hi := rangePad(0.12, ys)
		if fromZero {
			lo, hi = rangePad(0.12, ys, []float64{0})
			lo = 0
		}
		setYRange(p, lo, hi)
		return p
	}
	f := &Figure{Width: 8 * vg.Inch, Height: 5.5 * vg.Inch}
	f.addRow(1,
		freePanel(panel(0, "chord", "chord ("+units+")", func(s Station) float64 { return s.Chord }, true)),
		freePanel(panel(1, "twist", "twist (deg)", func(s Station) float64 { return s.TwistDeg }, false)))
	f.addRow(1,
		freePanel(panel(2, "thickness", "t/c (%)", func(s Station) float64 { return 100 * s.Thickness }, true)),
		freePanel(panel(3, "fit RMS", "RMS ("+units+")", func(s Station) float64 { return s.FitRMS }, true)))
	return f, nil
}
