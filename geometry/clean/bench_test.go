package clean

import (
	"fmt"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// cleanBenchCloud returns a scan-like shuffled cloud of about n points from
// NACA 2412 (NACA Report 824 equations via NACA4) at 152.4 mm chord: noise
// of a tenth of the point spacing, 1% gross outliers 2 to 5 mm off the
// surface and 2% duplicates (the set-up is this benchmark's own).
//
// With band set the noise is instead 0.02 mm, which exceeds the spacing from
// n = 2e4 on, as in a dense hand-held scan: Clean then orders a band.
func cleanBenchCloud(n int, band bool) *geometry.Cloud {
	count := n * 100 / 103
	loop := cleanTestSample(shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12}, cleanChord, cleanRot, cleanOff, count)
	noise := 0.1 * loop[0].Dist(loop[1])
	if band {
		noise = cleanNoise
	}
	c, _ := cleanTestCloud(rand.New(rand.NewPCG(1, uint64(n))), [][]geometry.Point{loop}, noise, 0.01, 0.02)
	return c
}

func BenchmarkClean(b *testing.B) { cleanBench(b, false) }

func BenchmarkCleanBand(b *testing.B) { cleanBench(b, true) }

func cleanBench(b *testing.B, band bool) {
	for _, n := range []int{1e4, 1e5, 1e6} {
		c := cleanBenchCloud(n, band)
		b.Run(fmt.Sprintf("n=1e%d", cleanLog10(n)), func(b *testing.B) {
			b.ReportAllocs()
			var ct *geometry.Contour
			for b.Loop() {
				var err error
				ct, _, err = Clean(c, Options{})
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
