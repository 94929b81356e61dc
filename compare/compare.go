package compare

import (
	"errors"
	"fmt"
	"math"

	"github.com/foilwright/foilwright/compare/align"
	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/enum"
)

// Alignment modes (Options.Align).
const (
	AlignBestFit = "best-fit"
	AlignMinZone = "min-zone"
	AlignDatum   = "datum"
	AlignAsIs    = "as-is"
)

// Alignments returns the alignment modes with what each does, in the
// order help texts give them.
func Alignments() []enum.Choice {
	return []enum.Choice{
		{Name: AlignBestFit, Doc: "least-squares fit of the points to the design"},
		{Name: AlignMinZone, Doc: "the fit with the smallest worst deviation, or worst use of its zone"},
		{Name: AlignDatum, Doc: "nose and trailing edge on the design's, or the nominal placement"},
		{Name: AlignAsIs, Doc: "the coordinates as they are"},
	}
}

// Datums of the datum alignment (Options.Datum).
const (
	DatumLETE    = "le-te"   // the measured leading edge on the design's, the chord lines along each other
	DatumNominal = "nominal" // the part measured in its fixture frame, the design at its nominal placement
)

// Datums returns the datums of the datum alignment.
func Datums() []enum.Choice {
	return []enum.Choice{
		{Name: DatumLETE, Doc: "leading edge on the design's, chord lines along each other"},
		{Name: DatumNominal, Doc: "the part measured in its fixture frame, the design as placed"},
	}
}

// Scale modes (Options.Scale).
const (
	ScaleLocked = "locked"
	ScaleFree   = "free"
)

// Options say how a measurement is compared with its design.
type Options struct {
	// Align is one of Alignments; "" means AlignBestFit.
	Align string
	// Datum is one of Datums, for AlignDatum; "" means DatumLETE.
	Datum string
	// Scale is ScaleLocked, ScaleFree or "": locked when the design has a
	// chord (given, in part units, or in its section document's frame),
	// free otherwise.
	Scale string
	// Tolerance is the tolerance drawing; the zero value gives no verdict.
	Tolerance Tolerance
}

// ErrOptions means the options of a comparison do not fit together.
var ErrOptions = errors.New("compare")

// Verdicts.
const (
	VerdictPass = "pass" // every toleranced point is within its band
	VerdictFail = "fail" // at least one is not
	VerdictNone = "none" // no tolerance was given
)

// A PointDeviation is one measured point against the design.
type PointDeviation struct {
	Origin geometry.Origin
	At     geometry.Point // as measured
	Foot   geometry.Point // the nearest point of the design, part frame
	// Normal is the direction in the part frame along which the deviation
	// is measured (the design's outward normal at a smooth foot).
	Normal    geometry.Point
	Position  float64 // arc length of the foot along the design's outline, from the upper trailing edge
	XC        float64 // chord station of the foot in the design's frame
	Surface   string  // SurfaceUpper, SurfaceLower or SurfaceBase
	Zone      int     // index in Report.Zones
	Deviation float64 // signed normal deviation, measurement units, > 0 outside the design
	Band      *Band   // the tolerance that applies, nil for none
	In        bool    // within its band (true when there is none)
}

// Comparison is a measurement held against its design: the report and
// what is behind it.
type Comparison struct {
	Report      *Report
	Points      []PointDeviation
	Measurement *Measurement
	Design      *Design
	// Motion maps the measured points onto the design's part frame.
	Motion align.Motion
	// Cp holds the pressure distributions behind the aerodynamic
	// differences, for the ΔCp picture; set by Aero.
	Cp *CpPair
}

