package scangen

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// shapeCases cover every family and trailing edge.
var shapeCases = []struct {
	name string
	spec ShapeSpec
}{
	{"naca0012-open", ShapeSpec{Family: FamilyNACA, NACA: &NACASpec{Thickness: 0.12}}},
	{"naca2412-closed", ShapeSpec{Family: FamilyNACA, NACA: &NACASpec{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, ClosedTE: true}}},
	{"naca6221-open", ShapeSpec{Family: FamilyNACA, NACA: &NACASpec{Camber: 0.06, CamberPos: 0.2, Thickness: 0.21}}},
	{"naca4406-rounded", ShapeSpec{Family: FamilyNACA, NACA: &NACASpec{Camber: 0.04, CamberPos: 0.4, Thickness: 0.06, ClosedTE: true}, RoundRadius: 0.004}},
	{"naca2415-open-rounded", ShapeSpec{Family: FamilyNACA, NACA: &NACASpec{Camber: 0.02, CamberPos: 0.4, Thickness: 0.15}, RoundRadius: 0.006}},
	{"kt-cambered", ShapeSpec{Family: FamilyKT, KT: &KTSpec{CentreX: -0.08, CentreY: 0.06, TEAngleDeg: 12}}},
	{"kt-symmetric", ShapeSpec{Family: FamilyKT, KT: &KTSpec{CentreX: -0.15, TEAngleDeg: 3}}},
	{"kt-rounded", ShapeSpec{Family: FamilyKT, KT: &KTSpec{CentreX: -0.1, CentreY: 0.1, TEAngleDeg: 20}, RoundRadius: 0.01}},
	{"kt-near-cusp", ShapeSpec{Family: FamilyKT, KT: &KTSpec{CentreX: -0.1, CentreY: 0.05, TEAngleDeg: 0.5}}},
	{"naca23012-closed", ShapeSpec{Family: FamilyNACA5, NACA5: &NACA5Spec{L: 2, P: 3, Thickness: 0.12, ClosedTE: true}}},
	{"naca23036-open", ShapeSpec{Family: FamilyNACA5, NACA5: &NACA5Spec{L: 2, P: 3, Thickness: 0.36}}},
	{"naca23112-reflexed", ShapeSpec{Family: FamilyNACA5, NACA5: &NACA5Spec{L: 2, P: 3, Reflex: true, Thickness: 0.12, ClosedTE: true}}},
	{"naca0003-thin", ShapeSpec{Family: FamilyNACA, NACA: &NACASpec{Camber: 0.09, CamberPos: 0.5, Thickness: 0.03, ClosedTE: true}}},
	{"mod-4412-63", ShapeSpec{Family: FamilyModNACA, Mod: &ModNACA4Spec{Camber: 0.04, CamberPos: 0.4, Thickness: 0.12, NoseIndex: 6, MaxPos: 0.3, TESlope: 0.234}}},
	{"mod-cusped", ShapeSpec{Family: FamilyModNACA, Mod: &ModNACA4Spec{Thickness: 0.15, NoseIndex: 3, MaxPos: 0.4, TESlope: 0.02, ClosedTE: true}}},
	{"flat-bottomed", ShapeSpec{Family: FamilyFlat, Flat: &FlatSpec{Thickness: 0.12, FlatFrom: 0.25}}},
	{"flat-bottomed-rounded", ShapeSpec{Family: FamilyFlat, Flat: &FlatSpec{Thickness: 0.15, FlatFrom: 0.2}, RoundRadius: 0.004}},
}

