package campaign

import (
	"math"
	"testing"
)

// TestTwistCarriesLeadingEdge runs case 128 (internal/scangen: an
// invented scan, invented noise and spacing), wrong beyond its stated
// uncertainty at the start of stop 26: twist 0.205° against 0.184°
// stated, while the leading edge's own bound, 0.0045 c, turns the chord
// line by up to 0.26° seen from the trailing edge a chord away. The
// replicas read the nose alike and their twist did not show it. The
// section must be within its bounds, and its twist bound at least the
// leading edge's over the chord.
func TestTwistCarriesLeadingEdge(t *testing.T) {
	r, chord, ok := runStated(t, 128)
	if !ok {
		return
	}
	if r.Wrong != "" {
		t.Errorf("wrong beyond its stated uncertainty (%s): chord off %.4f, twist %.3f°, node %.4f c; stated chord %.4g, twist %.3g°, surface %.4f c", r.Wrong, r.ChordErr, r.TwistErr, r.NodeErr, r.Stated.Chord, r.Stated.TwistDeg, r.Stated.Surface)
	}
	// The bound is read against the section's own chord, the true one
	// off by the chord error (the longer of the two it may be).
	c := chord * (1 + r.ChordErr)
	if want := math.Atan(r.Stated.LE/c) * 180 / math.Pi; r.Stated.TwistDeg < want {
		t.Errorf("twist bound %.4g° below the leading edge's bound over the chord, %.4g°", r.Stated.TwistDeg, want)
	}
}
