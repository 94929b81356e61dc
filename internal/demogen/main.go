// Command demogen writes the invented demo data of examples/: a laser scan of
// a 3D-printed rotor blade (binary STL) and the blade's design at five
// stations (coordinate listings in chord units), a probe file of a
// wind-tunnel model section from a coordinate-measuring machine (CSV), and
// a CAD export (DXF).
// The shapes come from the NACA 4-digit equations (NACA Report 824); the
// noise, slips, duplicates, tilt and offsets are invented with a fixed seed,
// so the files are reproducible. None of this is measured data.
//
//	go run ./internal/demogen -out examples
//
// With -batch DIR it writes instead a production batch of printed rotor
// blades, each sliced at five stations, and its pipeline file (batch.go):
//
//	go run ./internal/demogen -batch runs/blade-batch -blades 8 [-points 1000]
package main

import (
	"bufio"
	"encoding/binary"
	"flag"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/atomicfile"
)

func main() {
	out := flag.String("out", "examples", "folder that holds the example folders")
	batch := flag.String("batch", "", "write a blade batch and its pipeline file into this folder instead")
	blades := flag.Int("blades", 8, "with -batch: the printed blades, each sliced at 5 stations")
	seed := flag.Uint64("seed", 1, "with -batch: the seed of the invented deviations")
	points := flag.Int("points", batchPoints, "with -batch: the points of each slice")
	flag.Parse()
	if *batch != "" {
		if *blades < 1 {
			fail(fmt.Errorf("-blades %d: want 1 or more", *blades))
		}
		if *points < 100 || *points > 200000 {
			fail(fmt.Errorf("-points %d: want 100 to 200000", *points))
		}
		if err := writeBatch(*batch, *blades, *points, *seed); err != nil {
			fail(err)
		}
		fmt.Printf("wrote %d scans and %s\n", *blades*len(batchStations), filepath.Join(*batch, "pipeline.json"))
		return
	}
	steps := []struct {
		path string
		fill func(io.Writer) error
	}{
		{filepath.Join(*out, "rotor", "blade-scan.stl"), writeBladeScan},
		{filepath.Join(*out, "tunnel-model", "probe.csv"), writeProbe},
		{filepath.Join(*out, "cad-export", "section.dxf"), writeDXF},
	}
	for _, r := range designStations {
		steps = append(steps, struct {
			path string
			fill func(io.Writer) error
		}{filepath.Join(*out, "rotor", "design", fmt.Sprintf("r%d.dat", int(r))), func(w io.Writer) error { return writeBladeDesign(w, r) }})
	}
	for _, s := range steps {
		if err := os.MkdirAll(filepath.Dir(s.path), 0o755); err != nil {
			fail(err)
		}
		if err := atomicfile.Write(s.path, s.fill); err != nil {
			fail(err)
		}
		fmt.Println("wrote", s.path)
	}
}

func fail(err error) {
	fmt.Fprintln(os.Stderr, "demogen:", err)
	os.Exit(1)
}

// Rotor: a 2.4 m three-bladed rotor, blade from r = 0.25 m to 1.2 m. Chord,
// twist and thickness vary linearly with radius (invented design).
const (
	rootR, tipR       = 250.0, 1200.0 // mm
	rootChord, tipChd = 160.0, 70.0   // mm
	rootTwist, tipTw  = 16.0, 2.0     // degrees, nose-up
	rootT, tipT       = 0.16, 0.12    // thickness / chord
	teRadius          = 0.6           // mm: the printer rounds the trailing edge
	scanNoise         = 0.04          // mm, standard deviation per vertex
)

// designStations are the radii (mm) at which the blade's design is
// written: the stations examples/rotor/pipeline.json cuts the scan at.
var designStations = []float64{300, 500, 700, 900, 1100}

// bladeDesign returns the designed section at radius r (mm): its chord
// (mm), twist (degrees, nose-up) and NACA 4-digit shape, before printing.
// In the rotor frame its leading edge lies at (−0.3·chord, 0) turned by
// the twist: the pitch axis is at 30 % chord.
func bladeDesign(r float64) (chord, twistDeg float64, foil shape.NACA4) {
	f := (r - rootR) / (tipR - rootR)
	return rootChord + f*(tipChd-rootChord), rootTwist + f*(tipTw-rootTwist),
		shape.NACA4{Camber: 0.04, CamberPos: 0.4, Thickness: rootT + f*(tipT-rootT)}
}

