package main

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"github.com/foilwright/foilwright/compare"
	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/internal/enum"
	"github.com/foilwright/foilwright/internal/limits"
	"github.com/foilwright/foilwright/plot"
	"github.com/foilwright/foilwright/plugins/builtin"
	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
	"github.com/foilwright/foilwright/prep"
)

type compareOptions struct {
	prep        prepFlags
	host        hostFlags
	design      string
	designUnits string
	chord       float64
	twist       float64
	offset      string
	align       string
	datum       string
	scale       string
	tolerance   string
	zones       []string
	alpha       string
	cpAlpha     float64
	noAero      bool
	json        bool
	out         string
	points      string
	plot        string
	magnify     wordFloat
	name        string
	quiet       bool
}

func newCompareCmd() *cobra.Command {
	var opts compareOptions
	cmd := &cobra.Command{
		Use:   "compare MEASURED... --design DESIGN [flags]",
		Short: "Hold a measured section against its design: deviations, tolerance zones, verdict, aerodynamic differences",
		Long: `compare reads the measured points of one section (any input prep reads, cleaned
the same way, or a section document) and its design (a section document, a
coordinate listing, a DXF or other point file, or a reference shape), aligns
them, and reports for every measured point its signed normal deviation from the
design (positive where there is material outside the design), its tolerance zone
and whether it is in or out; per zone and overall the RMS, range, points out and
worst points with their file and line; the verdict; the differences in chord,
twist, thickness, camber, leading-edge radius and trailing edge; and what the
deviations do to lift and moment: the design and the measured section through
the vortex-panel and thin-aerofoil stages (child processes), ΔCl(α), ΔCm and
Δα_L0.

Design: --design naca4:2412 (naca4:2412:sharp for the closed trailing edge),
karman-trefftz:XC,YC,TE_DEG, or a file. A design in chord units is placed with
--chord (the measurement's units), --twist (degrees, nose-up) and --offset X,Y
(the leading edge); what is not given comes from the section document's frame,
else from the measured section. A design in part units is taken as it is.

Alignment (--align): best-fit (least squares; the scale is locked when the
design's chord is known, free otherwise or with --scale free), min-zone (the
placement with the smallest worst deviation, or worst use of its zone: the
evaluation a profile-of-a-line tolerance of ISO 1101 implies), datum
(--datum le-te: the measured leading edge on the design's and the chord lines
along each other; --datum nominal: the part measured in its fixture frame, the
design at its nominal placement), as-is.

Tolerance: --tolerance 0.05 (±0.05) or +0.05/-0.02, in the measurement's units,
for every point no zone takes; --zone name=nose,x=0:0.05,tol=0.02 (repeatable;
surface=upper|lower; the first zone that holds a point applies).

Exit status: 0 when every point is within its tolerance (or none was given),
3 when the comparison ran and a point is out of tolerance, 1 when processing
failed, 2 on bad usage or unreadable input.

The aerodynamic differences are inviscid estimates: check them against test
data before relying on them.`,
		Example: `  foilwright compare examples/tunnel-model/probe.csv --design naca4:2412 --chord 200 \
      --tolerance 0.05 --zone name=nose,x=0:0.05,tol=0.02
  foilwright compare r700.json --design design/r700.dat --design-units chord --chord 118.02 \
      --twist 9.53 --offset -35.4,5.89 --align datum --datum nominal --tolerance 0.3 --plot r700.svg
  foilwright compare part.csv --design drawing.dxf --align min-zone --tolerance +0.1/-0.05 --json`,
		Args:              cobra.MinimumNArgs(1),
		ValidArgsFunction: pointFileArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			return runCompare(cmd, args, opts)
		},
	}
	opts.prep.registerRead(cmd)
	opts.prep.registerShape(cmd)
	f := cmd.Flags()
	f.StringVar(&opts.design, "design", "", `the design: a file (section document, listing, DXF, ...) or a reference shape, "naca4:2412" or "karman-trefftz:XC,YC,TE_DEG"`)
	f.StringVar(&opts.designUnits, "design-units", "", "length unit of a design file that does not say: "+enum.Or(enum.Strings(geometry.Units())...))
	f.Float64Var(&opts.chord, "chord", 0, "the design's nominal chord, in the measurement's units (a design in chord units)")
	f.Float64Var(&opts.twist, "twist", 0, "the design's nominal twist, degrees nose-up (a design in chord units)")
	f.StringVar(&opts.offset, "offset", "", "the design's nominal leading edge X,Y, in the measurement's units (a design in chord units)")
	f.StringVar(&opts.align, "align", compare.AlignBestFit, "alignment: "+enum.Help(compare.Alignments()))
	f.StringVar(&opts.datum, "datum", compare.DatumLETE, "datum of --align datum: "+enum.Help(compare.Datums()))
	f.StringVar(&opts.scale, "scale", "", "scale of the fit: locked or free (default: locked when the design's chord is known)")
	f.StringVar(&opts.tolerance, "tolerance", "", `tolerance of every point no zone takes, in the measurement's units: "0.05" (±0.05) or "+0.05/-0.02"`)
	f.StringArrayVar(&opts.zones, "zone", nil, `a tolerance zone, "name=nose,x=0:0.05,tol=0.02" (keys name, x=FROM:TO in x/c of the design, surface=both|upper|lower, tol); repeatable, the first that holds a point applies`)
	f.StringVar(&opts.alpha, "alpha", "-4:8:2", `angles of attack of the aerodynamic comparison (degrees): "a,b,c" or "start:stop:step"`)
	f.Float64Var(&opts.cpAlpha, "cp-alpha", 4, "angle of attack (degrees) of the ΔCp picture and figures: the nearest of --alpha")
	f.BoolVar(&opts.noAero, "no-aero", false, "skip the aerodynamic comparison (no stage processes)")
	jsonFlag(cmd, &opts.json, "print the report (JSON, foilwright.compare/1) on standard output in place of the summary")
	outputFlag(cmd, &opts.out, "write the report (JSON, foilwright.compare/1) to this file (- for standard output; the summary then goes to standard error)", "json")
	f.StringVar(&opts.points, "points", "", "write every point's deviation to this CSV file (- for standard output)")
	f.StringVar(&opts.plot, "plot", "", "draw the design with the deviations to this .svg or .png file, and beside it the deviation along the outline (-deviation) and ΔCp (-dcp)")
	opts.magnify = wordFloat{word: "auto", min: 0, open: true, kind: "factor"}
	f.Var(&opts.magnify, "magnify", "factor the deviations are drawn at on the outline picture (auto: a round factor that draws the largest at about 6 % of the chord)")
	f.StringVar(&opts.name, "name", "", "name of the measured section (default: the first file's name)")
	quietFlag(cmd, &opts.quiet, "print no summary")
	opts.host.register(cmd)
	cmd.MarkFlagRequired("design")
	cmd.MarkFlagFilename("points", "csv")
	cmd.RegisterFlagCompletionFunc("design", func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
		return []string{compare.ShapeNACA4 + ":", compare.ShapeKarmanTrefftz + ":"}, cobra.ShellCompDirectiveDefault // a shape, or a file
	})
	for _, name := range []string{"chord", "twist", "offset", "cp-alpha", "magnify", "name"} {
		cmd.RegisterFlagCompletionFunc(name, noFiles)
	}
	cmd.RegisterFlagCompletionFunc("tolerance", fixedCompletions("0.05", "+0.05/-0.02"))
	cmd.RegisterFlagCompletionFunc("zone", fixedCompletions("name=nose,x=0:0.05,tol=0.02", "name=te,x=0.9:1,surface=upper,tol=+0.1/-0.05"))
	cmd.RegisterFlagCompletionFunc("alpha", fixedCompletions("-4:8:2", "0,4,8"))
	cmd.MarkFlagFilename("plot", "svg", "png")
	cmd.RegisterFlagCompletionFunc("align", fixedCompletions(enum.Names(compare.Alignments())...))
	cmd.RegisterFlagCompletionFunc("datum", fixedCompletions(enum.Names(compare.Datums())...))
	cmd.RegisterFlagCompletionFunc("scale", fixedCompletions(compare.ScaleLocked, compare.ScaleFree))
	cmd.RegisterFlagCompletionFunc("design-units", fixedCompletions(enum.Strings(geometry.Units())...))
	return cmd
}

