package main

import (
	"errors"
	"fmt"
	"slices"
	"strconv"
	"strings"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/frame"
	"github.com/foilwright/foilwright/geometry/pointfile"
	"github.com/foilwright/foilwright/geometry/props"
	"github.com/foilwright/foilwright/internal/enum"
	"github.com/foilwright/foilwright/prep"
	"github.com/foilwright/foilwright/repanel"
)

// prepFlags are the flags of the geometry chain, shared by prep, inspect and
// points. Each has a key of the same name (with underscores) in the
// "prepare" object of a pipeline file.
type prepFlags struct {
	format, columns, units, cut string
	layer                       string
	band, flatTol               wordFloat
	mergeTol, outlierSigma      wordFloat
	keepOutliers                bool
	loop                        int
	noise                       string
	probeRadius                 lengthValue
	fitTol                      wordFloat
	te                          string
	teThickness, teBlendLength  lengthValue
	teBlend                     float64 // the earlier --te-blend (chord fraction)
	leAt                        string
	mirror                      string
	panels                      panelsValue
	panelTol                    float64
	spacing                     string
	leCluster, teCluster        float64
	curvatureWeight             float64
	thicknessMode, camberMode   string
}

// chainGroup is the help group of the geometry chain's flags.
const chainGroup = "chain"

// registerRead adds the reading and cleaning flags.
func (p *prepFlags) registerRead(cmd *cobra.Command) {
	f := cmd.Flags()
	p.band = wordFloat{word: "all", min: 0, open: true, kind: "length"}
	p.flatTol = wordFloat{word: "auto", min: 0, open: true, kind: "length"}
	p.mergeTol = wordFloat{word: "auto", min: 0, kind: "length"}
	p.outlierSigma = wordFloat{word: "auto", min: 0, open: true, max: 100, kind: "number"}
	p.outlierSigma.Set("6")
	f.StringVar(&p.format, "format", "auto", "input format: auto (from the content), "+enum.Or(pointfile.Formats()...))
	f.StringVar(&p.columns, "columns", "", `columns holding x,y[,z]: 1-based numbers "2,3,4" or header names "x,y,z" (default: the first numeric ones)`)
	f.StringVar(&p.units, "units", "file", "length unit of the input: file (what the file says), "+enum.Or(enum.Strings(geometry.Units())...))
	f.StringVar(&p.cut, "cut", "", `plane that cuts a mesh or selects 3D points: "z=240" or "px,py,pz:nx,ny,nz" (default: a best-fit plane of 3D points)`)
	f.StringVar(&p.layer, "layer", "", "read only the DXF entities on this layer, e.g. SECTION (default: every layer)")
	f.Var(&p.band, "band", "keep 3D points within this distance of the --cut plane (input units; all: keep every point)")
	f.Var(&p.flatTol, "flat-tol", "refuse 3D points farther than this from their plane (input units; auto: 0.1% of the part's size)")
	f.Var(&p.mergeTol, "merge-tol", "merge points closer than this (input units; auto: 1e-6 of the part's size)")
	f.Var(&p.outlierSigma, "outlier-sigma", "drop points more than this many robust standard deviations off the local fit")
	f.BoolVar(&p.keepOutliers, "keep-outliers", false, "report outliers but keep them")
	f.IntVar(&p.loop, "loop", 0, "which loop is the section when there are several: 0 the largest, 1 the next, ...")
	for _, name := range []string{"format", "columns", "units", "cut", "layer", "band", "flat-tol", "merge-tol", "outlier-sigma", "keep-outliers", "loop"} {
		f.SetAnnotation(name, groupAnnotation, []string{chainGroup})
	}
	cmd.RegisterFlagCompletionFunc("units", fixedCompletions(append([]string{"file"}, enum.Strings(geometry.Units())...)...))
	cmd.RegisterFlagCompletionFunc("format", fixedCompletions(append([]string{"auto"}, pointfile.Formats()...)...))
	cmd.RegisterFlagCompletionFunc("columns", fixedCompletions("1,2", "2,3", "1,2,3", "2,3,4", "x,y", "x,y,z"))
	cmd.RegisterFlagCompletionFunc("cut", fixedCompletions("x=", "y=", "z="))
	cmd.RegisterFlagCompletionFunc("band", fixedCompletions("all"))
	cmd.RegisterFlagCompletionFunc("layer", fixedCompletions("SECTION", "SPLINE", "0"))
	cmd.RegisterFlagCompletionFunc("flat-tol", fixedCompletions("auto"))
	cmd.RegisterFlagCompletionFunc("merge-tol", fixedCompletions("auto"))
	cmd.RegisterFlagCompletionFunc("outlier-sigma", fixedCompletions("4", "5", "6", "8"))
	cmd.RegisterFlagCompletionFunc("loop", fixedCompletions("0", "1", "2"))
}

