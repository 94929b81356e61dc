package clean

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// A corner the fits cannot place (they have crossed already at the
// aftmost point, so say nothing of how far on the surfaces meet) may lie
// edgeOpen steps beyond it: as far as leaving the stretch twice that much
// longer (once each side) costs edgePlausible in gapDeviance. The reach
// must keep that balance: edgeOpen was once an integer division (6 / 4),
// one step, and the chord's bound of thin edges read blunt from last
// points 0.025 c short of their corner (campaign case 1198) fell short.
func TestCornerReachOpenSteps(t *testing.T) {
	const h = 0.01
	// Straight surfaces crossed at x = 0.99: at x = 1 the upper fit lies
	// below the lower one.
	f := endFits{
		u: quadFit{c: [3]float64{0.099, -0.1, 0}, ok: true},
		l: quadFit{c: [3]float64{-0.099, 0.1, 0}, ok: true},
	}
	x, _ := f.cornerReach(1, h)
	d := x - 1
	if got := gapDeviance(2*d, h); math.Abs(got-edgePlausible) > 1e-9 {
		t.Errorf("corner reach %.4g beyond the aftmost point (%.3g steps): the stretch it leaves costs %.4g, want edgePlausible %d", d, d/h, got, edgePlausible)
	}
}

// endGap takes the gap that holds the trailing-edge point. A corner put at
// the aftmost point lies on a point, which both segments that meet there
// reach: the one along that point's surface (a step) and the one across
// the end to the other surface's last point. The second is the stretch
// the points leave open; in campaign case 5067 (a lower surface whose
// last 0.058 c were not measured) the first was taken, a ratio of 0.34
// in place of 12.4, and the end counted as sampled. Here the lower
// surface's points, stepped 0.01 c, run to the aftmost point (1, 0); the
// upper surface's stop at 0.93 c.
func TestEndGapCornerOnPoint(t *testing.T) {
	var pts []geometry.Point
	up := func(x float64) geometry.Point { return geometry.Point{X: x, Y: 0.1 * math.Sqrt(x) * (1 - x)} }
	lo := func(x float64) geometry.Point { return geometry.Point{X: x, Y: -0.05 * math.Sqrt(x) * (1 - x)} }
	// The loop: the upper surface from 0.93 forward to the nose, the
	// lower surface back to 1.
	for x := 0.93; x > 0.005; x -= 0.01 {
		pts = append(pts, up(x))
	}
	pts = append(pts, geometry.Point{})
	for x := 0.01; x < 1.0001; x += 0.01 {
		pts = append(pts, lo(math.Min(x, 1)))
	}
	loop := make([]int32, len(pts))
	for i := range loop {
		loop[i] = int32(i)
	}
	tip := pts[len(pts)-1]
	const nu, nl = 3, 3
	got := endGap(pts, loop, nu, nl, tip)
	across := tip.Dist(pts[0])
	if want := across / 0.01; math.Abs(got-want) > 0.1*want {
		t.Errorf("end gap ratio %.3g, want about %.3g (the %.3g c across the end over steps of 0.01 c)", got, want, across)
	}
	if !(got > edgeGapK) {
		t.Errorf("end gap ratio %.3g: the end counts as sampled (want more than edgeGapK, %d)", got, edgeGapK)
	}
}
