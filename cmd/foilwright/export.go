package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"github.com/spf13/cobra"

	"github.com/foilwright/foilwright/export"
	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/internal/enum"
	"github.com/foilwright/foilwright/internal/limits"
	"github.com/foilwright/foilwright/pipeline"
)

type exportOptions struct {
	to       string
	out      string
	frame    string
	chord    lengthValue
	farfield float64
	wallSize wordFloat
	farSize  wordFloat
	quiet    bool
	json     bool
}

// register adds the flags export and export stations share.
func (o *exportOptions) register(cmd *cobra.Command, kinds []enum.Choice) {
	f := cmd.Flags()
	f.StringVar(&o.to, "to", "", "what to write: "+enum.Help(kinds))
	outputFlag(cmd, &o.out, "write the export to this file (- for standard output; default: standard output unless it is a terminal)",
		"dxf", "svg", "csv", "geo")
	quietFlag(cmd, &o.quiet, "print no report")
	jsonFlag(cmd, &o.json, "print the report as JSON")
	cmd.MarkFlagRequired("to")
	cmd.RegisterFlagCompletionFunc("to", fixedCompletions(enum.Names(kinds)...))
}

// target settles where the export goes: -o, or standard output when that
// is not a terminal.
func (o *exportOptions) target(stdout io.Writer) error {
	if o.out != "" {
		return nil
	}
	if isTerminal(stdout) {
		return badInputf("give -o FILE (or -o - to write the export to the terminal)")
	}
	o.out = stdoutPath
	return nil
}

// exportReport is what export prints when it is done.
type exportReport struct {
	Kind     string   `json:"kind"`
	Output   string   `json:"output"`
	Frame    string   `json:"frame,omitempty"`
	Units    string   `json:"units,omitempty"`
	Sections []string `json:"sections"`
	Nodes    int      `json:"nodes,omitempty"`
	Rows     int      `json:"rows,omitempty"`
}

// report prints r: on standard output unless the export went there, then
// on standard error; as JSON with --json; not at all with -q.
func (o *exportOptions) report(stdout, stderr io.Writer, r exportReport) error {
	if o.quiet {
		return nil
	}
	w := stdout
	if o.out == stdoutPath {
		w = stderr
	}
	if o.json {
		return writeJSON(w, r)
	}
	where := r.Output
	if where == stdoutPath {
		where = "standard output"
	}
	what := strings.Join(r.Sections, ", ")
	switch {
	case r.Frame != "" && r.Nodes > 0:
		fmt.Fprintf(w, "wrote %s: %s of %s, %d nodes, %s frame, %s\n", where, r.Kind, what, r.Nodes, r.Frame, r.Units)
	case r.Frame != "":
		fmt.Fprintf(w, "wrote %s: %s of %s, %s frame, %s\n", where, r.Kind, what, r.Frame, r.Units)
	default:
		fmt.Fprintf(w, "wrote %s: %s of %s, %d row(s)\n", where, r.Kind, what, r.Rows)
	}
	return nil
}

