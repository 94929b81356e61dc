package clean

import (
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"slices"
	"strings"
	"testing"
)

// A missing stretch of the upper surface leaves two bins of x with the
// lower surface alone, and their points split in two by chance: each
// such bin's middle lies on the lower surface, 0.04 below the camber
// line. The robust running line sets them aside, and the camber line
// there is its good neighbours' (calculated by hand: upper y = 0.05,
// lower y = −0.03, camber 0.01), never the set-aside middle itself.
func TestCamberOneSidedBins(t *testing.T) {
	const nb = 64
	rng := rand.New(rand.NewPCG(16, 20))
	var xs, ys []float64
	for k := range nb {
		x0 := float64(k) / nb
		one := k == 19 || k == 20
		for j := range 8 {
			x := x0 + (float64(j)+0.5)/8/nb
			if one {
				// Lower points only, in two clusters 0.004 apart.
				xs, ys = append(xs, x), append(ys, -0.03+0.002*float64(2*(j%2)-1)+1e-5*rng.NormFloat64())
				continue
			}
			xs, ys = append(xs, x, x), append(ys, 0.05+1e-4*rng.NormFloat64(), -0.03+1e-4*rng.NormFloat64())
		}
	}
	if len(xs)/12 < nb {
		t.Fatalf("%d points make fewer than %d bins", len(xs), nb)
	}
	cl := camber(xs, ys, nil)
	const tol = 0.002 // well inside the 0.04 the one-sided bins are off
	for x := 0.05; x < 0.95; x += 0.005 {
		if got := cl.at(x); math.Abs(got-0.01) > tol {
			t.Errorf("camber at x %.3f: %.4f, want 0.01 ± %g", x, got, tol)
		}
	}
}

// Near the tail of campaign seed 1941 (testdata/tail-seed1941.txt), a
// coarse upper surface of 42 points over a lower one of 109, 0.034 apart
// at x = 0.867 and meeting at the trailing edge: too many points for the
// one-parabola siding of a few coarse points, whose scale they widened
// to 0.0035 until 37 of them fell inside its cut and were sided lower.
// It must leave them alone; the two surfaces' fits (tailSides) keep the
// camber line's verdict wherever the surfaces lie clear of each other
// (x < 0.97: 0.0075 apart there, 25 times the points' scatter).
func TestTailSidesCoarseSurface(t *testing.T) {
	data, err := os.ReadFile("testdata/tail-seed1941.txt")
	if err != nil {
		t.Fatal(err)
	}
	var xs, ys []float64
	var upper []bool
	for _, line := range strings.Split(string(data), "\n") {
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		var x, y float64
		var u int
		if _, err := fmt.Sscan(line, &x, &y, &u); err != nil {
			t.Fatalf("%q: %v", line, err)
		}
		xs, ys, upper = append(xs, x), append(ys, y), append(upper, u == 1)
	}
	if len(xs) != 151 {
		t.Fatalf("%d points read, want 151", len(xs))
	}
	near := make([]int, len(xs))
	for i := range near {
		near[i] = i
	}
	verdict := slices.Clone(upper)
	if oneSurfaceAft(xs, ys, near, slices.Clone(upper)) {
		t.Error("42 coarse points over 109 others: sided as one surface and a few points")
	}
	tailSides(xs, ys, upper)
	for i := range xs {
		if upper[i] != verdict[i] && xs[i] < 0.97 {
			t.Errorf("point %d at x %.4f y %.5f: upper %v, want %v", i, xs[i], ys[i], upper[i], verdict[i])
		}
	}
}
