package plot

import (
	"bytes"
	"testing"

	"gonum.org/v1/plot/vg"

	"github.com/foilwright/foilwright/geometry"
)

// TestSmallestInputs draws the least each function accepts; each must give
// a figure that renders as well-formed SVG.
func TestSmallestInputs(t *testing.T) {
	tri := []geometry.Point{{X: 1}, {X: 0, Y: 0.1}, {X: 0}, {X: 1}}
	for _, tc := range []struct {
		name string
		call func() (*Figure, error)
	}{
		{"prep curve only", func() (*Figure, error) { return PrepPlot(PrepData{Curve: tri}) }},
		{"prep one point", func() (*Figure, error) { return PrepPlot(PrepData{Measured: tri[:1]}) }},
		{"deviation one residual", func() (*Figure, error) {
			return DeviationPlot(PrepData{Measured: tri[:1], S: []float64{0}, Residual: []float64{0}})
		}},
		{"nodes three", func() (*Figure, error) { return NodesPlot(tri[:3]) }},
		{"section three", func() (*Figure, error) { return SectionPlot(SectionData{Nodes: tri[:3]}) }},
		{"cp three", func() (*Figure, error) {
			return CpPlot([]CpCase{{X: []float64{1, 0, 1}, Y: []float64{0, 0, 0}, Cp: []float64{0, 1, 0}}}, CpOptions{})
		}},
		{"polar one", func() (*Figure, error) {
			return PolarPlot([]PolarSeries{{AlphaDeg: []float64{0}, Cl: []float64{0}}})
		}},
		{"flow constant", func() (*Figure, error) {
			return StreamlinePlot(FlowField{Nx: 2, Ny: 2, DX: 1, DY: 1, Psi: []float64{1, 1, 1, 1}, Body: tri})
		}},
		{"stations one", func() (*Figure, error) { return StationsPlot("", []Station{{Position: 1, Chord: 1}}) }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			f, err := tc.call()
			if err != nil {
				t.Fatal(err)
			}
			var b bytes.Buffer
			if err := Write(&b, f, SVG, 0, 0); err != nil {
				t.Fatal(err)
			}
			svgPaths(t, b.Bytes())
		})
	}
}

// TestTinySizes draws every demo figure far smaller than it can be read:
// it must not panic.
func TestTinySizes(t *testing.T) {
	for _, d := range demoFigures() {
		f, err := d.build()
		if err != nil {
			t.Fatal(err)
		}
		for _, size := range [][2]float64{{40, 40}, {400, 30}} {
			var b bytes.Buffer
			if err := Write(&b, f, SVG, vg.Length(size[0]), vg.Length(size[1])); err != nil {
				t.Errorf("%s %v: %v", d.name, size, err)
			}
		}
	}
}
