package prep

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry/accuracy"
	"github.com/foilwright/foilwright/geometry/clean"
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
	scan, err := scangen.Generate(scangen.Draw(seed), seed)
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
