package builtin_test

import (
	"bytes"
	"context"
	"encoding/xml"
	"errors"
	"image/png"
	"io"
	"slices"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/plugins/builtin"
	"github.com/foilwright/foilwright/plugins/stage"
)

func TestPlotsStage(t *testing.T) {
	sec, _ := naca(t, "2412", 60, false)
	_, vortex, err := runStage(t, "vortex-panel", sec, `{"alpha_deg": [0, 4, 8], "field_grid": [-0.5, 1.5, -0.5, 0.5, 0.05]}`)
	if err != nil {
		t.Fatal(err)
	}
	_, thin, err := runStage(t, "thin-aerofoil", sec, `{"alpha_deg": [0, 4, 8]}`)
	if err != nil {
		t.Fatal(err)
	}
	s, _ := builtin.Lookup("plots")
	// The results of the stages it runs after reach it decoded (as the
	// host gives them) or as JSON text in the row form of
	// foilwright.result/1 (as a JSON stage may give them): both draw.
	v1 := func(d *stage.ResultDoc) []byte {
		b, err := d.EncodeV1()
		if err != nil {
			t.Fatal(err)
		}
		return b
	}
	for _, format := range []string{"svg", "png"} {
		req := stage.Request{Section: sec, Params: []byte(`{"format": "` + format + `"}`), SectionName: "test.json",
			DepResults: map[string]*stage.ResultDoc{"vortex": vortex.Doc, "thin": thin.Doc}}
		if format == "png" {
			req.DepResults = nil
			req.Deps = map[string][]byte{"vortex": v1(vortex.Doc), "thin": v1(thin.Doc)}
		}
		res, err := s.Run(context.Background(), req)
		if err != nil {
			t.Fatal(err)
		}
		var names []string
		for _, a := range res.Artifacts {
			names = append(names, a.Name)
			switch format {
			case "png":
				if _, err := png.Decode(bytes.NewReader(a.Data)); err != nil {
					t.Errorf("%s: %v", a.Name, err)
				}
			case "svg":
				dec := xml.NewDecoder(bytes.NewReader(a.Data))
				for {
					if _, err := dec.Token(); err == io.EOF {
						break
					} else if err != nil {
						t.Errorf("%s: not well-formed XML: %v", a.Name, err)
						break
					}
				}
			}
		}
		// The section, Cp of each stage with pressures (thin-aerofoil gives
		// none), one polar of both methods, streamlines of the stage with a
		// field.
		want := []string{"section", "cp-vortex", "streamlines-vortex", "polar"}
		for i := range want {
			want[i] += "." + format
		}
		if !slices.Equal(names, want) {
			t.Errorf("%s artifacts %v, want %v", format, names, want)
		}
	}
	_, err = s.Run(context.Background(), stage.Request{Section: sec, Params: []byte(`{}`), Deps: map[string][]byte{"bad": []byte("{")}})
	if !errors.Is(err, stage.ErrBadInput) {
		t.Errorf("malformed dependency: err = %v, want ErrBadInput", err)
	}
}

// With more angles than a Cp chart draws, its title says how many it
// draws of how many; the section's outline is drawn under the chart.
func TestPlotsCpNote(t *testing.T) {
	sec, _ := naca(t, "2412", 60, false)
	_, vortex, err := runStage(t, "vortex-panel", sec, `{"alpha_deg": [-4, -2, 0, 2, 4, 6, 8, 10, 12]}`)
	if err != nil {
		t.Fatal(err)
	}
	s, _ := builtin.Lookup("plots")
	res, err := s.Run(context.Background(), stage.Request{
		Section: sec, Params: []byte(`{"format": "svg", "polar": false, "section": false}`), SectionName: "test.json",
		DepResults: map[string]*stage.ResultDoc{"vortex": vortex.Doc},
	})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Artifacts) != 1 || res.Artifacts[0].Name != "cp-vortex.svg" {
		t.Fatalf("artifacts %v", res.Artifacts)
	}
	svg := string(res.Artifacts[0].Data)
	if !strings.Contains(svg, "5 of 9 angles") || !strings.Contains(svg, "y/c") {
		t.Errorf("the Cp chart says nothing of the angles left out, or has no outline strip")
	}
}
