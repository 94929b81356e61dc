package builtin

import "testing"

func TestParseAngles(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want []float64
	}{
		{"-4:12:1", []float64{-4, -3, -2, -1, 0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12}},
		{"0:1:0.25", []float64{0, 0.25, 0.5, 0.75, 1}},
		{"0:0.3:0.1", []float64{0, 0.1, 0.2, 0.30000000000000004}},
		{"5:-5:-5", []float64{5, 0, -5}},
		{"0:1:0.4", []float64{0, 0.4, 0.8}},
		{" 1, 2.5 ,-90", []float64{1, 2.5, -90}},
		{"90", []float64{90}},
	} {
		got, err := ParseAngles(tc.in)
		if err != nil || len(got) != len(tc.want) {
			t.Errorf("%q: got %v, %v; want %v", tc.in, got, err, tc.want)
			continue
		}
		for i := range got {
			if d := got[i] - tc.want[i]; d > 1e-12 || d < -1e-12 {
				t.Errorf("%q: got %v, want %v", tc.in, got, tc.want)
				break
			}
		}
	}
	for _, in := range []string{"", "1:2", "1:2:0", "1:2:3:4", "NaN", "Inf", "1e400", "0:2000:1", "1,,2"} {
		if got, err := ParseAngles(in); err == nil {
			t.Errorf("%q: got %v, want an error", in, got)
		}
	}
}

func TestPictureKind(t *testing.T) {
	for _, tc := range []struct{ artifact, want string }{
		{"cp-analysis.svg", "cp"},
		{"polar.svg", "polar"},
		{"streamlines-analysis.svg", "streamlines"},
		{"section.svg", "section"},
	} {
		if got := PictureKind(tc.artifact, "svg", "analysis"); got != tc.want {
			t.Errorf("%s: %s, want %s", tc.artifact, got, tc.want)
		}
	}
}