// toleranceError is the outcome "measured fine, out of tolerance": the
// command exits with status 3.
type toleranceError struct{ msg string }

func (e *toleranceError) Error() string { return e.msg }

func runCompare(cmd *cobra.Command, args []string, opts compareOptions) error {
	stdout, stderr := cmd.OutOrStdout(), cmd.ErrOrStderr()
	fl := cmd.Flags()
	copts, spec, err := opts.parse(fl)
	if err != nil {
		return err
	}
	var alphas []float64
	if !opts.noAero {
		if alphas, err = builtin.ParseAngles(opts.alpha); err != nil {
			return badInputf("--alpha %q: %v", opts.alpha, err)
		}
	}
	jsonTo := ""
	if opts.json {
		jsonTo = stdoutPath
	}
	if err := oneStdout("--output", opts.out, "--points", opts.points, "--json", jsonTo); err != nil {
		return err
	}
	if err := fileOnly("--plot", opts.plot); err != nil {
		return err
	}
	if opts.plot != "" {
		if _, err := plot.FormatOf(opts.plot); err != nil {
			return badInputf("--plot %s: %v", opts.plot, err)
		}
	}
	settings, err := opts.prep.settings(cmd)
	if err != nil {
		return err
	}
	// Every output is checked before any work, and written as one.
	out, err := newOutputs(stdout, compareTargets(opts)...)
	if err != nil {
		return err
	}
	defer out.abort()
	files, err := inputFiles(cmd, args)
	if err != nil {
		return err
	}
	meas, err := measurement(files, args, opts.name, settings)
	if err != nil {
		return err
	}
	if !compare.IsShape(opts.design) {
		data, _, err := readInput(cmd, opts.design)
		if err != nil {
			return err
		}
		spec.Data = data
	}
	d, err := compare.NewDesign(spec, meas, compare.PanelOptions(meas.Section, settings), compare.PropsOptions(settings))
	if errors.Is(err, prep.ErrNoUnits) {
		return badInputf("design %v: say it with --design-units", err)
	}
	if err != nil {
		return badInput(err)
	}
	c, err := compare.Compare(meas, d, copts)
	if err != nil {
		if errors.Is(err, compare.ErrOptions) || errors.Is(err, compare.ErrTolerance) {
			return badInput(err)
		}
		return err
	}
	if !opts.noAero {
		lim, err := limitsOf(cmd)
		if err != nil {
			return err
		}
		if err := compareAero(cmd.Context(), c, opts, alphas, stderr, lim); err != nil {
			return err
		}
	}
	if err := writeCompare(stdout, out, c, opts); err != nil {
		return err
	}
	if !opts.quiet {
		summary := stdout
		if opts.json || opts.out == stdoutPath || opts.points == stdoutPath {
			summary = stderr
		}
		c.Report.WriteSummary(summary)
		for _, w := range []string{opts.out, opts.points, opts.plot} {
			wrote(summary, w)
		}
	}
	if r := c.Report; r.Verdict == compare.VerdictFail {
		return &toleranceError{fmt.Sprintf("%s: out of tolerance: %d of %d point(s) outside their band", r.Name, r.PointsOut, r.Deviation.Points)}
	}
	return nil
}

