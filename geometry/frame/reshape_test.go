package frame

import (
	"errors"
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/testfoil"
)

// reshapeTestCurve fits a NACA 0012 (NACA Report 824 equations; blunt
// unless sharp) placed at 152.4 mm chord, rotated 7°, with 0.02 mm noise.
func reshapeTestCurve(t *testing.T, sharp bool) *curve.Curve {
	t.Helper()
	n := shape.NACA4{Thickness: 0.12, SharpTE: sharp}
	part := testfoil.Part{Chord: 152.4, RotDeg: 7, Shift: geometry.Point{X: 37, Y: -12}, Noise: 0.02, Seed: 42}
	cv, _, err := curve.Fit(testfoil.Contour(testfoil.Loop(n, 150), part), curve.FitOptions{Noise: 0.02})
	if err != nil {
		t.Fatal(err)
	}
	return cv
}

// A reshape moves the corners to M ± (t/2)·b̂ and leaves the trailing-edge
// midpoint, hence chord and twist, where they were (up to the
// interpolation of the resampled outline, which moves the nose by about
// 1e-10 chord); ahead of the blend length nothing moves (exact geometry of
// the construction).
func TestReshapeBlunt(t *testing.T) {
	cv := reshapeTestCurve(t, false)
	kept, err := Normalize(cv, Options{})
	if err != nil {
		t.Fatal(err)
	}
	chord := kept.Frame.Chord
	gap := kept.TE.Thickness * chord // 0.00252 c of NACA Report 824: 0.384 mm
	for _, tc := range []struct {
		name      string
		thickness geometry.Length
		blend     geometry.Length
		action    string
	}{
		{"thin, mm", geometry.Length{Value: 0.2}, geometry.Length{Value: 20}, TEThinned},
		{"thicken, chord units", geometry.Length{Value: 0.005, Unit: geometry.ChordUnit}, geometry.Length{Value: 0.15, Unit: geometry.ChordUnit}, TEThickened},
		{"close", geometry.Length{}, geometry.Length{}, TEClosed},
	} {
		t.Run(tc.name, func(t *testing.T) {
			th := tc.thickness
			nz, err := Normalize(cv, Options{Thickness: &th, BlendLength: tc.blend})
			if err != nil {
				t.Fatal(err)
			}
			p := nz.Path.(*curve.Curve)
			want := th.Of(chord) / chord
			blend := tc.blend.Of(chord) / chord
			if blend == 0 {
				blend = EdgeDefaultBlend
			}
			if nz.TE.Action != tc.action || nz.TE.Target == nil || math.Abs(*nz.TE.Target-want) > 1e-12 || math.Abs(nz.TE.Blend-blend) > 1e-12 {
				t.Errorf("trailing edge %+v, want %s to %g over %g", nz.TE, tc.action, want, blend)
			}
			if got := p.Start().Dist(p.End()); math.Abs(got-want) > 1e-9 {
				t.Errorf("ends %.6g apart, want %.6g", got, want)
			}
			if mid := p.Start().Add(p.End()).Scale(0.5); mid.Dist(geometry.Point{X: 1}) > 1e-9 {
				t.Errorf("trailing-edge midpoint %v, want (1, 0)", mid)
			}
			if math.Abs(nz.Frame.Chord-chord) > 1e-8*chord || math.Abs(nz.Frame.TwistDeg-kept.Frame.TwistDeg) > 1e-5 {
				t.Errorf("frame %+v, want chord and twist of %+v", nz.Frame, kept.Frame)
			}
			if wantShift := math.Abs(gap-th.Of(chord)) / 2; math.Abs(nz.TE.MaxShift-wantShift) > 1e-9 {
				t.Errorf("largest shift %.6g, want %.6g", nz.TE.MaxShift, wantShift)
			}
			kp := kept.Path.(*curve.Curve)
			for _, x := range []float64{0.1, 0.5, 0.98 - blend} {
				if d := edgeTestUpperY(p, nz.SLE, x) - edgeTestUpperY(kp, kept.SLE, x); math.Abs(d) > 2e-6 {
					t.Errorf("upper surface at x = %g moved by %.2g", x, d)
				}
			}
			if p.Closed() != (want == 0) {
				t.Errorf("closed %v with thickness %g", p.Closed(), want)
			}
		})
	}
}

// A sharp edge thickened gets a base across the chord line, symmetric
// about it.
func TestReshapeSharp(t *testing.T) {
	cv := reshapeTestCurve(t, true)
	th := geometry.Length{Value: 0.004, Unit: geometry.ChordUnit}
	nz, err := Normalize(cv, Options{Thickness: &th})
	if err != nil {
		t.Fatal(err)
	}
	p := nz.Path.(*curve.Curve)
	if nz.TE.Kind != TESharp || nz.TE.Action != TEThickened || p.Closed() {
		t.Fatalf("trailing edge %+v, closed %v", nz.TE, p.Closed())
	}
	for _, end := range []struct{ got, want geometry.Point }{{p.Start(), geometry.Point{X: 1, Y: 0.002}}, {p.End(), geometry.Point{X: 1, Y: -0.002}}} {
		if end.got.Dist(end.want) > 1e-6 {
			t.Errorf("end %v, want %v", end.got, end.want)
		}
	}
	zero := geometry.Length{}
	nz, err = Normalize(cv, Options{Thickness: &zero})
	if err != nil || nz.TE.Action != TEKept || len(nz.Warnings) == 0 {
		t.Errorf("zero thickness on a sharp edge: %+v, %q, %v; want kept with a warning", nz.TE, nz.Warnings, err)
	}
}

func TestReshapeRefused(t *testing.T) {
	cv := reshapeTestCurve(t, false)
	l := func(v float64, u geometry.Unit) *geometry.Length { return &geometry.Length{Value: v, Unit: u} }
	for _, tc := range []struct {
		name string
		o    Options
	}{
		{"too thick", Options{Thickness: l(0.1, geometry.ChordUnit)}},
		{"negative", Options{Thickness: l(-0.1, "")}},
		{"blend longer than the chord", Options{Thickness: l(0, ""), BlendLength: geometry.Length{Value: 200}}},
		{"negative blend", Options{Thickness: l(0, ""), BlendLength: geometry.Length{Value: -0.1, Unit: geometry.ChordUnit}}},
		{"and sharpen", Options{Thickness: l(0, ""), TE: TESharpen}},
	} {
		if _, err := Normalize(cv, tc.o); !errors.Is(err, ErrTrailingEdge) {
			t.Errorf("%s: %v, want ErrTrailingEdge", tc.name, err)
		}
	}
	rounded, _, err := curve.Fit(testfoil.Contour(edgeTestRounded(0.005, 150, 12), testfoil.Part{Chord: 100, Noise: 0.005, Seed: 3}), curve.FitOptions{Noise: 0.005})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := Normalize(rounded, Options{Thickness: l(0, "")}); !errors.Is(err, ErrTrailingEdge) {
		t.Errorf("rounded edge: %v, want ErrTrailingEdge", err)
	}
}
