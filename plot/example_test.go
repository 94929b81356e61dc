package plot_test

import (
	"bytes"
	"fmt"
	"image/png"
	"log"

	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/plot"
)

// A section document drawn as a PNG 800 points wide; the height follows in
// the figure's natural proportions.
func ExampleSectionPlot() {
	s := &section.Section{
		Name:       "NACA 0012",
		Nodes:      shape.NACA4{Thickness: 0.12}.Loop(60),
		Properties: &section.Properties{LERadius: 1.1019 * 0.12 * 0.12},
	}
	f, err := plot.SectionPlot(plot.SectionFrom(s))
	if err != nil {
		log.Fatal(err)
	}
	var b bytes.Buffer
	if err := plot.Write(&b, f, plot.PNG, 800, 0); err != nil {
		log.Fatal(err)
	}
	cfg, err := png.DecodeConfig(&b)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println("width", cfg.Width, "px; taller than 1/4 of it:", cfg.Height > cfg.Width/4)
	// Output:
	// width 1067 px; taller than 1/4 of it: true
}
