package prep

import (
	"encoding/json"
	"errors"
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/accuracy"
	"github.com/foilwright/foilwright/geometry/clean"
	"github.com/foilwright/foilwright/geometry/frame"
	"github.com/foilwright/foilwright/internal/scangen"
)

// A thin, strongly cambered Kármán–Trefftz section (exact shape by
// conformal mapping; invented scan, internal/scangen case 508: 1500
// points, irregular spacing, a sparse stretch, 0.005 mm noise) whose
// trailing-edge angle of 20° makes it as wide near its tail as near its
// nose: read backwards it passed every gate with its twist 180° off and a
// "blunt edge" 5 % thick across its nose. The end no model explains is
// now looked at from the other side.
func TestPrepareThinCamberedReadForwards(t *testing.T) {
	const seed = 508
	// The case as scangen drew it for seed 508 before the generator grew
	// harder (its draws moved); Generate makes the same file from it.
	scan, err := scangen.Generate(specOf(t, `{"category":"lift","shape":{"family":"karman-trefftz","kt":{"centre_x":-0.14108749428111694,"centre_y":0.08209818975947093,"te_angle_deg":19.988161670723805}},"sampling":{"points":1500,"sigma":0.770097400378323,"wave":0.5148739654663491,"zone":"sparse","zone_factor":0.25860942178294116},"noise":{"mm":0.005},"defects":{"outliers":0.006887733446880437,"duplicates":0.00047053442427633763,"near_share":0.8867016696098348},"order":{"mode":"shuffled"},"placement":{"chord_mm":156.31938734281238,"twist_deg":-11.223414277738573,"orientation":"standard","le_mm":[-445.6702972123974,674.4007158493175]},"file":{"format":"blank","units":"mm","header":"names","decimals":4}}`), seed)
	if err != nil {
		t.Fatal(err)
	}
	p, err := Prepare("kt", []File{NewFile(scan.Name, scan.Data)}, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	fr, tr := p.Shape.Frame, scan.Truth
	dt := math.Mod(math.Abs(fr.TwistDeg-tr.TwistDeg), 360)
	if fr.Mirrored != tr.Mirrored || min(dt, 360-dt) > 0.5 || math.Abs(fr.Chord-tr.Chord) > 0.01*tr.Chord {
		t.Errorf("frame: chord %.4g twist %.3f° mirrored %v; truth chord %.4g twist %.3f° mirrored %v",
			fr.Chord, fr.TwistDeg, fr.Mirrored, tr.Chord, tr.TwistDeg, tr.Mirrored)
	}
	if k := p.Section.TrailingEdge.Kind; k != "sharp" {
		t.Errorf("trailing edge %s, want sharp (a Kármán–Trefftz section ends in a corner)", k)
	}
}

// A 4 % thick NACA 4-digit section (Report 824 equations) whose open
// edge was rounded with a radius of 0.0096 chord, five times its nose
// radius (1.1019 t², Report 824): an invented voxel scan (internal/scangen
// case 105172: 1758 points, irregular spacing, a sparse stretch). The
// nose fitted the rounded-end model as well as the tail, and the section
// was read backwards, its twist 180° off with a stated bound of 0.05°,
// exit 0. Now the other end is analysed too when the end found is
// rounded: the chain either refuses the section (a gate, exit 2) or reads
// it forwards, never backwards within a bound that misses it.
func TestPrepareRoundedTailBlunterThanNose(t *testing.T) {
	const seed = 105172
	scan, err := scangen.Generate(specOf(t, `{"category": "voxel", "shape": {"family": "naca4", "naca": {"camber": 0.05, "camber_pos": 0.6, "thickness": 0.04, "closed_te": false}, "round_radius": 0.009603747883600895}, "sampling": {"points": 1758, "sigma": 0.5553225268225682, "wave": 0.30076924139688554, "zone": "sparse", "zone_factor": 0.31223925999053803}, "noise": {"mm": 0.012931211964223258, "step_mm": 0.06147582819635124}, "defects": {"outliers": 0.011543013606797183}, "order": {"mode": "shuffled"}, "placement": {"chord_mm": 508.55635200209656, "twist_deg": 32.15336790595233, "orientation": "standard", "le_mm": [17.14660923343658, 3.501603644302122]}, "file": {"format": "tab", "units": "mm", "header": "units", "decimals": 3, "trailing_sep": true}}`), seed)
	if err != nil {
		t.Fatal(err)
	}
	p, err := Prepare("rounded-tail", []File{NewFile(scan.Name, scan.Data)}, Settings{})
	if err != nil {
		var ge *GateError
		if !errors.As(err, &ge) {
			t.Fatalf("refused, but not by a gate: %v", err)
		}
		return
	}
	fr, tr := p.Shape.Frame, scan.Truth
	dt := math.Mod(math.Abs(fr.TwistDeg-tr.TwistDeg), 360)
	if dt = min(dt, 360-dt); dt > max(0.2, p.Uncertainty.TwistDeg) {
		t.Errorf("twist %.3f°, truth %.3f°: %.3g° off with a bound of %.3g°", fr.TwistDeg, tr.TwistDeg, dt, p.Uncertainty.TwistDeg)
	}
}

// widenForEdge takes in what the points leave open at the end: the chord
// up to the spread along it, the twist up to the spread across it over
// the chord (an end 1 unit higher or lower at a chord of 100 turns the
// chord line by atan 0.01 = 0.573°); neither bound is ever narrowed.
func TestWidenForEdge(t *testing.T) {
	u := accuracy.Uncertainty{Chord: 0.1, TwistDeg: 0.1}
	widenForEdge(&u, &clean.Edge{Chord: 100, Spread: 0.5, SpreadAcross: 1})
	if math.Abs(u.Chord-0.5) > 1e-12 || math.Abs(u.TwistDeg-math.Atan(0.01)*180/math.Pi) > 1e-12 {
		t.Errorf("widened to chord %g, twist %g°; want 0.5, 0.573°", u.Chord, u.TwistDeg)
	}
	u = accuracy.Uncertainty{Chord: 2, TwistDeg: 1}
	widenForEdge(&u, &clean.Edge{Chord: 100, Spread: 0.5, SpreadAcross: 1})
	widenForEdge(&u, nil)
	if u.Chord != 2 || u.TwistDeg != 1 {
		t.Errorf("narrowed to chord %g, twist %g°", u.Chord, u.TwistDeg)
	}
}

// Where another kind of end fits nearly as well, the chord's bound
// reaches that end and the leading edge's bound besides: an exact open
// edge 0.002 c thick stated sharp with its corner 0.9 % of the chord
// beyond the base (where the surfaces of NACA Report 824's open edge
// meet), its leading edge known to 0.1 % of the chord, must cover a base
// 0.9 % short with the leading edge 0.1 % off (0.9 + 0.1); the surface's
// bound reaches the rival's outline. Without a rival kind the spread
// alone stays the chord's bound.
func TestWidenForEdgeRivals(t *testing.T) {
	e := &clean.Edge{Kind: clean.EdgeSharp, Chord: 100, Spread: 0.9, SpreadSurface: 2e-3, Rivals: []string{clean.EdgeBlunt}}
	u := accuracy.Uncertainty{Chord: 0.8, LE: 0.1, Surface: 1e-3}
	widenForEdge(&u, e)
	if math.Abs(u.Chord-1.0) > 1e-12 || u.Surface != 2e-3 {
		t.Errorf("with a blunt rival: chord %g, surface %g; want 1.0, 0.002", u.Chord, u.Surface)
	}
	e.Rivals = nil
	u = accuracy.Uncertainty{Chord: 0.8, LE: 0.1, Surface: 1e-3}
	widenForEdge(&u, e)
	if u.Chord != 0.9 || u.Surface != 2e-3 {
		t.Errorf("without a rival: chord %g, surface %g; want 0.9, 0.002", u.Chord, u.Surface)
	}
}

// The surface's bound takes in SpreadSurface (chord units) likewise, and
// a fit's own trailing edge that replaced the points' edge keeps the
// points' edge in the bounds: its tip 3 units beyond the end the fit
// found, 0.5 units above the chord line, with a spread of 1 along and 0.2
// across, at a chord of 100 twisted by 90° (the chord runs along y),
// widens the chord's bound to 3 + 1 and the twist's to atan(0.7/100).
func TestWidenForRejectedEdge(t *testing.T) {
	u := accuracy.Uncertainty{Chord: 0.1, TwistDeg: 0.1, Surface: 1e-3}
	widenForEdge(&u, &clean.Edge{Chord: 100, SpreadSurface: 4e-3})
	if u.Surface != 4e-3 {
		t.Errorf("surface widened to %g, want 0.004", u.Surface)
	}
	fr := frame.Frame{Chord: 100, TwistDeg: -90, LE: [2]float64{10, 20}}
	te := fr.ToPart(geometry.Point{X: 1}) // the end the fit found
	if d := te.Dist(geometry.Point{X: 10, Y: 120}); d > 1e-9 {
		t.Fatalf("frame: trailing edge at %v", te)
	}
	tip := fr.ToPart(geometry.Point{X: 1.03, Y: 0.005})
	e := &clean.Edge{Kind: clean.EdgeSharp, Chord: 100, Upper: tip, Lower: tip, Spread: 1, SpreadAcross: 0.2}
	u = accuracy.Uncertainty{Chord: 0.1, TwistDeg: 0.1}
	widenForRejectedEdge(&u, e, fr)
	if math.Abs(u.Chord-4) > 1e-9 || math.Abs(u.TwistDeg-math.Atan(0.007)*180/math.Pi) > 1e-9 {
		t.Errorf("widened to chord %g, twist %g°; want 4, %g°", u.Chord, u.TwistDeg, math.Atan(0.007)*180/math.Pi)
	}
	u = accuracy.Uncertainty{Chord: 9, TwistDeg: 5}
	widenForRejectedEdge(&u, e, fr)
	widenForRejectedEdge(&u, nil, fr)
	if u.Chord != 9 || u.TwistDeg != 5 {
		t.Errorf("narrowed to chord %g, twist %g°", u.Chord, u.TwistDeg)
	}
}

// specOf decodes a scangen case written down as JSON.
func specOf(t *testing.T, js string) scangen.Spec {
	t.Helper()
	var s scangen.Spec
	if err := json.Unmarshal([]byte(js), &s); err != nil {
		t.Fatal(err)
	}
	return s
}
