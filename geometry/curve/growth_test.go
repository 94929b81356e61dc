package curve

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/testfoil"
)

func TestReplicasFollowLocalNoise(t *testing.T) {
	// A scan whose noise grows four times round the nose (the first 8 %
	// of the chord), as where a scanner's beam grazes the surface: NACA
	// 0012 (Report 824), chord 152.4 mm, 0.02 mm of Gaussian noise in x
	// and y, 0.08 mm round the nose. The replicas must scatter by the
	// local noise there (growth within 2.2 to 5.5 times the fit's figure,
	// the median over the nose's knots) and by the fit's figure elsewhere
	// (more than 10 % of the knots clear of the nose grown is a profile
	// that follows chance). Bounds from a few seeds, rounded out.
	const chord, quiet, loud, noseX = 152.4, 0.02, 0.08, 0.08
	n, _ := shape.ParseNACA4("0012")
	for seed := range uint64(3) {
		rng := rand.New(rand.NewPCG(seed, 11))
		c := testfoil.Contour(testfoil.Loop(n, 200), testfoil.Part{Chord: chord})
		for i, p := range c.Points {
			s := quiet
			if p.X < noseX*chord {
				s = loud
			}
			c.Points[i] = p.Add(geometry.Point{X: s * rng.NormFloat64(), Y: s * rng.NormFloat64()})
		}
		_, rep, err := Fit(c, FitOptions{})
		if err != nil {
			t.Fatal(err)
		}
		rs := rep.resampler
		if rs == nil || rs.growth == nil {
			t.Fatalf("seed %d: no growth of the replicas' noise (noise estimate %.4g)", seed, rep.NoiseEstimate)
		}
		var nose []float64
		grown, clear := 0, 0
		for i, g := range rs.growth {
			x := rs.xd[i] / chord
			switch {
			case x < noseX-0.02:
				nose = append(nose, g)
			case x > noseX+0.05:
				clear++
				if g > 1 {
					grown++
				}
			}
		}
		t.Logf("seed %d: growth %.3g round the nose, %d of %d knots grown clear of it", seed, median(nose), grown, clear)
		if m := median(nose); !(m >= 2.2 && m <= 5.5) {
			t.Errorf("seed %d: replicas' noise grows %.3g times round the nose, want 2.2 to 5.5 (4 put in)", seed, m)
		}
		if share := float64(grown) / float64(clear); share > 0.1 || math.IsNaN(share) {
			t.Errorf("seed %d: %d of %d knots clear of the nose grown", seed, grown, clear)
		}
	}
}
