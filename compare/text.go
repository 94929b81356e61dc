package compare

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"text/tabwriter"

	"github.com/foilwright/foilwright/geometry"
)

// WriteCSV writes one line per measured point: where it came from, its
// coordinates as measured, the chord station and surface of its foot on
// the design, its zone, its deviation (> 0: material outside the design),
// the limits of its band (empty where none applies) and whether it is
// within them.
func (c *Comparison) WriteCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	cw.Write([]string{"index", "file", "line", "entity", "x", "y", "x_c", "surface", "zone", "deviation", "lower", "upper", "in"})
	f := func(v float64) string { return strconv.FormatFloat(v, 'g', 10, 64) }
	for i, p := range c.Points {
		lo, hi := "", ""
		if p.Band != nil {
			lo, hi = f(-p.Band.Minus), f(p.Band.Plus)
		}
		in := "yes"
		switch {
		case p.Band == nil:
			in = ""
		case !p.In:
			in = "no"
		}
		cw.Write([]string{
			strconv.Itoa(i + 1), p.Origin.File, strconv.Itoa(p.Origin.Line), strconv.Itoa(p.Origin.Entity),
			f(p.At.X), f(p.At.Y), strconv.FormatFloat(p.XC, 'f', 6, 64), p.Surface, c.Report.Zones[p.Zone].Name,
			f(p.Deviation), lo, hi, in,
		})
	}
	cw.Flush()
	return cw.Error()
}

// OneLine returns a one-line summary: verdict, points out, the range and
// RMS of the deviations.
func (r *Report) OneLine() string {
	u := r.Units
	s := fmt.Sprintf("%s against %s: %s, %d of %d point(s) out; deviation %+.3g to %+.3g %s, RMS %.3g %s",
		r.Name, r.Design.Name, r.Verdict, r.PointsOut, r.Deviation.Points, r.Deviation.Min, r.Deviation.Max, u, r.Deviation.RMS, u)
	return s
}

