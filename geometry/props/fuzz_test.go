package props

import (
	"encoding/binary"
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/frame"
	"github.com/foilwright/foilwright/geometry/shape"
)

// FuzzFitNormalize feeds arbitrary loops through Fit, Normalize and
// Compute: they may return errors but never panic, and a
// successful normalisation puts the leading edge at the origin.
func FuzzFitNormalize(f *testing.F) {
	seed := func(pts []geometry.Point) []byte {
		var b []byte
		for _, p := range pts {
			b = binary.LittleEndian.AppendUint16(b, uint16(int16(p.X*1000)))
			b = binary.LittleEndian.AppendUint16(b, uint16(int16(p.Y*1000)))
		}
		return b
	}
	n, _ := shape.ParseNACA4("2412")
	f.Add(seed(n.Loop(12)))
	n.SharpTE = true
	f.Add(seed(n.Loop(10)[:20]))
	f.Add(seed([]geometry.Point{{X: 0, Y: 0}, {X: 1, Y: 0}, {X: 1, Y: 1}, {X: 0, Y: 1}, {X: 0.5, Y: 0.5}, {X: 0.2, Y: 0.9}, {X: 0.1, Y: 0.3}, {X: 0.9, Y: 0.1}}))
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) > 4*400 {
			return
		}
		c := &geometry.Contour{}
		for i := 0; i+4 <= len(data); i += 4 {
			x := float64(int16(binary.LittleEndian.Uint16(data[i:]))) / 1000
			y := float64(int16(binary.LittleEndian.Uint16(data[i+2:]))) / 1000
			c.Points = append(c.Points, geometry.Point{X: x, Y: y})
		}
		if geometry.SignedArea(c.Points) < 0 {
			for i, j := 1, len(c.Points)-1; i < j; i, j = i+1, j-1 {
				c.Points[i], c.Points[j] = c.Points[j], c.Points[i]
			}
		}
		for _, o := range []curve.FitOptions{{}, {Exact: true}, {Noise: 0.01}} {
			cv, _, err := curve.Fit(c, o)
			if err != nil {
				continue
			}
			for _, te := range []string{frame.TEAuto, frame.TEClose, frame.TESharpen} {
				nz, err := frame.Normalize(cv, frame.Options{TE: te})
				if err != nil {
					continue
				}
				if d := nz.Path.At(nz.SLE).Norm(); d > 1e-6 && !math.IsNaN(d) {
					t.Fatalf("leading edge %g from the origin", d)
				}
				_, _, _ = Compute(nz.Path, nz.SLE, Options{})
			}
		}
	})
}
