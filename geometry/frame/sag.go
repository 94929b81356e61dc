package frame

import (
	"math"
	"sort"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
)

// Stations of the mean-line sag, in chord units: from just aft of the
// nose (the camber of a NACA 5-digit line with its maximum at 5 % of the
// chord is all there) to clear of the trailing edge's reconstruction.
const (
	sagFrom     = 0.01
	sagTo       = 0.9
	sagStations = 36
	// EdgeMirrorSag is the smallest mean sag of the mean line below the
	// straight line through its ends at the stations (chord units) that
	// counts as camber for the mirror decision. The faintest camber line in
	// use, NACA 5-digit at design lift coefficient 0.15 with its maximum at
	// 5 %, sags by 1.6e-3 (Report 824's constants); 3e-4 leaves five times
	// that margin and stays ten times above what the noise of a scan leaves.
	EdgeMirrorSag = 3e-4
	// noseBiasFactor turns the nose's half-thickness growth into the
	// most the thickness can bow the mean line's sag (noseBias). The
	// thickness of a NACA section is laid off normal to its mean line
	// (Report 824), so where the mean line rises at a slope θ near the
	// nose the surfaces' midpoint at equal x lies about h·h'·sin θ above
	// the mean line, h the half-thickness (first order of the
	// construction); near the nose h² grows as 2·r·x, so h·h' is of the
	// nose radius r's order. The anchor of the sag's straight line at 1 %
	// rises with it, and the sag reads low. Measured numerically on
	// Report 824's 5-digit lines with their greatest camber at 5 % at
	// 12–24 % thickness, in our chord convention, the sag reads low by
	// 0.11, 0.17 and 0.21 times the nose's h·h' (noseBias) for design
	// lift 0.15, 0.3 and 0.45 (nose slopes 0.3, 0.6 and 0.9, the
	// steepest lines the campaign draws). The camber the steep line
	// carries bows the sag up by nearly as much, so the sag of such a
	// section reads down right way up (and up upside down) by the
	// difference only: at most 0.107 times h·h' over all of Report 824's
	// 5-digit lines (design lift 0.15–0.45, greatest camber at 5–25 %,
	// plain and reflexed) at 10–24 % thickness, at 0.107 for the 31024
	// (fitted from 200 exact points a surface with 0.01/300 chord of
	// noise, either way up); 0.13 covers it with a fifth to spare. A
	// sag beyond that says which side is up, whatever the nose did.
	noseBiasFactor = 0.13
	// sagAftFrom is the first station of the mean line's sag read aft of
	// the nose, and sagAftFactor times the sag's least (sagMin) what it
	// must bow there for the upper side to be plain whatever the nose
	// reads. Camber laid well aft (a 4-digit line, a Kármán–Trefftz arc,
	// the 5-digit lines with their greatest camber at 15 % or more) bows
	// the mean line aft of 10 % by 1e-3 chord or more, which the nose's
	// thickness does not fake; the 5-digit lines cambered at 5–10 % of
	// design lift up to 0.45, straight aft of their greatest camber, bow
	// it by 4e-4 at most at 12–24 % thickness, and the 230 line by 5e-4
	// at 21 % (Report 824's constants, computed numerically).
	sagAftFrom   = 0.1
	sagAftFactor = 1.5
	// noseBiasAt are the stations (chord units) whose half-thicknesses
	// give the nose's growth h·h' = (h₂² − h₁²) / (2 (x₂ − x₁)).
	noseBiasNear, noseBiasFar = sagFrom, 0.05
	// sagGap is the widest gap between the points either side of the
	// leading edge (chord units) over which the curve's nose still counts
	// as measured for the mirror decision: well inside the first station.
	sagGap = 5e-3
)

// meanLineSag returns how far the mean line of path, a section in the
// normalised frame starting at the trailing edge with its leading edge at
// arc length sLE, lies above the straight line through its ends at the
// stations, on average over sagStations even stations from `from` (at
// least sagFrom) to sagTo. A section with positive camber sags up (positive), a mirrored one
// down, whatever the shape of its camber line (parabolic arcs, the
// 5-digit line straight aft of its maximum, a reflexed line). Unlike the
// centroid, it does not change when the chord line tilts (a tilt adds
// a + b·x to the mean line, which the straight line through its ends takes
// up), so the uncertain place of the leading edge on a thick, blunt nose
// cannot make a symmetric section look mirrored. ok is false when the
// surfaces do not both cross every station once.
func meanLineSag(path *curve.Curve, sLE, from float64) (sag float64, ok bool) {
	const n = 600
	from = max(from, sagFrom)
	if from >= sagTo-0.2 {
		return 0, false // too little of the mean line left to read a sag from
	}
	upper := sampleArc(path, 0, sLE, n)
	lower := sampleArc(path, sLE, path.Length(), n)
	// The upper run goes from the trailing edge to the nose (x falling),
	// the lower from the nose back (x rising).
	var ms [sagStations]float64
	var xs [sagStations]float64
	for k := range sagStations {
		x := from + (sagTo-from)*float64(k)/float64(sagStations-1)
		yu, oku := crossing(upper, x, true)
		yl, okl := crossing(lower, x, false)
		if !oku || !okl {
			return 0, false
		}
		xs[k], ms[k] = x, (yu+yl)/2
	}
	a, b := ms[0], ms[sagStations-1]
	for k := range sagStations {
		line := a + (b-a)*(xs[k]-xs[0])/(xs[sagStations-1]-xs[0])
		sag += ms[k] - line
	}
	sag /= sagStations
	return sag, !math.IsNaN(sag) && !math.IsInf(sag, 0)
}

