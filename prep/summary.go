package prep

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/props"
	"github.com/foilwright/foilwright/geometry/section"
)

// OneLine returns a one-line summary of the preparation: chord, twist,
// fit, trailing edge, thickness and what was dropped.
func (p *Preparation) OneLine() string {
	s := p.Section
	u := s.Units
	line := fmt.Sprintf("chord %s, twist %s°, fit RMS %s, TE %s, t/c %.4f at %.3f, %d of %d points used",
		lengthG(s.Frame.Chord, 5, u), Fixed(s.Frame.TwistDeg, 2), LengthText(s.Fit.RMS, u), s.TrailingEdge.Kind, s.Properties.Thickness, s.Properties.ThicknessAt,
		s.Source.PointsUsed, s.Source.PointsRead)
	if a := s.Uncertainty; a != nil {
		line = fmt.Sprintf("chord %.5g ± %.2g %s, twist %.2f ± %.2g°, surface ± %.2g c, fit RMS %.3g %s, TE %s, t/c %.4f at %.3f, %d of %d points used",
			s.Frame.Chord, a.Chord, u, s.Frame.TwistDeg, a.TwistDeg, a.Surface, s.Fit.RMS, u, s.TrailingEdge.Kind, s.Properties.Thickness, s.Properties.ThicknessAt,
			s.Source.PointsUsed, s.Source.PointsRead)
	}
	if n := len(s.Warnings); n > 0 {
		line += fmt.Sprintf(", %d warning(s)", n)
	}
	return line
}

// WriteSummary writes a short human summary of the preparation: what was
// read and dropped, the fit, the frame, the trailing edge, the panels, the
// main properties and the warnings.
func (p *Preparation) WriteSummary(w io.Writer) {
	s := p.Section
	notes := 0 // lines skipped: notes of a line (a DXF's entities on other layers are not lines)
	for _, c := range p.Clouds {
		for _, n := range c.Notes {
			if n.Origin.Line > 0 {
				notes++
			}
		}
	}
	fmt.Fprintf(w, "%s: %d points read from %s (%d lines skipped), %d used, %d dropped\n",
		s.Name, s.Source.PointsRead, strings.Join(s.Source.Files, ", "), notes, s.Source.PointsUsed, len(s.Source.Dropped))
	const maxListed = 12
	for i, d := range s.Source.Dropped {
		if i == maxListed {
			fmt.Fprintf(w, "  ... and %d more (see the section document)\n", len(s.Source.Dropped)-maxListed)
			break
		}
		at := geometry.Origin{File: d.File, Line: d.Line, Entity: d.Entity}
		fmt.Fprintf(w, "  dropped %s: %s\n", at, d.Reason)
	}
	if r := s.Source.ProbeRadius; r > 0 {
		fmt.Fprintf(w, "  probe ball  radius %s: the points, its centres, moved that far toward the part\n", LengthText(r, s.Units))
	}
	for i, c := range p.Clouds {
		// The plain case (the first columns, x, y and z) goes without
		// saying.
		plain := strings.HasPrefix(c.Columns, "1, 2 (") || strings.HasPrefix(c.Columns, "1, 2, 3 (")
		if c.Columns != "" && i < len(s.Source.Files) && (c.ColumnsGuessed || !plain) {
			fmt.Fprintf(w, "  columns     %s: %s\n", s.Source.Files[i], c.Columns)
		}
	}
	if f := p.Flatness; f != nil {
		fmt.Fprintf(w, "  plane       %d points kept, %d outside the band%s; flatness RMS %s, max %s\n", f.Kept, f.Outside, StrayText(len(f.Strays)), LengthText(f.RMS, s.Units), LengthText(f.Max, s.Units))
	}
	if len(p.Clean.Loops) > 1 {
		fmt.Fprintf(w, "  loops       %d found; the section is the one of largest area unless told\n", len(p.Clean.Loops))
	}
	WriteSectionReport(w, s, p.Props.ThicknessMode, p.Props.CamberMode)
}

