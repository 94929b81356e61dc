package export

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strings"
)

// GeoOptions control the Gmsh geometry script. Lengths are in chords; the
// zero value of each field means its default.
type GeoOptions struct {
	// Farfield is the radius of the circular far-field boundary, centred
	// at mid-chord, in chords; 0 means DefaultFarfield. It must exceed 1.
	Farfield float64
	// WallSize is the mesh size at the nodes of the section, in chords;
	// 0 means the length of the panels at each node (the mean of the two
	// panels that meet there). Gmsh sizes a spline from the sizes at its
	// ends, so the section's mesh follows the sizes at the leading and
	// trailing edge, the finest there are with the usual spacings: a
	// WallSize sets one size for the whole section.
	WallSize float64
	// FarSize is the mesh size on the far-field boundary, in chords; 0
	// means Farfield/DefaultFarDivisions.
	FarSize float64
}

// Defaults of GeoOptions.
const (
	DefaultFarfield     = 20
	DefaultFarDivisions = 8
)

// Geo writes p as a Gmsh geometry script (see the package documentation):
// the nodes as points with their mesh sizes, the upper surface (trailing
// edge to leading edge) and the lower surface (leading edge to trailing
// edge) as splines through them, a line across a blunt trailing edge, the
// far-field circle in four arcs, the plane surface between the two loops
// and the physical groups "section", "farfield" and "fluid". Coordinates
// are in p's unit. It returns an error for options out of range and the
// first error of w.
func Geo(w io.Writer, p *Placed, o GeoOptions) error {
	if o.Farfield == 0 {
		o.Farfield = DefaultFarfield
	}
	if !(o.Farfield > 1) || math.IsInf(o.Farfield, 0) {
		return fmt.Errorf("export: far field at %g chords: want more than 1", o.Farfield)
	}
	if o.FarSize == 0 {
		o.FarSize = o.Farfield / DefaultFarDivisions
	}
	if !(o.WallSize >= 0) || !(o.FarSize > 0) || math.IsInf(o.WallSize+o.FarSize, 0) {
		return fmt.Errorf("export: mesh sizes %g (wall) and %g (far field) chords: want positive sizes", o.WallSize, o.FarSize)
	}
	le := leIndex(p)
	if le <= 0 || le >= len(p.Nodes)-1 {
		return fmt.Errorf("export: section %q has no leading-edge node between its ends", p.Name)
	}
	bw := bufio.NewWriter(w)
	bw.WriteString(describe(p, "// "))
	fmt.Fprintf(bw, "// units: %s; far field at %s chords; Gmsh geometry script: gmsh -2 this.geo\n", unitWord(p.Units), num(o.Farfield))
	bw.WriteString("SetFactory(\"Built-in\");\n")

	out := p.outline()
	n := len(out)
	size := func(i int) float64 {
		if o.WallSize > 0 {
			return o.WallSize * p.Chord
		}
		prev, next := out[(i-1+n)%n], out[(i+1)%n]
		if !p.Sharp && i == 0 {
			prev = out[i] // across the base: the panel on the surface only
		}
		if !p.Sharp && i == n-1 {
			next = out[i]
		}
		a, b := out[i].Dist(prev), out[i].Dist(next)
		switch {
		case a == 0:
			return b
		case b == 0:
			return a
		}
		return (a + b) / 2
	}
	// Points 1 … n are the nodes of the outline.
	for i, q := range out {
		fmt.Fprintf(bw, "Point(%d) = {%s, %s, 0, %s};\n", i+1, num(q.X), num(q.Y), num(size(i)))
	}
	id := func(i int) int { return i%n + 1 } // node i of p.Nodes; the last of a sharp edge is the first
	list := func(from, to int) string {
		var b strings.Builder
		for i := from; i <= to; i++ {
			if i > from {
				b.WriteString(", ")
			}
			fmt.Fprint(&b, id(i))
		}
		return b.String()
	}
	last := len(p.Nodes) - 1
	fmt.Fprintf(bw, "Spline(1) = {%s}; // upper surface, trailing edge to leading edge\n", list(0, le))
	fmt.Fprintf(bw, "Spline(2) = {%s}; // lower surface, leading edge to trailing edge\n", list(le, last))
	section := "1, 2"
	if !p.Sharp {
		fmt.Fprintf(bw, "Line(3) = {%d, %d}; // blunt trailing edge\n", id(last), id(0))
		section = "1, 2, 3"
	}
	// The far field: centre at mid-chord, four quarter arcs
	// counter-clockwise from the downstream point.
	mid := p.LE.Add(p.TE).Scale(0.5)
	r := o.Farfield * p.Chord
	c := n + 1
	fmt.Fprintf(bw, "Point(%d) = {%s, %s, 0, %s}; // far-field centre\n", c, num(mid.X), num(mid.Y), num(o.FarSize*p.Chord))
	for k := 0; k < 4; k++ {
		a := float64(k) * math.Pi / 2
		fmt.Fprintf(bw, "Point(%d) = {%s, %s, 0, %s};\n", c+1+k, num(mid.X+r*math.Cos(a)), num(mid.Y+r*math.Sin(a)), num(o.FarSize*p.Chord))
	}
	for k := 0; k < 4; k++ {
		fmt.Fprintf(bw, "Circle(%d) = {%d, %d, %d};\n", 11+k, c+1+k, c, c+1+(k+1)%4)
	}
	bw.WriteString("Curve Loop(1) = {11, 12, 13, 14}; // far field, counter-clockwise\n")
	fmt.Fprintf(bw, "Curve Loop(2) = {%s}; // section, counter-clockwise\n", section)
	bw.WriteString("Plane Surface(1) = {1, 2};\n")
	fmt.Fprintf(bw, "Physical Curve(\"section\", 1) = {%s};\n", section)
	bw.WriteString("Physical Curve(\"farfield\", 2) = {11, 12, 13, 14};\n")
	bw.WriteString("Physical Surface(\"fluid\", 3) = {1};\n")
	return bw.Flush()
}

// leIndex returns the index of the node nearest the leading edge.
func leIndex(p *Placed) int {
	best := 0
	for i, q := range p.Nodes {
		if q.Dist(p.LE) < p.Nodes[best].Dist(p.LE) {
			best = i
		}
	}
	return best
}