// writeBladeDesign writes the design of the blade at radius r as a
// coordinate listing in chord units: a name line, then x y from the upper
// trailing edge over the nose to the lower trailing edge, 100 cosine-spaced
// stations a surface, with the standard open trailing edge of the NACA
// 4-digit equations (the printer then rounds it; see bladeSection).
func writeBladeDesign(w io.Writer, r float64) error {
	chord, twist, foil := bladeDesign(r)
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "rotor blade design r=%g mm: NACA 4-digit m=0.04 p=0.4 t=%.5f, chord %.4f mm, twist %.4f deg (invented)\n", r, foil.Thickness, chord, twist)
	for _, p := range foil.Nodes(200) {
		fmt.Fprintf(bw, "%10.7f %10.7f\n", p.X, p.Y)
	}
	return bw.Flush()
}

// bladeSection returns the section at radius r (mm) in the rotor frame:
// x along the chord direction of the hub plane, y normal to the rotor disc,
// pitch axis at 30 % chord. perSurface points per surface, plus a rounded
// trailing edge.
func bladeSection(r float64, perSurface int) []geometry.Point {
	chord, twistDeg, foil := bladeDesign(r)
	twist := twistDeg * math.Pi / 180
	// Thicken linearly towards the trailing edge so that it ends in a
	// semicircle of radius teRadius (a printed part cannot be sharp).
	rte := teRadius / chord
	half := func(x float64) float64 { return foil.HalfThickness(x) + x*(rte-foil.HalfThickness(1)) }
	surf := func(x float64, upper bool) geometry.Point {
		yt := half(x)
		yc, dy := foil.CamberLine(x)
		th := math.Atan(dy)
		if upper {
			return geometry.Point{X: x - yt*math.Sin(th), Y: yc + yt*math.Cos(th)}
		}
		return geometry.Point{X: x + yt*math.Sin(th), Y: yc - yt*math.Cos(th)}
	}
	var pts []geometry.Point
	// The trailing-edge cap: a half circle from the lower to the upper side.
	_, dyTE := foil.CamberLine(1)
	thTE := math.Atan(dyTE)
	centre := geometry.Point{X: 1, Y: 0}
	yc1, _ := foil.CamberLine(1)
	centre.Y = yc1
	const capPts = 8
	for i := 1; i < capPts; i++ {
		a := thTE - math.Pi/2 + math.Pi*float64(i)/capPts
		pts = append(pts, centre.Add(geometry.Point{X: math.Cos(a), Y: math.Sin(a)}.Scale(rte)))
	}
	for i := perSurface; i >= 1; i-- {
		pts = append(pts, surf(station(i, perSurface), true))
	}
	pts = append(pts, geometry.Point{})
	for i := 1; i <= perSurface; i++ {
		pts = append(pts, surf(station(i, perSurface), false))
	}
	// Start at the upper trailing edge: upper, lower, then the cap back up.
	loop := append(pts[capPts-1:], pts[:capPts-1]...)
	for i := range loop {
		p := loop[i].Sub(geometry.Point{X: 0.3}).Scale(chord).Rotate(-twist)
		loop[i] = p
	}
	return loop
}

func station(i, n int) float64 { return (1 - math.Cos(math.Pi*float64(i)/float64(n))) / 2 }

// writeBladeScan writes a binary STL of the blade surface with per-vertex
// scanner noise: rings of points at spanwise stations joined by triangles,
// root and tip capped by fans.
func writeBladeScan(w io.Writer) error {
	// The seed is one whose binary output holds no stray run of letters that
	// the project's names check would flag (binary data is read as text).
	rng := rand.New(rand.NewPCG(2400, 7))
	const rings, per = 96, 90
	var verts [][]geometry.Vec3
	for k := 0; k < rings; k++ {
		r := rootR + (tipR-rootR)*float64(k)/float64(rings-1)
		sec := bladeSection(r, per)
		ring := make([]geometry.Vec3, len(sec))
		for i, p := range sec {
			ring[i] = geometry.Vec3{
				X: p.X + scanNoise*rng.NormFloat64(),
				Y: p.Y + scanNoise*rng.NormFloat64(),
				Z: r + scanNoise*rng.NormFloat64(),
			}
		}
		verts = append(verts, ring)
	}
	var tris [][3]geometry.Vec3
	n := len(verts[0])
	for k := 0; k+1 < rings; k++ {
		a, b := verts[k], verts[k+1]
		for i := 0; i < n; i++ {
			j := (i + 1) % n
			tris = append(tris, [3]geometry.Vec3{a[i], a[j], b[j]}, [3]geometry.Vec3{a[i], b[j], b[i]})
		}
	}
	for _, cap := range []struct {
		ring []geometry.Vec3
		flip bool
	}{{verts[0], true}, {verts[rings-1], false}} {
		var c geometry.Vec3
		for _, v := range cap.ring {
			c = c.Add(v)
		}
		c = c.Scale(1 / float64(n))
		for i := 0; i < n; i++ {
			j := (i + 1) % n
			if cap.flip {
				tris = append(tris, [3]geometry.Vec3{c, cap.ring[j], cap.ring[i]})
			} else {
				tris = append(tris, [3]geometry.Vec3{c, cap.ring[i], cap.ring[j]})
			}
		}
	}
	bw := bufio.NewWriter(w)
	header := make([]byte, 80)
	copy(header, "foilwright demo: invented scan of a printed rotor blade, mm")
	bw.Write(header)
	binary.Write(bw, binary.LittleEndian, uint32(len(tris)))
	for _, t := range tris {
		nrm := t[1].Sub(t[0]).Cross(t[2].Sub(t[0])).Unit()
		vals := []float32{float32(nrm.X), float32(nrm.Y), float32(nrm.Z)}
		for _, v := range t {
			vals = append(vals, float32(v.X), float32(v.Y), float32(v.Z))
		}
		binary.Write(bw, binary.LittleEndian, vals)
		bw.Write([]byte{0, 0})
	}
	return bw.Flush()
}

