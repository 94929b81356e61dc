package testfoil

import (
	"bytes"
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// ScanCSV returns an invented scan of a NACA 2412 section (NACA Report 824
// equations), 152.4 mm chord, rotated 7°: n points evenly spaced along the
// surface, as a scanner gives them, in shuffled order with 0.02 mm noise, as
// delimited text in millimetres.
func ScanCSV(n int) []byte {
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
		f := (s - arc[j]) / (arc[j+1] - arc[j])
		loop[k] = dense[j].Add(dense[j+1].Sub(dense[j]).Scale(f))
	}
	rng.Shuffle(len(loop), func(i, j int) { loop[i], loop[j] = loop[j], loop[i] })
	var b bytes.Buffer
	b.WriteString("# units: mm\nx,y\n")
	for _, p := range loop[:n] {
		q := p.Scale(152.4).Rotate(-7 * math.Pi / 180)
		fmt.Fprintf(&b, "%.5f,%.5f\n", q.X+0.02*rng.NormFloat64()+40, q.Y+0.02*rng.NormFloat64()-12)
	}
	return b.Bytes()
}
