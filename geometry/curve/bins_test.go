package curve

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// Bins of a dense scan lie on the outline, not inside its bend: 4000
// unevenly spaced points of a circle (an exact solution: every point at
// radius 1), binned, give bin points within a tenth of the sagitta by
// which the plain centroids of the bins sit inside (measured 2.2e-8
// against 6.9e-7).
func TestBinsOnTheOutline(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 5))
	const n = 4000
	pts := make([]geometry.Point, n)
	ws := make([]float64, n)
	a := 0.0
	for i := range pts {
		pts[i] = geometry.Point{X: math.Cos(a), Y: math.Sin(a)}
		ws[i] = 1
		a += 2 * math.Pi / n * (0.5 + rng.Float64())
		if a >= 2*math.Pi {
			pts, ws = pts[:i+1], ws[:i+1]
			break
		}
	}
	fp := newFitPoints(pts, ws, nil, false, true)
	if fp.of == nil {
		t.Fatalf("%d points not binned", len(pts))
	}
	var worst, worstCentroid float64
	sum := make([]geometry.Point, len(fp.pts))
	cnt := make([]float64, len(fp.pts))
	for i, p := range pts {
		sum[fp.of[i]] = sum[fp.of[i]].Add(p)
		cnt[fp.of[i]]++
	}
	for j, p := range fp.pts {
		worst = math.Max(worst, math.Abs(p.Norm()-1))
		worstCentroid = math.Max(worstCentroid, math.Abs(sum[j].Scale(1/cnt[j]).Norm()-1))
	}
	t.Logf("%d bins of %d points: largest distance from the circle %.3g (plain centroids %.3g)", len(fp.pts), len(pts), worst, worstCentroid)
	if worst > worstCentroid/10 {
		t.Errorf("bins %.3g off the circle, want within a tenth of the plain centroids' %.3g", worst, worstCentroid)
	}
	if worstCentroid < 1e-7 {
		t.Errorf("plain centroids %.3g off the circle: the test needs bins whose sagitta shows", worstCentroid)
	}
}
