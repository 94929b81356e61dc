package campaign

import "testing"

// TestShortEndCases runs cases whose points stop 0.014–0.016 c short of
// a rounded trailing edge and whose end was read blunt through the last
// points (internal/scangen: invented scans of Kármán–Trefftz sections,
// invented noise, spacing and missed stretches), each wrong beyond its
// stated uncertainty at the start of stop 26. The bounds reached the
// plausible rounded ends too near: 929 (an end 0.017 c thick, its points
// stopping 0.016 c short) and 2424 (0.0087 c thick, 0.014 c short) had
// their arcs' tips tried no more than a step beyond the aftmost point, and
// the last one tried still scored as well as the best, so the bound ended
// where the grid did (chord 1.68 % against 1.53 %, 1.42 % against
// 1.38 %). Each must be within its bounds.
func TestShortEndCases(t *testing.T) {
	for _, seed := range []uint64{929, 2424} {
		r, _, ok := runStated(t, seed)
		if !ok {
			continue
		}
		if r.Wrong != "" {
			t.Errorf("case %d: wrong beyond its stated uncertainty (%s): chord off %.4f, twist %.3f°, node %.4f c; stated chord %.4g, twist %.3g°, surface %.4f c", seed, r.Wrong, r.ChordErr, r.TwistErr, r.NodeErr, r.Stated.Chord, r.Stated.TwistDeg, r.Stated.Surface)
		}
	}
}

// TestMissedEndStretchCase runs case 5067 (internal/scangen: an invented
// scan of a Kármán–Trefftz section, invented spacing, bursts and missed
// stretches), wrong beyond its stated uncertainty at the start of stop
// 26: the last 0.058 c of one surface before its sharp corner were not
// measured. The corner was put on the other surface's last point, and
// the gap round the end was read as the step along that surface beside
// it (a ratio of 0.34 to the spacing in place of 12.4), so the end
// counted as sampled; read right, the end is open, but the fits' crossing
// lay only 0.0036 c on, while the corner lies 0.0115 c on, where the
// missed surface bends away. The chord came out 1.07 % short against
// 0.50 % stated. It must be within its chord bound, and not wrong.
func TestMissedEndStretchCase(t *testing.T) {
	r, _, ok := runStated(t, 5067)
	if !ok {
		return
	}
	if r.Wrong != "" || !r.Covered[0] {
		t.Errorf("wrong beyond its stated uncertainty (%q): chord off %.4f, twist %.3f°, node %.4f c; stated chord %.4g, twist %.3g°, surface %.4f c", r.Wrong, r.ChordErr, r.TwistErr, r.NodeErr, r.Stated.Chord, r.Stated.TwistDeg, r.Stated.Surface)
	}
}

// TestCornerReachCase runs case 1198 (internal/scangen: an invented scan
// of a modified NACA 4-digit section, NACA Report 824 equations, invented
// noise and spacing), wrong beyond its stated uncertainty at the start of
// stop 26: a sharp edge whose points stop 0.025 c short of it, read blunt
// through the last points. The sharp corner the fits cannot place
// reached one step beyond where they put it, not the 1.5 steps meant
// (edgeOpen, an integer division): chord 2.48 % off against 2.42 %
// stated, twist 0.34° against 0.31°. Its chord and twist must be within
// their bounds (its nodes, 0.0083 c off mid-chord against 0.0073 c, are
// not yet).
func TestCornerReachCase(t *testing.T) {
	r, _, ok := runStated(t, 1198)
	if !ok {
		return
	}
	if !r.Covered[0] || !r.Covered[1] {
		t.Errorf("chord off %.4f against %.4g stated, twist %.3f° against %.3g°", r.ChordErr, r.Stated.Chord, r.TwistErr, r.Stated.TwistDeg)
	}
}
