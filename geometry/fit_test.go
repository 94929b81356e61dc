package geometry

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// fitTestPart describes how a test contour is placed in the part frame.
type fitTestPart struct {
	chord  float64 // input units
	rotDeg float64 // counter-clockwise rotation of the section (nose-down twist)
	shift  Point
	noise  float64 // standard deviation of Gaussian noise on each coordinate
	seed   uint64
	flipX  bool // mirror x before placing (nose pointing the other way)
	flipY  bool // mirror y before placing (measured upside down)
}

// toPart maps a chord-frame point into the part frame.
func (f fitTestPart) toPart(p Point) Point {
	if f.flipX {
		p.X = -p.X
	}
	if f.flipY {
		p.Y = -p.Y
	}
	return p.Scale(f.chord).Rotate(f.rotDeg * math.Pi / 180).Add(f.shift)
}

// fitTestLoop returns a NACA 4-digit loop (NACA Report 824 equations) in the
// package node order, with half-cosine chord stations x = 1 − cos(πi/2n)
// (clustered at the leading edge only, so that spacing at the trailing
// edge stays well above the noise; common practice).
func fitTestLoop(n NACA4, perSurface int) []Point {
	st := func(i int) float64 { return 1 - math.Cos(math.Pi/2*float64(i)/float64(perSurface)) }
	var pts []Point
	for i := perSurface; i >= 1; i-- {
		pts = append(pts, n.Upper(math.Min(1, st(i))))
	}
	pts = append(pts, Point{})
	for i := 1; i <= perSurface; i++ {
		pts = append(pts, n.Lower(math.Min(1, st(i))))
	}
	if n.SharpTE {
		pts = pts[:len(pts)-1] // the last point repeats the first
	}
	return pts
}

// fitTestContour places loop in the part frame with noise and origins.
func fitTestContour(loop []Point, f fitTestPart) *Contour {
	rng := rand.New(rand.NewPCG(f.seed, 7))
	c := &Contour{Units: Millimetre}
	pts := make([]Point, len(loop))
	for i, p := range loop {
		pts[i] = f.toPart(p).Add(Point{rng.NormFloat64() * f.noise, rng.NormFloat64() * f.noise})
	}
	if f.flipX != f.flipY {
		// A mirror reverses the loop; restore counter-clockwise order with
		// the trailing edge first.
		for i, j := 1, len(pts)-1; i < j; i, j = i+1, j-1 {
			pts[i], pts[j] = pts[j], pts[i]
		}
	}
	for i, p := range pts {
		c.Points = append(c.Points, p)
		c.Origins = append(c.Origins, Origin{File: "test.csv", Line: i + 2})
	}
	return c
}

func TestFitNoiseRMS(t *testing.T) {
	for _, code := range []string{"0012", "2412"} {
		n, _ := ParseNACA4(code)
		part := fitTestPart{chord: 152.4, rotDeg: 7, shift: Point{37, -12}, noise: 0.02, seed: 42}
		c := fitTestContour(fitTestLoop(n, 150), part)
		cv, rep, err := Fit(c, FitOptions{Noise: 0.02})
		if err != nil {
			t.Fatal(err)
		}
		fmt.Println(code, rep.Method, rep.Ends, rep.Lambda, rep.RMS, rep.Max, rep.MaxAt, rep.EffectiveParams, len(rep.Beyond), rep.Warnings, cv.Length())
		cv2, rep2, err := Fit(c, FitOptions{})
		fmt.Println(code, rep2.Method, rep2.Ends, rep2.Lambda, rep2.RMS, rep2.Max, rep2.MaxAt, rep2.EffectiveParams, len(rep2.Beyond), rep2.Warnings, cv2.Length())
	}
}
