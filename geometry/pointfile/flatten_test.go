package pointfile

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/planar"
)

func TestFlattenBand(t *testing.T) {
	c, err := readTestOpen(t, "naca2412-probe-z240.csv", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if c.Dim != 3 || c.Units != geometry.Millimetre {
		t.Fatalf("dim %d units %q, want 3 mm", c.Dim, c.Units)
	}
	cut, _ := planar.ParseSpec("z=240")
	flat, fl, err := planar.Flatten(c, planar.FlattenOptions{Plane: &cut, Band: 0.1})
	if err != nil {
		t.Fatal(err)
	}
	if fl.Kept != c.Len() || fl.Outside != 0 || flat.Dim != 2 || flat.Units != geometry.Millimetre {
		t.Errorf("kept %d outside %d dim %d units %q, want %d 0 2 mm", fl.Kept, fl.Outside, flat.Dim, flat.Units, c.Len())
	}
	if want := 0.05 / math.Sqrt(3); math.Abs(fl.RMS-want) > 0.2*want || fl.Max > 0.05 || fl.Max < 0.04 {
		t.Errorf("flatness rms %.4g max %.4g, want rms ≈ %.4g and max just under 0.05", fl.RMS, fl.Max, want)
	}
	for i, p := range flat.Points {
		if p.X != c.Points[i].X || p.Y != c.Points[i].Y || p.Z != 0 || flat.Origins[i] != c.Origins[i] {
			t.Fatalf("point %d: %v from %v, want (x, y, 0) with its origin", i, p, c.Points[i])
		}
	}

	// Two stray points 0.5 mm off the plane fall outside the band and are
	// noted; without the band they are refused with the figures.
	c.Points = append(c.Points, geometry.Vec3{X: 10, Y: 1, Z: 240.5}, geometry.Vec3{X: 20, Y: 2, Z: 239.5})
	c.Origins = append(c.Origins, geometry.Origin{File: "p.csv", Line: 90}, geometry.Origin{File: "p.csv", Line: 91})
	flat, fl, err = planar.Flatten(c, planar.FlattenOptions{Plane: &cut, Band: 0.1})
	if err != nil || fl.Outside != 2 || flat.Len() != c.Len()-2 {
		t.Fatalf("with strays: error %v, outside %d, %d points", err, fl.Outside, flat.Len())
	}
	if n := flat.Notes[len(flat.Notes)-1]; n.Origin.Line != 91 || !strings.Contains(n.Reason, "outside the band") {
		t.Errorf("last note %+v, want the stray at line 91", n)
	}
	_, fl, err = planar.Flatten(c, planar.FlattenOptions{Plane: &cut, Tolerance: 0.1})
	if !errors.Is(err, planar.ErrNotPlanar) || !strings.Contains(err.Error(), "0.5") || !strings.Contains(err.Error(), "p.csv:90") || fl.Max != 0.5 {
		t.Errorf("strays without a band: error %v, max %g; want ErrNotPlanar naming 0.5 at p.csv:90", err, fl.Max)
	}
}

// TestFlatten2D checks that a 2D cloud passes through unchanged.
func TestFlatten2D(t *testing.T) {
	c, err := readTestOpen(t, "naca2412-loop.dat", Options{})
	if err != nil {
		t.Fatal(err)
	}
	flat, fl, err := planar.Flatten(c, planar.FlattenOptions{})
	if err != nil || fl.Max != 0 || readTestMaxDist(readTestPlanar(flat), readTestPlanar(c)) != 0 || flat.Name != c.Name || !flat.Ordered {
		t.Errorf("2D cloud changed: error %v, %+v", err, fl)
	}
}