// WriteSectionReport writes what a section document records: fit, frame,
// trailing edge, panels, properties and warnings, one topic a line. The
// modes name how thickness and camber were measured ("" when unknown).
func WriteSectionReport(w io.Writer, s *section.Section, thicknessMode, camberMode string) {
	u := s.Units
	if f := s.Fit; f != nil && f.Method == curve.FitInterpolate {
		fmt.Fprintf(w, "  fit         interpolating spline through every kept point")
		if f.Parameter != "" {
			fmt.Fprintf(w, " (%s parameter)", f.Parameter)
		}
		if f.Interpolates != "" {
			fmt.Fprintf(w, ": %s", f.Interpolates)
		}
		fmt.Fprintln(w)
	} else if f != nil {
		fmt.Fprintf(w, "  fit         %s smoothing spline, RMS %s, max %s at %s", f.Method, LengthText(f.RMS, u), LengthText(f.Max, u), f.MaxAt)
		if f.NoiseEstimate > 0 {
			fmt.Fprintf(w, "; noise estimate %s", LengthText(f.NoiseEstimate, u))
		}
		fmt.Fprintln(w)
	}
	if f := s.Fit; f != nil && f.Fairness != nil {
		fmt.Fprintf(w, "  fairness    %d inflection(s), %d noise-made, %d dip(s) round the nose, curvature roughness %.3g /c²\n", f.Fairness.Inflections, f.Fairness.Wiggles, f.Fairness.Ripples, f.Fairness.Roughness)
	}
	if fr := s.Frame; fr != nil {
		mirrored := "not mirrored"
		if fr.Mirrored {
			mirrored = "mirrored"
		}
		fmt.Fprintf(w, "  frame       chord %s, twist %s, LE at (%.5g, %.5g) %s, %s\n", lengthG(fr.Chord, 5, u), TwistText(fr.TwistDeg), fr.LE[0], fr.LE[1], UnitSymbol(u), mirrored)
	}
	if te := s.TrailingEdge; te != nil {
		fmt.Fprintf(w, "  trailing    %s, thickness %.4g c, %s", te.Kind, te.Thickness, te.Action)
		if te.Target != nil {
			if fr := s.Frame; fr != nil && u != "" && u != geometry.ChordUnit {
				fmt.Fprintf(w, " to %s over %s ahead of the edge", lengthG(*te.Target*fr.Chord, 4, u), lengthG(te.Blend*fr.Chord, 4, u))
			} else {
				fmt.Fprintf(w, " to %.4g c over %.4g c ahead of the edge", *te.Target, te.Blend)
			}
		}
		if te.MaxShift > 0 {
			fmt.Fprintf(w, " (largest shift %s)", LengthText(te.MaxShift, u))
		}
		fmt.Fprintln(w)
	}
	if a := s.Uncertainty; a != nil {
		fmt.Fprintf(w, "  accuracy    chord ± %.2g %s, twist ± %.2g°, LE ± %.2g %s, surface ± %.2g c (95 %% bounds)\n", a.Chord, u, a.TwistDeg, a.LE, u, a.Surface)
	}
	if pn := s.Panels; pn != nil {
		fmt.Fprintf(w, "  panels      %d (%s", pn.Count, pn.Spacing)
		switch {
		case pn.Target > 0:
			fmt.Fprintf(w, "; the fewest within %g c of the curve: %.3g c", pn.Target, pn.Deviation)
		case pn.Deviation > 0:
			fmt.Fprintf(w, "; within %.3g c of the curve", pn.Deviation)
		}
		fmt.Fprintf(w, "), largest length ratio %.2f, largest turn %.1f°\n", pn.MaxRatio, pn.MaxTurnDeg)
	}
	if pr := s.Properties; pr != nil {
		fmt.Fprintf(w, "  thickness   %.4f c at x = %.3f", pr.Thickness, pr.ThicknessAt)
		if thicknessMode != "" {
			fmt.Fprintf(w, " (%s)", thicknessWords(thicknessMode))
		}
		if math.Abs(pr.Camber) < 5e-5 {
			fmt.Fprintf(w, "\n  camber      none (symmetric within 0.00005 c)")
		} else {
			fmt.Fprintf(w, "\n  camber      %.4f c at x = %.3f", pr.Camber, pr.CamberAt)
		}
		if camberMode != "" {
			fmt.Fprintf(w, " (%s)", camberMode)
		}
		fmt.Fprintf(w, "\n  LE radius   %.4f c; TE angle %.1f°; area %.5f c²\n", pr.LERadius, pr.TEAngleDeg, pr.Area)
	}
	for _, warn := range s.Warnings {
		fmt.Fprintf(w, "  warning: %s\n", warn)
	}
}

func thicknessWords(mode string) string {
	if mode == props.ThicknessCamber {
		return "normal to the camber line"
	}
	return "perpendicular to the chord line"
}

// UnitSymbol returns the symbol of u in a readout: its name, or "c" for
// chord units.
func UnitSymbol(u geometry.Unit) string {
	if u == geometry.ChordUnit {
		return "c"
	}
	return string(u)
}

// LengthText formats a length v in unit u with three significant figures:
// "0.0106 mm", or "0.0106 c" in chord units.
func LengthText(v float64, u geometry.Unit) string { return lengthG(v, 3, u) }

// lengthG formats v in u with digits significant figures.
func lengthG(v float64, digits int, u geometry.Unit) string {
	t := strconv.FormatFloat(v, 'g', digits, 64)
	if sym := UnitSymbol(u); sym != "" {
		t += " " + sym
	}
	return t
}

// Fixed formats v with prec decimals, never as a negative zero: -0.001
// to two decimals is "0.00".
func Fixed(v float64, prec int) string {
	t := strconv.FormatFloat(v, 'f', prec, 64)
	if strings.HasPrefix(t, "-") && strings.Trim(t, "-0.") == "" {
		t = t[1:]
	}
	return t
}

// TwistText words a twist (degrees, positive nose-up, in (−180°, 180°]):
// "4.091° nose-up", "2.500° nose-down", "0.000°", or for a section turned
// more than a right angle, "180.000° (turned round)".
func TwistText(deg float64) string {
	t := Fixed(math.Abs(deg), 3) + "°"
	switch {
	case strings.Trim(t, "0.°") == "":
		return t
	case math.Abs(deg) > 90:
		return Fixed(deg, 3) + "° (turned round)"
	case deg > 0:
		return t + " nose-up"
	default:
		return t + " nose-down"
	}
}

// StrayText is the summary's note of the points dropped as strays off the
// plane of a 3D file (planar.Flatness.Strays): empty when there are none.
func StrayText(n int) string {
	if n == 0 {
		return ""
	}
	return fmt.Sprintf(", %d stray(s) off the plane dropped", n)
}
