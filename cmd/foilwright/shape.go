package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/repanel"
)

// shapeOptions are the flags shared by the analytic shapes.
type shapeOptions struct {
	panels int
	out    string
	nodes  string
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
	cmd.AddCommand(newShapeNACA4Cmd(&opts))
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
			foil, err := geometry.ParseNACA4(args[0])
			if err != nil {
				return badInput(err)
			}
			foil.SharpTE = sharp
			if err := checkPanels(opts.panels); err != nil {
				return err
			}
			nodes := foil.Nodes(opts.panels)
			le := (opts.panels + 1) / 2
			kind, thick := "blunt", nodes[0].Dist(nodes[len(nodes)-1])
			if sharp {
				kind, thick = "sharp", 0
			}
			s := &geometry.Section{
				Format:       geometry.SectionFormat,
				Name:         "NACA " + foil.String(),
				Units:        geometry.ChordUnit,
				TrailingEdge: &geometry.TrailingEdge{Kind: kind, Thickness: thick, Action: "kept"},
				LEIndex:      &le,
				Nodes:        nodes,
			}
			setPanels(s, "cosine")
			return writeShape(cmd.OutOrStdout(), opts, s)
		},
	}
	cmd.Flags().BoolVar(&sharp, "sharp", false, "close the trailing edge (coefficient 0.1036 instead of 0.1015)")
	return cmd
}

// setPanels records the panel count, spacing law and quality of s.Nodes,
// and the quality warnings.
func setPanels(s *geometry.Section, spacing string) {
	q := repanel.Measure(s.Nodes)
	s.Panels = &geometry.PanelSummary{Count: len(s.Nodes) - 1, Spacing: spacing, MaxRatio: q.MaxRatio, MaxTurnDeg: q.MaxTurnDeg}
	s.Warnings = append(s.Warnings, q.Warnings...)
}

// checkPanels rejects a panel count outside 16 to 2000.
func checkPanels(n int) error {
	if n < 16 || n > 2000 {
		return badInputf("--panels %d: want 16 to 2000", n)
	}
	return nil
}

// writeShape writes the section document and, if asked, the node listing.
func writeShape(stdout io.Writer, opts *shapeOptions, s *geometry.Section) error {
	if err := writeOutput(stdout, opts.out, func(w io.Writer) error { return geometry.WriteSection(w, s) }); err != nil {
		return err
	}
	if opts.nodes != "" {
		name := strings.TrimSpace(s.Name)
		if err := writeOutput(stdout, opts.nodes, func(w io.Writer) error { return geometry.WriteNodes(w, name, s.Nodes) }); err != nil {
			return fmt.Errorf("write %s: %w", opts.nodes, err)
		}
	}
	return nil
}