// The frame of the tool's convention: the trailing-edge point at (1, 0),
// the leading edge at (0, 0) and no outline point farther from the
// trailing-edge point than the leading edge (common practice); a rounded
// end's tip is also the point farthest from the leading edge.
func TestShapeConvention(t *testing.T) {
	const tol = 1e-9
	for _, tc := range shapeCases {
		t.Run(tc.name, func(t *testing.T) {
			sec, err := tc.spec.Build()
			if err != nil {
				t.Fatal(err)
			}
			sh := sec.Shape
			if le := sh.At(sh.LE()); le.Norm() > tol {
				t.Errorf("leading edge at %v, want (0, 0)", le)
			}
			if te := sh.At(sh.TE()); te.Dist(geometry.Point{X: 1}) > tol {
				t.Errorf("trailing-edge point at %v, want (1, 0)", te)
			}
			for _, p := range sh.Dense() {
				if d := p.Dist(geometry.Point{X: 1}); d > 1+tol {
					t.Fatalf("outline point %v is %.12f from the trailing-edge point, farther than the leading edge", p, d)
				}
				if sec.TEKind == TERounded && p.Norm() > 1+tol {
					t.Fatalf("outline point %v is %.12f from the leading edge, farther than the tip", p, p.Norm())
				}
			}
			if a := geometry.SignedArea(sh.Dense()); a <= 0 {
				t.Errorf("outline runs clockwise (area %g)", a)
			}
			// Upper pieces lie above the chord line near mid-chord.
			if p := sh.At(0.5); sh.Kind(0.5) != Upper || p.Y <= 0 {
				t.Errorf("t = 0.5 is %s at %v, want the upper surface", sh.Kind(0.5), p)
			}
		})
	}
}

// NACA Report 824: the open trailing edge of the standard equation is
// 2·yt(1) = 0.021 t thick; for a symmetric section the chord line is the
// x axis, so the normalised base is the same. The maximum thickness of a
// symmetric section is t at x = 0.3: the equation gives 1.00023 t there
// and a little more just ahead (calculated by hand).
func TestNACAReport824(t *testing.T) {
	sec, err := ShapeSpec{Family: FamilyNACA, NACA: &NACASpec{Thickness: 0.12}}.Build()
	if err != nil {
		t.Fatal(err)
	}
	if got, want := sec.TEThickness, 0.021*0.12; math.Abs(got-want) > 1e-12 {
		t.Errorf("base %.15f, want %.15f", got, want)
	}
	var tmax, xmax float64
	for _, p := range sec.Shape.Dense() {
		if 2*p.Y > tmax {
			tmax, xmax = 2*p.Y, p.X
		}
	}
	if math.Abs(tmax/0.12-1) > 5e-4 || math.Abs(xmax-0.3) > 0.01 {
		t.Errorf("maximum thickness %.7f at %.3f, want 0.12 at 0.3", tmax, xmax)
	}
}

// The Kármán–Trefftz outline agrees with the geometry package's own shape
// (an independent implementation of the same map and leading edge).
func TestKTAgainstShapePackage(t *testing.T) {
	for _, tc := range shapeCases {
		if tc.spec.Family != FamilyKT || tc.spec.RoundRadius > 0 {
			continue
		}
		t.Run(tc.name, func(t *testing.T) {
			sec, err := tc.spec.Build()
			if err != nil {
				t.Fatal(err)
			}
			k := shape.KarmanTrefftz{Centre: geometry.Point{X: tc.spec.KT.CentreX, Y: tc.spec.KT.CentreY}, TEAngle: tc.spec.KT.TEAngleDeg * math.Pi / 180}
			pts, err := k.Normalized(400)
			if err != nil {
				t.Fatal(err)
			}
			// Node i of the shape package lies at circle angle φ₀ + 2πi/400,
			// φ₀ = arg(1 − centre).
			phi0 := math.Atan2(-tc.spec.KT.CentreY, 1-tc.spec.KT.CentreX)
			worst := 0.0
			for i, p := range pts {
				d, tp := sec.Shape.Nearest(p)
				worst = math.Max(worst, d)
				phi, ok := sec.Shape.CircleAngle(tp)
				if !ok {
					t.Fatal("no circle angle on a Kármán–Trefftz outline")
				}
				want := phi0 + 2*math.Pi*float64(i)/400
				if i > 0 && i < 400 && math.Abs(math.Remainder(phi-want, 2*math.Pi)) > 1e-6 {
					t.Errorf("node %d: circle angle %.9f, want %.9f", i, phi, want)
				}
			}
			// The shape package locates its leading edge to about 1e-8.
			if worst > 5e-8 {
				t.Errorf("nodes of the shape package lie up to %.3g off the outline", worst)
			}
		})
	}
}

