package main

import (
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
	band, flatTol               float64
	mergeTol, outlierSigma      float64
	keepOutliers                bool
	loop                        int
	noise                       string
	fitTol                      float64
	te                          string
	teBlend                     float64
	leAt                        string
	mirror                      string
	panels                      int
	spacing                     string
	leCluster, teCluster        float64
	curvatureWeight             float64
	thicknessMode, camberMode   string
}

// registerRead adds the reading and cleaning flags.
func (p *prepFlags) registerRead(f *pflag.FlagSet) {
	f.StringVar(&p.format, "format", "", "input format: "+enum.Or(pointfile.Formats()...)+" (default: detected from the content)")
	f.StringVar(&p.columns, "columns", "", `columns holding x,y[,z]: 1-based numbers "2,3,4" or header names "x,y,z"`)
	f.StringVar(&p.units, "units", "", "length unit of the input: "+enum.Or(enum.Strings(geometry.Units())...)+" (default: what the file says)")
	f.StringVar(&p.cut, "cut", "", `plane that cuts a mesh or selects 3D points: "z=240" or "px,py,pz:nx,ny,nz"`)
	f.Float64Var(&p.band, "band", 0, "keep 3D points within this distance of the --cut plane (input units; 0 keeps all)")
	f.Float64Var(&p.flatTol, "flat-tol", 0, "refuse 3D points farther than this from their plane (input units; 0: 0.1% of the part's size)")
	f.Float64Var(&p.mergeTol, "merge-tol", 0, "merge points closer than this (input units; 0: 1e-6 of the part's size)")
	f.Float64Var(&p.outlierSigma, "outlier-sigma", 0, "drop points more than this many robust standard deviations off the local fit (0: 6)")
	f.BoolVar(&p.keepOutliers, "keep-outliers", false, "report outliers but keep them")
	f.IntVar(&p.loop, "loop", 0, "which loop is the section when there are several: 0 the largest, 1 the next, ...")
}

// registerShape adds the fitting, edge, panel and property flags.
func (p *prepFlags) registerShape(cmd *cobra.Command) {
	f := cmd.Flags()
	f.StringVar(&p.noise, "noise", "auto", `expected measurement noise (input units): "auto" chooses the smoothing by cross-validation, 0 interpolates every point`)
	f.Float64Var(&p.fitTol, "fit-tol", 0, "list points farther than this from the fitted curve (input units; 0: 4 times the noise)")
	f.StringVar(&p.te, "te", frame.TEAuto, "trailing edge: "+enum.Help(frame.Treatments()))
	f.Float64Var(&p.teBlend, "te-blend", 0, "aft chord fraction over which --te close blends the thickness away (0: default)")
	f.StringVar(&p.leAt, "le-at", "", "put the leading edge at the curve point nearest X,Y (input coordinates)")
	f.StringVar(&p.mirror, "mirror", frame.MirrorAuto, "mirror the section into the normalised frame: "+enum.Or(enum.Names(frame.MirrorModes())...))
	f.IntVar(&p.panels, "panels", repanel.DefaultPanels, "number of panels, 16 to 2000 (nodes = panels + 1)")
	f.StringVar(&p.spacing, "spacing", repanel.LawCosine, "node spacing: "+strings.Join(repanel.Laws(), ", "))
	f.Float64Var(&p.leCluster, "le-cluster", 0, "cluster nodes at the leading edge more (> 0) or less (< 0), -3 to 3")
	f.Float64Var(&p.teCluster, "te-cluster", 0, "cluster nodes at the trailing edge more (> 0) or less (< 0), -3 to 3")
	f.Float64Var(&p.curvatureWeight, "curvature-weight", 0, "for --spacing curvature: blend of curvature weighting with cosine spacing, 0 to 1 (0: 0.5)")
	f.StringVar(&p.thicknessMode, "thickness-mode", props.ThicknessChord, "measure thickness perpendicular to the chord line (chord) or normal to the camber line (camber)")
	f.StringVar(&p.camberMode, "camber-mode", props.CamberMean, "camber line: "+enum.Help(props.CamberModes()))
	cmd.RegisterFlagCompletionFunc("spacing", fixedCompletions(repanel.Laws()...))
	cmd.RegisterFlagCompletionFunc("te", fixedCompletions(enum.Names(frame.Treatments())...))
	cmd.RegisterFlagCompletionFunc("mirror", fixedCompletions(enum.Names(frame.MirrorModes())...))
	cmd.RegisterFlagCompletionFunc("units", fixedCompletions(enum.Strings(geometry.Units())...))
	cmd.RegisterFlagCompletionFunc("format", fixedCompletions(pointfile.Formats()...))
}

func fixedCompletions(values ...string) func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
	return func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
		return values, cobra.ShellCompDirectiveNoFileComp
	}
}

// settings turns the flags that were set into pipeline settings; flags left
// at their defaults stay unset so the chain's own defaults apply.
func (p *prepFlags) settings(f *pflag.FlagSet) (prep.Settings, error) {
	var s prep.Settings
	set := func(name string) bool { fl := f.Lookup(name); return fl != nil && fl.Changed }
	num := func(name string, v float64) *float64 {
		if !set(name) {
			return nil
		}
		return &v
	}
	s.Format, s.Columns, s.Units, s.Cut = p.format, p.columns, p.units, p.cut
	if s.Units != "" {
		if _, err := geometry.ParseUnit(s.Units); err != nil {
			return s, badInputf("--units: %v", err)
		}
	}
	s.Band, s.FlatTol, s.MergeTol, s.OutlierSigma = num("band", p.band), num("flat-tol", p.flatTol), num("merge-tol", p.mergeTol), num("outlier-sigma", p.outlierSigma)
	for name, v := range map[string]*float64{"band": s.Band, "flat-tol": s.FlatTol, "merge-tol": s.MergeTol, "outlier-sigma": s.OutlierSigma, "fit-tol": num("fit-tol", p.fitTol)} {
		if v != nil && !(*v >= 0) {
			return s, badInputf("--%s %g: want a number ≥ 0", name, *v)
		}
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
	s.FitTol = num("fit-tol", p.fitTol)
	if p.te != frame.TEAuto {
		s.TE = p.te
	}
	s.TEBlend = num("te-blend", p.teBlend)
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
	if set("panels") {
		if err := checkPanels(p.panels); err != nil {
			return s, err
		}
		s.Panels = &p.panels
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
