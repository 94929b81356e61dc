package geometry

import (
	"errors"
	"math"
	"testing"
)

func TestParseLength(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want Length
	}{
		{"0.5", Length{0.5, ""}},
		{"0.5mm", Length{0.5, Millimetre}},
		{" 0.5 mm ", Length{0.5, Millimetre}},
		{"0.02c", Length{0.02, ChordUnit}},
		{"0.02 chord", Length{0.02, ChordUnit}},
		{"1e-3m", Length{1e-3, Metre}},
		{"0.02in", Length{0.02, Inch}},
		{"-1.5", Length{-1.5, ""}},
	} {
		got, err := ParseLength(tc.in)
		if err != nil || got != tc.want {
			t.Errorf("ParseLength(%q) = %+v, %v; want %+v", tc.in, got, err, tc.want)
		}
		if back, err := ParseLength(got.String()); err != nil || back != got {
			t.Errorf("%q: String %q reads back as %+v, %v", tc.in, got.String(), back, err)
		}
	}
	for _, bad := range []string{"", "mm", "0.5 furlong", "NaN", "Inf mm", "1,5mm", "2emm"} {
		if _, err := ParseLength(bad); !errors.Is(err, ErrLength) {
			t.Errorf("ParseLength(%q): %v, want ErrLength", bad, err)
		}
	}
}

// 1 in = 25.4 mm exactly (the international inch of 1959).
func TestLengthFor(t *testing.T) {
	for _, tc := range []struct {
		l    Length
		in   Unit
		want Length
	}{
		{Length{1, Inch}, Millimetre, Length{25.4, ""}},
		{Length{25.4, Millimetre}, Inch, Length{1, ""}},
		{Length{0.5, Millimetre}, Millimetre, Length{0.5, ""}},
		{Length{0.5, ""}, Inch, Length{0.5, ""}},
		{Length{0.01, ChordUnit}, Metre, Length{0.01, ChordUnit}},
		{Length{0.01, ChordUnit}, ChordUnit, Length{0.01, ""}},
		{Length{2, Metre}, Millimetre, Length{2000, ""}},
	} {
		got, err := tc.l.For(tc.in)
		if err != nil || got.Unit != tc.want.Unit || math.Abs(got.Value-tc.want.Value) > 1e-12*math.Abs(tc.want.Value) {
			t.Errorf("%+v.For(%s) = %+v, %v; want %+v", tc.l, tc.in, got, err, tc.want)
		}
	}
	if _, err := (Length{0.5, Millimetre}).For(ChordUnit); !errors.Is(err, ErrLength) {
		t.Errorf("mm for a chord-unit input: %v", err)
	}
	if got := (Length{0.1, ChordUnit}).Of(200); math.Abs(got-20) > 1e-12 {
		t.Errorf("0.1c of 200: %g", got)
	}
	if got := (Length{3, ""}).Of(200); got != 3 {
		t.Errorf("3 of 200: %g", got)
	}
}