// A rounded end is a circular arc of the requested radius, tangent to both
// surfaces at its ends.
func TestRoundedEnd(t *testing.T) {
	for _, tc := range shapeCases {
		if tc.spec.RoundRadius == 0 {
			continue
		}
		t.Run(tc.name, func(t *testing.T) {
			sec, err := tc.spec.Build()
			if err != nil {
				t.Fatal(err)
			}
			sh := sec.Shape
			if sec.TEKind != TERounded || sh.Kind(2.5) != Round {
				t.Fatalf("kind %s, piece 2 %s", sec.TEKind, sh.Kind(2.5))
			}
			// Three points of the arc give its radius.
			a, b, c := sh.At(2.1), sh.At(2.5), sh.At(2.9)
			r := a.Dist(b) * b.Dist(c) * c.Dist(a) / (2 * math.Abs(b.Sub(a).Cross(c.Sub(a))))
			if math.Abs(r*2-sec.TEThickness) > 1e-9 {
				t.Errorf("arc radius %.9f, diameter %.9f recorded", r, sec.TEThickness)
			}
			if sec.TEThickness < 2*tc.spec.RoundRadius*0.95 || sec.TEThickness > 2*tc.spec.RoundRadius*1.1 {
				t.Errorf("diameter %.5f chord for radius %.5f of the unrounded chord", sec.TEThickness, tc.spec.RoundRadius)
			}
			for _, joint := range []float64{0, 2, 3} {
				n1, n2 := sh.Normal(joint-1e-9), sh.Normal(joint+1e-9)
				if ang := math.Acos(math.Min(n1.Dot(n2), 1)); ang > 1e-4 {
					t.Errorf("outline turns %.2g rad at the joint t = %g", ang, joint)
				}
			}
			if k := sh.Kind(sh.TE()); k != Round {
				t.Errorf("tip on the %s piece", k)
			}
		})
	}
}

// Nearest agrees with a brute-force search on a much finer sampling of the
// exact pieces.
func TestNearest(t *testing.T) {
	sec, err := shapeCases[2].spec.Build()
	if err != nil {
		t.Fatal(err)
	}
	sh := sec.Shape
	const fine = 200000
	var pts []geometry.Point
	for i := range fine {
		pts = append(pts, sh.At(float64(sh.Pieces())*float64(i)/fine))
	}
	for _, q := range []geometry.Point{{X: 0.3, Y: 0.2}, {X: -0.05, Y: 0.01}, {X: 1.02, Y: 0.001}, {X: 0.5, Y: 0.03}, {X: 3, Y: -2}, {X: 0.999, Y: 0.0001}} {
		d, tq := sh.Nearest(q)
		best := math.Inf(1)
		for _, p := range pts {
			best = math.Min(best, p.Dist(q))
		}
		if d > best+1e-9 || d < best-2e-5 {
			t.Errorf("Nearest(%v) = %.9f, brute force %.9f", q, d, best)
		}
		if got := sh.At(tq).Dist(q); math.Abs(got-d) > 1e-12 {
			t.Errorf("Nearest(%v): distance %.12f but its point is %.12f away", q, d, got)
		}
	}
}

// The 4-digit-modified thickness meets the conditions that define it
// (Abbott and von Doenhoff, §6.5): maximum thickness t at M with zero
// slope and continuous curvature there, the half base d₀·t/0.2 at the
// trailing edge with slope −d₁·t/0.2, and the leading-edge radius
// 1.1019 (t·I/6)², the curvature radius of a₀√x at its vertex.
func TestModNACA4Thickness(t *testing.T) {
	for _, s := range []ModNACA4Spec{
		{Thickness: 0.12, NoseIndex: 6, MaxPos: 0.3, TESlope: 0.234},
		{Thickness: 0.2, NoseIndex: 3, MaxPos: 0.5, TESlope: 0.465},
		{Thickness: 0.15, NoseIndex: 8, MaxPos: 0.4, TESlope: 0.02, ClosedTE: true},
	} {
		f := s.thickness()
		M := s.MaxPos
		y, dy := f(M)
		ya, dya := f(M - 1e-7)
		if math.Abs(y-s.Thickness/2) > 1e-12 || math.Abs(dy) > 1e-9 || math.Abs(dya) > 1e-6 || math.Abs(ya-y) > 1e-9 {
			t.Errorf("%+v: at M yt %g slope %g (ahead %g, %g), want t/2 and 0", s, y, dy, ya, dya)
		}
		curv := func(x, h float64) float64 {
			a, _ := f(x - h)
			b, _ := f(x)
			c, _ := f(x + h)
			return (a - 2*b + c) / (h * h)
		}
		if fore, aft := curv(M-2e-4, 1e-4), curv(M+2e-4, 1e-4); math.Abs(fore-aft) > 0.01*math.Abs(aft)+1e-3 {
			t.Errorf("%+v: curvature at M %g ahead, %g aft", s, fore, aft)
		}
		d0 := 0.002
		if s.ClosedTE {
			d0 = 0
		}
		if y1, d1 := f(1); math.Abs(y1-d0*s.Thickness/0.2) > 1e-12 || math.Abs(d1+s.TESlope*s.Thickness/0.2) > 1e-9 {
			t.Errorf("%+v: trailing edge yt %g slope %g", s, y1, d1)
		}
		want := 1.1019 * math.Pow(s.Thickness*s.NoseIndex/6, 2)
		x := 1e-10
		yx, _ := f(x)
		if r := yx * yx / (2 * x); math.Abs(r/want-1) > 1e-3 {
			t.Errorf("%+v: nose radius %g, want %g", s, r, want)
		}
	}
}

