package plot

import (
	"flag"
	"math"
	"os"
	"path/filepath"
	"testing"

	"gonum.org/v1/plot/vg"
)

var samplesDir = flag.String("samples", "", "write every demo figure as PNG and SVG into this folder")

// demoFigure is a named figure builder over the demo data.
type demoFigure struct {
	name  string
	build func() (*Figure, error)
}

// demoFigures returns every drawing function over the demo data.
func demoFigures() []demoFigure {
	return []demoFigure{
		{"prep", func() (*Figure, error) { return PrepPlot(demoPrep()) }},
		{"deviation", func() (*Figure, error) { return DeviationPlot(demoPrep()) }},
		{"nodes", func() (*Figure, error) { return NodesPlot(naca2412.Loop(80)) }},
		{"section", func() (*Figure, error) { return SectionPlot(demoSection()) }},
		{"cp", func() (*Figure, error) { return CpPlot(demoCp(4), CpOptions{}) }},
		{"cp-sweep", func() (*Figure, error) {
			return CpPlot(demoCp(0, 4, 8), CpOptions{Note: "3 of 5 angles", Outline: demoOutline()})
		}},
		{"polar", func() (*Figure, error) { return PolarPlot(demoPolars()) }},
		{"streamlines", func() (*Figure, error) {
			return StreamlinePlot(demoJoukowski.flow(6*math.Pi/180, 211, 121, -0.5, -0.6, 0.01, 0.01))
		}},
		{"stations", func() (*Figure, error) { return StationsPlot("mm", demoStations) }},
	}
}

// TestWriteSamples writes every demo figure to the folder given by
// -samples, for looking at; without the flag it is skipped.
func TestWriteSamples(t *testing.T) {
	if *samplesDir == "" {
		t.Skip("no -samples folder")
	}
	if err := os.MkdirAll(*samplesDir, 0o755); err != nil {
		t.Fatal(err)
	}
	for _, d := range demoFigures() {
		f, err := d.build()
		if err != nil {
			t.Fatalf("%s: %v", d.name, err)
		}
		for _, ext := range []string{".png", ".svg"} {
			if err := Save(f, filepath.Join(*samplesDir, d.name+ext), 0, 0); err != nil {
				t.Fatalf("%s: %v", d.name, err)
			}
		}
		// The same figure in a tall and a wide frame.
		if err := Save(f, filepath.Join(*samplesDir, d.name+"-tall.png"), 5*vg.Inch, 7*vg.Inch); err != nil {
			t.Fatalf("%s: %v", d.name, err)
		}
		if err := Save(f, filepath.Join(*samplesDir, d.name+"-wide.png"), 10*vg.Inch, 3*vg.Inch); err != nil {
			t.Fatalf("%s: %v", d.name, err)
		}
	}
}
