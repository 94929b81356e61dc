package main

import (
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"github.com/foilwright/foilwright/geometry/pointfile"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/internal/atomicfile"
	"github.com/foilwright/foilwright/plot"
	"github.com/foilwright/foilwright/prep"
)

type prepOptions struct {
	flags prepFlags
	out   string
	nodes string
	name  string
	plot  string
	quiet bool
}

func newPrepCmd() *cobra.Command {
	var opts prepOptions
	cmd := &cobra.Command{
		Use:   "prep FILE... [flags]",
		Short: "Turn measured or exported points into a clean, normalised, repanelled section",
		Long: `prep runs the whole geometry chain on the points of one section: it reads the
files (delimited text, coordinate listings, DXF, STL cut by a plane), flattens 3D
points onto their plane, merges duplicates, orders the points into a loop, drops
gross outliers, fits a smoothing spline, finds the trailing and leading edge,
normalises to unit chord with the leading edge at (0, 0), repanels, and computes
the section's properties. It writes the section document and prints a summary:
how far the curve departs from the kept points, how the section maps back to the
part (chord, twist, leading edge, mirroring), and every point it dropped, with
its file and line.`,
		Example: `  foilwright prep examples/tunnel-model/probe.csv -o section.json
  foilwright prep blade-scan.stl --units mm --cut z=700 --panels 200 -o r700.json --nodes r700.dat
  foilwright prep section.dxf --noise 0.01 --te close --plot prep.svg -o section.json`,
		Args: cobra.MinimumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			s, err := opts.flags.settings(cmd.Flags())
			if err != nil {
				return err
			}
			files, err := inputFiles(cmd, args)
			if err != nil {
				return err
			}
			name := opts.name
			if name == "" {
				name = sectionName(args)
			}
			// Refuse an output that may not be written before any work.
			if err := atomicfile.CheckTargets(prepTargets(opts)...); err != nil {
				return err
			}
			p, err := prep.Prepare(name, files, s)
			if err != nil {
				return badInput(err)
			}
			return writePrep(cmd.OutOrStdout(), cmd.ErrOrStderr(), p, opts)
		},
	}
	opts.flags.registerRead(cmd.Flags())
	opts.flags.registerShape(cmd)
	f := cmd.Flags()
	f.StringVarP(&opts.out, "out", "o", "-", "section document to write (- for stdout; the summary then goes to stderr)")
	f.StringVar(&opts.nodes, "nodes", "", "also write the plain node listing (name line, then x y) to this file")
	f.StringVar(&opts.name, "name", "", "name of the section (default: the first file's name)")
	f.StringVar(&opts.plot, "plot", "", "draw the preparation to this .svg or .png file, and the deviation, nodes and section beside it")
	f.BoolVarP(&opts.quiet, "quiet", "q", false, "print no summary")
	cmd.MarkFlagFilename("out", "json")
	cmd.MarkFlagFilename("plot", "svg", "png")
	return cmd
}

// prepTargets are the files prep writes: the section, the node listing
// and the pictures.
func prepTargets(opts prepOptions) []string {
	ts := []string{opts.out, opts.nodes}
	if opts.plot != "" {
		for _, name := range prep.PlotNames {
			ts = append(ts, prep.SiblingPath(opts.plot, name))
		}
	}
	return ts
}

// writePrep writes the outputs of a preparation as one set (plots, the node
// listing, the section document: all or none), and the summary.
func writePrep(stdout, stderr io.Writer, p *prep.Preparation, opts prepOptions) error {
	out, err := newOutputs(stdout, prepTargets(opts)...)
	if err != nil {
		return err
	}
	defer out.abort()
	if opts.plot != "" {
		if err := writePrepPlots(out, opts.plot, p); err != nil {
			return err
		}
	}
	if opts.nodes != "" {
		if err := out.write(opts.nodes, func(w io.Writer) error {
			return pointfile.WriteNodes(w, p.Section.Name, p.Section.Nodes)
		}); err != nil {
			return err
		}
	}
	if err := out.write(opts.out, func(w io.Writer) error { return section.Write(w, p.Section) }); err != nil {
		return err
	}
	if err := out.commit(); err != nil {
		return err
	}
	if opts.quiet {
		return nil
	}
	summary := stdout
	if opts.out == "-" || opts.out == "" {
		summary = stderr
	}
	p.WriteSummary(summary)
	if opts.out != "-" && opts.out != "" {
		fmt.Fprintf(summary, "wrote %s\n", opts.out)
	}
	return nil
}

// writePrepPlots draws the preparation pictures to path (its extension
// chooses SVG or PNG) and to siblings named path-deviation, path-nodes and
// path-section.
func writePrepPlots(out *outputs, path string, p *prep.Preparation) error {
	if _, err := plot.FormatOf(path); err != nil {
		return badInputf("--plot %s: %v", path, err)
	}
	figs, err := p.PrepFigures()
	if err != nil {
		return err
	}
	for _, name := range prep.PlotNames {
		if err := out.picture(figs[name], prep.SiblingPath(path, name)); err != nil {
			return err
		}
	}
	return nil
}
