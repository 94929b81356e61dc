package sourcepanel

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// Potential-flow theory: the body surface is a streamline. This also checks
// that the centroid-relative branch of the source angles leaves ψ
// single-valued round a section.
func TestSurfaceIsStreamline(t *testing.T) {
	n, err := shape.ParseNACA4("4412")
	if err != nil {
		t.Fatal(err)
	}
	n.SharpTE = true
	nodes := n.Loop(80)
	_, cs := solve(t, nodes, 6*math.Pi/180)
	var pts []geometry.Point
	for k := range len(nodes) - 1 {
		a, b := nodes[k], nodes[k+1]
		d := b.Sub(a)
		pts = append(pts, a.Add(d.Scale(0.5)).Add(geometry.Point{X: d.Y, Y: -d.X}.Scale(0.02)))
	}
	f, err := cs[0].Field(pts)
	if err != nil {
		t.Fatal(err)
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, p := range f {
		lo, hi = math.Min(lo, p.StreamFunction), math.Max(hi, p.StreamFunction)
	}
	t.Logf("ψ spread %.2e", hi-lo)
	// The points sit about V·d off the surface, d = 2% of a panel length
	// (measured spread 1e-3 at 160 panels, rounded up).
	if hi-lo > 3e-3 {
		t.Errorf("ψ along the surface spans %.3g", hi-lo)
	}
}
