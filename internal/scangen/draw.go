package scangen

import (
	"math"
	"math/rand/v2"
)

// The categories Draw chooses from, with their shares of the cases.
var categories = []struct {
	name  string
	share float64
}{
	{"general", 0.25},
	{"cmm", 0.14},
	{"scan", 0.14},
	{"cad", 0.06},
	{"lift", 0.13},
	{"dense", 0.02},
	{"sparse", 0.08},
	{"voxel", 0.07},
	{"passes", 0.11},
}

// Categories returns the names of the categories Draw chooses from.
func Categories() []string {
	out := make([]string, len(categories))
	for i, c := range categories {
		out[i] = c.name
	}
	return out
}

// Draw returns a random realistic case for seed; see the package
// documentation for the model of each category. Whether a case carries
// correlated noise is drawn from a stream of its own (drawCorrelated), so
// the other draws of every case are those of a generator without it.
func Draw(seed uint64) Spec {
	rng := rand.New(rand.NewPCG(seed, 0xd7a3))
	u := rng.Float64()
	name := categories[len(categories)-1].name
	for _, c := range categories {
		if u < c.share {
			name = c.name
			break
		}
		u -= c.share
	}
	s := DrawCategory(name, rng)
	drawCorrelated(&s, seed)
	return s
}

// DrawCategory returns a random case of the named category with the
// draws of rng. It panics for an unknown category.
func DrawCategory(name string, rng *rand.Rand) Spec {
	d := drawer{rng}
	s := Spec{Category: name}
	s.Placement = d.placement()
	s.File = d.file()
	s.Order = Order{Mode: d.pick("loop", 0.4, "shuffled", 0.4, "two-pass", 0.2), Reverse: d.coin(0.5)}
	switch name {
	case "general":
		s.Shape = d.shape(0.15)
		s.Sampling = d.sampling(d.logUniform(150, 3000), d.uniform(0, 0.8))
		s.Noise.Chord = d.uniform(0, 0.05/152)
		s.Defects = d.defects(0.05, 0.03)
		s.Defects.Bursts = d.coin(0.2)
		if s.Defects.Bursts && d.coin(0.5) {
			s.Defects.BurstMax = 8
		}
		s.Placement.ChordMM = d.logUniform(10, 2000)
		s.Placement.Plane = d.plane(0.1)
	case "cmm":
		// A probe program on a coordinate-measuring machine: few points,
		// slower at the nose, two passes, probe slips, a tilted fixture.
		s.Shape = d.shape(0.1)
		s.Sampling = d.sampling(d.logUniform(150, 800), d.uniform(0, 0.6))
		if d.coin(0.6) {
			s.Sampling.Zone, s.Sampling.ZoneFactor = "nose", d.uniform(2, 5)
		}
		s.Noise.MM = d.uniform(0.002, 0.01)
		s.Defects = d.defects(0.03, 0.02)
		s.Order.Mode = d.pick("two-pass", 0.5, "loop", 0.5)
		s.Placement.ChordMM = d.logUniform(10, 500)
		s.Placement.Plane = d.plane(0.5)
		s.File.Decimals = 4
	case "scan":
		// A slice of a laser scan of a printed blade: grazing gaps, holes,
		// unordered, a rounded trailing edge more often than not.
		s.Shape = d.shape(0.5)
		s.Sampling = d.sampling(d.logUniform(300, 3000), d.uniform(0.2, 0.8))
		if d.coin(0.4) {
			s.Sampling.Zone, s.Sampling.ZoneFactor = "sparse", d.uniform(0.15, 0.5)
		}
		if d.coin(0.25) {
			s.Sampling.Missing, s.Sampling.MissingLen = 1+d.rng.IntN(2), d.uniform(0.01, 0.03)
		}
		s.Noise.MM = d.uniform(0.02, 0.1)
		if d.coin(0.5) {
			s.Noise.Grazing, s.Noise.BeamDeg = d.uniform(1, 4), d.uniform(0, 360)
		}
		s.Defects = d.defects(0.05, 0.03)
		s.Defects.Bursts = d.coin(0.5)
		if s.Defects.Bursts && d.coin(0.5) {
			s.Defects.BurstMax = 8
		}
		s.Order.Mode = d.pick("shuffled", 0.7, "loop", 0.3)
		s.Placement.ChordMM = d.logUniform(40, 2000)
		s.Placement.Plane = d.plane(0.3)
		s.File.Decimals = 3
	case "cad":
		// A noise-free CAD polyline: 20 intervals a surface.
		s.Shape = d.shape(0)
		s.Sampling = Sampling{CAD: d.pick("cosine", 0.5, "uniform", 0.5), PerSurface: 20}
		s.Order = Order{Mode: "loop", Reverse: d.coin(0.5)}
		s.Defects.CloseLoop = d.coin(0.5) && !s.Shape.Blunt()
		s.Placement.ChordMM = d.logUniform(10, 2000)
		s.File.Format = d.pick("dxf-polyline", 0.4, "dxf-points", 0.2, "csv", 0.4)
		s.File.Decimals = -1
	case "lift":
		// An exact Kármán–Trefftz section scanned with 1500 points for the
		// end-to-end lift check: 0.005 or 0.02 mm noise, even or irregular.
		s.Shape = ShapeSpec{Family: FamilyKT, KT: d.kt()}
		if d.coin(0.5) {
			s.Sampling = Sampling{Points: 1500}
		} else {
			s.Sampling = d.sampling(1500, d.uniform(0.3, 0.8))
			s.Sampling.Missing = 0
		}
		s.Noise.MM = 0.005
		if d.coin(0.5) {
			s.Noise.MM = 0.02
		}
		s.Defects = d.defects(0.01, 0.01)
		s.Placement.ChordMM = d.uniform(120, 200)
		s.File.Units, s.File.Decimals = "mm", 4
		if s.File.Format == "dxf-points" {
			s.File.Format = "csv"
		}
	case "dense":
		// A dense slab of a scan's point cloud.
		s.Shape = d.shape(0.3)
		s.Sampling = d.sampling(100000, d.uniform(0, 0.8))
		s.Sampling.Missing = 0
		s.Noise.MM = d.uniform(0.005, 0.05)
		s.Defects = d.defects(0.01, 0.01)
		s.Order.Mode = d.pick("shuffled", 0.7, "loop", 0.3)
		s.Placement.ChordMM = d.logUniform(50, 500)
		s.Placement.Plane = d.plane(0.3)
		s.File.Decimals = 4
	case "sparse":
		// A short probe program or a coarse slice: 60–150 points.
		s.Shape = d.shape(0.1)
		s.Sampling = d.sampling(d.logUniform(60, 150), d.uniform(0, 0.5))
		s.Sampling.Missing = 0
		s.Noise.MM = d.uniform(0.002, 0.02)
		s.Defects = d.defects(0.02, 0.02)
		s.Order.Mode = d.pick("loop", 0.5, "two-pass", 0.3, "shuffled", 0.2)
		s.Placement.ChordMM = d.logUniform(30, 1000)
		s.File.Decimals = 4
	case "voxel":
		// A slice of a voxelised scan: coordinates on a grid of 0.05–0.2 mm
		// (at most 0.2 % of the chord), noise that grows where the beam
		// grazed, dense and unordered.
		s.Shape = d.shape(0.4)
		s.Sampling = d.sampling(d.logUniform(500, 3000), d.uniform(0.1, 0.6))
		s.Noise.StepMM = d.uniform(0.05, 0.2)
		s.Noise.MM = d.uniform(0.01, 0.05)
		if d.coin(0.5) {
			s.Noise.Grazing, s.Noise.BeamDeg = d.uniform(1, 3), d.uniform(0, 360)
		}
		s.Defects = d.defects(0.03, 0.02)
		s.Order.Mode = d.pick("shuffled", 0.6, "loop", 0.4)
		s.Placement.ChordMM = math.Max(d.logUniform(60, 2000), s.Noise.StepMM/0.002)
		s.Placement.Plane = d.plane(0.3)
		s.File.Decimals = 3
	case "passes":
		// A probe program in passes: the passes overlap at the nose or the
		// tail and are a little apart (the part re-seated), a stretch
		// measured again, a probe-radius compensation error, one surface
		// probed with a finer step, outliers in clusters.
		s.Shape = d.shape(0.15)
		s.Sampling = d.sampling(d.logUniform(150, 1500), d.uniform(0, 0.6))
		if d.coin(0.5) {
			s.Sampling.Surface, s.Sampling.SurfaceFactor = d.pick("upper", 0.5, "lower", 0.5), d.uniform(5, 20)
		}
		s.Noise.MM = d.uniform(0.002, 0.02)
		s.Placement.ChordMM = d.logUniform(30, 800)
		// At most 0.05 mm and 0.2 % of the chord: a worse compensation error
		// would be seen on the part's gauge.
		s.Noise.OffsetMM = math.Min(d.uniform(0, 0.05), 0.002*s.Placement.ChordMM)
		if d.coin(0.5) {
			s.Noise.OffsetMM = -s.Noise.OffsetMM
		}
		s.Defects = d.defects(0.05, 0.02)
		s.Defects.Bursts = d.coin(0.5)
		s.Defects.BurstMax = 8
		if d.coin(0.4) {
			s.Defects.Repeat = d.uniform(0.05, 0.2)
			s.Defects.RepeatShiftMM = math.Min(d.uniform(0, 0.02), 0.0005*s.Placement.ChordMM)
		}
		s.Order.Mode = d.pick("two-pass", 0.6, "loop", 0.3, "shuffled", 0.1)
		if s.Order.Mode == "two-pass" {
			s.Order.Overlap = d.uniform(0.005, 0.03)
			s.Order.Meet = d.pick("nose", 0.5, "te", 0.5)
			s.Order.PassShiftMM = math.Min(d.uniform(0.005, 0.03), 0.0005*s.Placement.ChordMM)
		}
		s.Placement.Plane = d.plane(0.3)
		s.File.Decimals = 4
	default:
		panic("scangen: unknown category " + name)
	}
	if s.Order.Mode == "loop" && s.Sampling.CAD == "" {
		s.Order.Start = d.pick("", 0.6, "nose", 0.2, "te", 0.2)
	}
	if s.Shape.RoundRadius > 0 {
		// A rounding that fits no circle against both surfaces (a cusped
		// or thin edge) is made wider, up to three times, or left out.
		for try := 0; ; try++ {
			if _, err := s.Shape.Build(); err == nil {
				break
			}
			if try == 3 {
				s.Shape.RoundRadius = 0
				break
			}
			s.Shape.RoundRadius *= 1.5
		}
	}
	if s.Placement.Plane != "" {
		s.Placement.ZMM = d.uniform(-500, 1500)
		if s.Placement.Plane == "tilted" {
			s.Placement.TiltDeg, s.Placement.SpinDeg = d.uniform(3, 40), d.uniform(0, 360)
		}
		if s.File.Format == "dxf-polyline" {
			s.File.Format = "dxf-points"
		}
		if s.File.Header == "point" {
			s.File.Header = "idx"
		}
	}
	if s.File.Units == "m" && s.File.Decimals >= 0 {
		s.File.Decimals += 3
	} else if s.File.Units == "in" && s.File.Decimals >= 0 {
		s.File.Decimals++
	}
	return s
}