// parse turns the compare flags into options and the design's spec.
func (o compareOptions) parse(fl *pflag.FlagSet) (compare.Options, compare.DesignSpec, error) {
	copts := compare.Options{Align: o.align, Datum: o.datum, Scale: o.scale}
	if !enum.Has(compare.Alignments(), o.align) {
		return copts, compare.DesignSpec{}, badInputf("--align %q: want %s", o.align, enum.Or(enum.Names(compare.Alignments())...))
	}
	if !enum.Has(compare.Datums(), o.datum) {
		return copts, compare.DesignSpec{}, badInputf("--datum %q: want %s", o.datum, enum.Or(enum.Names(compare.Datums())...))
	}
	if o.scale != "" && o.scale != compare.ScaleLocked && o.scale != compare.ScaleFree {
		return copts, compare.DesignSpec{}, badInputf("--scale %q: want %s or %s", o.scale, compare.ScaleLocked, compare.ScaleFree)
	}
	if o.tolerance != "" {
		b, err := compare.ParseBand(o.tolerance)
		if err != nil {
			return copts, compare.DesignSpec{}, badInputf("--tolerance: %v", err)
		}
		copts.Tolerance.Default = &b
	}
	for _, z := range o.zones {
		zone, err := compare.ParseZone(z)
		if err != nil {
			return copts, compare.DesignSpec{}, badInputf("--zone: %v", err)
		}
		copts.Tolerance.Zones = append(copts.Tolerance.Zones, zone)
	}
	spec := compare.DesignSpec{Source: strings.TrimSpace(o.design), Units: o.designUnits}
	if spec.Source == "" {
		return copts, spec, badInputf("--design: give a file or a reference shape")
	}
	if o.designUnits != "" {
		if _, err := geometry.ParseUnit(o.designUnits); err != nil {
			return copts, spec, badInputf("--design-units: %v", err)
		}
	}
	if fl.Changed("chord") {
		if !(o.chord > 0) || math.IsInf(o.chord, 0) {
			return copts, spec, badInputf("--chord %g: want a positive length", o.chord)
		}
		spec.Chord = &o.chord
	}
	if fl.Changed("twist") {
		if math.IsNaN(o.twist) || math.Abs(o.twist) > 360 {
			return copts, spec, badInputf("--twist %g: want degrees in [-360, 360]", o.twist)
		}
		spec.TwistDeg = &o.twist
	}
	if o.offset != "" {
		p, err := parsePair(o.offset)
		if err != nil {
			return copts, spec, badInputf("--offset %q: %v", o.offset, err)
		}
		spec.Offset = &p
	}
	return copts, spec, nil
}

