package repanel_test

import (
	"fmt"
	"strings"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/repanel"
)

// flatPlate is a flat plate of unit chord as a closed loop: from the
// trailing edge (1, 0) along the upper side to the leading edge (0, 0) at
// arc length 1, and back along the lower side. It has no curvature.
type flatPlate struct{}

func (flatPlate) Length() float64 { return 2 }

func (flatPlate) At(s float64) geometry.Point {
	s = min(max(s, 0), 2)
	if s <= 1 {
		return geometry.Point{X: 1 - s}
	}
	return geometry.Point{X: s - 1}
}

func (flatPlate) Curvature(float64) float64 { return 0 }

func ExampleCosine_Fractions() {
	fmt.Printf("%.4f\n", (repanel.Cosine{}).Fractions(4))
	// Output:
	// [0.0000 0.1464 0.5000 0.8536 1.0000]
}

func ExampleStretched_Fractions() {
	// A strength of 1 at the start shrinks the first panel by about e⁻¹.
	plain := (repanel.Uniform{}).Fractions(100)
	warped := repanel.Stretched{Base: repanel.Uniform{}, Start: 1}.Fractions(100)
	fmt.Printf("first panel %.5f → %.5f (ratio %.3f)\n", plain[1], warped[1], warped[1]/plain[1])
	// Output:
	// first panel 0.01000 → 0.00377 (ratio 0.377)
}

func ExampleDistribute() {
	nodes, err := repanel.Distribute(flatPlate{}, 1, repanel.Options{Panels: 16})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(len(nodes), "nodes")
	// The upper surface, trailing edge to leading edge: x = (1 − cos β)/2.
	xs := make([]string, 0, 9)
	for _, p := range nodes[:9] {
		xs = append(xs, fmt.Sprintf("%.4f", p.X))
	}
	fmt.Println(strings.Join(xs, " "))
	_, err = repanel.Distribute(flatPlate{}, 1, repanel.Options{Panels: 15})
	fmt.Println(err)
	// Output:
	// 17 nodes
	// 1.0000 0.9619 0.8536 0.6913 0.5000 0.3087 0.1464 0.0381 0.0000
	// repanel: panel count out of range: 15, want 16..2000
}

func ExampleMeasure() {
	nodes := []geometry.Point{{X: 0, Y: 0}, {X: 1, Y: 0}, {X: 1, Y: 2}, {X: 0, Y: 2}}
	q := repanel.Measure(nodes)
	fmt.Printf("panels %.1f..%.1f, ratio %.1f, turn %.0f°\n", q.MinLength, q.MaxLength, q.MaxRatio, q.MaxTurnDeg)
	for _, w := range q.Warnings {
		fmt.Println(w)
	}
	// Output:
	// panels 1.0..2.0, ratio 2.0, turn 90°
	// the surface turns 90.0° at node 1, more than 15°
}
