package geometry

import (
	"fmt"
	"math/rand/v2"
	"testing"
)

// cleanBenchCloud returns a scan-like shuffled cloud of about n points from
// NACA 2412 (NACA Report 824 equations via NACA4) at 152.4 mm chord: noise
// of a tenth of the point spacing, 1% gross outliers 2 to 5 mm off the
// surface and 2% duplicates (the set-up is this benchmark's own).
func cleanBenchCloud(n int) *Cloud {
	count := n * 100 / 103
	loop := cleanTestSample(NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12}, cleanChord, cleanRot, cleanOff, count)
	spacing := loop[0].Dist(loop[1])
	c, _ := cleanTestCloud(rand.New(rand.NewPCG(1, uint64(n))), [][]Point{loop}, 0.1*spacing, 0.01, 0.02)
	return c
}

func BenchmarkClean(b *testing.B) {
	for _, n := range []int{1e4, 1e5, 1e6} {
		c := cleanBenchCloud(n)
		b.Run(fmt.Sprintf("n=1e%d", cleanLog10(n)), func(b *testing.B) {
			b.ReportAllocs()
			var ct *Contour
			for b.Loop() {
				var err error
				ct, _, err = Clean(c, CleanOptions{})
				if err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(ct.Len()), "points")
		})
	}
}

// cleanLog10 returns the decimal exponent of a power of ten.
func cleanLog10(n int) int {
	e := 0
	for ; n >= 10; n /= 10 {
		e++
	}
	return e
}