// WriteSummary writes the report for a person: the design and its
// placement, the alignment, the deviations, the zones and verdict, the
// derived differences, the aerodynamic differences and the caution.
func (r *Report) WriteSummary(w io.Writer) error {
	var b strings.Builder
	u := string(r.Units)
	fmt.Fprintf(&b, "%s against %s (%s)\n", r.Name, r.Design.Name, r.Design.Source)
	if pl := r.Design.Placement; pl != nil {
		fmt.Fprintf(&b, "  design      in chord units, placed with chord %.6g %s (%s), twist %.4g° (%s), leading edge (%.6g, %.6g) (%s)\n",
			pl.Chord, u, pl.ChordFrom, pl.TwistDeg, pl.TwistFrom, pl.Offset.X, pl.Offset.Y, pl.OffsetFrom)
	} else {
		fmt.Fprintf(&b, "  design      in part units (%s)\n", u)
	}
	fmt.Fprintf(&b, "  measured    %d of %d points kept", r.Measured.PointsUsed, r.Measured.PointsRead)
	if n := len(r.Measured.Dropped); n > 0 {
		fmt.Fprintf(&b, ", %d dropped (listed in the report)", n)
	}
	b.WriteByte('\n')
	b.WriteString("  alignment   " + r.Alignment.words(u) + "\n")
	for _, n := range r.Alignment.Notes {
		fmt.Fprintf(&b, "              note: %s\n", n)
	}
	d := r.Deviation
	fmt.Fprintf(&b, "  deviation   RMS %.3g %s, mean %+.3g, min %+.4g at %s, max %+.4g at %s (> 0: material outside the design)\n",
		d.RMS, u, d.Mean, d.Min, worstAt(d.MinAt), d.Max, worstAt(d.MaxAt))
	if len(r.Zones) > 0 {
		tw := tabwriter.NewWriter(&b, 0, 4, 2, ' ', 0)
		fmt.Fprintf(tw, "  zone\tx/c\tsurface\tband (%s)\tpoints\tout\tmin\tmax\tverdict\n", u)
		for _, z := range r.Zones {
			band := "none"
			if z.Tolerance != nil {
				band = z.Tolerance.String()
			}
			mn, mx := "-", "-"
			if z.Points > 0 {
				mn, mx = fmt.Sprintf("%+.4g", z.Min), fmt.Sprintf("%+.4g", z.Max)
			}
			fmt.Fprintf(tw, "  %s\t%g-%g\t%s\t%s\t%d\t%d\t%s\t%s\t%s\n", z.Name, z.X[0], z.X[1], z.Surface, band, z.Points, z.Out, mn, mx, z.Verdict)
		}
		tw.Flush()
	}
	switch r.Verdict {
	case VerdictNone:
		b.WriteString("  verdict     none: no tolerance given\n")
	default:
		fmt.Fprintf(&b, "  verdict     %s: %d of %d point(s) out of tolerance\n", strings.ToUpper(r.Verdict), r.PointsOut, r.Deviation.Points)
		shown := 0
		for _, z := range r.Zones {
			for _, wp := range z.Worst {
				if !wp.In && shown < 5 {
					fmt.Fprintf(&b, "              out: %s %+.4g %s at x/c %.4f %s (zone %s)\n", originText(wp.File, wp.Line, wp.Entity), wp.Deviation, u, wp.XC, wp.Surface, z.Name)
					shown++
				}
			}
		}
	}
	dv := r.Derived
	fmt.Fprintf(&b, "  chord       %.6g %s (design %.6g, %+.3g); twist %.4f° (design %.4f°, %+.4f°) in the alignment\n",
		dv.Chord.Measured, u, dv.Chord.Design, dv.Chord.Difference, dv.TwistDeg.Measured, dv.TwistDeg.Design, dv.TwistDeg.Difference)
	fmt.Fprintf(&b, "  thickness   %.4f c at %.3f (design %.4f at %.3f); camber %.4f c at %.3f (design %.4f at %.3f)\n",
		dv.Thickness.Measured, dv.ThicknessAt.Measured, dv.Thickness.Design, dv.ThicknessAt.Design,
		dv.Camber.Measured, dv.CamberAt.Measured, dv.Camber.Design, dv.CamberAt.Design)
	fmt.Fprintf(&b, "  edges       LE radius %.4f c (design %.4f); TE thickness %.4f c (design %.4f), angle %.1f° (design %.1f°)\n",
		dv.LERadius.Measured, dv.LERadius.Design, dv.TEThickness.Measured, dv.TEThickness.Design, dv.TEAngleDeg.Measured, dv.TEAngleDeg.Design)
	if a := r.Aero; a != nil {
		for _, m := range a.Methods {
			if len(m.AlphaDeg) == 0 {
				fmt.Fprintf(&b, "  aero        %s: no results\n", m.Stage)
				continue
			}
			fmt.Fprintf(&b, "  aero        %s, α %g° to %g°: ΔCl %s, ΔCm %s, Δα_L0 %+.4f°\n", m.Stage, m.AlphaDeg[0], m.AlphaDeg[len(m.AlphaDeg)-1],
				spanOf(m.DeltaCl), spanOf(m.DeltaCm), m.AlphaL0Deg.Difference)
		}
		fmt.Fprintf(&b, "              measured at α %+.4f° (its twist against the design), coefficients on the design's chord (ratio %.5f)\n", a.TwistDeg, a.ChordRatio)
	}
	for _, wn := range r.Warnings {
		fmt.Fprintf(&b, "  warning: %s\n", wn)
	}
	b.WriteString("  caution: inviscid estimates; check against test data and defer to the applicable codes and licensed engineering practice\n")
	_, err := io.WriteString(w, b.String())
	return err
}

// words describes the alignment in one line.
func (a AlignmentInfo) words(u string) string {
	var s string
	switch a.Mode {
	case AlignAsIs:
		return "as is: the coordinates as they are"
	case AlignDatum:
		if a.Datum == DatumNominal {
			return "datum: the nominal placement (the part in its fixture frame)"
		}
		s = "datum: leading edge on the design's, chord lines along each other"
	case AlignBestFit:
		s = "best fit (least squares)"
	case AlignMinZone:
		s = "minimum zone"
	}
	if a.Scale != "" {
		s += ", scale " + a.Scale
	}
	s += fmt.Sprintf(": rotated %+.5f°, moved (%+.5g, %+.5g) %s", a.RotationDeg, a.Translation[0], a.Translation[1], u)
	if a.Scale == ScaleFree {
		s += fmt.Sprintf(", scaled %.7f", a.ScaleFactor)
	}
	if a.Mirrored {
		s += ", mirrored"
	}
	if a.Iterations > 0 {
		s += fmt.Sprintf("; %s %.4g", a.ObjectiveName, a.Objective)
		if a.ObjectiveName != "largest zone use" {
			s += " " + u
		}
		s += fmt.Sprintf(" after %d step(s)", a.Iterations)
	}
	return s
}

// worstAt names the point w.
func worstAt(w *Worst) string {
	if w == nil {
		return "-"
	}
	return fmt.Sprintf("%s (x/c %.3f %s)", originText(w.File, w.Line, w.Entity), w.XC, w.Surface)
}

func originText(file string, line, entity int) string {
	return geometry.Origin{File: filepath.Base(file), Line: line, Entity: entity}.String()
}

// spanOf writes the range of vs.
func spanOf(vs []float64) string {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range vs {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	if lo == hi {
		return fmt.Sprintf("%+.4f", lo)
	}
	return fmt.Sprintf("%+.4f to %+.4f", lo, hi)
}
