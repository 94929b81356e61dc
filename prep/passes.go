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

// widenForReseat takes in two whole passes moved apart (clean.Reseat):
// the section is placed midway between them, and where the part was is
// unknown to half their move either way, so half the shift is added to
// the leading edge's bound and half the turn to the twist's; the shape,
// the same in both passes, is not widened.
func widenForReseat(u *accuracy.Uncertainty, r *clean.Reseat) {
	if r == nil {
		return
	}
	u.LE += r.Shift.Norm() / 2
	u.TwistDeg += math.Abs(r.Turn) / 2 * 180 / math.Pi
}

// reseatWarning says that the file held two whole passes moved apart, by
// how much, and where the section was placed.
func reseatWarning(r *clean.Reseat, units geometry.Unit) string {
	if r == nil {
		return ""
	}
	return fmt.Sprintf("the file holds two whole passes round the section (starting at %s and %s) and the second lies %s from the first (x %s, y %s; turned %.3g°, ± %s): the part moved between them; each pass was moved half the way to the other, so the section is placed midway and the leading edge's and twist's bounds take in half the move; measure in one clamping to remove it",
		r.First, r.Second, LengthText(r.Shift.Norm(), units), LengthText(r.Shift.X, units), LengthText(r.Shift.Y, units), r.Turn*180/math.Pi, LengthText(r.Spread, units))
}
