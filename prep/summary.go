package prep

import (
	"fmt"
	"io"
	"math"
	"path/filepath"
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
	line := fmt.Sprintf("chord %.5g %s, twist %.2f°, fit RMS %.3g %s, TE %s, t/c %.4f at %.3f, %d of %d points used",
		s.Frame.Chord, u, s.Frame.TwistDeg, s.Fit.RMS, u, s.TrailingEdge.Kind, s.Properties.Thickness, s.Properties.ThicknessAt,
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
	u := string(s.Units)
	notes := 0
	for _, c := range p.Clouds {
		notes += len(c.Notes)
	}
	files := make([]string, len(s.Source.Files))
	for i, f := range s.Source.Files {
		files[i] = filepath.Base(f)
	}
	fmt.Fprintf(w, "%s: %d points read from %s (%d lines skipped), %d used, %d dropped\n",
		s.Name, s.Source.PointsRead, strings.Join(files, ", "), notes, s.Source.PointsUsed, len(s.Source.Dropped))
	const maxListed = 12
	for i, d := range s.Source.Dropped {
		if i == maxListed {
			fmt.Fprintf(w, "  ... and %d more (see the section document)\n", len(s.Source.Dropped)-maxListed)
			break
		}
		at := geometry.Origin{File: filepath.Base(d.File), Line: d.Line, Entity: d.Entity}
		fmt.Fprintf(w, "  dropped %s: %s\n", at, d.Reason)
	}
	if f := p.Flatness; f != nil {
		fmt.Fprintf(w, "  plane       %d points kept, %d outside the band; flatness RMS %.3g %s, max %.3g %s\n", f.Kept, f.Outside, f.RMS, u, f.Max, u)
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
	u := string(s.Units)
	if f := s.Fit; f != nil && f.Method == curve.FitInterpolate {
		fmt.Fprintf(w, "  fit         interpolating spline through every kept point")
		if f.Interpolates != "" {
			fmt.Fprintf(w, ": %s", f.Interpolates)
		}
		fmt.Fprintln(w)
	} else if f != nil {
		fmt.Fprintf(w, "  fit         %s smoothing spline, RMS %.3g %s, max %.3g %s at %s", f.Method, f.RMS, u, f.Max, u, shortOrigin(f.MaxAt))
		if f.NoiseEstimate > 0 {
			fmt.Fprintf(w, "; noise estimate %.3g %s", f.NoiseEstimate, u)
		}
		fmt.Fprintln(w)
	}
	if f := s.Fit; f != nil && f.Fairness != nil {
		fmt.Fprintf(w, "  fairness    %d inflection(s), %d noise-made, curvature roughness %.3g /c²\n", f.Fairness.Inflections, f.Fairness.Wiggles, f.Fairness.Roughness)
	}
	if fr := s.Frame; fr != nil {
		mirrored := "not mirrored"
		if fr.Mirrored {
			mirrored = "mirrored"
		}
		fmt.Fprintf(w, "  frame       chord %.5g %s, twist %.3f° nose-up, LE at (%.5g, %.5g) %s, %s\n", fr.Chord, u, fr.TwistDeg, fr.LE[0], fr.LE[1], u, mirrored)
	}
	if te := s.TrailingEdge; te != nil {
		fmt.Fprintf(w, "  trailing    %s, thickness %.4g c, %s", te.Kind, te.Thickness, te.Action)
		if te.MaxShift > 0 {
			fmt.Fprintf(w, " (largest shift %.3g %s)", te.MaxShift, u)
		}
		fmt.Fprintln(w)
	}
	if a := s.Uncertainty; a != nil {
		fmt.Fprintf(w, "  accuracy    chord ± %.2g %s, twist ± %.2g°, LE ± %.2g %s, surface ± %.2g c (95 %% bounds)\n", a.Chord, u, a.TwistDeg, a.LE, u, a.Surface)
	}
	if pn := s.Panels; pn != nil {
		fmt.Fprintf(w, "  panels      %d (%s), largest length ratio %.2f, largest turn %.1f°\n", pn.Count, pn.Spacing, pn.MaxRatio, pn.MaxTurnDeg)
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

// shortOrigin trims the folder from "folder/file:line".
func shortOrigin(s string) string {
	if i := strings.LastIndexAny(s, `/\`); i >= 0 {
		return s[i+1:]
	}
	return s
}
