package main

import (
	"bytes"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/frame"
	"github.com/foilwright/foilwright/geometry/pointfile"
)

// The CAD round trip of the README: prep the probe, export DXF and CSV,
// read each back with prep. The exported nodes read back within 1e-9 of
// the chord (checked in package export); here the section made again from
// them has the same frame and properties.
func TestExportRoundTrip(t *testing.T) {
	dir := t.TempDir()
	sec := filepath.Join(dir, "probe.json")
	if _, stderr, code := runCLI(t, "prep", "../../examples/tunnel-model/probe.csv", "-o", sec, "-q"); code != 0 {
		t.Fatal(stderr)
	}
	orig := loadSection(t, sec)
	for _, tc := range []struct {
		kind string
		read []string
	}{
		{"dxf", []string{"--layer", "SECTION"}},
		{"csv", nil},
	} {
		file := filepath.Join(dir, "probe."+tc.kind)
		stdout, stderr, code := runCLI(t, "export", sec, "--to", tc.kind, "-o", file)
		if code != 0 || !strings.Contains(stdout, fmt.Sprintf("wrote %s: %s of probe, %d nodes, part frame, mm", file, tc.kind, len(orig.Nodes))) {
			t.Fatalf("export %s: exit %d\n%s%s", tc.kind, code, stdout, stderr)
		}
		// The file holds the nodes in the part's coordinates.
		data, _ := os.ReadFile(file)
		c, err := pointfile.Read(bytes.NewReader(data), file, pointfile.Options{Layer: map[bool]string{true: "SECTION"}[tc.kind == "dxf"]})
		if err != nil {
			t.Fatal(err)
		}
		fr := frame.Frame(*orig.Frame)
		worst := 0.0
		for i, q := range c.Points {
			p := fr.ToPart(orig.Nodes[i])
			worst = math.Max(worst, math.Hypot(q.X-p.X, q.Y-p.Y)/fr.Chord)
		}
		if worst > 1e-9 || c.Units != geometry.Millimetre {
			t.Errorf("%s: nodes read back %.3g chord off, units %q", tc.kind, worst, c.Units)
		}
		back := filepath.Join(dir, "back-"+tc.kind+".json")
		args := append([]string{"prep", file, "--noise", "0", "-o", back, "-q"}, tc.read...)
		if _, stderr, code := runCLI(t, args...); code != 0 {
			t.Fatalf("prep %s: %s", tc.kind, stderr)
		}
		b := loadSection(t, back)
		// Tolerances measured, then rounded up: the section is made again
		// from its own nodes through an interpolating spline, whose nose
		// departs from the fitted curve's between the nodes by up to the
		// panels' deviation (1e-4 c); the form of the nose the leading
		// edge is read from (geometry/frame/nose.go) averages that, and
		// the leading edge moves by 2.5e-6 c (5e-4 mm), the twist by
		// 1.4e-4° and the chord by 1.1e-8 of itself (measured; 2e-6 mm,
		// 5.9e-7° and 3e-15 with the curve's own farthest point).
		if d := math.Abs(b.Frame.Chord-orig.Frame.Chord) / orig.Frame.Chord; d > 5e-8 {
			t.Errorf("%s: chord %.6f, was %.6f", tc.kind, b.Frame.Chord, orig.Frame.Chord)
		}
		if d := math.Abs(b.Frame.TwistDeg - orig.Frame.TwistDeg); d > 3e-4 {
			t.Errorf("%s: twist %.5f°, was %.5f°", tc.kind, b.Frame.TwistDeg, orig.Frame.TwistDeg)
		}
		if d := math.Abs(b.Properties.Thickness - orig.Properties.Thickness); d > 1e-5 {
			t.Errorf("%s: thickness %.5f, was %.5f", tc.kind, b.Properties.Thickness, orig.Properties.Thickness)
		}
		if b.TrailingEdge.Kind != orig.TrailingEdge.Kind {
			t.Errorf("%s: trailing edge %s, was %s", tc.kind, b.TrailingEdge.Kind, orig.TrailingEdge.Kind)
		}
		t.Logf("%s round trip: chord %+.2e, twist %+.2e°, LE moved %.2e mm, thickness %+.2e c", tc.kind,
			(b.Frame.Chord-orig.Frame.Chord)/orig.Frame.Chord, b.Frame.TwistDeg-orig.Frame.TwistDeg,
			math.Hypot(b.Frame.LE[0]-orig.Frame.LE[0], b.Frame.LE[1]-orig.Frame.LE[1]), b.Properties.Thickness-orig.Properties.Thickness)
	}
	// SVG and .geo; a shape in chord units needs --frame chord or a chord.
	naca := filepath.Join(dir, "naca.json")
	runCLI(t, "shape", "naca4", "2412", "-o", naca, "-q")
	if _, stderr, code := runCLI(t, "export", naca, "--to", "svg", "-o", filepath.Join(dir, "n.svg")); code != exitUsage || !strings.Contains(stderr, "chord units") {
		t.Errorf("svg of a chord-unit section: exit %d, %s", code, stderr)
	}
	if _, stderr, code := runCLI(t, "export", naca, "--to", "svg", "--chord", "150mm", "-o", filepath.Join(dir, "n.svg")); code != 0 {
		t.Errorf("svg at 150 mm: %s", stderr)
	}
	if svg, _ := os.ReadFile(filepath.Join(dir, "n.svg")); !bytes.Contains(svg, []byte(`mm" height=`)) {
		t.Errorf("svg at 150 mm is not sized in mm")
	}
	if _, stderr, code := runCLI(t, "export", sec, "--to", "geo", "--farfield", "0.5", "-o", filepath.Join(dir, "x.geo")); code == 0 {
		t.Errorf("far field inside the section: exit 0, %s", stderr)
	}
}