// drawer draws the parts of a spec.
type drawer struct{ rng *rand.Rand }

func (d drawer) uniform(a, b float64) float64 { return a + (b-a)*d.rng.Float64() }
func (d drawer) logUniform(a, b float64) float64 {
	return math.Exp(d.uniform(math.Log(a), math.Log(b)))
}
func (d drawer) coin(p float64) bool { return d.rng.Float64() < p }

// pick chooses among name, share pairs.
func (d drawer) pick(pairs ...any) string {
	u := d.rng.Float64()
	for i := 0; i+1 < len(pairs); i += 2 {
		p := pairs[i+1].(float64)
		if u < p {
			return pairs[i].(string)
		}
		u -= p
	}
	return pairs[len(pairs)-2].(string)
}

// shape draws a section: NACA 4-digit (40 %), 5-digit (15 %),
// 4-digit-modified (10 %), flat-bottomed (10 %) or Kármán–Trefftz (25 %),
// rounded with probability pRound.
func (d drawer) shape(pRound float64) ShapeSpec {
	var s ShapeSpec
	blunt := false
	switch d.pick("naca4", 0.4, "naca5", 0.15, "mod", 0.1, "flat", 0.1, "kt", 0.25) {
	case "naca4":
		n := &NACASpec{Thickness: d.thickness(), ClosedTE: d.coin(0.5)}
		if d.coin(0.7) {
			n.Camber = float64(1+d.rng.IntN(9)) / 100 // up to 9 %
			n.CamberPos = float64(2+d.rng.IntN(5)) / 10
		}
		s, blunt = ShapeSpec{Family: FamilyNACA, NACA: n}, !n.ClosedTE
	case "naca5":
		// The 5-digit family is tabulated to 24 % thickness (Abbott and
		// von Doenhoff, from memory). Thicker, its thickness laid off
		// normal to the steep nose of its mean line makes the outline
		// itself bow the other way: a NACA 23030 built right way up has
		// its centroid below its chord line and its mean line (the
		// surfaces' midpoints, or those corrected to first order for the
		// construction) sagging down, so no reading of the points can
		// tell it from one measured upside down. Thick draws are folded
		// back to 18–24 %, keeping the random stream of every case.
		t5 := d.thickness()
		if t5 > 0.24 {
			t5 = 0.24 - (t5-0.25)*0.4
		}
		n := &NACA5Spec{L: 2, P: 3, Thickness: t5, ClosedTE: d.coin(0.5)}
		if d.coin(0.5) { // other lines than the 230
			n.L, n.P = 1+d.rng.IntN(3), 1+d.rng.IntN(5)
		}
		n.Reflex = d.coin(0.3) && n.P >= 2
		s, blunt = ShapeSpec{Family: FamilyNACA5, NACA5: n}, !n.ClosedTE
	case "mod":
		var m *ModNACA4Spec
		// Some combinations of a small nose and a far, steep aft piece
		// have no positive thickness everywhere, and some of a large
		// nose with them a waist (ModNACA4Spec.waist): draw again (the
		// sixth draw keeps the normal nose, which always has neither).
		for try := 0; ; try++ {
			m = &ModNACA4Spec{Thickness: d.thickness(), NoseIndex: d.uniform(2, 9), MaxPos: float64(3+d.rng.IntN(4)) / 10, ClosedTE: d.coin(0.5)}
			// The trailing-edge slope of Abbott and von Doenhoff's table
			// by M (from memory), or a cusp.
			m.TESlope = map[float64]float64{0.3: 0.234, 0.4: 0.315, 0.5: 0.465, 0.6: 0.700}[m.MaxPos]
			if d.coin(0.3) {
				m.TESlope, m.ClosedTE = d.uniform(0.01, 0.06), true
			}
			if d.coin(0.6) {
				m.Camber = float64(1+d.rng.IntN(9)) / 100
				m.CamberPos = float64(2+d.rng.IntN(5)) / 10
			}
			if try == 5 {
				m.NoseIndex, m.MaxPos, m.TESlope = 6, 0.4, 0.315
			}
			if _, err := (ShapeSpec{Family: FamilyModNACA, Mod: m}).form(); err == nil || try == 5 {
				break
			}
		}
		s, blunt = ShapeSpec{Family: FamilyModNACA, Mod: m}, !m.ClosedTE
	case "flat":
		s = ShapeSpec{Family: FamilyFlat, Flat: &FlatSpec{Thickness: d.uniform(0.08, 0.2), FlatFrom: d.uniform(0.1, 0.35)}}
	default:
		s = ShapeSpec{Family: FamilyKT, KT: d.kt()}
		if d.coin(0.15) {
			s.KT.TEAngleDeg = d.uniform(0.5, 3) // near a cusp
		}
	}
	if d.coin(pRound) {
		s.RoundRadius = d.logUniform(0.002, 0.01)
		if blunt {
			// The rounding must be wider than the open base (about 0.0105 t).
			s.RoundRadius = math.Max(s.RoundRadius, 0.0105*s.Thickness()*0.75)
		}
	}
	return s
}

