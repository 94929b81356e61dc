package main

import (
	"fmt"
	"io"
	"path/filepath"

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
(x,y,file,line) with -o, or as JSON with --json.`,
		Example: `  foilwright points examples/tunnel-model/probe.csv -o clean.csv
  foilwright points examples/rotor/blade-scan.stl --units mm --cut z=700 --json`,
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
			cl, err := prep.ReadAndClean(files, s)
			if err != nil {
				return badInput(err)
			}
			return writePoints(cmd.OutOrStdout(), cmd.ErrOrStderr(), cl, opts)
		},
	}
	opts.flags.registerRead(cmd.Flags())
	cmd.Flags().StringVarP(&opts.out, "out", "o", "", "write the ordered contour to this file (CSV x,y,file,line; JSON with --json)")
	cmd.Flags().BoolVar(&opts.json, "json", false, "write the contour and the report as JSON (to stdout without -o)")
	cmd.Flags().BoolVar(&opts.notes, "notes", false, "also list every skipped line")
	cmd.Flags().StringVar(&opts.plot, "plot", "", "draw the ordered contour and the dropped points to this .svg or .png file")
	cmd.MarkFlagFilename("plot", "svg", "png")
	cmd.MarkFlagFilename("out", "csv", "json")
	return cmd
}

func writePoints(stdout, stderr io.Writer, cl *prep.Cleaned, opts pointsOptions) error {
	c := cl.Contour
	out, err := newOutputs(stdout, opts.out, opts.plot)
	if err != nil {
		return err
	}
	defer out.abort()
	if opts.plot != "" {
		if _, err := plot.FormatOf(opts.plot); err != nil {
			return badInputf("--plot %s: %v", opts.plot, err)
		}
		f, err := plot.PrepPlot(cl.PlotData())
		if err != nil {
			return err
		}
		if err := out.picture(f, opts.plot); err != nil {
			return err
		}
	}
	if opts.json {
		b, err := cl.ContourDocument()
		if err != nil {
			return err
		}
		if err := out.write(opts.out, func(w io.Writer) error { _, err := w.Write(b); return err }); err != nil {
			return err
		}
		if err := out.commit(); err != nil {
			return err
		}
		if opts.out == "" {
			return nil
		}
	} else if opts.out != "" {
		if err := out.write(opts.out, func(w io.Writer) error { return pointfile.WriteCSV(w, c.Points, c.Origins) }); err != nil {
			return err
		}
	}
	if err := out.commit(); err != nil {
		return err
	}
	w := stdout
	if opts.json && opts.out == "" {
		w = stderr
	}
	writePointsReport(w, cl, opts.notes)
	if opts.out != "" {
		fmt.Fprintf(w, "wrote %s\n", opts.out)
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
		fmt.Fprintf(w, "%s: %s, %d %s points, %d line(s) skipped, units %s\n", filepath.Base(cl.Files[i]), c.Format, c.Len(), dim, len(c.Notes), c.Units)
		for k, n := range c.Notes {
			if k == 5 && !allNotes {
				fmt.Fprintf(w, "  ... %d more skipped line(s) (--notes lists them)\n", len(c.Notes)-k)
				break
			}
			fmt.Fprintf(w, "  skipped line %d: %s: %q\n", n.Origin.Line, n.Reason, n.Text)
		}
	}
	if f := cl.Flatness; f != nil {
		fmt.Fprintf(w, "plane: %d points kept, %d outside the band; flatness RMS %.3g %s, max %.3g %s\n", f.Kept, f.Outside, f.RMS, u, f.Max, u)
	}
	r := cl.Clean
	fmt.Fprintf(w, "merged: %d duplicate(s) within %.3g %s\n", len(r.Merged), r.MergeTol, u)
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
		fmt.Fprintf(w, "  %s loop %d: %d points, area %.5g %s², starting at %s\n", mark, i, l.Points, l.Area, u, l.First)
	}
	n := 0
	for _, d := range r.Dropped {
		if d.Kept {
			fmt.Fprintf(w, "kept outlier %s: %.3g %s off the local fit (%.1f robust sigmas)\n", d.Origin, d.Distance, u, d.Sigmas)
			continue
		}
		n++
	}
	fmt.Fprintf(w, "dropped: %d point(s) (robust scale of the local-fit residuals %.3g %s)\n", n, r.Sigma, u)
	for _, d := range r.Dropped {
		if !d.Kept {
			fmt.Fprintf(w, "  %s: %s, %.3g %s off the local fit (%.1f robust sigmas)\n", d.Origin, d.Reason, d.Distance, u, d.Sigmas)
		}
	}
	fmt.Fprintf(w, "contour: %d points, from the trailing edge over the upper surface\n", cl.Contour.Len())
}
