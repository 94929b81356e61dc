package main

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/pointfile"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/plot"
	"github.com/foilwright/foilwright/prep"
	"github.com/foilwright/foilwright/repanel"
)

// shapeOptions are the flags every analytic shape has.
type shapeOptions struct {
	panels   panelsValue
	panelTol float64
	out      string
	nodes    string
	plot     string
	quiet    bool
	json     bool
}

// register adds the flags every shape has to cmd, its own flags.
func (o *shapeOptions) register(cmd *cobra.Command) {
	f := cmd.Flags()
	f.Var(&o.panels, "panels", fmt.Sprintf("number of panels, 16 to 2000 (nodes = panels + 1), or auto: the fewest (%d to %d) within --panel-tol of the exact section", repanel.AutoMinPanels, repanel.AutoMaxPanels))
	f.Float64Var(&o.panelTol, "panel-tol", repanel.DefaultTolerance, "for --panels auto: the largest distance between a panel and the exact section (chord units)")
	outputFlag(cmd, &o.out, "write the section document to this file (- for standard output; default: standard output unless it is a terminal)", "json")
	f.StringVar(&o.nodes, "nodes", "", "also write the plain node listing (name line, then x y) to this file (- for standard output)")
	f.StringVar(&o.plot, "plot", "", "draw the section, its camber line and thickness to this .svg or .png file")
	quietFlag(cmd, &o.quiet, "print no summary")
	jsonFlag(cmd, &o.json, "print the section document on standard output in place of the summary")
	cmd.MarkFlagFilename("nodes", "dat", "txt")
	cmd.MarkFlagFilename("plot", "svg", "png")
	cmd.RegisterFlagCompletionFunc("panels", fixedCompletions("auto", "100", "200", "400"))
	cmd.RegisterFlagCompletionFunc("panel-tol", fixedCompletions("1e-4", "5e-5", "2e-5"))
}

// options returns the panel options of the flags.
func (o *shapeOptions) options(cmd *cobra.Command) (repanel.Options, error) {
	po := repanel.Options{Panels: o.panels.n}
	if cmd.Flags().Changed("panel-tol") {
		if !(o.panelTol > 0) || o.panelTol >= 0.1 {
			return po, badInputf("--panel-tol %g: want a positive length below 0.1 (chord units)", o.panelTol)
		}
		po.Tolerance = o.panelTol
	}
	if err := fileOnly("--plot", o.plot); err != nil {
		return po, err
	}
	if o.plot != "" {
		if _, err := plot.FormatOf(o.plot); err != nil {
			return po, badInputf("--plot %s: %v", o.plot, err)
		}
	}
	if o.json && o.nodes == stdoutPath {
		return po, badInputf("--json and --nodes - both write to standard output: give --nodes a file")
	}
	if o.out == "" && !o.json && o.nodes != stdoutPath && !isTerminal(cmd.OutOrStdout()) {
		o.out = stdoutPath
	}
	return po, oneStdout("--output", o.out, "--nodes", o.nodes)
}

func newShapeCmd() *cobra.Command {
	cmd := &cobra.Command{
		Use:   "shape KIND ...",
		Short: "Write analytic reference sections as section documents",
		Long: `shape writes sections defined by published equations, normalised to unit chord,
as section documents: for tests, demos and as references for measured parts.`,
	}
	cmd.AddCommand(newShapeNACA4Cmd(), newShapeKarmanTrefftzCmd())
	return cmd
}

func newShapeNACA4Cmd() *cobra.Command {
	var opts shapeOptions
	var sharp bool
	cmd := &cobra.Command{
		Use:   "naca4 CODE",
		Short: "A NACA 4-digit section (NACA Report 824 equations)",
		Long: `naca4 writes a NACA 4-digit section from the equations of NACA Report 824,
with cosine spacing in x on each surface and a node at the leading edge. The
standard equations leave the trailing edge open (thickness 0.0105·t); --sharp
uses the variant that closes it.`,
		Example: `  foilwright shape naca4 2412 -o naca2412.json
  foilwright shape naca4 0012 --sharp --panels 200 --nodes naca0012.dat -o naca0012.json`,
		Args: cobra.ExactArgs(1),
		ValidArgsFunction: func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
			return []string{"0012", "2412", "4412", "4415"}, cobra.ShellCompDirectiveNoFileComp
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			foil, err := shape.ParseNACA4(args[0])
			if err != nil {
				return badInput(err)
			}
			foil.SharpTE = sharp
			po, err := opts.options(cmd)
			if err != nil {
				return err
			}
			s, err := prep.NACA4Section(foil, po)
			if err != nil {
				return badInput(err)
			}
			return writeShape(cmd.OutOrStdout(), cmd.ErrOrStderr(), &opts, s)
		},
	}
	opts.register(cmd)
	cmd.Flags().BoolVar(&sharp, "sharp", false, "close the trailing edge (coefficient 0.1036 instead of 0.1015)")
	return cmd
}