// thickness draws a maximum thickness: 6–21 % mostly, thin 3–6 % (15 %) or
// thick 25–40 % as at a wind-turbine blade's root (15 %).
func (d drawer) thickness() float64 {
	switch d.pick("normal", 0.7, "thin", 0.15, "thick", 0.15) {
	case "thin":
		return float64(3+d.rng.IntN(4)) / 100
	case "thick":
		return float64(25+d.rng.IntN(16)) / 100
	}
	return float64(6+d.rng.IntN(16)) / 100
}

// kt draws Kármán–Trefftz parameters: thickness about 5–20 %, camber up
// to about 6 % (a quarter of them symmetric), trailing-edge angle 3–20°.
func (d drawer) kt() *KTSpec {
	k := &KTSpec{CentreX: -d.uniform(0.04, 0.16), TEAngleDeg: d.uniform(3, 20)}
	if d.coin(0.75) {
		k.CentreY = d.uniform(0.01, 0.12)
	}
	return k
}

// sampling draws the irregular sampling of a scan of n points with gap σ.
func (d drawer) sampling(n, sigma float64) Sampling {
	s := Sampling{Points: int(math.Round(n)), Sigma: sigma, Wave: d.uniform(0, 0.8)}
	switch d.pick("none", 0.5, "nose", 0.25, "sparse", 0.25) {
	case "nose":
		s.Zone, s.ZoneFactor = "nose", d.uniform(2, 5)
	case "sparse":
		s.Zone, s.ZoneFactor = "sparse", d.uniform(0.2, 0.5)
	}
	if d.coin(0.15) {
		s.Missing, s.MissingLen = 1+d.rng.IntN(2), d.uniform(0.01, 0.03)
	}
	return s
}

