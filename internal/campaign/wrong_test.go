package campaign

import (
	"strings"
	"testing"

	"github.com/foilwright/foilwright/prep"
)

// runStated runs the generator's case seed and returns its record and
// the true chord; ok is false, with the test marked failed, when prep
// failed or stated no uncertainty.
func runStated(t *testing.T, seed uint64) (r Record, chord float64, ok bool) {
	t.Helper()
	c, err := NewCase(seed)
	if err != nil {
		t.Fatal(err)
	}
	r = c.Run()
	if !r.OK || r.Stated == nil {
		t.Errorf("case %d: failed or stated no uncertainty: %s", seed, r.Err)
		return r, 0, false
	}
	return r, c.Scan.Truth.Chord, true
}

// TestFormerlyWrongCases runs cases that exited 0 wrong beyond their own
// stated uncertainty at the start of stop 21, one per cause fixed since,
// and checks each now succeeds within its bounds. The truth is the
// generator's (internal/scangen: NACA Report 824 equations, invented
// noise and spacing).
//
//   - 4213: a scan of a NACA 4404 whose points leave a gap of 0.015 c
//     round the nose; the leading edge found on the curve's guess there
//     was 0.011 c off against a bound of 0.002 c.
//   - 573, 2488: NACA 5-digit sections cambered at 5 % (21 % and 23 %
//     thick), probed right way up, read as upside down (in our chord
//     convention their mean lines sag down) and turned over: nodes
//     0.010–0.014 c off against surface bounds of 0.001–0.002 c.
func TestFormerlyWrongCases(t *testing.T) {
	for _, seed := range []uint64{4213, 573, 2488} {
		r, _, ok := runStated(t, seed)
		if !ok {
			continue
		}
		if r.Wrong != "" {
			t.Errorf("case %d: wrong beyond its stated uncertainty (%s): chord off %.4f, twist %.3f°, node %.4f c; stated chord %.4g, twist %.3g°, surface %.4f c", seed, r.Wrong, r.ChordErr, r.TwistErr, r.NodeErr, r.Stated.Chord, r.Stated.TwistDeg, r.Stated.Surface)
		}
	}
}

// TestDegenerateEndModelStaysOut runs case 2065 (internal/scangen: an
// invented scan of a Kármán–Trefftz section with a rounded tail): one of
// the rounded ends tried there fits with its tip 884 000 chords off. The
// gaps' law capped its cost of the stretch it leaves unsampled at
// gapDevMax while the exponential law's cost it replaces grew with the
// stretch, so the far model scored best by 3e15 and its tip set the
// chord's bound at 1.3e8 % of the chord. The bound must stay a bound a
// practitioner can use: within 5 % of the true chord, and covering the
// true error.
func TestDegenerateEndModelStaysOut(t *testing.T) {
	r, chord, ok := runStated(t, 2065)
	if !ok {
		return
	}
	t.Logf("chord off %.4g, bound %.4g (chord %.4g)", r.ChordErr, r.Stated.Chord, chord)
	if r.Stated.Chord > 0.05*chord {
		t.Errorf("chord bound %.4g is %.3g %% of the chord", r.Stated.Chord, 100*r.Stated.Chord/chord)
	}
	if r.Wrong != "" {
		t.Errorf("wrong beyond its stated uncertainty: %s", r.Wrong)
	}
}

// TestBluntEndStationsFromPoints runs cases that exited 0 with the chord
// off beyond its own bound at the start of stop 22, each a trailing edge
// read as blunt from the last points either side, with no points on a
// base (the truth is the generator's, internal/scangen: NACA Report 824
// equations and Kármán–Trefftz outlines, invented noise and spacing).
// The bound took the last points for a base at one station because it
// compared the fitted curve's ends, which the fit carries to one station,
// not the points'; and it took the spacing at the ends for a hair's
// breadth where stations were measured twice close together.
//
//   - 22: a 21 % 4-digit section, points in pairs 0.0003 c apart at
//     stations up to 0.08 c apart; chord 0.93 % short against a bound of
//     0.13 %.
//   - 475: a 13 % section whose last points stop 0.008 c apart along the
//     chord, in pairs; chord 0.98 % short against 0.16 %.
//   - 1924: the last points of one surface stop 0.033 c short of the
//     other's; chord 1.2 % short against 0.71 %.
//   - 2020, 2824: probed sections (cmm) with rounded and blunt edges;
//     chord 1.9 % and 2.8 % short against 1.4 % and 1.2 %.
func TestBluntEndStationsFromPoints(t *testing.T) {
	for _, seed := range []uint64{22, 475, 1924, 2020, 2824} {
		r, chord, ok := runStated(t, seed)
		if !ok {
			continue
		}
		if r.Wrong != "" {
			t.Errorf("case %d: wrong beyond its stated uncertainty (%s): chord off %.4f, stated ± %.4g of %.4g", seed, r.Wrong, r.ChordErr, r.Stated.Chord, chord)
		}
		// The bound stays one a practitioner can use: the points leave
		// the end open over a spacing or two, not a tenth of the chord.
		if b := r.Stated.Chord / chord; b > 0.05 {
			t.Errorf("case %d: chord bound %.3g %% of the chord", seed, 100*b)
		}
	}
}