// registerShape adds the fitting, edge, panel and property flags.
func (p *prepFlags) registerShape(cmd *cobra.Command) {
	f := cmd.Flags()
	p.fitTol = wordFloat{word: "auto", min: 0, open: true, kind: "length"}
	f.StringVar(&p.noise, "noise", "auto", `expected measurement noise (input units): auto chooses the smoothing by cross-validation, 0 interpolates every point`)
	f.Var(&p.fitTol, "fit-tol", "list points farther than this from the fitted curve (input units; auto: 4 times the noise)")
	f.Var(&p.probeRadius, "probe-radius", "the points are the centres of a probe ball of this radius (a measuring machine's output without radius compensation): move them this far toward the part, e.g. 1.5mm (a bare number is in input units)")
	f.StringVar(&p.te, "te", frame.TEAuto, "trailing edge: "+enum.Help(frame.Treatments())+"; see --te-thickness")
	f.Var(&p.teThickness, "te-thickness", "reshape a sharp, blunt or open trailing edge to this thickness, e.g. 0.5mm or 0.004c (a bare number is in input units; 0 closes it)")
	p.teBlendLength.s = geometry.Length{Value: frame.EdgeDefaultBlend, Unit: geometry.ChordUnit}.String()
	f.Var(&p.teBlendLength, "te-blend-length", "length ahead of the trailing edge, along the chord, over which --te-thickness blends into the surfaces, e.g. 20mm or 0.1c")
	f.Float64Var(&p.teBlend, "te-blend", 0, "aft chord fraction over which --te close blends")
	deprecate(f, "te-blend", "use --te-blend-length (0.1 of the chord is 0.1c)")
	f.StringVar(&p.leAt, "le-at", "", "put the leading edge at the curve point nearest X,Y (input coordinates; default: the point farthest from the trailing edge)")
	f.StringVar(&p.mirror, "mirror", frame.MirrorAuto, "mirror the section into the normalised frame: "+enum.Or(enum.Names(frame.MirrorModes())...))
	f.Var(&p.panels, "panels", fmt.Sprintf("number of panels, 16 to 2000 (nodes = panels + 1), or auto: the fewest (%d to %d) within --panel-tol of the curve", repanel.AutoMinPanels, repanel.AutoMaxPanels))
	f.Float64Var(&p.panelTol, "panel-tol", repanel.DefaultTolerance, "for --panels auto: the largest distance between a panel and the curve it replaces (chord units)")
	f.StringVar(&p.spacing, "spacing", repanel.LawCosine, "node spacing: "+enum.Or(repanel.Laws()...))
	f.Float64Var(&p.leCluster, "le-cluster", 0, "cluster nodes at the leading edge more (> 0) or less (< 0), -3 to 3")
	f.Float64Var(&p.teCluster, "te-cluster", 0, "cluster nodes at the trailing edge more (> 0) or less (< 0), -3 to 3")
	f.Float64Var(&p.curvatureWeight, "curvature-weight", repanel.DefaultCurvatureWeight, "for --spacing curvature: blend of curvature weighting with cosine spacing, 0 to 1")
	f.StringVar(&p.thicknessMode, "thickness-mode", props.ThicknessChord, "measure thickness perpendicular to the chord line (chord) or normal to the camber line (camber)")
	f.StringVar(&p.camberMode, "camber-mode", props.CamberMean, "camber line: "+enum.Help(props.CamberModes()))
	for _, name := range []string{"noise", "fit-tol", "probe-radius", "te", "te-thickness", "te-blend-length", "le-at", "mirror", "panels", "panel-tol", "spacing",
		"le-cluster", "te-cluster", "curvature-weight", "thickness-mode", "camber-mode"} {
		f.SetAnnotation(name, groupAnnotation, []string{chainGroup})
	}
	cmd.RegisterFlagCompletionFunc("noise", fixedCompletions("auto", "0"))
	cmd.RegisterFlagCompletionFunc("fit-tol", fixedCompletions("auto"))
	cmd.RegisterFlagCompletionFunc("probe-radius", fixedCompletions("0.5mm", "1mm", "1.5mm", "2.5mm"))
	cmd.RegisterFlagCompletionFunc("te", fixedCompletions(enum.Names(frame.Treatments())...))
	cmd.RegisterFlagCompletionFunc("te-thickness", fixedCompletions("0", "0.5mm", "0.002c"))
	cmd.RegisterFlagCompletionFunc("te-blend-length", fixedCompletions("0.1c", "0.2c", "20mm"))
	cmd.RegisterFlagCompletionFunc("le-at", noFiles)
	cmd.RegisterFlagCompletionFunc("mirror", fixedCompletions(enum.Names(frame.MirrorModes())...))
	cmd.RegisterFlagCompletionFunc("panels", fixedCompletions("auto", "100", "200", "400"))
	cmd.RegisterFlagCompletionFunc("panel-tol", fixedCompletions("1e-4", "5e-5", "2e-5"))
	cmd.RegisterFlagCompletionFunc("spacing", fixedCompletions(repanel.Laws()...))
	cmd.RegisterFlagCompletionFunc("le-cluster", fixedCompletions("-1", "0", "1"))
	cmd.RegisterFlagCompletionFunc("te-cluster", fixedCompletions("-1", "0", "1"))
	cmd.RegisterFlagCompletionFunc("curvature-weight", fixedCompletions("0.25", "0.5", "0.75"))
	cmd.RegisterFlagCompletionFunc("thickness-mode", fixedCompletions(enum.Names(props.ThicknessModes())...))
	cmd.RegisterFlagCompletionFunc("camber-mode", fixedCompletions(enum.Names(props.CamberModes())...))
}

