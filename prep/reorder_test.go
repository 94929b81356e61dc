package prep

import (
	"math"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/internal/scangen"
)

// untangled cuts every loop out of a ring: a square whose top edge folds
// back over itself (from (4, 4) to (1, 4), up to (1.5, 5), down across
// the top edge at (13/6, 4) to (2.5, 3.5), then on to (0, 4)) loses the
// loop's two vertices, gains the crossing, and crosses itself nowhere.
func TestUntangled(t *testing.T) {
	ring := []geometry.Point{
		{X: 0, Y: 0}, {X: 4, Y: 0}, {X: 4, Y: 4},
		{X: 1, Y: 4}, {X: 1.5, Y: 5}, {X: 2.5, Y: 3.5},
		{X: 0, Y: 4},
	}
	if _, _, ok := geometry.LoopCrossing(ring); !ok {
		t.Fatal("the test ring does not cross itself")
	}
	got := untangled(ring)
	if i, j, ok := geometry.LoopCrossing(got); got == nil || ok {
		t.Fatalf("segments %d and %d still cross: %v", i, j, got)
	}
	want := []geometry.Point{{X: 0, Y: 0}, {X: 4, Y: 0}, {X: 4, Y: 4}, {X: 13.0 / 6, Y: 4}, {X: 2.5, Y: 3.5}, {X: 0, Y: 4}}
	if len(got) != len(want) {
		t.Fatalf("got %v, want %v", got, want)
	}
	for k := range want {
		if got[k].Dist(want[k]) > 1e-12 {
			t.Errorf("vertex %d: %v, want %v", k, got[k], want[k])
		}
	}
	// The square less the triangle (13/6, 4), (2.5, 3.5), (0, 4) the cut
	// leaves out: 16 − ½ · 13/6 · ½ (calculated by hand).
	if a, w := geometry.SignedArea(got), 16-13.0/24; math.Abs(a-w) > 1e-12 {
		t.Errorf("area %g, want %g", a, w)
	}
}

// alongOutline takes points listed out of turn in the order of their
// feet on the ring, from the foot of the start given, with those feet as
// their positions along the loop, increasing.
func TestAlongOutline(t *testing.T) {
	ring := []geometry.Point{{X: 0, Y: 0}, {X: 4, Y: 0}, {X: 4, Y: 4}, {X: 0, Y: 4}}
	c := &geometry.Contour{
		Points: []geometry.Point{{X: 3, Y: 0.1}, {X: 1, Y: -0.1}, {X: 2, Y: 0}, {X: 3.9, Y: 2}, {X: 2, Y: 4.1}},
		Origins: []geometry.Origin{{File: "f", Line: 1}, {File: "f", Line: 2}, {File: "f", Line: 3},
			{File: "f", Line: 4}, {File: "f", Line: 5}},
	}
	got := alongOutline(c, ring, geometry.Point{X: 0.5, Y: 0})
	if got == nil {
		t.Fatal("nil")
	}
	wantLines := []int{2, 3, 1, 4, 5}
	wantAlong := []float64{0.5, 1.5, 2.5, 5.5, 9.5} // feet 1, 2, 3, 6, 10 less the start's 0.5
	for k := range wantLines {
		if got.Origins[k].Line != wantLines[k] || math.Abs(got.Along[k]-wantAlong[k]) > 1e-12 {
			t.Errorf("point %d: line %d along %g, want line %d along %g", k, got.Origins[k].Line, got.Along[k], wantLines[k], wantAlong[k])
		}
	}
	// A ring running the other way round is turned to run the contour's
	// way (the contour here runs counter-clockwise, as the square does).
	rev := []geometry.Point{ring[0], ring[3], ring[2], ring[1]}
	if got2 := alongOutline(c, rev, geometry.Point{X: 0.5, Y: 0}); got2 == nil || got2.Origins[0].Line != 2 {
		t.Errorf("reversed ring: %v", got2)
	}
}

// A dense scan (invented, internal/scangen case 783 of the robustness
// campaign with 30 000 points instead of 100 000) of a Kármán–Trefftz
// section with a 1.4° trailing-edge angle (exact shape by conformal
// mapping), 0.02 mm noise on a 101 mm chord, irregular spacing, shuffled:
// the band of points was ordered by positions measured on a curve that
// doubled back near the thin edge, and the fit through them folded into
// panels that crossed, in every ordering. Retaken in the order of the
// fitted outline with its loops cut out, the points give a section that
// does not cross itself and whose stated bound covers its true error.
func TestPrepareDenseBandRetaken(t *testing.T) {
	if raceEnabled {
		t.Skip("a dense scan: too slow under the race detector")
	}
	const seed = 783
	scan, err := scangen.Generate(specOf(t, `{"category":"dense","shape":{"family":"karman-trefftz","kt":{"centre_x":-0.10076202709150851,"centre_y":0.014618124624595902,"te_angle_deg":1.3941107962603998}},"sampling":{"points":30000,"sigma":0.4012000927665129,"wave":0.5802219933873553,"zone":"nose","zone_factor":3.4609901833060714},"noise":{"mm":0.02155199190389932},"defects":{"outliers":0.00667672931028803,"duplicates":0.0014758107208553018,"near_share":0.09705769530746433},"order":{"mode":"shuffled","reverse":true},"placement":{"chord_mm":101.12860888792436,"twist_deg":1.5112368237786598,"orientation":"standard","le_mm":[772.919782421897,59.08781566241055]},"file":{"format":"semicolon","units":"mm","header":"names","decimals":4}}`), seed)
	if err != nil {
		t.Fatal(err)
	}
	p, err := Prepare("783", []File{NewFile(scan.Name, scan.Data)}, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	retaken := false
	for _, w := range p.Section.Warnings {
		retaken = retaken || strings.Contains(w, "retaken")
	}
	if !retaken {
		t.Errorf("passed without retaking the points (warnings %q): the case no longer tests the retaking", p.Section.Warnings)
	}
	if _, err := section.CheckNodes(p.Section.Nodes); err != nil {
		t.Fatal(err)
	}
	var worst float64
	for _, n := range p.Section.Nodes {
		d, _ := scan.Truth.Section.Shape.Nearest(n)
		worst = math.Max(worst, d)
	}
	if worst > p.Uncertainty.Surface {
		t.Errorf("nodes up to %.3g c off the true outline, stated surface bound %.3g c", worst, p.Uncertainty.Surface)
	}
	if d := math.Abs(p.Shape.Frame.Chord - scan.Truth.Chord); d > p.Uncertainty.Chord {
		t.Errorf("chord off by %.3g mm, stated bound %.3g mm", d, p.Uncertainty.Chord)
	}
}