// TestUntangledEdgeChordBound runs case 2235 (internal/scangen: an
// invented two-pass probe file of a Kármán–Trefftz section whose surfaces
// meet at 0.5°, nearly a cusp): the smoothed surfaces cross 0.026 c ahead of the
// corner and the edge was put where they cross, as in every replica of
// the fit, so the chord's bound (0.75 %) did not reach the corner and the
// chord came out 2.7 % short. The bound must take in the corner.
func TestUntangledEdgeChordBound(t *testing.T) { chordBoundHolds(t, 2235, 0.05) }

// chordBoundHolds runs case seed and checks that it is not wrong beyond
// its stated uncertainty and that its chord bound stays within most of
// the chord.
func chordBoundHolds(t *testing.T, seed uint64, most float64) {
	t.Helper()
	r, chord, ok := runStated(t, seed)
	if !ok {
		return
	}
	t.Logf("chord off %.4g, bound %.4g of the chord", r.ChordErr, r.Stated.Chord/chord)
	if r.Wrong != "" {
		t.Errorf("wrong beyond its stated uncertainty (%s): chord off %.4f, stated ± %.4g of %.4g", r.Wrong, r.ChordErr, r.Stated.Chord, chord)
	}
	if b := r.Stated.Chord / chord; b > most {
		t.Errorf("chord bound %.3g %% of the chord", 100*b)
	}
}

// TestEndForEndRefused runs cases that exited 0 turned end for end (twist
// 180° off against bounds of about 1°) at the start of stop 23; the truth
// is the generator's (internal/scangen: NACA 4-digit-modified sections
// by the equations of Abbott and von Doenhoff, invented noise and
// spacing). Each is thin (5 % and 3 %) with a rounded trailing edge
// blunter than its nose, and its thicknesses near the ends differ by less
// than the section's own surface bound leaves them: prep must say it
// cannot tell the ends apart, or get them right.
//
//   - 2282: 5 %, noise 0.2 % of the chord, the nose sparsely sampled.
//   - 458: 3 %, the trailing edge rounded to 0.025 c thick.
func TestEndForEndRefused(t *testing.T) {
	for _, seed := range []uint64{2282, 458} {
		c, err := NewCase(seed)
		if err != nil {
			t.Fatal(err)
		}
		r := c.Run()
		if r.OK && r.TwistErr > 90 {
			t.Errorf("case %d: exited 0 turned end for end (twist off %.1f°, stated ± %.3g°)", seed, r.TwistErr, r.Stated.TwistDeg)
		}
		if !r.OK && !strings.Contains(r.Err, prep.GateThinEnd) {
			t.Errorf("case %d: refused for another reason: %s", seed, r.Err)
		}
	}
}

// TestUnsampledRoundedEndChordBound runs case 2851 (internal/scangen: an
// invented mesh-slice scan of a Kármán–Trefftz section with a sharp 15.5°
// trailing edge, 157 points): one point lies at the end and the outline
// turns 106° over the 0.024 c to the next, so the fit rounds the end off
// and every replica with it; the chord came out 4.0 % short against a
// bound of 1.1 %. The bound must reach where the surfaces run on to.
func TestUnsampledRoundedEndChordBound(t *testing.T) { chordBoundHolds(t, 2851, 0.08) }

// TestRoundedTipApexKept runs cases whose rounded trailing edge (radius
// 0.9 % and 0.7 % of the chord; internal/scangen: modified NACA 4-digit
// sections by Abbott and von Doenhoff's equations, invented noise and
// spacing) lost its apex to the apex test: the end model had taken the
// tip's other points for outliers, and the apex, reached in a spike among
// them, passed for a fixture's point on a face they made (in 1455 with a
// probe slip lined up with the apex and one tip point). The chord came out
// 1.3 % (1455) and 0.9 % (5569) short against bounds of 0.8 % and 0.5 %.
// The tip's points lie between the loop and the line through the apex: no
// fixture's face, so the apex stays and the chord is right within its
// bound.
func TestRoundedTipApexKept(t *testing.T) {
	for _, seed := range []uint64{1455, 5569} {
		r, _, ok := runStated(t, seed)
		if !ok {
			continue
		}
		if r.Wrong != "" || r.ChordErr > 0.005 {
			t.Errorf("case %d: chord off %.4f (wrong: %q), stated chord %.4g", seed, r.ChordErr, r.Wrong, r.Stated.Chord)
		}
	}
}

// TestKneeStationsKept runs cases of flat-bottomed sections
// (internal/scangen: the 4-digit thickness of NACA Report 824 about a
// blended mean line, flat from 11–16 % of the chord; invented sampling)
// whose points below the knee, where the nose's lower side swings below
// the flat and up into it, were dropped as outliers: a 40-point exact
// polyline (1058, 6185) and a two-pass probe (839). The section came out
// 0.012–0.022 c off there against surface bounds of 0.007–0.017 c. Each
// must now be right within its bounds with at most one good point
// dropped. 5065 (a probed section with a burst of two points 0.55 mm off)
// guards the other side: the burst must still go, and the section
// succeed right.
func TestKneeStationsKept(t *testing.T) {
	for _, seed := range []uint64{1058, 6185, 839, 5065} {
		r, _, ok := runStated(t, seed)
		if !ok {
			continue
		}
		if r.Wrong != "" || r.GoodDropped > 1 || r.Caught != r.Planted {
			t.Errorf("case %d: wrong %q (node %.4f c, stated %.4f c), %d good points dropped, %d of %d planted outliers caught", seed, r.Wrong, r.NodeErr, r.Stated.Surface, r.GoodDropped, r.Caught, r.Planted)
		}
	}
}