// Compare aligns the measurement with the design as opts says, measures
// the signed normal deviation of every point, sorts the points into their
// tolerance zones, gives the verdict and the derived differences. Errors
// wrap ErrOptions for options that do not fit the design (a datum that
// needs a placement the design lacks, a locked scale without a chord), or
// come from the fit.
func Compare(m *Measurement, d *Design, opts Options) (*Comparison, error) {
	if opts.Align == "" {
		opts.Align = AlignBestFit
	}
	if !enum.Has(Alignments(), opts.Align) {
		return nil, fmt.Errorf("%w: alignment %q: want %s", ErrOptions, opts.Align, enum.Or(enum.Names(Alignments())...))
	}
	if opts.Datum == "" {
		opts.Datum = DatumLETE
	}
	if !enum.Has(Datums(), opts.Datum) {
		return nil, fmt.Errorf("%w: datum %q: want %s", ErrOptions, opts.Datum, enum.Or(enum.Names(Datums())...))
	}
	scaleFree := !d.Placement.chordGiven
	switch opts.Scale {
	case "":
	case ScaleFree:
		scaleFree = true
	case ScaleLocked:
		if !d.Placement.chordGiven {
			return nil, fmt.Errorf("%w: a locked scale needs the design's chord (give it, or a design in part units)", ErrOptions)
		}
		scaleFree = false
	default:
		return nil, fmt.Errorf("%w: scale %q: want %s or %s", ErrOptions, opts.Scale, ScaleLocked, ScaleFree)
	}
	for i := range opts.Tolerance.Zones {
		if err := opts.Tolerance.Zones[i].Check(); err != nil {
			return nil, err
		}
	}
	if len(m.Points) < 8 {
		return nil, fmt.Errorf("%w: %d measured point(s), want at least 8", ErrOptions, len(m.Points))
	}
	c := &Comparison{Measurement: m, Design: d}
	al := AlignmentInfo{Mode: opts.Align, Scale: ScaleLocked}
	if scaleFree {
		al.Scale = ScaleFree
	}
	motion, feet, err := c.align(opts, scaleFree, &al)
	if err != nil {
		return nil, err
	}
	c.Motion = motion
	al.RotationDeg = motion.Angle * 180 / math.Pi
	al.Translation = [2]float64{motion.Shift.X, motion.Shift.Y}
	al.ScaleFactor = motion.Scale
	al.Mirrored = motion.Mirror
	c.points(feet, opts.Tolerance)
	c.Report = c.report(opts, al)
	return c, nil
}

// datumMotion returns the motion that puts the measured leading edge on
// the design's and the measured chord line along the design's, scaling
// the measured chord to the design's when scaleFree.
func (c *Comparison) datumMotion(scaleFree bool) align.Motion {
	mf, df := c.Measurement.Frame(), c.Design.Frame
	if !scaleFree {
		df.Chord = mf.Chord
	}
	f := func(p geometry.Point) geometry.Point { return df.ToPart(mf.ToChord(p)) }
	b := f(geometry.Point{})
	ex, ey := f(geometry.Point{X: 1}).Sub(b), f(geometry.Point{Y: 1}).Sub(b)
	return align.FromMatrix([2][2]float64{{ex.X, ey.X}, {ex.Y, ey.Y}}, b)
}

// align finds the motion of opts and the feet of the moved points,
// recording how in al.
func (c *Comparison) align(opts Options, scaleFree bool, al *AlignmentInfo) (align.Motion, []align.Foot, error) {
	o, pts := c.Design.Outline, c.Measurement.Points
	fit := align.Options{Scale: scaleFree}
	switch opts.Align {
	case AlignAsIs:
		al.Scale = ""
		al.Converged = true
		return align.Identity(), align.Feet(o, align.Identity(), pts), nil
	case AlignDatum:
		al.Datum = opts.Datum
		al.Converged = true
		if opts.Datum == DatumNominal {
			if !c.Design.Placement.nominalGiven {
				return align.Motion{}, nil, fmt.Errorf("%w: the nominal datum needs the design's placement (chord, twist and offset, or a design in part units)", ErrOptions)
			}
			al.Scale = ""
			return align.Identity(), align.Feet(o, align.Identity(), pts), nil
		}
		m := c.datumMotion(scaleFree)
		return m, align.Feet(o, m, pts), nil
	}
	start := c.datumMotion(scaleFree)
	lsFit := fit
	if opts.Align == AlignMinZone {
		// The zone fit needs a start near its optimum, not the least
		// squares to rounding.
		lsFit.MaxIterations = 3
	}
	ls, err := align.LeastSquares(o, pts, start, lsFit)
	if err != nil {
		return align.Motion{}, nil, fmt.Errorf("best fit: %w", err)
	}
	al.Iterations, al.Converged = ls.Iterations, ls.Converged
	al.Objective, al.ObjectiveName = ls.Objective, "rms"
	if opts.Align == AlignBestFit {
		return ls.Motion, ls.Feet, nil
	}
	// The zone fit depends on which zone each point falls in, which
	// depends on the fit: assign, fit, and assign again until the zones
	// hold still, or until the points that moved to another zone neither
	// bind nor would (their use below the optimum under both bands): the
	// points that bind and their bands are then those of the last fit, so
	// its motion is still the optimum.
	res := ls
	var zones []int
	var prev []align.Band
	for round := 0; round < 4; round++ {
		bands, assigned := c.bands(res.Motion, res.Feet, opts.Tolerance)
		if round > 0 && (equalInts(assigned, zones) || slack(prev, bands, zones, assigned, res)) {
			break
		}
		zones, prev = assigned, bands
		fit.Feet = res.Feet
		mz, err := align.MinimumZone(o, pts, bands, res.Motion, fit)
		if err != nil {
			return align.Motion{}, nil, fmt.Errorf("minimum-zone fit: %w", err)
		}
		al.Iterations += mz.Iterations
		al.Converged = mz.Converged
		al.Objective = mz.Objective
		res = mz
	}
	al.ObjectiveName = "largest zone use"
	if !opts.Tolerance.Given() {
		al.ObjectiveName = "largest |deviation|"
		al.Objective /= res.Motion.Scale
	}
	return res.Motion, res.Feet, nil
}