// changed reports whether the flag name, or a deprecated alias of it, was
// given.
func changed(f *pflag.FlagSet, name string) bool {
	fl := f.Lookup(name)
	if fl == nil {
		return false
	}
	found := fl.Changed
	f.VisitAll(func(o *pflag.Flag) {
		if o.Changed && o.Value == fl.Value {
			found = true
		}
	})
	return found
}

// settings turns the flags of cmd that were set into pipeline settings;
// flags left at their defaults stay unset so the chain's own defaults
// apply. Notes on earlier forms of a flag go to cmd's stderr.
func (p *prepFlags) settings(cmd *cobra.Command) (prep.Settings, error) {
	f := cmd.Flags()
	var s prep.Settings
	set := func(name string) bool { return changed(f, name) }
	num := func(name string, v float64) *float64 {
		if !set(name) {
			return nil
		}
		return &v
	}
	if p.format != "auto" {
		if !slices.Contains(pointfile.Formats(), p.format) {
			return s, badInputf("--format %q: want auto, %s", p.format, enum.Or(pointfile.Formats()...))
		}
		s.Format = p.format
	}
	s.Columns, s.Cut, s.Layer = p.columns, p.cut, p.layer
	if p.units != "file" && p.units != "" {
		u, err := geometry.ParseUnit(p.units)
		if err != nil {
			return s, badInputf("--units: %v", err)
		}
		s.Units = string(u)
	}
	s.Band, s.FlatTol, s.MergeTol = p.band.ptr(), p.flatTol.ptr(), p.mergeTol.ptr()
	if set("outlier-sigma") {
		s.OutlierSigma = p.outlierSigma.ptr()
	}
	if set("keep-outliers") {
		s.KeepOutliers = &p.keepOutliers
	}
	if set("loop") {
		if p.loop < 0 {
			return s, badInputf("--loop %d: want 0 or more", p.loop)
		}
		s.Loop = &p.loop
	}
	if f.Lookup("noise") == nil {
		return s, nil
	}
	switch n := strings.TrimSpace(p.noise); n {
	case "", "auto":
	default:
		v, err := strconv.ParseFloat(n, 64)
		if err != nil || !(v >= 0) || v > 1e300 {
			return s, badInputf("--noise %q: want auto, 0 or a positive length", p.noise)
		}
		s.Noise = &v
	}
	s.FitTol = p.fitTol.ptr()
	if set("probe-radius") {
		s.ProbeRadius = p.probeRadius.s
	}
	if err := p.edgeSettings(cmd, &s); err != nil {
		return s, err
	}
	if p.leAt != "" {
		pt, err := parsePair(p.leAt)
		if err != nil {
			return s, badInputf("--le-at %q: %v", p.leAt, err)
		}
		s.LEAt = &[2]float64{pt.X, pt.Y}
	}
	if p.mirror != frame.MirrorAuto {
		s.Mirror = p.mirror
	}
	if p.panels.n != 0 {
		n := p.panels.n
		s.Panels = &n
	}
	if set("panel-tol") {
		if !(p.panelTol > 0) || p.panelTol >= 0.1 {
			return s, badInputf("--panel-tol %g: want a positive length below 0.1 (chord units)", p.panelTol)
		}
		s.PanelTol = &p.panelTol
	}
	if set("spacing") {
		s.Spacing = p.spacing
	}
	s.LECluster, s.TECluster, s.CurvatureWeight = num("le-cluster", p.leCluster), num("te-cluster", p.teCluster), num("curvature-weight", p.curvatureWeight)
	if set("thickness-mode") {
		s.ThicknessMode = p.thicknessMode
	}
	if set("camber-mode") {
		s.CamberMode = p.camberMode
	}
	return s, nil
}

