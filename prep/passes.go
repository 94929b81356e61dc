package prep

import (
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/accuracy"
	"github.com/foilwright/foilwright/geometry/clean"
)

// widenForPasses takes in the disagreement of passes that measured a
// stretch twice (clean.PassOffset): which pass holds the part where it
// was is unknown, and the section follows one pass on the stretches only
// it measured and their mean where both did, so every figure may be off
// by as much as the passes' offset beyond what the noise leaves open. The
// largest offset is added to the chord and leading-edge bounds (input
// units), to the surface bound (chord units) and, over the chord, to the
// twist's; none is ever narrowed.
func widenForPasses(u *accuracy.Uncertainty, passes []clean.PassOffset, chord float64) {
	var d float64
	for _, p := range passes {
		d = math.Max(d, math.Abs(p.Offset))
	}
	if d == 0 || !(chord > 0) {
		return
	}
	u.Chord += d
	u.LE += d
	u.Surface += d / chord
	u.TwistDeg += math.Atan(d/chord) * 180 / math.Pi
}

// passWarnings says, for each two passes that disagree where both measured
// the outline, by how much and where, and what the bounds took in.
func passWarnings(passes []clean.PassOffset, units geometry.Unit) []string {
	var out []string
	for _, p := range passes {
		side := "outside"
		if p.Offset < 0 {
			side = "inside"
		}
		out = append(out, fmt.Sprintf("the passes starting at %s and %s measured a stretch both and disagree there: the second lies %s %s the first (± %s, over %d points); the part or the probe moved between them, or the probe radius was compensated differently; the section follows their mean where both measured and each alone elsewhere, and the stated bounds take in the offset; re-seat and re-measure in one pass to remove it", p.First, p.Second, LengthText(math.Abs(p.Offset), units), side, LengthText(p.Spread, units), p.Points))
	}
	return out
}
