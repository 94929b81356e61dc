package prep

import (
	"bytes"
	"fmt"
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// A thin, strongly cambered section exported as a polyline: NACA 6206
// (NACA Report 824 equations, geometry/shape) at 30 cosine stations a
// surface, one to three points on its open base, three decimals in mm,
// turned 23°. Sixty points make the section order's camber bins 0.125 c
// wide: the surfaces of the sloping tail overlap in y within the last
// bins and of the nose within the first, and a camber line held at the
// height of the bins that count (0.037 c and 0.058 c) passed above the
// upper surface aft of 80 % of the chord and round the nose, so those
// points were taken for the lower surface and the section failed "no
// self-crossing", with --noise 0 too. The camber line now runs to the
// chord frame's ends. prep must order the points, and the chord and the
// nodes must lie within the bounds the section states (the end's reading
// on such thin bases is another matter: the bounds are wide there, and
// honest).
func TestPrepareThinCamberedPolyline(t *testing.T) {
	const (
		chordMM    = 150.0
		twistDeg   = 23.0
		offX, offY = -40.0, 615.0
	)
	n, err := shape.ParseNACA4("6206")
	if err != nil {
		t.Fatal(err)
	}
	for base := 1; base <= 3; base++ {
		for _, noise := range []*float64{nil, new(float64)} {
			name := fmt.Sprintf("%d-on-base/noise-auto", base)
			if noise != nil {
				name = fmt.Sprintf("%d-on-base/noise-0", base)
			}
			t.Run(name, func(t *testing.T) {
				outline := exactBaseOutline(n, 30, base, 1, false)
				s, c := math.Sincos(twistDeg * math.Pi / 180)
				toPart := func(q geometry.Point) geometry.Point {
					return geometry.Point{X: offX + chordMM*(c*q.X+s*q.Y), Y: offY + chordMM*(-s*q.X+c*q.Y)}
				}
				var buf bytes.Buffer
				for _, q := range outline.points {
					p := toPart(q)
					fmt.Fprintf(&buf, "%.3f\t%.3f\n", p.X, p.Y)
				}
				p, err := Prepare("6206", []File{NewFile("6206.txt", buf.Bytes())}, Settings{Units: "mm", Noise: noise})
				if err != nil {
					t.Fatal(err)
				}
				// The chord: from the trailing-edge midpoint to the
				// farthest point of the true outline (DESIGN.md).
				var far float64
				for _, q := range outline.dense {
					far = math.Max(far, q.Dist(outline.teMid))
				}
				u := p.Uncertainty
				if d := math.Abs(p.Shape.Frame.Chord - chordMM*far); d > u.Chord {
					t.Errorf("chord %.4f mm, true %.4f mm: off by %.3g mm, beyond its bound %.3g mm", p.Shape.Frame.Chord, chordMM*far, d, u.Chord)
				}
				var worst float64
				for _, q := range p.Section.Nodes {
					worst = math.Max(worst, distToPolyline(p.Shape.Frame.ToPart(q), outline.dense, toPart)/chordMM)
				}
				if worst > u.Surface {
					t.Errorf("nodes up to %.3g c off the true outline, beyond the surface bound %.3g c", worst, u.Surface)
				}
				if p.Props.Thickness < 0.055 || p.Props.Thickness > 0.065 {
					t.Errorf("thickness %.4f c, want 0.06 within 0.005 (the section, not a fold)", p.Props.Thickness)
				}
			})
		}
	}
}
