package clean

import (
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// A dense scan (60 000 points, 0.02 mm noise at 152.4 mm chord, 1 %
// planted outliers 2–5 mm off, 1 % duplicates, shuffled) is cleaned on a
// subset and every point placed by its projection: the planted outliers
// go (≥ 98 %), hardly a good point does (≤ 0.1 %, the campaign's target),
// the duplicates are merged, and the contour runs along the outline
// (Along never falls) from the trailing edge, counter-clockwise. The
// section is NACA 2412 of Report 824; the set-up is cleanTestCloud's.
func TestCleanDense(t *testing.T) {
	n, _ := shape.ParseNACA4("2412")
	const count = 60000
	rng := rand.New(rand.NewPCG(7, 2026))
	loop := cleanTestSample(n, cleanChord, cleanRot, cleanOff, count)
	c, es := cleanTestCloud(rng, [][]geometry.Point{loop}, cleanNoise, 0.01, 0.01)
	ct, rep, err := Clean(c, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Subset == 0 || rep.Subset >= denseFrom || !rep.Band {
		t.Errorf("subset %d, band %v: want a dense clean on a subset", rep.Subset, rep.Band)
	}
	_, od, gl := cleanTestScore(ct, es, 0, count)
	t.Logf("read %d, subset %d, merged %d, dropped %d: outliers dropped %.4f, good lost %.5f", rep.Read, rep.Subset, len(rep.Merged), len(rep.Dropped), od, gl)
	if od < 0.98 {
		t.Errorf("planted outliers dropped %.4f, want ≥ 0.98", od)
	}
	if gl > 0.001 {
		t.Errorf("good points lost %.5f, want ≤ 0.001", gl)
	}
	if len(rep.Merged) < count/200 {
		t.Errorf("%d duplicates merged, want about %d", len(rep.Merged), count/100)
	}
	if len(ct.Along) != ct.Len() {
		t.Fatalf("%d along values for %d points", len(ct.Along), ct.Len())
	}
	for k := 1; k < len(ct.Along); k++ {
		if ct.Along[k] < ct.Along[k-1] {
			t.Fatalf("along falls at %d: %g after %g", k, ct.Along[k], ct.Along[k-1])
		}
	}
	cleanTestOriented(t, ct, cleanTE(n), 2.5*cleanChord*0.0105*n.Thickness+1)
}
