package prep

import (
	"bytes"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// scanCSV returns an invented scan of a NACA 2412 section (NACA Report 824
// equations), 152.4 mm chord, rotated 7°: n points evenly spaced along the
// surface, as a scanner gives them, in shuffled order with 0.02 mm noise, as
// delimited text in millimetres.
func scanCSV(n int) []byte {
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

// BenchmarkPrepare runs the whole geometry chain on a scan of n points to
// 160 panels (target for n = 1e4: under 100 ms).
func BenchmarkPrepare(b *testing.B) {
	for _, n := range []int{1000, 10000, 100000} {
		data := scanCSV(n)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Prepare("scan", []File{{Path: "scan.csv", Data: data}}, Settings{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func TestPrepareScan(t *testing.T) {
	// The chain on a shuffled, noisy scan of NACA 2412 (NACA Report 824):
	// chord 152.4 mm within 0.1 %, thickness 0.120 ± 0.001.
	p, err := Prepare("scan", []File{{Path: "scan.csv", Data: scanCSV(2000)}}, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	s := p.Section
	if math.Abs(s.Frame.Chord-152.4)/152.4 > 1e-3 || math.Abs(s.Properties.Thickness-0.12) > 1e-3 {
		t.Errorf("chord %.3f mm, thickness %.4f", s.Frame.Chord, s.Properties.Thickness)
	}
	if len(s.Nodes) != s.Panels.Count+1 || s.LEIndex == nil || s.Nodes[*s.LEIndex] != (geometry.Point{}) {
		t.Errorf("%d nodes, %d panels, LE index %v", len(s.Nodes), s.Panels.Count, s.LEIndex)
	}
	// The panel count was chosen for the default accuracy, and meets it.
	if s.Panels.Target != 1e-4 || !(s.Panels.Deviation > 0 && s.Panels.Deviation <= 1e-4) {
		t.Errorf("panels %+v, want the deviation within the 1e-4 chord target", s.Panels)
	}
}
