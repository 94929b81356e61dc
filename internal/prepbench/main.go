// Command prepbench writes the invented scan that scripts/prep-bench.sh
// times `foilwright prep` on: a NACA 2412 section (NACA Report 824
// equations), 152.4 mm chord, rotated 7°, n points evenly spaced along the
// surface in shuffled order with 0.02 mm noise, as delimited text in
// millimetres (the same scan as prep's BenchmarkPrepare).
//
//	go run ./internal/prepbench -n 100000 -o scan.csv
package main

import (
	"bufio"
	"flag"
	"fmt"
	"math"
	"math/rand/v2"
	"os"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

func main() {
	n := flag.Int("n", 10000, "points of the scan")
	out := flag.String("o", "", "file to write (required)")
	flag.Parse()
	if *out == "" || *n < 10 {
		fmt.Fprintln(os.Stderr, "prepbench: -o FILE and -n ≥ 10 are required")
		os.Exit(2)
	}
	if err := write(*out, *n); err != nil {
		fmt.Fprintln(os.Stderr, "prepbench:", err)
		os.Exit(1)
	}
}

func write(path string, n int) error {
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	w := bufio.NewWriter(f)
	rng := rand.New(rand.NewPCG(2412, uint64(n)))
	foil := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12}
	dense := foil.Nodes(20000)
	arc := make([]float64, len(dense))
	for i := 1; i < len(dense); i++ {
		arc[i] = arc[i-1] + dense[i].Dist(dense[i-1])
	}
	loop := make([]geometry.Point, n)
	j := 0
	for k := range loop {
		s := arc[len(arc)-1] * float64(k) / float64(n)
		for arc[j+1] < s {
			j++
		}
		t := (s - arc[j]) / (arc[j+1] - arc[j])
		loop[k] = dense[j].Add(dense[j+1].Sub(dense[j]).Scale(t))
	}
	rng.Shuffle(len(loop), func(i, j int) { loop[i], loop[j] = loop[j], loop[i] })
	fmt.Fprint(w, "# units: mm\nx,y\n")
	for _, p := range loop {
		q := p.Scale(152.4).Rotate(-7 * math.Pi / 180)
		fmt.Fprintf(w, "%.5f,%.5f\n", q.X+0.02*rng.NormFloat64()+40, q.Y+0.02*rng.NormFloat64()-12)
	}
	if err := w.Flush(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}