func newExportCmd() *cobra.Command {
	var opts exportOptions
	cmd := &cobra.Command{
		Use:   "export SECTION --to KIND [-o FILE] | export RESULT... --to polar-csv|cp-csv",
		Short: "Write a section for CAD, a template, a mesher or a spreadsheet, or the results as tables",
		Long: `export writes a section document (written by prep, or a section folder of a run
folder) in the part's coordinates and true scale (the default, --frame part) or
normalised (--frame chord):

  dxf        ASCII DXF (release 12) for CAD: a closed polyline through the nodes
             (layer SECTION), a cubic spline through the same nodes (layer
             SPLINE), the chord line (CHORD), datum marks at the leading edge,
             the trailing edge and the quarter chord (DATUM); the unit in the
             header. foilwright reads it back: prep FILE --layer SECTION.
  svg        a 1:1 template to print for cutting or checking, with a scale bar
  csv        the nodes as x,y with the unit in a comment
  geo        a Gmsh geometry script: the section as splines, a far-field circle
             at --farfield chords, mesh sizes, physical groups

and the results of the stages as tables (give result documents, section folders
or a run folder):

  polar-csv  section, stage, alpha_deg, cl, cm_c4 and the self-checks
  cp-csv     section, stage, alpha_deg, x, y, cp (chord units)

A section in chord units (an analytic shape) has no part to map back to: export
it with --frame chord, or give it a size with --chord 150mm. "export stations"
writes the stations of a blade from a run folder.

Results are inviscid estimates: check them against test data.`,
		Example: `  foilwright export section.json --to dxf -o section.dxf
  foilwright export section.json --to svg -o template.svg
  foilwright export runs/tunnel-model/midspan --to geo --farfield 30 -o midspan.geo
  foilwright export naca2412.json --to svg --chord 150mm -o naca2412-template.svg
  foilwright export runs/tunnel-model --to polar-csv -o polars.csv
  foilwright export stations runs/rotor --to dxf -o blade.dxf`,
		Args: cobra.MinimumNArgs(1),
		ValidArgsFunction: func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
			return []string{"json"}, cobra.ShellCompDirectiveFilterFileExt
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			return runExport(cmd, args, &opts)
		},
	}
	opts.register(cmd, export.Kinds())
	f := cmd.Flags()
	f.StringVar(&opts.frame, "frame", export.FramePart, "coordinates: part (the part's, through the section's frame, in its unit) or chord (normalised)")
	f.Var(&opts.chord, "chord", "scale a normalised section to this chord, in the part frame, e.g. 150mm or 6in (leading edge at the origin, no twist)")
	f.Float64Var(&opts.farfield, "farfield", export.DefaultFarfield, "for --to geo: radius of the far-field circle round mid-chord (chords)")
	opts.wallSize = wordFloat{word: "auto", min: 0, open: true, kind: "size"}
	opts.farSize = wordFloat{word: "auto", min: 0, open: true, kind: "size"}
	f.Var(&opts.wallSize, "wall-size", "for --to geo: mesh size at the section (chords; auto: the panel length at each node)")
	f.Var(&opts.farSize, "far-size", fmt.Sprintf("for --to geo: mesh size at the far field (chords; auto: the far-field radius / %d)", export.DefaultFarDivisions))
	cmd.RegisterFlagCompletionFunc("frame", fixedCompletions(export.Frames()...))
	cmd.RegisterFlagCompletionFunc("chord", fixedCompletions("100mm", "150mm", "200mm", "6in"))
	cmd.RegisterFlagCompletionFunc("farfield", fixedCompletions("10", "20", "50"))
	cmd.RegisterFlagCompletionFunc("wall-size", fixedCompletions("auto", "0.001", "0.005"))
	cmd.RegisterFlagCompletionFunc("far-size", fixedCompletions("auto", "1", "2.5"))
	cmd.AddCommand(newExportStationsCmd())
	return cmd
}

func runExport(cmd *cobra.Command, args []string, opts *exportOptions) error {
	stdout, stderr := cmd.OutOrStdout(), cmd.ErrOrStderr()
	if !enum.Has(export.Kinds(), opts.to) {
		return badInputf("--to %q: want %s", opts.to, enum.Or(enum.Names(export.Kinds())...))
	}
	if err := opts.target(stdout); err != nil {
		return err
	}
	if export.FromResults(opts.to) {
		if cmd.Flags().Changed("frame") || cmd.Flags().Changed("chord") {
			return badInputf("--to %s: the tables are in chord units; --frame and --chord apply to the geometric exports", opts.to)
		}
		return exportResults(stdout, stderr, args, opts)
	}
	if len(args) != 1 {
		return badInputf("--to %s writes one section; got %d arguments", opts.to, len(args))
	}
	data, name, err := sectionFromArg(cmd, args[0])
	if err != nil {
		return err
	}
	sec, err := section.Read(bytes.NewReader(data), name)
	if err != nil {
		return badInput(err)
	}
	po := export.PlaceOptions{Frame: opts.frame}
	if opts.chord.s != "" {
		l, _ := geometry.ParseLength(opts.chord.s)
		po.Chord = l
	}
	p, err := export.Place(sec, po)
	if err != nil {
		return badInput(err)
	}
	eo := export.Options{Geo: export.GeoOptions{Farfield: opts.farfield}}
	if v := opts.wallSize.ptr(); v != nil {
		eo.Geo.WallSize = *v
	}
	if v := opts.farSize.ptr(); v != nil {
		eo.Geo.FarSize = *v
	}
	if err := writeOutput(stdout, opts.out, func(w io.Writer) error { return export.Write(w, opts.to, p, eo) }); err != nil {
		if errors.Is(err, export.ErrNoScale) {
			return badInput(err)
		}
		return err
	}
	return opts.report(stdout, stderr, exportReport{Kind: opts.to, Output: opts.out, Frame: p.Frame, Units: string(p.Units),
		Sections: []string{p.Name}, Nodes: len(p.Nodes)})
}

