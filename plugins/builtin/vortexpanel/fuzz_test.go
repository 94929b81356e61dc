package vortexpanel

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// FuzzNew feeds arbitrary contours to New and Solve: they must return an
// error or finite results, never panic.
func FuzzNew(f *testing.F) {
	seed := func(pts []geometry.Point) []byte {
		var b []byte
		for _, p := range pts {
			b = append(b, byte(int8(p.X*100)), byte(int8(p.Y*100)))
		}
		return b
	}
	f.Add(seed(shape.NACA4{Thickness: 0.12, SharpTE: true}.Loop(8)))
	f.Add(seed(shape.NACA4{Camber: 0.04, CamberPos: 0.4, Thickness: 0.15}.Loop(10)))
	f.Add([]byte{1, 2, 3})
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) > 400 {
			return
		}
		nodes := make([]geometry.Point, len(data)/2)
		for i := range nodes {
			nodes[i] = geometry.Point{X: float64(int8(data[2*i])) / 100, Y: float64(int8(data[2*i+1])) / 100}
		}
		sv, err := New(nodes)
		if err != nil {
			return
		}
		cs, err := sv.Solve([]float64{0, 0.2})
		if err != nil {
			t.Fatalf("Solve after a successful New: %v", err)
		}
		for _, c := range cs {
			for _, v := range append([]float64{c.Cl, c.ClPressure, c.Cm, c.CdPressure}, c.Cp...) {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					t.Fatalf("non-finite result for %v", nodes)
				}
			}
		}
	})
}
