package compare

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// scan returns n points of an invented laser scan of NACA 2412 (NACA
// Report 824), 200 mm chord, 4° nose-up, with 0.02 mm of noise along the
// normal, spread evenly in arc length, in scan order along the outline,
// and the measurement the geometry chain makes of 2000 of them (the chain
// is not what the benchmark times).
func scan(b testing.TB, n int) *Measurement {
	b.Helper()
	rng := rand.New(rand.NewPCG(uint64(n), 1))
	p := part{foil: naca2412, chord: chord200, twist: 4, le: tunnelLE, per: 1000, seed: 1}
	dense, _, _ := p.points()
	// Arc-length positions along the dense outline.
	arc := make([]float64, len(dense))
	for i := 1; i < len(dense); i++ {
		arc[i] = arc[i-1] + dense[i].Dist(dense[i-1])
	}
	at := func(s float64) (geometry.Point, geometry.Point) {
		j := 0
		for j+2 < len(arc) && arc[j+1] < s {
			j++
		}
		f := (s - arc[j]) / (arc[j+1] - arc[j])
		d := dense[j+1].Sub(dense[j])
		q := dense[j].Add(d.Scale(f))
		nrm := geometry.Point{X: d.Y, Y: -d.X}.Scale(1 / d.Norm())
		return q, nrm
	}
	pts := make([]geometry.Point, n)
	L := arc[len(arc)-1]
	for k := range pts {
		q, nrm := at(L * (float64(k) + 0.5) / float64(n))
		pts[k] = q.Add(nrm.Scale(0.02 * rng.NormFloat64()))
	}
	sub := make([]geometry.Point, 0, 2000)
	for k := 0; k < 2000; k++ {
		sub = append(sub, pts[k*n/2000])
	}
	m := measure(b, sub)
	m.Points = pts
	m.Origins = make([]geometry.Origin, n)
	for i := range m.Origins {
		m.Origins[i] = geometry.Origin{File: "scan.csv", Line: i + 2}
	}
	return m
}

// BenchmarkCompare compares a scan of n points with its design: the
// design built and placed, the best fit, every point's deviation, zone
// and verdict, and the derived differences (target for n = 1e5: under
// 1 s, growing near-linearly).
func BenchmarkCompare(b *testing.B) {
	benchCompare(b, AlignBestFit)
}

// BenchmarkCompareMinZone is BenchmarkCompare with the zone fit (which
// starts from the best fit).
func BenchmarkCompareMinZone(b *testing.B) {
	benchCompare(b, AlignMinZone)
}

func benchCompare(b *testing.B, align string) {
	band := Band{Plus: 0.1, Minus: 0.1}
	nose, _ := ParseZone("name=nose,x=0:0.05,tol=0.08")
	for _, n := range []int{1000, 10000, 100000} {
		m := scan(b, n)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				d := design(b, "naca4:2412", m, ptr(chord200), nil, nil)
				c, err := Compare(m, d, Options{Align: align, Tolerance: Tolerance{Default: &band, Zones: []Zone{nose}}})
				if err != nil {
					b.Fatal(err)
				}
				if r := c.Report; r.Deviation.Points != n || math.Abs(r.Deviation.RMS-0.02) > 0.003 {
					b.Fatalf("%d points, RMS %.4f mm", r.Deviation.Points, r.Deviation.RMS)
				}
			}
		})
	}
}
