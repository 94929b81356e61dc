package plot

import (
	"math"
	"strings"
	"testing"

	"gonum.org/v1/plot/plotter"

	"github.com/foilwright/foilwright/geometry"
)

// The label of a dropped point reads away from the curve: above a point
// above the curve, below one below it, so the curve does not cross it.
func TestLabelRise(t *testing.T) {
	curve := plotter.XYs{{X: 0, Y: 0}, {X: 1, Y: 0}, {X: 2, Y: 0}}
	if r := labelRise(plotter.XY{X: 1, Y: 0.3}, curve); r <= 0 {
		t.Errorf("point above the curve: offset %v, want up", r)
	}
	if r := labelRise(plotter.XY{X: 1, Y: -0.3}, curve); r >= -noteSize {
		t.Errorf("point below the curve: offset %v, want down by more than the text height", r)
	}
}

// The leading-edge label of the deviation chart sits at the end of its
// line away from the largest deviation and its label.
func TestLELabelEnd(t *testing.T) {
	if y, _ := leLabelEnd(0.01, 0.01); y >= 0 {
		t.Errorf("largest deviation above: label at %g, want the lower end", y)
	}
	if y, _ := leLabelEnd(-0.01, 0.01); y <= 0 {
		t.Errorf("largest deviation below: label at %g, want the upper end", y)
	}
}

// The keys of the two line styles of a Cp chart of several cases have a
// colour no case takes (a grey key once matched the fifth case's grey).
func TestCpStyleKeys(t *testing.T) {
	upper, lower := cpStyleKeys()
	for i := range 2 * len(seriesColours) {
		if seriesColour(i) == upper.Color || seriesColour(i) == lower.Color {
			t.Errorf("case %d has the colour of a style key", i)
		}
	}
	if len(lower.Dashes) == 0 || len(upper.Dashes) != 0 {
		t.Errorf("keys: upper dashes %v, lower %v", upper.Dashes, lower.Dashes)
	}
}

// A note goes into the title; an outline adds a strip below the chart on
// its x axis.
func TestCpNoteAndOutline(t *testing.T) {
	f, err := CpPlot(demoCp(0, 4, 8), CpOptions{Note: "3 of 9 angles", Outline: demoOutline()})
	if err != nil {
		t.Fatal(err)
	}
	ps := f.Panels()
	if len(ps) != 2 || !strings.Contains(ps[0].Title.Text, "(3 of 9 angles)") || f.rows[1].panels[0].xFrom != f.rows[0].panels[0] {
		t.Errorf("%d panels, title %q", len(ps), ps[0].Title.Text)
	}
	f, err = CpPlot(demoCp(4), CpOptions{})
	if err != nil || len(f.Panels()) != 1 {
		t.Errorf("no outline: %v, %v", f, err)
	}
	if _, err := CpPlot(demoCp(4), CpOptions{Outline: []geometry.Point{{X: 1}, {X: math.NaN()}, {}}}); err == nil {
		t.Error("non-finite outline: no error")
	}
}

// Near the corners of a blunt trailing edge, within one base length, Cp is
// singular and left out; a sharp edge has no corners to leave out.
func TestTrailingEdgeCorners(t *testing.T) {
	blunt := []geometry.Point{{X: 1, Y: 0.002}, {X: 0.5, Y: 0.06}, {}, {X: 0.5, Y: -0.05}, {X: 1, Y: -0.002}}
	pts := []geometry.Point{{X: 1, Y: 0.002}, {X: 0.997, Y: 0.0025}, {X: 0.99, Y: 0.004}, {X: 0.5, Y: 0}, {X: 0.9985, Y: -0.0021}, {X: 1, Y: -0.002}}
	got := TrailingEdgeCorners(blunt, pts)
	want := map[int]bool{0: true, 1: true, 4: true, 5: true}
	if len(got) != len(want) {
		t.Errorf("left out %v, want %v", got, want)
	}
	for i := range want {
		if !got[i] {
			t.Errorf("point %d kept", i)
		}
	}
	sharp := []geometry.Point{{X: 1}, {X: 0.5, Y: 0.06}, {}, {X: 0.5, Y: -0.05}, {X: 1}}
	if got := TrailingEdgeCorners(sharp, pts); len(got) != 0 {
		t.Errorf("sharp: left out %v", got)
	}
}
