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
)

// shapeOptions are the flags shared by the analytic shapes.
type shapeOptions struct {
	panels int
	out    string
	nodes  string
	plot   string
}

func newShapeCmd() *cobra.Command {
	var opts shapeOptions
	cmd := &cobra.Command{
		Use:   "shape KIND ...",
		Short: "Write analytic reference sections as section documents",
		Long: `shape writes sections defined by published equations, normalised to unit chord,
as section documents: for tests, demos and as references for measured parts.`,
	}
	cmd.PersistentFlags().IntVar(&opts.panels, "panels", 160, "number of panels (nodes = panels + 1), 16 to 2000")
	cmd.PersistentFlags().StringVarP(&opts.out, "out", "o", "-", "section document to write (- for stdout)")
	cmd.PersistentFlags().StringVar(&opts.nodes, "nodes", "", "also write the plain node listing (name line, then x y) to this file")
	cmd.PersistentFlags().StringVar(&opts.plot, "plot", "", "draw the section, its camber line and thickness to this .svg or .png file")
	cmd.AddCommand(newShapeNACA4Cmd(&opts), newShapeKarmanTrefftzCmd(&opts))
	return cmd
}

func newShapeNACA4Cmd(opts *shapeOptions) *cobra.Command {
	var sharp bool
	cmd := &cobra.Command{
		Use:   "naca4 CODE",
		Short: "A NACA 4-digit section (NACA Report 824 equations)",
		Long: `naca4 writes a NACA 4-digit section from the equations of NACA Report 824,
with cosine spacing in x on each surface and a node at the leading edge. The
standard equations leave the trailing edge open (thickness 0.0105·t); --sharp
uses the variant that closes it.`,
		Example: "  foilwright shape naca4 2412 --panels 160 -o naca2412.json\n  foilwright shape naca4 0012 --sharp --nodes naca0012.dat",
		Args:    cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			foil, err := shape.ParseNACA4(args[0])
			if err != nil {
				return badInput(err)
			}
			foil.SharpTE = sharp
			if err := checkPanels(opts.panels); err != nil {
				return err
			}
			s := prep.NACA4Section(foil, opts.panels)
			return writeShape(cmd.OutOrStdout(), opts, s)
		},
	}
	cmd.Flags().BoolVar(&sharp, "sharp", false, "close the trailing edge (coefficient 0.1036 instead of 0.1015)")
	return cmd
}

func newShapeKarmanTrefftzCmd(opts *shapeOptions) *cobra.Command {
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
			if err := checkPanels(opts.panels); err != nil {
				return err
			}
			s, err := prep.KarmanTrefftzSection(c, teAngle, opts.panels)
			if err != nil {
				return badInput(err)
			}
			return writeShape(cmd.OutOrStdout(), opts, s)
		},
	}
	cmd.Flags().StringVar(&centre, "centre", "-0.08,0.06", "circle centre X,Y in the mapping plane (circle through 1, 0)")
	cmd.Flags().Float64Var(&teAngle, "te-angle", 10, "included trailing-edge angle (degrees, 0 to 180)")
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

// checkPanels rejects a panel count outside 16 to 2000.
func checkPanels(n int) error {
	if n < 16 || n > 2000 {
		return badInputf("--panels %d: want 16 to 2000", n)
	}
	return nil
}

// writeShape writes the section document and, if asked, the node listing.
func writeShape(stdout io.Writer, opts *shapeOptions, s *section.Section) error {
	if opts.plot != "" {
		if _, err := plot.FormatOf(opts.plot); err != nil {
			return badInputf("--plot %s: %v", opts.plot, err)
		}
	}
	out, err := newOutputs(stdout, opts.out, opts.nodes, opts.plot)
	if err != nil {
		return err
	}
	defer out.abort()
	pd, err := prep.NodeProperties(s)
	if err != nil {
		return err
	}
	if opts.plot != "" {
		f, err := plot.SectionPlot(pd)
		if err != nil {
			return err
		}
		if err := out.picture(f, opts.plot); err != nil {
			return err
		}
	}
	if err := out.write(opts.out, func(w io.Writer) error { return section.Write(w, s) }); err != nil {
		return err
	}
	if opts.nodes != "" {
		name := strings.TrimSpace(s.Name)
		if err := out.write(opts.nodes, func(w io.Writer) error { return pointfile.WriteNodes(w, name, s.Nodes) }); err != nil {
			return err
		}
	}
	return out.commit()
}