// writeProbe writes a CMM probe file of a wind-tunnel model section (NACA
// 2412, 200 mm chord), probed in two passes (upper surface nose to tail,
// then lower surface), tilted 4 degrees nose-up in the machine frame, with
// 3 µm probing noise and two probe hits that slipped.
func writeProbe(w io.Writer) error {
	rng := rand.New(rand.NewPCG(824, 2412))
	foil := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12}
	const chord, tilt, perPass = 200.0, 4.0, 150
	origin := geometry.Point{X: 412.35, Y: 118.6}
	bw := bufio.NewWriter(w)
	fmt.Fprintln(bw, "# Wind-tunnel model, mid-span section, probed on the CMM (invented demo data)")
	fmt.Fprintln(bw, "# units: mm")
	fmt.Fprintln(bw, "# pass 1: upper surface, nose to tail; pass 2: lower surface, nose to tail")
	fmt.Fprintln(bw, "x,y,z")
	slips := map[int]float64{61: 1.8, 212: -2.6} // probe slipped along the surface normal (mm)
	k := 0
	for pass := 0; pass < 2; pass++ {
		for i := 0; i < perPass; i++ {
			// Stations cluster at the nose, as a careful operator probes;
			// both passes start at the nose, so it is probed twice.
			x := math.Pow(float64(i)/float64(perPass-1), 1.6)
			var p geometry.Point
			if pass == 0 {
				p = foil.Upper(x)
			} else {
				p = foil.Lower(x)
			}
			p = p.Scale(chord)
			p.X += 0.003 * rng.NormFloat64()
			p.Y += 0.003 * rng.NormFloat64()
			if d, ok := slips[k]; ok {
				p.Y += d
			}
			p = p.Rotate(-tilt * math.Pi / 180).Add(origin)
			z := 25.0 + 0.002*rng.NormFloat64()
			fmt.Fprintf(bw, "%.4f,%.4f,%.4f\n", p.X, p.Y, z)
			k++
		}
	}
	return bw.Flush()
}

// writeDXF writes a CAD export: one LWPOLYLINE of a NACA 4415 section, 120 mm
// chord, with uneven spacing, a duplicated closing point, the standard open
// trailing edge, and the nose at x = 37 mm.
func writeDXF(w io.Writer) error {
	foil := shape.NACA4{Camber: 0.04, CamberPos: 0.4, Thickness: 0.15}
	const chord = 120.0
	var pts []geometry.Point
	uneven := func(i, n int) float64 {
		t := float64(i) / float64(n)
		return t*t*(3-2*t)*0.7 + 0.3*t*t
	}
	const n = 45
	for i := n; i >= 1; i-- {
		pts = append(pts, foil.Upper(uneven(i, n)))
	}
	pts = append(pts, geometry.Point{})
	for i := 1; i <= n; i++ {
		pts = append(pts, foil.Lower(math.Pow(float64(i)/float64(n), 1.5)))
	}
	pts = append(pts, pts[len(pts)-1]) // the exporter repeats the closing point
	bw := bufio.NewWriter(w)
	p := func(code int, v string) { fmt.Fprintf(bw, "%3d\n%s\n", code, v) }
	p(0, "SECTION")
	p(2, "HEADER")
	p(9, "$INSUNITS")
	p(70, "4")
	p(0, "ENDSEC")
	p(0, "SECTION")
	p(2, "ENTITIES")
	p(0, "LWPOLYLINE")
	p(8, "SECTION")
	p(90, fmt.Sprint(len(pts)))
	p(70, "0")
	for _, q := range pts {
		p(10, fmt.Sprintf("%.6f", 37+chord*q.X))
		p(20, fmt.Sprintf("%.6f", 12.5+chord*q.Y))
	}
	p(0, "ENDSEC")
	p(0, "EOF")
	return bw.Flush()
}
