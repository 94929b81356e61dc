package prep

import (
	"fmt"
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/internal/scangen"
)

// A Kármán–Trefftz section with a 1° trailing-edge angle (exact shape
// by conformal mapping, internal/scangen), scanned with noise larger than
// its thickness over the last 1 % of the chord: near the edge the two
// surfaces lie within the noise of each other, and the data say only that
// the edge is thinner than the noise. prep must still make a section
// whose surfaces do not cross (they meet, or stay apart by no less than
// zero) and whose stated bounds cover its true error. Invented scans:
// 1500 points, irregular spacing (log-normal gaps, σ 0.5), 0.08 mm noise
// on a 152 mm chord, in file order and shuffled, four seeds each.
func TestPrepareThinEdgeUnderNoise(t *testing.T) {
	const noiseMM, chordMM = 0.08, 152.0
	for _, mode := range []string{"loop", "shuffled"} {
		for seed := uint64(1); seed <= 4; seed++ {
			t.Run(fmt.Sprintf("%s/seed%d", mode, seed), func(t *testing.T) {
				scan, err := scangen.Generate(specOf(t, fmt.Sprintf(`{"category":"general","shape":{"family":"karman-trefftz","kt":{"centre_x":-0.08,"centre_y":0.04,"te_angle_deg":1}},"sampling":{"points":1500,"sigma":0.5,"wave":0.3},"noise":{"mm":%g},"defects":{},"order":{"mode":%q},"placement":{"chord_mm":%g,"twist_deg":7,"orientation":"standard","le_mm":[10,20]},"file":{"format":"csv","units":"mm","header":"names","decimals":4}}`, noiseMM, mode, chordMM)), seed)
				if err != nil {
					t.Fatal(err)
				}
				tr := scan.Truth
				// The premise: the true section is thinner than the noise
				// over its last 1 % of chord.
				if t99 := trueThickness(tr.Section.Shape.Dense(), 0.99); !(t99 < tr.Noise) {
					t.Fatalf("true thickness %.3g c at x = 0.99 is not below the noise %.3g c", t99, tr.Noise)
				}
				p, err := Prepare("kt", []File{NewFile(scan.Name, scan.Data)}, Settings{})
				if err != nil {
					t.Fatal(err)
				}
				nodes, le := p.Section.Nodes, *p.Section.LEIndex
				if _, err := section.CheckNodes(nodes); err != nil {
					t.Fatalf("nodes: %v", err)
				}
				for x := 0.95; x < 0.9995; x += 0.0005 {
					if th := thicknessAt(nodes, le, x); th < 0 {
						t.Fatalf("the surfaces cross: thickness %.3g c at x = %.4f", th, x)
					}
				}
				// The stated bounds cover the true error: the nodes'
				// distance from the true outline and the chord's error.
				u := p.Uncertainty
				var worst float64
				for _, n := range nodes {
					d, _ := tr.Section.Shape.Nearest(n)
					worst = math.Max(worst, d)
				}
				if worst > u.Surface {
					t.Errorf("nodes up to %.3g c off the true outline, stated surface bound %.3g c", worst, u.Surface)
				}
				if d := math.Abs(p.Shape.Frame.Chord - tr.Chord); d > u.Chord {
					t.Errorf("chord %.5g mm off by %.3g mm, stated bound %.3g mm", p.Shape.Frame.Chord, d, u.Chord)
				}
			})
		}
	}
}

// trueThickness returns the distance across the closed outline pts
// (normalised frame) at chord station x: the highest less the lowest of
// its crossings of the vertical line there.
func trueThickness(pts []geometry.Point, x float64) float64 {
	hi, lo := math.Inf(-1), math.Inf(1)
	for k := range pts {
		a, b := pts[k], pts[(k+1)%len(pts)]
		if (a.X-x)*(b.X-x) <= 0 && a.X != b.X {
			y := a.Y + (b.Y-a.Y)*(x-a.X)/(b.X-a.X)
			hi, lo = math.Max(hi, y), math.Min(lo, y)
		}
	}
	return hi - lo
}
