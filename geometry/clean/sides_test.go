package clean

import (
	"fmt"
	"os"
	"slices"
	"strings"
	"testing"
)

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