// noseBias returns the most the thickness of path, a section in the
// normalised frame starting at the trailing edge with its leading edge at
// arc length sLE, can bow its mean line's sag (meanLineSag) by being laid
// off normal to a mean line that rises steeply at the nose:
// noseBiasFactor times the growth h·h' of the half-thickness h over the
// nose (see noseBiasFactor). A thick section cambered near its nose (a
// NACA 21024 or 22024, say) reads as sagging down right way up, so
// camber fainter than this cannot tell its upper side. ok is false when
// the surfaces do not both cross the stations once.
func noseBias(path *curve.Curve, sLE float64) (bias float64, ok bool) {
	const n = 600
	upper := sampleArc(path, 0, sLE, n)
	lower := sampleArc(path, sLE, path.Length(), n)
	half := func(x float64) (float64, bool) {
		yu, oku := crossing(upper, x, true)
		yl, okl := crossing(lower, x, false)
		return (yu - yl) / 2, oku && okl
	}
	h1, ok1 := half(noseBiasNear)
	h2, ok2 := half(noseBiasFar)
	if !ok1 || !ok2 {
		return 0, false
	}
	growth := (h2*h2 - h1*h1) / (2 * (noseBiasFar - noseBiasNear))
	return noseBiasFactor * math.Max(growth, 0), !math.IsNaN(growth) && !math.IsInf(growth, 0)
}

// sampleArc returns n+1 points of path from arc length s0 to s1.
func sampleArc(path *curve.Curve, s0, s1 float64, n int) []geometry.Point {
	out := make([]geometry.Point, n+1)
	for k := range out {
		out[k] = path.At(s0 + (s1-s0)*float64(k)/float64(n))
	}
	return out
}

// crossing returns y where the polyline ps first crosses x, walking it
// with x falling (falling true) or rising, and whether it does so exactly
// once in that direction.
func crossing(ps []geometry.Point, x float64, falling bool) (y float64, ok bool) {
	found := 0
	for i := 1; i < len(ps); i++ {
		a, b := ps[i-1], ps[i]
		var hit bool
		if falling {
			hit = a.X >= x && b.X < x
		} else {
			hit = a.X < x && b.X >= x
		}
		if !hit {
			continue
		}
		found++
		if found == 1 {
			t := (x - a.X) / (b.X - a.X)
			y = a.Y + t*(b.Y-a.Y)
		}
	}
	return y, found == 1
}

// supportedFrom returns the chord station (normalised frame fr) from which
// the points support the mean line: aft of the farther of the two points
// either side of the leading edge le when they lie more than sagGap chord
// apart along cv, the curve whose arc lengths support holds; 0 when the
// nose is sampled or support is empty.
func supportedFrom(cv *curve.Curve, support []float64, le geometry.Point, fr Frame) float64 {
	if len(support) < 2 || !(fr.Chord > 0) {
		return 0
	}
	s := append([]float64(nil), support...)
	sort.Float64s(s)
	L := cv.Length()
	sLE, _ := cv.Project(le)
	a, b := s[len(s)-1], s[0]+L // the pair across the start of a closed curve
	if k := sort.SearchFloat64s(s, sLE); k > 0 && k < len(s) {
		a, b = s[k-1], s[k]
	} else if !cv.Closed() {
		return 0
	}
	if b-a <= sagGap*fr.Chord {
		return 0
	}
	at := func(t float64) geometry.Point {
		if cv.Closed() {
			t = math.Mod(t, L)
		}
		return cv.At(t)
	}
	return max(fr.ToChord(at(a)).X, fr.ToChord(at(b)).X)
}

// sampledSag returns how far the mean line of a curve fitted through
// points as far apart as support's (arc lengths along cv) can bow by the
// spacing alone, in chords: h² for the mean gap h in chords. Between
// points h apart, a curve of curvature κ is guessed to within about κh²/8,
// and the curvature of the surfaces near the first stations, which anchor
// the sag's line, reaches about 8 per chord. Probe files of 52 points
// spaced log-normally (h ≈ 0.04) bow a symmetric section's mean line by up
// to 1.1e-3 (TestNormalizeSparseMirror). 0 without support.
func sampledSag(cv *curve.Curve, support []float64, chord float64) float64 {
	if len(support) < 2 || !(chord > 0) {
		return 0
	}
	h := cv.Length() / float64(len(support)) / chord
	return h * h
}