// defects draws outliers (in 60 % of the cases, up to maxOut) and
// duplicates (in half, up to maxDup).
func (d drawer) defects(maxOut, maxDup float64) Defects {
	var df Defects
	if d.coin(0.6) {
		df.Outliers = d.uniform(0, maxOut)
	}
	if d.coin(0.5) {
		df.Duplicates, df.NearShare = d.uniform(0, maxDup), d.uniform(0, 1)
	}
	return df
}

// placement draws twist, orientation and position; the chord is set by
// the category.
func (d drawer) placement() Placement {
	p := Placement{
		TwistDeg:    d.uniform(-25, 35),
		Orientation: d.pick("standard", 0.55, "reversed", 0.15, "upside-down", 0.15, "reversed-upside-down", 0.15),
	}
	span := 1000.0
	if d.coin(0.2) {
		span = 50
	}
	p.LEMM = [2]float64{d.uniform(-span, span), d.uniform(-span, span)}
	return p
}

// plane draws 3D points with probability p: at a constant z or in a
// tilted plane.
func (d drawer) plane(p float64) string {
	if !d.coin(p) {
		return ""
	}
	return d.pick("z", 0.4, "tilted", 0.6)
}

// file draws the format, unit, header and decimals, and the habits of
// the program that wrote it: CR LF line ends, a byte order mark,
// scientific notation, a title line, blank and comment lines between the
// points, a separator ending every line.
func (d drawer) file() FileSpec {
	f := FileSpec{
		Format:   d.pick("csv", 0.45, "blank", 0.25, "tab", 0.1, "semicolon", 0.1, "dxf-points", 0.1),
		Units:    d.pick("mm", 0.7, "m", 0.15, "in", 0.15),
		Header:   d.pick("names", 0.35, "units", 0.2, "none", 0.25, "idx", 0.1, "point", 0.1),
		Decimals: 4,
		CRLF:     d.coin(0.2),
		BOM:      d.coin(0.1),
		Sci:      d.coin(0.1),
	}
	if d.coin(0.2) {
		f.Title = d.pick("ROTOR STATION 3", 0.3, "Section B-B, blade 2", 0.3, "tunnel model, mid span", 0.4)
	}
	if d.coin(0.1) {
		f.Breaks = d.uniform(0.002, 0.02)
	}
	f.TrailingSep = d.coin(0.1) && f.Format != "blank"
	return f
}
