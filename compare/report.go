package compare

import (
	"encoding/json"
	"fmt"
	"io"
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
)

// Format is the value of the "format" key of a compare report.
const Format = "foilwright.compare/1"

// Caution is the caution every report carries.
const Caution = "The aerodynamic differences are inviscid estimates (no boundary layer, no separation, no stall): " +
	"check them against test data, and defer to the applicable codes and licensed engineering practice before relying on them. " +
	"The verdict holds for the measured points only, as good as the measurement."

// Report is the compare report (format foilwright.compare/1). Lengths
// are in the measurement's units (Units) unless a field says chord units;
// deviations are signed normal distances, positive where there is
// material outside the design.
type Report struct {
	Format    string        `json:"format"`
	Name      string        `json:"name"`
	Units     geometry.Unit `json:"units"`
	Measured  MeasuredInfo  `json:"measured"`
	Design    DesignInfo    `json:"design"`
	Alignment AlignmentInfo `json:"alignment"`
	Deviation Summary       `json:"deviation"`
	Zones     []ZoneReport  `json:"zones"`
	// Verdict is VerdictPass, VerdictFail or VerdictNone.
	Verdict string `json:"verdict"`
	// PointsOut counts the points outside their band.
	PointsOut int         `json:"points_out"`
	Derived   Derived     `json:"derived"`
	Aero      *AeroReport `json:"aero,omitempty"`
	Warnings  []string    `json:"warnings"`
	Caution   string      `json:"caution"`
}

// MeasuredInfo is what was measured: the files and what the geometry
// chain kept of them, and the measured section's frame.
type MeasuredInfo struct {
	Files      []string          `json:"files,omitempty"`
	SHA256     []string          `json:"sha256,omitempty"`
	PointsRead int               `json:"points_read"`
	PointsUsed int               `json:"points_used"`
	Dropped    []section.Dropped `json:"dropped"`
	Frame      section.Frame     `json:"frame"`
}

// DesignInfo is the design and where it was placed.
type DesignInfo struct {
	Name         string               `json:"name"`
	Source       string               `json:"source"`
	Kind         string               `json:"kind"`
	SHA256       string               `json:"sha256,omitempty"`
	ChordUnits   bool                 `json:"chord_units"`
	Placement    *Placement           `json:"placement,omitempty"`
	Frame        section.Frame        `json:"frame"`
	TrailingEdge section.TrailingEdge `json:"trailing_edge"`
}

// AlignmentInfo is the motion that took the measured points onto the
// design: q ↦ scale_factor · R(rotation) · [mirror] · q + translation,
// rotation counter-clockwise in degrees, the mirror x ↦ −x.
type AlignmentInfo struct {
	Mode  string `json:"mode"`
	Datum string `json:"datum,omitempty"`
	// Scale is ScaleLocked or ScaleFree for a fit or a datum alignment.
	Scale       string     `json:"scale,omitempty"`
	RotationDeg float64    `json:"rotation_deg"`
	Translation [2]float64 `json:"translation"`
	ScaleFactor float64    `json:"scale_factor"`
	Mirrored    bool       `json:"mirrored"`
	Iterations  int        `json:"iterations"`
	Converged   bool       `json:"converged"`
	// Objective is what the fit minimised (ObjectiveName says which) at
	// the motion: the RMS distance, the largest |deviation| or the largest
	// use of a zone (1 is its edge).
	Objective     float64  `json:"objective,omitempty"`
	ObjectiveName string   `json:"objective_name,omitempty"`
	Notes         []string `json:"notes,omitempty"`
}

// Worst is one of the points that deviate most.
type Worst struct {
	File      string  `json:"file"`
	Line      int     `json:"line"`
	Entity    int     `json:"entity,omitempty"`
	X         float64 `json:"x"`
	Y         float64 `json:"y"`
	Deviation float64 `json:"deviation"`
	XC        float64 `json:"x_c"`
	Surface   string  `json:"surface"`
	Zone      string  `json:"zone,omitempty"`
	In        bool    `json:"in"`
}

// Summary sums up the deviations of a set of points.
type Summary struct {
	Points int     `json:"points"`
	RMS    float64 `json:"rms"`
	Mean   float64 `json:"mean"`
	Min    float64 `json:"min"`
	Max    float64 `json:"max"`
	Out    int     `json:"out"`
	// MinAt and MaxAt are the points of the smallest and largest
	// deviation; Worst the points of largest |deviation|, worst first.
	MinAt *Worst  `json:"min_at,omitempty"`
	MaxAt *Worst  `json:"max_at,omitempty"`
	Worst []Worst `json:"worst"`
}

