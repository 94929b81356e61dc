package scangen

import (
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// unitMM returns the length of one unit in millimetres.
func unitMM(u string) (float64, error) {
	switch u {
	case "mm":
		return 1, nil
	case "m":
		return 1000, nil
	case "in":
		return 25.4, nil
	}
	return 0, fmt.Errorf("scangen: unit %q: want mm, m or in", u)
}

// placement carries normalised points onto the part, in file units.
type placement struct {
	chord, twistDeg float64
	mirrored        bool
	le              geometry.Point
	dim             int
	origin          geometry.Vec3
	u, v, n         geometry.Vec3 // the plane's basis and normal (3D)
}

// newPlacement returns the placement of p in the file unit u. The
// orientations map onto the tool's frame (mirror x ↦ −x, then twist):
// reversed is the mirror at the same twist; upside down (y ↦ −y) is the
// mirror at twist − 180°; both together are the plain frame at
// twist − 180°.
func newPlacement(p Placement, u string) (*placement, error) {
	mm, err := unitMM(u)
	if err != nil {
		return nil, err
	}
	pl := &placement{chord: p.ChordMM / mm, twistDeg: p.TwistDeg, le: geometry.Point{X: p.LEMM[0] / mm, Y: p.LEMM[1] / mm}, dim: 2}
	switch p.Orientation {
	case "standard", "":
	case "reversed":
		pl.mirrored = true
	case "upside-down":
		pl.mirrored, pl.twistDeg = true, p.TwistDeg-180
	case "reversed-upside-down":
		pl.twistDeg = p.TwistDeg - 180
	default:
		return nil, fmt.Errorf("scangen: orientation %q", p.Orientation)
	}
	pl.twistDeg = math.Remainder(pl.twistDeg, 360)
	if pl.twistDeg == -180 {
		pl.twistDeg = 180
	}
	switch p.Plane {
	case "":
	case "z", "tilted":
		pl.dim = 3
		pl.origin = geometry.Vec3{Z: p.ZMM / mm}
		pl.u, pl.v, pl.n = geometry.Vec3{X: 1}, geometry.Vec3{Y: 1}, geometry.Vec3{Z: 1}
		if p.Plane == "tilted" {
			s, c := math.Sincos(p.SpinDeg * math.Pi / 180)
			axis := geometry.Vec3{X: c, Y: s}
			a := p.TiltDeg * math.Pi / 180
			pl.u, pl.v, pl.n = rotate(pl.u, axis, a), rotate(pl.v, axis, a), rotate(pl.n, axis, a)
		}
	default:
		return nil, fmt.Errorf("scangen: plane %q", p.Plane)
	}
	return pl, nil
}

// rotate returns v rotated by angle a about the unit axis k (Rodrigues'
// formula).
func rotate(v, k geometry.Vec3, a float64) geometry.Vec3 {
	s, c := math.Sincos(a)
	return v.Scale(c).Add(k.Cross(v).Scale(s)).Add(k.Scale(k.Dot(v) * (1 - c)))
}

// part returns the in-plane part coordinates of the normalised point q:
//
//	p = LE + c · M · R(−τ) · q
func (pl *placement) part(q geometry.Point) geometry.Point {
	p := q.Rotate(-pl.twistDeg * math.Pi / 180).Scale(pl.chord)
	if pl.mirrored {
		p.X = -p.X
	}
	return p.Add(pl.le)
}

// space returns the file coordinates of the in-plane point p lifted off
// the plane by z (file units); 2D placements ignore z.
func (pl *placement) space(p geometry.Point, z float64) geometry.Vec3 {
	if pl.dim == 2 {
		return geometry.Vec3{X: p.X, Y: p.Y}
	}
	return pl.origin.Add(pl.u.Scale(p.X)).Add(pl.v.Scale(p.Y)).Add(pl.n.Scale(z))
}

// frame fills the frame of the truth.
func (pl *placement) frame(tr *Truth) {
	tr.Chord, tr.TwistDeg, tr.Mirrored, tr.Dim = pl.chord, pl.twistDeg, pl.mirrored, pl.dim
	le := pl.space(pl.part(geometry.Point{}), 0)
	te := pl.space(pl.part(geometry.Point{X: 1}), 0)
	tr.LE, tr.TE = [3]float64{le.X, le.Y, le.Z}, [3]float64{te.X, te.Y, te.Z}
	if pl.dim == 3 {
		a := func(v geometry.Vec3) [3]float64 { return [3]float64{v.X, v.Y, v.Z} }
		tr.Plane = &PlaneTruth{Origin: a(pl.origin), U: a(pl.u), V: a(pl.v), Normal: a(pl.n)}
	}
}