// bands returns the band of every point for the zone fit at the motion m
// (in the moved points' scale), and the zone each point falls in. Points
// without a tolerance get a band too wide to matter; with no tolerance at
// all, the fit is the plain one (nil bands).
func (c *Comparison) bands(m align.Motion, feet []align.Foot, tol Tolerance) ([]align.Band, []int) {
	zones := make([]int, len(feet))
	if !tol.Given() {
		return nil, zones
	}
	out := make([]align.Band, len(feet))
	for i, f := range feet {
		xc, surf := c.station(f)
		z, b, ok := tol.Zone(xc, surf)
		zones[i] = z
		if !ok {
			out[i] = align.Band{Half: 1e30}
			continue
		}
		out[i] = align.Band{Centre: m.Scale * b.Centre(), Half: m.Scale * b.Half()}
	}
	return out, zones
}

// station returns the chord station (design frame) and surface of a foot.
func (c *Comparison) station(f align.Foot) (float64, string) {
	return c.Design.Frame.ToChord(f.Point).X, c.Design.Outline.Surface(f.Position)
}

// slack reports whether every point whose zone changed from was to now
// uses less of its band than the fit's optimum res.Objective, under its
// old band and under its new one.
func slack(old, now []align.Band, was, is []int, res align.Result) bool {
	if old == nil || now == nil {
		return false
	}
	limit := res.Objective * (1 - 1e-9)
	for i := range is {
		if is[i] == was[i] {
			continue
		}
		d := res.Feet[i].Distance
		if old[i].Use(d) >= limit || now[i].Use(d) >= limit {
			return false
		}
	}
	return true
}

func equalInts(a, b []int) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// points fills c.Points from the feet of the moved points.
func (c *Comparison) points(feet []align.Foot, tol Tolerance) {
	m := c.Measurement
	s := c.Motion.Scale
	c.Points = make([]PointDeviation, len(feet))
	for i, f := range feet {
		xc, surf := c.station(f)
		pd := PointDeviation{
			Origin: m.Origins[i], At: m.Points[i], Foot: f.Point, Normal: f.Normal,
			Position: f.Position, XC: xc, Surface: surf, Deviation: f.Distance / s, In: true,
		}
		z, b, ok := tol.Zone(xc, surf)
		switch {
		case z >= 0:
			pd.Zone = z
		case ok:
			pd.Zone = len(tol.Zones) // elsewhere: the default band
		default:
			pd.Zone = len(tol.Zones) + 1 // no tolerance
			if tol.Default == nil {
				pd.Zone = len(tol.Zones)
			}
		}
		if ok {
			bb := b
			pd.Band = &bb
			pd.In = b.Holds(pd.Deviation)
		}
		c.Points[i] = pd
	}
}

// worstOf returns up to n of the points idx, largest |deviation| first
// (ties by index): one pass that keeps the n worst so far.
func (c *Comparison) worstOf(idx []int, n int) []int {
	worse := func(a, b int) bool {
		da, db := math.Abs(c.Points[a].Deviation), math.Abs(c.Points[b].Deviation)
		return da > db || da == db && a < b
	}
	w := make([]int, 0, n+1)
	for _, i := range idx {
		if len(w) == n && !worse(i, w[n-1]) {
			continue
		}
		k := len(w)
		w = append(w, i)
		for k > 0 && worse(i, w[k-1]) {
			w[k] = w[k-1]
			k--
		}
		w[k] = i
		if len(w) > n {
			w = w[:n]
		}
	}
	return w
}