// ZoneReport is one tolerance zone: where it is, its band and how its
// points fared.
type ZoneReport struct {
	Name    string     `json:"name"`
	X       [2]float64 `json:"x"`
	Surface string     `json:"surface"`
	// Tolerance is the band; nil for the points no tolerance covers.
	Tolerance *Band  `json:"tolerance"`
	Verdict   string `json:"verdict"`
	Summary
}

// Difference is a figure of the measured section against the design's.
type Difference struct {
	Measured   float64 `json:"measured"`
	Design     float64 `json:"design"`
	Difference float64 `json:"difference"`
}

func diff(m, d float64) Difference { return Difference{m, d, m - d} }

// Derived holds the differences of the section's figures: chord in the
// measurement's units, twist in degrees (the measured chord line in the
// alignment against the design's), the rest in chord units of each
// section.
type Derived struct {
	Chord       Difference `json:"chord"`
	TwistDeg    Difference `json:"twist_deg"`
	Thickness   Difference `json:"thickness"`
	ThicknessAt Difference `json:"thickness_at"`
	Camber      Difference `json:"camber"`
	CamberAt    Difference `json:"camber_at"`
	LERadius    Difference `json:"le_radius"`
	TEThickness Difference `json:"te_thickness"`
	TEAngleDeg  Difference `json:"te_angle_deg"`
}

// worstListed is how many worst points a summary lists.
const worstListed = 5

// report builds the report of c.
func (c *Comparison) report(opts Options, al AlignmentInfo) *Report {
	m, d := c.Measurement, c.Design
	r := &Report{Format: Format, Name: m.Name, Units: m.Units, Alignment: al, Caution: Caution, Warnings: []string{}}
	if s := m.Section.Source; s != nil {
		r.Measured = MeasuredInfo{Files: s.Files, SHA256: s.SHA256, PointsRead: s.PointsRead, PointsUsed: s.PointsUsed, Dropped: s.Dropped}
	} else {
		r.Measured = MeasuredInfo{PointsRead: len(m.Points), PointsUsed: len(m.Points)}
	}
	if r.Measured.Dropped == nil {
		r.Measured.Dropped = []section.Dropped{}
	}
	if m.Section.Frame != nil {
		r.Measured.Frame = *m.Section.Frame
	} else {
		r.Measured.Frame = section.Frame{Chord: 1}
	}
	r.Design = DesignInfo{Name: d.Name, Source: d.Source, Kind: d.Kind, SHA256: d.SHA256, ChordUnits: d.ChordUnits,
		Frame: section.Frame(d.Frame), TrailingEdge: section.TrailingEdge(d.TE)}
	if d.ChordUnits {
		pl := d.Placement
		r.Design.Placement = &pl
	}
	r.Warnings = append(r.Warnings, d.Warnings...)
	if al.Scale == ScaleFree && (al.Mode == AlignBestFit || al.Mode == AlignMinZone) {
		r.Alignment.Notes = append(r.Alignment.Notes, "the scale is free: a deviation common to the whole outline (a uniform coat, an offset cutter) is partly read as scale and does not show in full")
	}
	if !al.Converged {
		r.Warnings = append(r.Warnings, fmt.Sprintf("the %s alignment stopped after %d steps before it settled", al.Mode, al.Iterations))
	}

	all := make([]int, len(c.Points))
	for i := range all {
		all[i] = i
	}
	r.Deviation = c.summary(all, opts.Tolerance)
	groups := make([][]int, len(opts.Tolerance.Zones)+2)
	for i, p := range c.Points {
		groups[p.Zone] = append(groups[p.Zone], i)
	}
	for i, z := range opts.Tolerance.Zones {
		b := z.Band
		r.Zones = append(r.Zones, c.zone(z.Name, [2]float64{z.From, z.To}, z.Surface, &b, groups[i], opts.Tolerance))
	}
	k := len(opts.Tolerance.Zones)
	if opts.Tolerance.Default != nil {
		b := *opts.Tolerance.Default
		r.Zones = append(r.Zones, c.zone("elsewhere", [2]float64{0, 1}, SurfaceBoth, &b, groups[k], opts.Tolerance))
		k++
	}
	if len(groups[k]) > 0 {
		r.Zones = append(r.Zones, c.zone("no tolerance", [2]float64{0, 1}, SurfaceBoth, nil, groups[k], opts.Tolerance))
		if opts.Tolerance.Given() {
			r.Warnings = append(r.Warnings, fmt.Sprintf("%d point(s) lie in no zone and no default tolerance covers them; they do not count towards the verdict", len(groups[k])))
		}
	}
	if r.Zones == nil {
		r.Zones = []ZoneReport{}
	}
	r.PointsOut = r.Deviation.Out
	switch {
	case !opts.Tolerance.Given():
		r.Verdict = VerdictNone
	case r.PointsOut > 0:
		r.Verdict = VerdictFail
	default:
		r.Verdict = VerdictPass
	}
	r.Derived = c.derived()
	return r
}

