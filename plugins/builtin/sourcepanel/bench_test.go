package sourcepanel

import (
	"fmt"
	"testing"

	"github.com/foilwright/foilwright/geometry/shape"
)

// BenchmarkNew times the build and factorisation; BenchmarkSolve one angle.
func BenchmarkNew(b *testing.B) {
	for _, n := range []int{100, 200, 400, 800} {
		nodes := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}.Loop(n / 2)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			for b.Loop() {
				if _, err := New(nodes); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkSolve(b *testing.B) {
	for _, n := range []int{100, 200, 400, 800} {
		nodes := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}.Loop(n / 2)
		sv, err := New(nodes)
		if err != nil {
			b.Fatal(err)
		}
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			for b.Loop() {
				if _, err := sv.Solve([]float64{0.05}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
