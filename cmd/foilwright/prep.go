package main

import (
	"fmt"
	"io"
	"os"
	"runtime/debug"

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
	json  bool
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
its file and line.

Outputs: -o writes the section document (- for standard output); without -o it
goes to standard output when that is a pipe or a file, and is not written on a
terminal. The summary goes to standard output unless a document does, then to
standard error. FILE "-" reads standard input.`,
		Example: `  foilwright prep examples/tunnel-model/probe.csv -o section.json
  foilwright prep blade-scan.stl --units mm --cut z=700 --panels 200 -o r700.json --nodes r700.dat
  foilwright prep section.dxf --noise 0.01 --te-thickness 0.3mm --plot prep.svg -o section.json
  foilwright prep probe.csv -q | foilwright analyze -`,
		Args:              cobra.MinimumNArgs(1),
		ValidArgsFunction: pointFileArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			s, err := opts.flags.settings(cmd)
			if err != nil {
				return err
			}
			if err := opts.check(cmd.OutOrStdout()); err != nil {
				return err
			}
			// Refuse an output that may not be written before any work.
			if err := atomicfile.CheckTargets(prepTargets(opts)...); err != nil {
				return err
			}
			files, err := inputFiles(cmd, args)
			if err != nil {
				return err
			}
			if small(files, os.LookupEnv) {
				defer debug.SetGCPercent(debug.SetGCPercent(smallGCPercent))
			}
			name := opts.name
			if name == "" {
				name = sectionName(args)
			}
			p, err := prep.Prepare(name, files, s)
			if err != nil {
				return chainError(err)
			}
			return writePrep(cmd.OutOrStdout(), cmd.ErrOrStderr(), p, opts)
		},
	}
	opts.flags.registerRead(cmd)
	opts.flags.registerShape(cmd)
	f := cmd.Flags()
	outputFlag(cmd, &opts.out, "write the section document to this file (- for standard output; default: standard output unless it is a terminal)", "json")
	f.StringVar(&opts.nodes, "nodes", "", "also write the plain node listing (name line, then x y) to this file (- for standard output)")
	f.StringVar(&opts.name, "name", "", "name of the section (default: the first file's name)")
	f.StringVar(&opts.plot, "plot", "", "draw the preparation to this .svg or .png file, and the deviation, nodes and section beside it (FILE-deviation.svg, ...)")
	quietFlag(cmd, &opts.quiet, "print no summary")
	jsonFlag(cmd, &opts.json, "print the section document on standard output in place of the summary")
	cmd.MarkFlagFilename("nodes", "dat", "txt")
	cmd.MarkFlagFilename("plot", "svg", "png")
	cmd.RegisterFlagCompletionFunc("name", noFiles)
	return cmd
}

// check checks the outputs before any work is done, and settles where the
// section document goes when -o is not given.
func (o *prepOptions) check(stdout io.Writer) error {
	if err := fileOnly("--plot", o.plot); err != nil {
		return err
	}
	if o.plot != "" {
		if _, err := plot.FormatOf(o.plot); err != nil {
			return badInputf("--plot %s: %v", o.plot, err)
		}
	}
	if o.json && o.nodes == stdoutPath {
		return badInputf("--json and --nodes - both write to standard output: give --nodes a file")
	}
	if o.out == "" && !o.json && o.nodes != stdoutPath && !isTerminal(stdout) {
		o.out = stdoutPath
	}
	return oneStdout("--output", o.out, "--nodes", o.nodes)
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
// listing, the section document: all or none, see outputs), and the
// summary: on standard output unless a document went there, then on
// standard error.
func writePrep(stdout, stderr io.Writer, p *prep.Preparation, opts prepOptions) error {
	out, err := newOutputs(stdout, prepTargets(opts)...)
	if err != nil {
		return err
	}
	defer out.abort()
	var written []string
	if opts.plot != "" {
		paths, err := writePrepPlots(out, opts.plot, p)
		if err != nil {
			return err
		}
		written = append(written, paths...)
	}
	if opts.nodes != "" {
		if err := out.write(opts.nodes, func(w io.Writer) error {
			return pointfile.WriteNodes(w, p.Section.Name, p.Section.Nodes)
		}); err != nil {
			return err
		}
		written = append(written, opts.nodes)
	}
	if opts.out != "" {
		if err := out.write(opts.out, func(w io.Writer) error { return section.Write(w, p.Section) }); err != nil {
			return err
		}
		written = append(written, opts.out)
	}
	if err := out.commit(); err != nil {
		return err
	}
	if opts.json && opts.out != stdoutPath {
		if err := section.Write(stdout, p.Section); err != nil {
			return err
		}
	}
	if opts.quiet {
		return nil
	}
	summary := stdout
	if opts.json || opts.out == stdoutPath || opts.nodes == stdoutPath {
		summary = stderr
	}
	if !opts.json {
		p.WriteSummary(summary)
	}
	for _, path := range written {
		wrote(summary, path)
	}
	if opts.out == "" && !opts.json {
		fmt.Fprintln(stderr, "note: the section document was not written; give -o FILE (or -o - for standard output)")
	}
	return nil
}

// writePrepPlots draws the preparation pictures to path (its extension
// chooses SVG or PNG) and to siblings named path-deviation, path-nodes and
// path-section, into out, and returns their paths.
func writePrepPlots(out *outputs, path string, p *prep.Preparation) ([]string, error) {
	figs, err := p.PrepFigures()
	if err != nil {
		return nil, err
	}
	var paths []string
	for _, name := range prep.PlotNames {
		to := prep.SiblingPath(path, name)
		if err := out.picture(figs[name], to); err != nil {
			return nil, err
		}
		paths = append(paths, to)
	}
	return paths, nil
}

// smallGCPercent is the garbage collector's target while prep runs the
// chain on a small input (smallInput bytes at most, some 200 000 points of
// delimited text) unless the environment sets GOGC: the heap may grow to
// five times what is live before a collection. The chain allocates many
// times its live heap in short-lived work (fits, tables, scratch), about
// 48 MB on a 10 000-point scan whose live heap stays under 8 MB, so at
// Go's default of 100 it collected nine or ten times in a run; at 400,
// twice, for about a tenth less processor time and a heap some 20 MB
// larger (GODEBUG=gctrace=1; task-clock of interleaved runs). Larger inputs keep the default,
// whose peak memory is bounded (issue 14: a million points under
// 600 MiB).
const smallGCPercent = 400

// smallInput is the largest input, in bytes over all files, that prep
// runs at smallGCPercent.
const smallInput = 4 << 20

// small reports whether prep runs the chain on files at smallGCPercent:
// a small input, and an environment (looked up by env) that does not set
// GOGC, which the runtime has read.
func small(files []prep.File, env func(string) (string, bool)) bool {
	if _, set := env("GOGC"); set {
		return false
	}
	total := 0
	for _, f := range files {
		total += len(f.Data)
	}
	return total <= smallInput
}
