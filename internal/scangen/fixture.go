package scangen

import (
	"math"
	"math/rand/v2"

	"github.com/foilwright/foilwright/geometry"
)

// LineFixture is a point of a fixture beside the part (a clamp's jaw
// face), measured with it: the section must leave it out.
const LineFixture = "fixture"

// Fixture is a straight face of a fixture beside the part that the probe
// or the scanner measured with the section (a clamp's jaw, a vice, a stop
// block): Points points evenly along a face Length long (chord units),
// Offset (chord units) off the section, with the case's noise, written
// after the section's points (shuffled among them in a shuffled file).
type Fixture struct {
	Points int     `json:"points"`
	Length float64 `json:"length"`
	Offset float64 `json:"offset"`
	// Place is where the face lies: "below-aft" or "below-fore" (along
	// the chord, Offset below the lower surface's lowest point near 90 %
	// or 5 % of the chord), "beyond-aft" or "beyond-fore" (square to the
	// chord, Offset beyond the trailing or the leading edge).
	Place string `json:"place"`
	// At is the chordwise station of a face below the section; Shift
	// moves a face beyond an edge along itself, chord units.
	At    float64 `json:"at,omitempty"`
	Shift float64 `json:"shift,omitempty"`
}

// WithFixture returns s with a fixture drawn from a random stream of its
// own for seed (so the case's other draws are those of the plain case):
// 3–12 points on a face 0.02–0.10 chord long, 0.01–0.15 chord off the
// section, below it or beyond an edge, aft six times in ten (common
// practice: a part is clamped by its thick root or its tail, the jaws a
// few millimetres from the outline; magnitudes not from a published table).
func WithFixture(s Spec, seed uint64) Spec {
	rng := rand.New(rand.NewPCG(seed, 0xf1c5))
	f := &Fixture{
		Points: 3 + rng.IntN(10),
		Length: 0.02 + 0.08*rng.Float64(),
		Offset: 0.01 + 0.14*rng.Float64(),
	}
	side := "fore"
	if rng.Float64() < 0.6 {
		side = "aft"
	}
	if rng.Float64() < 0.5 {
		f.Place = "below-" + side
		f.At = 0.05 + 0.1*(rng.Float64()-0.5)
		if side == "aft" {
			f.At = 0.9 + 0.1*(rng.Float64()-0.5)
		}
	} else {
		f.Place = "beyond-" + side
		f.Shift = 0.25 * f.Length * (2*rng.Float64() - 1)
	}
	s.Defects.Fixture = f
	return s
}

// fixturePoints returns the points of the fixture f of the section sh,
// with noise σ (chord units) from rng, in the normalised frame.
func fixturePoints(f *Fixture, sh *Shape, noise float64, rng *rand.Rand) []point {
	var c, dir geometry.Point
	switch f.Place {
	case "below-aft", "below-fore":
		// The lowest outline point within 0.01 chord of the station.
		low := math.Inf(1)
		const n = 4000 // a piece
		for k := range n * sh.Pieces() {
			p := sh.At(float64(k) / n)
			if math.Abs(p.X-f.At) <= 0.01 && p.Y < low {
				low = p.Y
			}
		}
		if math.IsInf(low, 1) {
			low = 0
		}
		c, dir = geometry.Point{X: f.At, Y: low - f.Offset}, geometry.Point{X: 1}
	case "beyond-aft":
		c, dir = geometry.Point{X: sh.At(sh.TE()).X + f.Offset, Y: f.Shift}, geometry.Point{Y: 1}
	default: // beyond-fore
		c, dir = geometry.Point{X: sh.At(sh.LE()).X - f.Offset, Y: f.Shift}, geometry.Point{Y: 1}
	}
	out := make([]point, f.Points)
	for k := range out {
		s := f.Length * (float64(k)/float64(max(f.Points-1, 1)) - 0.5)
		q := c.Add(dir.Scale(s)).Add(geometry.Point{X: rng.NormFloat64(), Y: rng.NormFloat64()}.Scale(noise))
		out[k] = point{q: q, line: Line{Kind: LineFixture, Offset: f.Offset}, src: -1}
	}
	return out
}
