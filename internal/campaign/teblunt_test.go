package campaign

import "testing"

// Blunt bases that 399fbe1 stated as rounded ends, each for one of two
// causes in the trailing-edge analysis, now come out blunt (the exact
// NACA Report 824 4-digit and 5-digit open edges of internal/scangen; the
// noise-free points separate the base from the nearest rounded end by
// λ ≥ 700 squared scatters, teIndistinct, so the kind is decidable):
//
//   - 1246 (sparse, 135 points), 741 (two passes): one point on the
//     end; an arc through it won over the base by a likelihood ratio of
//     e, where the points show no turning end (an arc on fewer than three
//     points is no longer stated);
//   - 1456 (2865 points): a base 0.004 c across that leans 17°
//     from square to the chord, square to the 6 % camber line
//     as the thickness is laid off; a base held square to the chord
//     missed its corners and an arc fitted them better.
func TestBluntBasesMended(t *testing.T) {
	seeds := []uint64{1246, 741, 1456}
	if raceEnabled {
		seeds = seeds[:2] // the smaller files
	}
	for _, seed := range seeds {
		c, err := NewCase(seed)
		if err != nil {
			t.Fatal(err)
		}
		r := c.Run()
		switch {
		case !r.OK:
			t.Errorf("case %d: %s", seed, r.Err)
		case r.Truth.TEKind != "blunt" || r.TEUndecidable:
			t.Errorf("case %d: truth %s, undecidable %v; the generator's draws moved", seed, r.Truth.TEKind, r.TEUndecidable)
		case r.TEGot != "blunt":
			t.Errorf("case %d: stated %s, want blunt", seed, r.TEGot)
		case r.Wrong != "":
			t.Errorf("case %d: wrong beyond its stated uncertainty (%s)", seed, r.Wrong)
		}
	}
}