// sectionFromArg reads a section document: the file, "-" for standard
// input, or section.json in a section folder of a run folder.
func sectionFromArg(cmd *cobra.Command, arg string) ([]byte, string, error) {
	if st, err := os.Stat(arg); err == nil && st.IsDir() {
		arg = filepath.Join(arg, "section.json")
	}
	return readInput(cmd, arg)
}

// exportResults writes the polars or the Cp of the result documents that
// args name: result files, section folders (their results/*.json) or run
// folders (every section's).
func exportResults(stdout, stderr io.Writer, args []string, opts *exportOptions) error {
	var rs []*export.Result
	var names []string
	for _, a := range args {
		files, err := resultFiles(a)
		if err != nil {
			return err
		}
		for _, f := range files {
			data, err := limits.ReadFile(f.path, limits.Default().InputBytes, 0)
			if err != nil {
				return badInput(err)
			}
			r, err := export.ReadResult(data, f.path, f.section)
			if err != nil {
				return badInput(err)
			}
			rs = append(rs, r)
			if len(names) == 0 || names[len(names)-1] != f.section {
				names = append(names, f.section)
			}
		}
	}
	rows := 0
	for _, r := range rs {
		for _, c := range r.Cases {
			if opts.to == export.KindCpCSV {
				rows += len(c.Cp)
			} else {
				rows++
			}
		}
	}
	write := export.PolarCSV
	if opts.to == export.KindCpCSV {
		write = export.CpCSV
	}
	if err := writeOutput(stdout, opts.out, func(w io.Writer) error { return write(w, rs) }); err != nil {
		return err
	}
	return opts.report(stdout, stderr, exportReport{Kind: opts.to, Output: opts.out, Sections: names, Rows: rows})
}

// resultFile is a result document and the section it belongs to.
type resultFile struct{ path, section string }

// resultFiles lists the result documents arg names: the file itself (its
// section is the folder above results/, or the file's name), a section
// folder's results/*.json, or every section folder's in a run folder (in
// the manifest's order).
func resultFiles(arg string) ([]resultFile, error) {
	st, err := os.Stat(arg)
	if err != nil {
		return nil, badInput(err)
	}
	if !st.IsDir() {
		abs, _ := filepath.Abs(arg)
		sec := strings.TrimSuffix(filepath.Base(arg), filepath.Ext(arg))
		if dir := filepath.Dir(abs); filepath.Base(dir) == "results" {
			sec = filepath.Base(filepath.Dir(dir))
		}
		return []resultFile{{arg, sec}}, nil
	}
	if m, err := pipeline.ReadManifest(filepath.Join(arg, pipeline.ManifestName)); err == nil {
		var out []resultFile
		for _, s := range m.Sections {
			fs, err := sectionResults(filepath.Join(arg, s.Name), s.Name)
			if err != nil {
				return nil, err
			}
			out = append(out, fs...)
		}
		if len(out) == 0 {
			return nil, badInputf("%s: a run folder with no results", arg)
		}
		return out, nil
	}
	out, err := sectionResults(arg, filepath.Base(filepath.Clean(arg)))
	if err == nil && len(out) == 0 {
		return nil, badInputf("%s: no results/*.json (give a result document, a section folder or a run folder)", arg)
	}
	return out, err
}

