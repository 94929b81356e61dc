package repanel

import (
	"fmt"
	"testing"
)

func BenchmarkDistribute(b *testing.B) {
	p, sle := naca0012()
	for _, law := range []string{LawCosine, LawCurvature} {
		for _, n := range []int{160, 2000} {
			b.Run(fmt.Sprintf("%s/n=%d", law, n), func(b *testing.B) {
				o := Options{Panels: n, Spacing: law}
				for b.Loop() {
					if _, err := Distribute(p, sle, o); err != nil {
						b.Fatal(err)
					}
				}
			})
		}
	}
}

func BenchmarkMeasure(b *testing.B) {
	p, sle := naca0012()
	nodes, err := Distribute(p, sle, Options{Panels: 2000})
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		Measure(nodes)
	}
}

// BenchmarkAutoCount is the cost of choosing the panel count for the
// default tolerance (the bisection of Count), beside one Stations call at
// a given count in BenchmarkDistribute.
func BenchmarkAutoCount(b *testing.B) {
	p, sle := naca0012()
	for _, law := range []string{LawCosine, LawCurvature} {
		b.Run(law, func(b *testing.B) {
			for b.Loop() {
				if _, _, err := Stations(p, sle, Options{Spacing: law}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
