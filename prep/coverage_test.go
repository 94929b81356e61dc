package prep

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/internal/scangen"
)

// A Kármán–Trefftz section (exact shape by conformal mapping; invented
// scan, internal/scangen case 1811: 1500 points, shuffled, irregular
// spacing, 0.02 mm noise) whose ordering broke into two loops side by
// side: the larger, 613 of 1493 points, passed as the section with an
// "open" trailing edge 0.43 chord thick and its chord 51 % short, because
// every other loop counted as a wall of a hollow part. Only a loop nested
// with the section is a wall; a piece beside it must be kept (the loop
// coverage gate), so the chain orders the points another way.
func TestPrepareKeepsBrokenOffPiece(t *testing.T) {
	const seed = 1811
	scan, err := scangen.Generate(scangen.Draw(seed), seed)
	if err != nil {
		t.Fatal(err)
	}
	p, err := Prepare("kt", []File{NewFile(scan.Name, scan.Data)}, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	tr := scan.Truth
	if used := p.Contour.Len(); float64(used) < 0.9*float64(tr.GoodPoints) {
		t.Errorf("the section keeps %d of %d good points", used, tr.GoodPoints)
	}
	if fr := p.Shape.Frame; math.Abs(fr.Chord-tr.Chord) > 0.01*tr.Chord {
		t.Errorf("chord %.4g, truth %.4g", fr.Chord, tr.Chord)
	}
}
