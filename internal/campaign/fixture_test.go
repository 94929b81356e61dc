package campaign

import "testing"

// TestFixtureFacesLeftOut runs cases of the opt-in fixture hazard
// (internal/scangen WithFixture: NACA Report 824 sections, invented noise
// and spacing, a clamp's jaw face 0.02–0.12 chord beyond the trailing
// edge) whose section used to keep one or two of the face's points,
// reached in a spike, and exit 0 wrong: 30 (chord 12 % long), 73 (2.2 %),
// 86 (twist). Every point of the face must be listed as dropped, and the
// section right within its stated uncertainty.
func TestFixtureFacesLeftOut(t *testing.T) {
	for _, seed := range []uint64{30, 73, 86} {
		c, err := NewFixtureCase(seed)
		if err != nil {
			t.Fatal(err)
		}
		r := c.Run()
		if !r.OK {
			t.Errorf("case %d: failed: %s", seed, r.Err)
			continue
		}
		if r.Fixture == 0 || r.FixtureCaught != r.Fixture {
			t.Errorf("case %d: %d of %d fixture points dropped", seed, r.FixtureCaught, r.Fixture)
		}
		if r.Wrong != "" {
			t.Errorf("case %d: wrong beyond its stated uncertainty (%s): chord off %.4f, twist %.3f°, node %.4f c", seed, r.Wrong, r.ChordErr, r.TwistErr, r.NodeErr)
		}
	}
}