// measurement makes the measured section of the files: a section
// document as it is, point files through the geometry chain.
func measurement(files []prep.File, args []string, name string, s prep.Settings) (*compare.Measurement, error) {
	if len(files) == 1 && compare.IsSectionDocument(files[0].Data) {
		sec, err := section.Read(bytes.NewReader(files[0].Data), files[0].Path)
		if err != nil {
			return nil, badInput(err)
		}
		if name != "" {
			sec.Name = name
		}
		m, err := compare.FromSection(sec, files[0].Path)
		if err != nil {
			return nil, badInput(err)
		}
		return m, nil
	}
	if name == "" {
		name = sectionName(args)
	}
	p, err := prep.Prepare(name, files, s)
	if err != nil {
		return nil, chainError(err)
	}
	return compare.FromPreparation(p), nil
}

// compareAero runs the aerodynamic comparison through stage processes.
func compareAero(ctx context.Context, c *compare.Comparison, opts compareOptions, alphas []float64, stderr io.Writer, lim limits.Limits) error {
	h, err := opts.host.newHost(stderr, lim)
	if err != nil {
		return err
	}
	defer h.Close()
	runners := map[string]*host.Runner{}
	run := func(ctx context.Context, name string, sec, params []byte) ([]byte, error) {
		r, ok := runners[name]
		if !ok {
			r = h.Runner(host.Builtin(name))
			runners[name] = r
		}
		reply, err := r.Run(ctx, stage.Request{Section: sec, Params: params, SectionName: c.Measurement.Name})
		if err != nil {
			return nil, stageError(err)
		}
		// The comparison reads foilwright.result/1; a stage may answer
		// packed (no JSON) or in /2.
		return reply.Result.DocumentV1()
	}
	if err := c.Aero(ctx, run, compare.AeroOptions{AlphaDeg: alphas, CpAlphaDeg: opts.cpAlpha}); err != nil {
		return fmt.Errorf("aerodynamic comparison: %w", err)
	}
	return nil
}

// compareTargets are the files compare writes: the report, the points and
// the pictures.
func compareTargets(opts compareOptions) []string {
	ts := []string{opts.out, opts.points}
	if opts.plot != "" {
		for _, name := range compare.PictureNames {
			ts = append(ts, compare.SiblingPath(opts.plot, name))
		}
	}
	return ts
}

// writeCompare writes the outputs as one set (pictures, the points, the
// report: all or none), and the report on standard output with --json.
func writeCompare(stdout io.Writer, out *outputs, c *compare.Comparison, opts compareOptions) error {
	if opts.plot != "" {
		magnify := 0.0 // a round factor
		if m := opts.magnify.ptr(); m != nil {
			magnify = *m
		}
		figs, err := c.Figures(magnify)
		if err != nil {
			return err
		}
		for _, name := range compare.PictureNames {
			if f, ok := figs[name]; ok {
				if err := out.picture(f, compare.SiblingPath(opts.plot, name)); err != nil {
					return err
				}
			}
		}
	}
	if opts.points != "" {
		if err := out.write(opts.points, c.WriteCSV); err != nil {
			return err
		}
	}
	if opts.out != "" {
		if err := out.write(opts.out, c.Report.WriteJSON); err != nil {
			return err
		}
	}
	if err := out.commit(); err != nil {
		return err
	}
	if opts.json && opts.out != stdoutPath {
		return c.Report.WriteJSON(stdout)
	}
	return nil
}
