package prep

import (
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// Readouts: no negative zero, twist worded by its sense, lengths with
// their unit ("c" for chord units, never "chord").
func TestReadouts(t *testing.T) {
	for _, tc := range []struct{ got, want string }{
		{Fixed(-0.001, 2), "0.00"},
		{Fixed(-0.0, 3), "0.000"},
		{Fixed(-0.01, 2), "-0.01"},
		{TwistText(4.0912), "4.091° nose-up"},
		{TwistText(-2.5), "2.500° nose-down"},
		{TwistText(-0.0001), "0.000°"},
		{TwistText(180), "180.000° (turned round)"},
		{TwistText(-135), "-135.000° (turned round)"},
		{LengthText(0.0106, geometry.Millimetre), "0.0106 mm"},
		{LengthText(1.00031, geometry.ChordUnit), "1 c"},
		{lengthG(1.00031, 5, geometry.ChordUnit), "1.0003 c"},
		{LengthText(2, ""), "2"},
	} {
		if tc.got != tc.want {
			t.Errorf("got %q, want %q", tc.got, tc.want)
		}
	}
}
