package builtin_test

import (
	"bytes"
	"context"
	"encoding/xml"
	"errors"
	"image/png"
	"io"
	"slices"
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
	for _, format := range []string{"svg", "png"} {
		res, err := s.Run(context.Background(), stage.Request{
			Section: sec, Params: []byte(`{"format": "` + format + `"}`), SectionName: "test.json",
			Deps: map[string][]byte{"vortex": vortex.JSON, "thin": thin.JSON},
		})
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