// checkRunExports exports polars and the stations of the rotor's run
// folder run (made by TestExamplePipelines) and checks them against the
// files the pipeline file's outputs.exports wrote.
func checkRunExports(t *testing.T, run string) {
	dir := t.TempDir()
	polars := filepath.Join(dir, "polars.csv")
	stdout, stderr, code := runCLI(t, "export", run, "--to", "polar-csv", "-o", polars)
	if code != 0 || !strings.Contains(stdout, "of r300, r500, r700, r900, r1100") {
		t.Fatalf("exit %d\n%s%s", code, stdout, stderr)
	}
	data, _ := os.ReadFile(polars)
	// 5 sections × (8 vortex + 8 thin + 1 source) angles, a header.
	if rows := strings.Count(string(data), "\n") - strings.Count(string(data), "#"); rows != 1+5*17 {
		t.Errorf("%d rows in polars.csv", rows)
	}
	for _, kind := range []string{"dxf", "csv"} {
		out := filepath.Join(dir, "blade."+kind)
		if _, stderr, code := runCLI(t, "export", "stations", run, "--to", kind, "-o", out, "-q"); code != 0 {
			t.Fatalf("stations %s: %s", kind, stderr)
		}
		mine, _ := os.ReadFile(out)
		written, err := os.ReadFile(filepath.Join(run, "stations."+kind))
		if err != nil || !bytes.Equal(mine, written) {
			t.Errorf("stations.%s of the run differs from export stations (%v)", kind, err)
		}
	}
	// A station read back: r700 cut at z = 700.
	c, err := pointfile.Read(bytes.NewReader(must(os.ReadFile(filepath.Join(dir, "blade.dxf")))), "blade.dxf", pointfile.Options{Layer: "R700"})
	if err != nil || c.Dim != 3 || math.Abs(c.Points[0].Z-700) > 1e-6 {
		t.Errorf("r700 from blade.dxf: %v, %v", err, c)
	}
	for _, f := range []string{"r700/export/section.dxf", "r700/export/polars.csv"} {
		if _, err := os.Stat(filepath.Join(run, f)); err != nil {
			t.Errorf("outputs.exports: %v", err)
		}
	}
}