func newShapeKarmanTrefftzCmd() *cobra.Command {
	var opts shapeOptions
	var centre string
	var teAngle float64
	cmd := &cobra.Command{
		Use:     "karman-trefftz",
		Aliases: []string{"kt"},
		Short:   "A Kármán–Trefftz section, whose potential flow is known exactly",
		Long: `karman-trefftz writes the image of a circle under the Kármán–Trefftz map
(Milne-Thomson, Theoretical Hydrodynamics, ch. 7), normalised to unit chord. The
circle passes through ζ = 1; its centre (--centre, in the ζ-plane) sets the
thickness (negative x) and camber (positive y); --te-angle sets the included
trailing-edge angle (0 gives a Joukowski section with a cusp). Nodes are equally
spaced in the circle angle, which clusters them at both edges.`,
		Example: "  foilwright shape karman-trefftz --centre -0.08,0.06 --te-angle 12 -o kt.json",
		Args:    cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			c, err := parsePair(centre)
			if err != nil {
				return badInputf("--centre %q: %v", centre, err)
			}
			po, err := opts.options(cmd)
			if err != nil {
				return err
			}
			s, err := prep.KarmanTrefftzSection(c, teAngle, po)
			if err != nil {
				return badInput(err)
			}
			return writeShape(cmd.OutOrStdout(), cmd.ErrOrStderr(), &opts, s)
		},
	}
	opts.register(cmd)
	cmd.Flags().StringVar(&centre, "centre", "-0.08,0.06", "circle centre X,Y in the mapping plane (circle through 1, 0)")
	cmd.Flags().Float64Var(&teAngle, "te-angle", 10, "included trailing-edge angle (degrees, 0 to 180)")
	cmd.RegisterFlagCompletionFunc("centre", fixedCompletions("-0.08,0.06", "-0.1,0", "-0.1,0.1"))
	cmd.RegisterFlagCompletionFunc("te-angle", fixedCompletions("0", "10", "20"))
	return cmd
}

// parsePair parses "X,Y".
func parsePair(s string) (geometry.Point, error) {
	parts := strings.Split(s, ",")
	if len(parts) != 2 {
		return geometry.Point{}, fmt.Errorf("want X,Y")
	}
	var v [2]float64
	for i, f := range parts {
		x, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
			return geometry.Point{}, fmt.Errorf("%q is not a finite number", f)
		}
		v[i] = x
	}
	return geometry.Point{X: v[0], Y: v[1]}, nil
}

// writeShape writes the section document and, if asked, the node listing
// and the picture, and the summary: on standard output unless a document
// went there, then on standard error.
func writeShape(stdout, stderr io.Writer, opts *shapeOptions, s *section.Section) error {
	out, err := newOutputs(stdout, opts.out, opts.nodes, opts.plot)
	if err != nil {
		return err
	}
	defer out.abort()
	pd, err := prep.NodeProperties(s)
	if err != nil {
		return err
	}
	var written []string
	if opts.plot != "" {
		f, err := plot.SectionPlot(pd)
		if err != nil {
			return err
		}
		if err := out.picture(f, opts.plot); err != nil {
			return err
		}
		written = append(written, opts.plot)
	}
	if opts.nodes != "" {
		name := strings.TrimSpace(s.Name)
		if err := out.write(opts.nodes, func(w io.Writer) error { return pointfile.WriteNodes(w, name, s.Nodes) }); err != nil {
			return err
		}
		written = append(written, opts.nodes)
	}
	if opts.out != "" {
		if err := out.write(opts.out, func(w io.Writer) error { return section.Write(w, s) }); err != nil {
			return err
		}
		written = append(written, opts.out)
	}
	if err := out.commit(); err != nil {
		return err
	}
	if opts.json && opts.out != stdoutPath {
		if err := section.Write(stdout, s); err != nil {
			return err
		}
	}
	if opts.quiet {
		return nil
	}
	w := stdout
	if opts.json || opts.out == stdoutPath || opts.nodes == stdoutPath {
		w = stderr
	}
	if !opts.json {
		fmt.Fprintf(w, "%s: section in chord units, %d nodes\n", s.Name, len(s.Nodes))
		prep.WriteSectionReport(w, s, "", "")
	}
	for _, p := range written {
		wrote(w, p)
	}
	if opts.out == "" && !opts.json {
		fmt.Fprintln(stderr, "note: the section document was not written; give -o FILE (or -o - for standard output)")
	}
	return nil
}