// A flat-bottomed section's lower surface is exactly straight from F to
// the trailing edge and its thickness is t (at 30 % of the chord, where
// the 4-digit thickness has its maximum).
func TestFlatBottom(t *testing.T) {
	s := FlatSpec{Thickness: 0.12, FlatFrom: 0.25}
	th := naca4Thickness(s.Thickness, true)
	f := xForm{thick: th, vertical: true, camber: func(x float64) (float64, float64) {
		yt, _ := th(x)
		return yt * s.blend(x), 0
	}}
	for x := s.FlatFrom; x <= 1; x += 0.01 {
		if p := f.lower(x); p.Y != 0 {
			t.Fatalf("lower surface at x = %.2f is at y = %g, want 0", x, p.Y)
		}
	}
	if d := f.upper(0.3).Y - f.lower(0.3).Y; math.Abs(d-s.Thickness) > 2e-4*s.Thickness/0.12 {
		t.Errorf("thickness at x = 0.3 is %g, want %g", d, s.Thickness)
	}
	if p := f.lower(0.1); !(p.Y < 0) {
		t.Errorf("lower surface at the nose (x = 0.1) at y = %g, want below the flat", p.Y)
	}
}

// A 4-digit-modified thickness form rises from the nose to its thickest
// point M and falls from there to the tail for the table's M and d₁
// (Abbott and von Doenhoff, §6.5; slopes from memory) at every nose
// index; the generator refuses a waist (I 8.03, M 0.6 and a cusp's d₁
// 0.050, drawn once for campaign seed 2367: 0.0012 c thick at 15–20 %
// of the chord against 0.11 c at M), and Draw never returns one.
func TestModNACA4Waist(t *testing.T) {
	slopes := map[float64]float64{0.3: 0.234, 0.4: 0.315, 0.5: 0.465, 0.6: 0.700}
	for M, d1 := range slopes {
		for I := 2.0; I <= 9; I += 0.5 {
			for _, closed := range []bool{false, true} {
				s := ModNACA4Spec{Thickness: 0.12, NoseIndex: I, MaxPos: M, TESlope: d1, ClosedTE: closed}
				if x, ok := s.waist(); ok {
					t.Errorf("%+v: waist at x = %g", s, x)
				}
			}
		}
	}
	bad := ModNACA4Spec{Camber: 0.06, CamberPos: 0.3, Thickness: 0.11, NoseIndex: 8.03470006129442, MaxPos: 0.6, TESlope: 0.050150000807613906, ClosedTE: true}
	f := bad.thickness()
	if y, _ := f(0.175); y > 0.02*bad.Thickness/2 {
		t.Fatalf("%+v: half thickness %g at x = 0.175; the check below needs the waist", bad, y)
	}
	if x, ok := bad.waist(); !ok || x > 0.2 {
		t.Errorf("%+v: waist %v at x = %g, want one before 0.2", bad, ok, x)
	}
	if _, err := (ShapeSpec{Family: FamilyModNACA, Mod: &bad}).form(); err == nil {
		t.Errorf("%+v: form accepted a waist", bad)
	}
	for seed := uint64(2001); seed <= 2600; seed++ { // 2367 among them
		if m := Draw(seed).Shape.Mod; m != nil {
			if x, ok := m.waist(); ok {
				t.Errorf("seed %d: drew %+v with a waist at x = %g", seed, *m, x)
			}
		}
	}
}