// sectionResults lists the results/*.json of a section folder, sorted.
func sectionResults(dir, name string) ([]resultFile, error) {
	paths, err := filepath.Glob(filepath.Join(dir, "results", "*.json"))
	if err != nil {
		return nil, badInput(err)
	}
	sort.Strings(paths)
	out := make([]resultFile, len(paths))
	for i, p := range paths {
		out[i] = resultFile{p, name}
	}
	return out, nil
}

func newExportStationsCmd() *cobra.Command {
	var opts exportOptions
	cmd := &cobra.Command{
		Use:   "stations RUN_FOLDER --to dxf|csv [-o FILE]",
		Short: "Write the stations of a blade in 3D, in the part's frame, for a CAD loft",
		Long: `stations writes every section of a run folder (a blade cut at several stations)
in space, in the part's coordinates and unit: each section in the plane it was
cut at (or, for a section read in 2D, at z = its station).

  dxf  a closed 3D polyline per station on its own layer (the section's name in
       capitals), a spline through the same nodes on that layer with -SPLINE
       appended, and guide lines through the leading and trailing edges (EDGES)
  csv  x,y,z,station, one block per station`,
		Example: `  foilwright export stations runs/rotor --to dxf -o blade.dxf
  foilwright export stations runs/rotor --to csv -o blade.csv`,
		Args: cobra.ExactArgs(1),
		ValidArgsFunction: func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
			return nil, cobra.ShellCompDirectiveFilterDirs
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			stdout, stderr := cmd.OutOrStdout(), cmd.ErrOrStderr()
			if !enum.Has(export.StationKinds(), opts.to) {
				return badInputf("--to %q: want %s", opts.to, enum.Or(enum.Names(export.StationKinds())...))
			}
			if err := opts.target(stdout); err != nil {
				return err
			}
			sts, err := runStations(args[0])
			if err != nil {
				return err
			}
			write := export.StationsDXF
			if opts.to == export.KindCSV {
				write = export.StationsCSV
			}
			if err := writeOutput(stdout, opts.out, func(w io.Writer) error { return write(w, sts) }); err != nil {
				return badInput(err)
			}
			var names []string
			for _, st := range sts {
				names = append(names, st.Section.Name)
			}
			return opts.report(stdout, stderr, exportReport{Kind: "stations " + opts.to, Output: opts.out, Frame: export.FramePart,
				Units: string(sts[0].Section.Units), Sections: names})
		},
	}
	opts.register(cmd, export.StationKinds())
	return cmd
}

// runStations reads the sections of a run folder, in the manifest's
// order, placed in space.
func runStations(folder string) ([]export.Station, error) {
	m, err := pipeline.ReadManifest(filepath.Join(folder, pipeline.ManifestName))
	if err != nil {
		return nil, badInput(err)
	}
	var sts []export.Station
	for _, rec := range m.Sections {
		path := filepath.Join(folder, rec.Name, "section.json")
		data, err := limits.ReadFile(path, limits.Default().InputBytes, 0)
		if errors.Is(err, os.ErrNotExist) {
			continue // a section that failed
		}
		if err != nil {
			return nil, badInput(err)
		}
		s, err := section.Read(bytes.NewReader(data), path)
		if err != nil {
			return nil, badInput(err)
		}
		p, err := export.Place(s, export.PlaceOptions{})
		if err != nil {
			return nil, badInput(err)
		}
		if p.Plane == nil {
			if rec.Station == nil {
				return nil, badInputf("%s: the section was read in 2D and its input gives no station: it has no place along the span", path)
			}
			p.AtStation(*rec.Station)
		}
		sts = append(sts, export.Station{Position: rec.Station, Section: p})
	}
	if len(sts) == 0 {
		return nil, badInputf("%s: no sections", folder)
	}
	return sts, nil
}
