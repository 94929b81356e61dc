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
	// The case as scangen drew it for seed 1811 before the generator grew
	// harder (its draws moved); Generate makes the same file from it.
	scan, err := scangen.Generate(specOf(t, `{"category":"lift","shape":{"family":"karman-trefftz","kt":{"centre_x":-0.08581636858753051,"centre_y":0.031221400632966217,"te_angle_deg":9.537675625676556}},"sampling":{"points":1500,"sigma":0.6886572351156373,"wave":0.5786360253881372},"noise":{"mm":0.02},"defects":{"outliers":0.0045457885526860075,"duplicates":0.0007113913234811442,"near_share":0.12206828748883325},"order":{"mode":"shuffled"},"placement":{"chord_mm":120.6031166940808,"twist_deg":11.186047991881267,"orientation":"standard","le_mm":[-548.1124332914278,-231.09867623002378]},"file":{"format":"csv","units":"mm","header":"names","decimals":4}}`), seed)
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
