package main

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/atomicfile"
)

// A production batch of the weather-mast rotor's blades, for the cluster
// workflow: every printed blade of a run laser-scanned and sliced at the
// five inspection stations, one point file per blade and station. The
// blades depart from the design as printed parts do (all invented): a
// chord a little off (shrinkage), a twist error, a trailing-edge rounding
// that varies, the scanner's noise, and a few reflections far off the
// surface. None of this is measured data.

// batchStations are the inspection stations along the blade, mm from the
// rotor axis.
var batchStations = []float64{300, 500, 700, 900, 1100}

// batchPoints is the number of points of a slice by default: a dense
// scan, evenly spaced along the outline as a laser line falls on it
// (about 0.3 mm apart at the root).
const batchPoints = 1000

// writeBatch writes blades blades × 5 stations of points points each into
// dir: scans/bNN-rSSS.csv and pipeline.json, whose run folder is dir/run.
func writeBatch(dir string, blades, points int, seed uint64) error {
	if err := os.MkdirAll(filepath.Join(dir, "scans"), 0o755); err != nil {
		return err
	}
	rng := rand.New(rand.NewPCG(seed, 13))
	for b := 1; b <= blades; b++ {
		// Per blade: shrinkage of the chord, a twist error, an offset of the
		// slice in the scanner's frame.
		shrink := 1 + 0.004*rng.NormFloat64()
		twistErr := 0.25 * rng.NormFloat64() * math.Pi / 180
		off := geometry.Point{X: 2 * rng.NormFloat64(), Y: 2 * rng.NormFloat64()}
		for _, r := range batchStations {
			name := fmt.Sprintf("b%02d-r%d.csv", b, int(r))
			seedB, seedR := rng.Uint64(), rng.Uint64()
			err := atomicfile.Write(filepath.Join(dir, "scans", name), func(w io.Writer) error {
				return writeSlice(w, b, r, points, shrink, twistErr, off, rand.New(rand.NewPCG(seedB, seedR)))
			})
			if err != nil {
				return err
			}
		}
	}
	return atomicfile.WriteBytes(filepath.Join(dir, "pipeline.json"), []byte(batchPipeline))
}

// writeSlice writes the slice of blade b at radius r: the design section,
// scaled, twisted and offset as this blade was printed and placed, with
// 0.03 mm of scanner noise and three reflections 0.4 to 1.2 mm off.
func writeSlice(w io.Writer, b int, r float64, points int, shrink, twistErr float64, off geometry.Point, rng *rand.Rand) error {
	pts := evenly(bladeSection(r, 2000), points)
	var c geometry.Point
	for _, p := range pts {
		c = c.Add(p)
	}
	c = c.Scale(1 / float64(len(pts)))
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "# Printed rotor blade %d, laser-scan slice at r = %g mm (invented demo data)\n", b, r)
	fmt.Fprintln(bw, "# units: mm")
	fmt.Fprintln(bw, "x,y")
	reflect := map[int]float64{}
	for range 3 {
		reflect[rng.IntN(len(pts))] = (0.4 + 0.8*rng.Float64()) * float64(1-2*rng.IntN(2))
	}
	// The scanner starts the slice anywhere along the outline.
	start := rng.IntN(len(pts))
	for k := range pts {
		i := (start + k) % len(pts)
		p := c.Add(pts[i].Sub(c).Scale(shrink)).Rotate(-twistErr).Add(off)
		p.X += 0.03 * rng.NormFloat64()
		p.Y += 0.03 * rng.NormFloat64()
		if d, ok := reflect[i]; ok {
			p.Y += d
		}
		fmt.Fprintf(bw, "%.4f,%.4f\n", p.X, p.Y)
	}
	return bw.Flush()
}

// batchPipeline runs every slice through the panel and thin-aerofoil
// stages, one input per station.
const batchPipeline = `{
  "foilwright": 1,
  "name": "blade-batch",
  "inputs": [
    {"files": ["scans/*-r300.csv"], "per_file": true, "station": 300},
    {"files": ["scans/*-r500.csv"], "per_file": true, "station": 500},
    {"files": ["scans/*-r700.csv"], "per_file": true, "station": 700},
    {"files": ["scans/*-r900.csv"], "per_file": true, "station": 900},
    {"files": ["scans/*-r1100.csv"], "per_file": true, "station": 1100}
  ],
  "prepare": {"units": "mm", "noise": 0.03},
  "stages": [
    {"id": "vortex", "stage": "vortex-panel", "params": {"alpha_deg": [-4, 0, 4, 8]}},
    {"id": "thin", "stage": "thin-aerofoil", "params": {"alpha_deg": [0, 4]}},
    {"id": "source", "stage": "source-panel", "params": {"alpha_deg": [0]}}
  ],
  "outputs": {"folder": "run", "exports": ["polar-csv"]}
}
`

// evenly returns n points spaced evenly along the closed polyline pts.
func evenly(pts []geometry.Point, n int) []geometry.Point {
	m := len(pts)
	at := make([]float64, m+1) // arc length at each vertex, the first again at the end
	for i := 0; i < m; i++ {
		at[i+1] = at[i] + pts[(i+1)%m].Sub(pts[i]).Norm()
	}
	out := make([]geometry.Point, 0, n)
	k := 0
	for j := 0; j < n; j++ {
		s := at[m] * float64(j) / float64(n)
		for k+1 < m && at[k+1] < s {
			k++
		}
		t := (s - at[k]) / (at[k+1] - at[k])
		a, b := pts[k], pts[(k+1)%m]
		out = append(out, a.Add(b.Sub(a).Scale(t)))
	}
	return out
}
