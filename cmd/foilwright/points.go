package main

import (
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"github.com/foilwright/foilwright/geometry/pointfile"
	"github.com/foilwright/foilwright/plot"
	"github.com/foilwright/foilwright/prep"
)

type pointsOptions struct {
	flags prepFlags
	out   string
	json  bool
	notes bool
	plot  string
	quiet bool
}

func newPointsCmd() *cobra.Command {
	var opts pointsOptions
	cmd := &cobra.Command{
		Use:   "points FILE... [flags]",
		Short: "Read, clean and order measured points into one closed contour",
		Long: `points runs the first half of the geometry chain: it reads the files, flattens
3D points onto their plane (reporting how flat they are), merges duplicates,
orders the points into closed loops, picks the section loop, drops gross
outliers, and starts the loop at the trailing edge, running over the upper
surface to the leading edge and back along the lower surface. It prints what it
made of the input (points read, lines skipped, merged, dropped with their lines
and reasons, loops found, flatness) and writes the ordered contour as CSV
(x,y,file,line) with -o, or as JSON with --json.

The report goes to standard output unless the contour does (-o -, or --json
without -o), then to standard error.`,
		Example: `  foilwright points examples/tunnel-model/probe.csv -o clean.csv
  foilwright points examples/rotor/blade-scan.stl --units mm --cut z=700 --json -o r700-contour.json`,
		Args:              cobra.MinimumNArgs(1),
		ValidArgsFunction: pointFileArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			s, err := opts.flags.settings(cmd)
			if err != nil {
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
			if opts.json && opts.out == "" {
				opts.out = stdoutPath
			}
			files, err := inputFiles(cmd, args)
			if err != nil {
				return err
			}
			cl, err := prep.ReadAndClean(files, s)
			if err != nil {
				return chainError(err)
			}
			return writePoints(cmd.OutOrStdout(), cmd.ErrOrStderr(), cl, opts)
		},
	}
	opts.flags.registerRead(cmd)
	outputFlag(cmd, &opts.out, "write the ordered contour to this file: CSV x,y,file,line, or JSON with --json (- for standard output)", "csv", "json")
	jsonFlag(cmd, &opts.json, "write the contour and the report as JSON (to standard output without -o)")
	quietFlag(cmd, &opts.quiet, "print no report")
	cmd.Flags().BoolVar(&opts.notes, "notes", false, "also list every skipped line")
	cmd.Flags().StringVar(&opts.plot, "plot", "", "draw the ordered contour and the dropped points to this .svg or .png file")
	cmd.MarkFlagFilename("plot", "svg", "png")
	return cmd
}

func writePoints(stdout, stderr io.Writer, cl *prep.Cleaned, opts pointsOptions) error {
	c := cl.Contour
	out, err := newOutputs(stdout, opts.out, opts.plot)
	if err != nil {
		return err
	}
	defer out.abort()
	var written []string
	if opts.plot != "" {
		f, err := plot.PrepPlot(cl.PlotData())
		if err != nil {
			return err
		}
		if err := out.picture(f, opts.plot); err != nil {
			return err
		}
		written = append(written, opts.plot)
	}
	switch {
	case opts.json:
		b, err := cl.ContourDocument()
		if err != nil {
			return err
		}
		if err := out.write(opts.out, func(w io.Writer) error { _, err := w.Write(b); return err }); err != nil {
			return err
		}
		written = append(written, opts.out)
	case opts.out != "":
		if err := out.write(opts.out, func(w io.Writer) error { return pointfile.WriteCSV(w, c.Points, c.Origins) }); err != nil {
			return err
		}
		written = append(written, opts.out)
	}
	if err := out.commit(); err != nil {
		return err
	}
	if opts.quiet {
		return nil
	}
	w := stdout
	if opts.out == stdoutPath {
		w = stderr
	}
	writePointsReport(w, cl, opts.notes)
	for _, p := range written {
		wrote(w, p)
	}
	return nil
}

// writePointsReport prints what the chain made of the files.
func writePointsReport(w io.Writer, cl *prep.Cleaned, allNotes bool) {
	u := cl.Units
	for i, c := range cl.Clouds {
		dim := "2D"
		if c.Dim == 3 {
			dim = "3D"
		}
		lines := 0
		for _, n := range c.Notes {
			if n.Origin.Line > 0 {
				lines++
			}
		}
		fmt.Fprintf(w, "%s: %s, %d %s points, %d line(s) skipped, units %s\n", cl.Files[i], c.Format, c.Len(), dim, lines, c.Units)
		if c.Columns != "" {
			fmt.Fprintf(w, "  columns read: %s\n", c.Columns)
		}
		for k, n := range c.Notes {
			if k == 5 && !allNotes {
				fmt.Fprintf(w, "  ... %d more skipped line(s) (--notes lists them)\n", len(c.Notes)-k)
				break
			}
			if n.Origin.Line == 0 {
				fmt.Fprintf(w, "  note: %s\n", n.Reason)
				continue
			}
			fmt.Fprintf(w, "  skipped line %d: %s: %q\n", n.Origin.Line, n.Reason, n.Text)
		}
	}
	if f := cl.Flatness; f != nil {
		fmt.Fprintf(w, "plane: %d points kept, %d outside the band%s; flatness RMS %s, max %s\n", f.Kept, f.Outside, prep.StrayText(len(f.Strays)), prep.LengthText(f.RMS, u), prep.LengthText(f.Max, u))
	}
	r := cl.Clean
	fmt.Fprintf(w, "merged: %d duplicate(s) within %s\n", len(r.Merged), prep.LengthText(r.MergeTol, u))
	order := "reordered"
	if r.OrderKept {
		order = "the file's own order kept"
	}
	if r.Reordered != "" {
		order += " (" + r.Reordered + ")"
	}
	fmt.Fprintf(w, "loops: %d found; order: %s\n", len(r.Loops), order)
	for i, l := range r.Loops {
		mark := " "
		if l.Picked {
			mark = "*"
		}
		fmt.Fprintf(w, "  %s loop %d: %d points, area %.5g %s², starting at %s\n", mark, i, l.Points, l.Area, prep.UnitSymbol(u), l.First)
	}
	n := 0
	for _, d := range r.Dropped {
		if d.Kept {
			fmt.Fprintf(w, "kept outlier %s: %s off the local fit (%.1f robust sigmas)\n", d.Origin, prep.LengthText(d.Distance, u), d.Sigmas)
			continue
		}
		n++
	}
	fmt.Fprintf(w, "dropped: %d point(s) (robust scale of the local-fit residuals %s)\n", n, prep.LengthText(r.Sigma, u))
	for _, d := range r.Dropped {
		if !d.Kept {
			fmt.Fprintf(w, "  %s: %s, %s off the local fit (%.1f robust sigmas)\n", d.Origin, d.Reason, prep.LengthText(d.Distance, u), d.Sigmas)
		}
	}
	fmt.Fprintf(w, "contour: %d points, from the trailing edge over the upper surface\n", cl.Contour.Len())
}