// edgeSettings sets the trailing-edge treatment: --te, or a reshape to
// --te-thickness over --te-blend-length; the earlier --te close and
// --te-blend still work, with a note.
func (p *prepFlags) edgeSettings(cmd *cobra.Command, s *prep.Settings) error {
	f := cmd.Flags()
	if p.te != frame.TEAuto {
		if p.te != frame.TEClose && !enum.Has(frame.Treatments(), p.te) {
			return badInputf("--te %q: want %s", p.te, enum.Or(enum.Names(frame.Treatments())...))
		}
		if p.te == frame.TEClose {
			fmt.Fprintln(cmd.ErrOrStderr(), "note: --te close is deprecated; use --te-thickness 0 (and --te-blend-length)")
		}
		s.TE = p.te
	}
	if changed(f, "te-thickness") {
		if s.TE != "" && s.TE != frame.TEClose {
			return badInputf("--te %s and --te-thickness both given: a reshape to a thickness is its own treatment", s.TE)
		}
		s.TE, s.TEThickness = "", p.teThickness.s
	}
	if changed(f, "te-blend-length") {
		if s.TEThickness == "" && s.TE != frame.TEClose {
			return badInputf("--te-blend-length applies only with --te-thickness")
		}
		s.TEBlendLength = p.teBlendLength.s
	}
	if changed(f, "te-blend") {
		if !(p.teBlend > 0 && p.teBlend < 1) {
			return badInputf("--te-blend %g: want a chord fraction between 0 and 1", p.teBlend)
		}
		s.TEBlend = &p.teBlend
	}
	return nil
}

// inputFiles reads the named files whole (or stdin for "-"), within the
// input limits of cmd's command line.
func inputFiles(cmd *cobra.Command, paths []string) ([]prep.File, error) {
	var files []prep.File
	for _, p := range paths {
		data, name, err := readInput(cmd, p)
		if err != nil {
			return nil, err
		}
		if len(data) == 0 {
			return nil, badInput(&geometry.ParseError{File: name, Err: geometry.ErrEmpty})
		}
		files = append(files, prep.NewFile(name, data))
	}
	return files, nil
}

// sectionName is the default name of a section made from paths: the first
// file's base name without its extension.
func sectionName(paths []string) string {
	p := paths[0]
	if i := strings.LastIndexAny(p, `/\`); i >= 0 {
		p = p[i+1:]
	}
	if i := strings.LastIndex(p, "."); i > 0 {
		p = p[:i]
	}
	return p
}

// chainError turns an error of the geometry chain into a bad-input error
// (exit status 2), naming the flag that answers it where there is one.
func chainError(err error) error {
	if errors.Is(err, prep.ErrNoUnits) {
		return badInputf("%v: give it with --units", err)
	}
	return badInput(err)
}

// pointFileArgs completes the positional arguments of commands that read
// point files.
func pointFileArgs(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
	return []string{"csv", "txt", "dat", "xyz", "dxf", "stl"}, cobra.ShellCompDirectiveFilterFileExt
}

// sectionArgs completes the positional argument of commands that read a
// section document.
func sectionArgs(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
	return []string{"json"}, cobra.ShellCompDirectiveFilterFileExt
}