// summary sums up the points idx.
func (c *Comparison) summary(idx []int, tol Tolerance) Summary {
	s := Summary{Points: len(idx), Worst: []Worst{}}
	if len(idx) == 0 {
		return s
	}
	lo, hi := idx[0], idx[0]
	var sum, sum2 float64
	for _, i := range idx {
		d := c.Points[i].Deviation
		sum += d
		sum2 += d * d
		if d < c.Points[lo].Deviation {
			lo = i
		}
		if d > c.Points[hi].Deviation {
			hi = i
		}
		if !c.Points[i].In {
			s.Out++
		}
	}
	s.Min, s.Max = c.Points[lo].Deviation, c.Points[hi].Deviation
	s.Mean = sum / float64(len(idx))
	s.RMS = math.Sqrt(sum2 / float64(len(idx)))
	worst := func(i int) Worst {
		p := c.Points[i]
		return Worst{File: p.Origin.File, Line: p.Origin.Line, Entity: p.Origin.Entity, X: p.At.X, Y: p.At.Y,
			Deviation: p.Deviation, XC: p.XC, Surface: p.Surface, In: p.In, Zone: c.zoneName(p.Zone, tol)}
	}
	wl, wh := worst(lo), worst(hi)
	s.MinAt, s.MaxAt = &wl, &wh
	for _, i := range c.worstOf(idx, worstListed) {
		s.Worst = append(s.Worst, worst(i))
	}
	return s
}

// zoneName returns the name of the report zone k.
func (c *Comparison) zoneName(k int, tol Tolerance) string {
	switch {
	case k < len(tol.Zones):
		return tol.Zones[k].Name
	case k == len(tol.Zones) && tol.Default != nil:
		return "elsewhere"
	}
	return "no tolerance"
}

// zone sums up one zone.
func (c *Comparison) zone(name string, x [2]float64, surface string, b *Band, idx []int, tol Tolerance) ZoneReport {
	z := ZoneReport{Name: name, X: x, Surface: surface, Tolerance: b, Summary: c.summary(idx, tol)}
	switch {
	case b == nil:
		z.Verdict = VerdictNone
	case z.Out > 0:
		z.Verdict = VerdictFail
	default:
		z.Verdict = VerdictPass
	}
	return z
}

// derived returns the differences of the measured section's figures from
// the design's.
func (c *Comparison) derived() Derived {
	m, d := c.Measurement, c.Design
	mf := m.Frame()
	mp, dp := m.Section.Properties, d.Props
	var out Derived
	out.Chord = diff(mf.Chord, d.Frame.Chord)
	out.TwistDeg = diff(c.alignedTwist(), d.Frame.TwistDeg)
	out.Thickness = diff(mp.Thickness, dp.Thickness)
	out.ThicknessAt = diff(mp.ThicknessAt, dp.ThicknessAt)
	out.Camber = diff(mp.Camber, dp.Camber)
	out.CamberAt = diff(mp.CamberAt, dp.CamberAt)
	out.LERadius = diff(mp.LERadius, dp.LERadius)
	var mte float64
	if m.Section.TrailingEdge != nil {
		mte = m.Section.TrailingEdge.Thickness
	}
	out.TEThickness = diff(mte, d.TE.Thickness)
	out.TEAngleDeg = diff(mp.TEAngleDeg, dp.TEAngleDeg)
	return out
}

// alignedTwist returns the twist (degrees, nose-up) of the measured chord
// line after the alignment, in the design's part frame.
func (c *Comparison) alignedTwist() float64 {
	mf := c.Measurement.Frame()
	le := c.Motion.Apply(geometry.Point{X: mf.LE[0], Y: mf.LE[1]})
	te := c.Motion.Apply(mf.ToPart(geometry.Point{X: 1}))
	d := te.Sub(le)
	if mf.Mirrored != c.Motion.Mirror {
		d.X = -d.X
	}
	return -math.Atan2(d.Y, d.X) * 180 / math.Pi
}

// WriteJSON writes the report, indented, with a final newline.
func (r *Report) WriteJSON(w io.Writer) error {
	b, err := r.Encode()
	if err != nil {
		return err
	}
	_, err = w.Write(b)
	return err
}

// Encode returns the report as indented JSON with a final newline.
func (r *Report) Encode() ([]byte, error) {
	b, err := json.MarshalIndent(r, "", "  ")
	if err != nil {
		return nil, fmt.Errorf("compare report: %w", err)
	}
	return append(b, '\n'), nil
}
