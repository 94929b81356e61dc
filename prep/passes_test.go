package prep

import (
	"math"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/accuracy"
	"github.com/foilwright/foilwright/geometry/clean"
)

// Passes that disagree by 0.03 mm on a 150 mm chord widen every bound by
// the offset (the twist by atan(0.03/150) = 0.011459°), whichever pass lies
// outside; no offset leaves the bounds alone; the warning names both
// passes' first lines, the offset and its side.
func TestWidenForPasses(t *testing.T) {
	passes := []clean.PassOffset{
		{First: geometry.Origin{File: "a.csv", Line: 5}, Second: geometry.Origin{File: "a.csv", Line: 429}, Offset: -0.03, Spread: 0.003, Points: 17},
		{Offset: 0.01},
	}
	u := accuracy.Uncertainty{Chord: 0.1, TwistDeg: 0.05, LE: 0.02, Surface: 0.001}
	widenForPasses(&u, passes, 150)
	want := accuracy.Uncertainty{Chord: 0.13, TwistDeg: 0.05 + math.Atan(0.03/150)*180/math.Pi, LE: 0.05, Surface: 0.001 + 0.0002}
	if math.Abs(u.Chord-want.Chord) > 1e-12 || math.Abs(u.TwistDeg-want.TwistDeg) > 1e-12 || math.Abs(u.LE-want.LE) > 1e-12 || math.Abs(u.Surface-want.Surface) > 1e-12 {
		t.Errorf("widened to %+v, want %+v", u, want)
	}
	v := accuracy.Uncertainty{Chord: 0.1, TwistDeg: 0.05, LE: 0.02, Surface: 0.001}
	widenForPasses(&v, nil, 150)
	if v != (accuracy.Uncertainty{Chord: 0.1, TwistDeg: 0.05, LE: 0.02, Surface: 0.001}) {
		t.Errorf("no passes changed the bounds to %+v", v)
	}
	w := passWarnings(passes[:1], geometry.Millimetre)
	if len(w) != 1 || !strings.Contains(w[0], "a.csv:5 and a.csv:429") || !strings.Contains(w[0], "0.03 mm inside") {
		t.Errorf("warning %q: want both passes' lines and the offset inside", w)
	}
}

// Two whole passes 0.05 mm apart (3, 4), turned 0.01° between them: the
// leading edge's bound takes in half the shift (0.025) and the twist's
// half the turn (0.005°); chord and surface are left alone (the shape is
// the same in both passes); no move leaves the bounds alone; the warning
// names both passes' first lines and the move.
func TestWidenForReseat(t *testing.T) {
	r := &clean.Reseat{First: geometry.Origin{File: "b.csv", Line: 2}, Second: geometry.Origin{File: "b.csv", Line: 610},
		Shift: geometry.Point{X: 0.03, Y: 0.04}, Turn: 0.01 * math.Pi / 180, Spread: 0.001, Points: 1200}
	u := accuracy.Uncertainty{Chord: 0.1, TwistDeg: 0.05, LE: 0.02, Surface: 0.001}
	widenForReseat(&u, r)
	want := accuracy.Uncertainty{Chord: 0.1, TwistDeg: 0.055, LE: 0.045, Surface: 0.001}
	if math.Abs(u.Chord-want.Chord) > 1e-12 || math.Abs(u.TwistDeg-want.TwistDeg) > 1e-12 || math.Abs(u.LE-want.LE) > 1e-12 || u.Surface != want.Surface {
		t.Errorf("widened to %+v, want %+v", u, want)
	}
	v := accuracy.Uncertainty{Chord: 0.1, TwistDeg: 0.05, LE: 0.02, Surface: 0.001}
	widenForReseat(&v, nil)
	if v != (accuracy.Uncertainty{Chord: 0.1, TwistDeg: 0.05, LE: 0.02, Surface: 0.001}) {
		t.Errorf("no move changed the bounds to %+v", v)
	}
	w := reseatWarning(r, geometry.Millimetre)
	if !strings.Contains(w, "b.csv:2 and b.csv:610") || !strings.Contains(w, "0.05 mm from the first") {
		t.Errorf("warning %q: want both passes' lines and the move", w)
	}
	if reseatWarning(nil, geometry.Millimetre) != "" {
		t.Error("a warning without a move")
	}
}
