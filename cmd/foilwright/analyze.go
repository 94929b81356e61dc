package main

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"path/filepath"
	"slices"
	"sort"
	"strings"
	"text/tabwriter"
	"time"

	"github.com/spf13/cobra"

	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/internal/atomicfile"
	"github.com/foilwright/foilwright/internal/limits"
	"github.com/foilwright/foilwright/plot"
	"github.com/foilwright/foilwright/plugins/builtin"
	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
)

type analyzeOptions struct {
	stage   string
	sha256  string
	alpha   string
	params  string
	json    bool
	quiet   bool
	out     string
	timings bool
	plot    string
	host    hostFlags
}

func newAnalyzeCmd() *cobra.Command {
	var opts analyzeOptions
	cmd := &cobra.Command{
		Use:   "analyze [flags] SECTION",
		Short: "Run one section through one analysis stage",
		Long: `analyze runs a section document (written by prep) through one analysis stage, in
a separate process, and prints a table of the cases: angle of attack, lift and
quarter-chord moment coefficients and the stage's self-checks. With --json the
result document is printed instead; -o writes it to a file (- for standard
output, the table then going to standard error), and any files the stage
returns beside it.

Angles are in degrees, positive nose-up: a list "-4,0,4" or a range
"start:stop:step" such as "-4:12:1" (stop included). SECTION "-" reads
standard input.

Results are inviscid estimates; check them against test data before relying
on them.`,
		Args: cobra.ExactArgs(1),
		Example: `  foilwright analyze blade-r1.json --stage vortex-panel --alpha -4:12:1
  foilwright analyze blade-r1.json --stage thin-aerofoil --alpha 0,2,4 --json
  foilwright analyze blade-r1.json --stage source-panel -o results/source.json --timings`,
		ValidArgsFunction: sectionArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			return runAnalyze(cmd, args[0], opts, cmd.Flags().Changed("alpha"))
		},
	}
	f := cmd.Flags()
	f.StringVar(&opts.stage, "stage", "vortex-panel", "stage to run: a built-in name or the path of a stage executable")
	f.StringVar(&opts.sha256, "sha256", "", "hex sha256 an external stage executable must have")
	f.StringVar(&opts.alpha, "alpha", "0", `angles of attack (degrees): "a,b,c" or "start:stop:step"`)
	f.StringVar(&opts.params, "params", "", `more stage parameters as a JSON object, e.g. '{"cp": false}'`)
	jsonFlag(cmd, &opts.json, "print the result document in place of the table")
	quietFlag(cmd, &opts.quiet, "print no table (warnings still go to standard error)")
	outputFlag(cmd, &opts.out, "write the result document to this file (- for standard output)", "json")
	f.BoolVar(&opts.timings, "timings", false, "print the solver's build, factor, solve and total times on standard error")
	f.StringVar(&opts.plot, "plot", "", "draw the results to this .svg or .png file: Cp (or, when the stage gives no Cp, Cl and Cm against alpha, or else the section); the other pictures go beside it (FILE-polar, FILE-section, FILE-streamlines)")
	cmd.MarkFlagFilename("plot", "svg", "png")
	opts.host.register(cmd)
	cmd.RegisterFlagCompletionFunc("stage", func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
		return builtin.Names(), cobra.ShellCompDirectiveDefault // a built-in name, or a path
	})
	cmd.RegisterFlagCompletionFunc("sha256", noFiles)
	cmd.RegisterFlagCompletionFunc("alpha", fixedCompletions("0", "-4:12:1", "0,4,8"))
	cmd.RegisterFlagCompletionFunc("params", fixedCompletions(`{"field_grid": [-0.5, 1.5, -0.5, 0.5, 0.02]}`))
	return cmd
}

func runAnalyze(cmd *cobra.Command, path string, opts analyzeOptions, alphaSet bool) error {
	ctx, stdout, stderr := cmd.Context(), cmd.OutOrStdout(), cmd.ErrOrStderr()
	spec, err := stageSpec(opts.stage, opts.sha256)
	if err != nil {
		return err
	}
	lim, err := limitsOf(cmd)
	if err != nil {
		return err
	}
	if err := fileOnly("--plot", opts.plot); err != nil {
		return err
	}
	var plotFormat string
	if opts.plot != "" {
		if plotFormat, err = plot.FormatOf(opts.plot); err != nil {
			return badInputf("--plot %s: %v", opts.plot, err)
		}
	}
	// Refuse an output that may not be written before any work.
	if err := atomicfile.CheckTargets(opts.out, opts.plot); err != nil {
		return err
	}
	data, name, err := readInput(cmd, path)
	if err != nil {
		return err
	}
	sec, err := section.Read(bytes.NewReader(data), name)
	if err != nil {
		return badInput(err)
	}

	h, err := opts.host.newHost(stderr, lim)
	if err != nil {
		return err
	}
	defer h.Close()
	runner := h.Runner(spec)
	info, err := runner.Describe(ctx)
	if err != nil {
		return stageError(err)
	}
	_, takesAlpha := info.Param("alpha_deg")
	params, err := analyzeParams(opts, alphaSet, takesAlpha, lim)
	if err != nil {
		return err
	}
	reply, err := runner.Run(ctx, stage.Request{Section: data, Params: params, SectionName: name})
	if err != nil {
		return stageError(err)
	}

	for _, w := range reply.Doc.Warnings {
		fmt.Fprintf(stderr, "warning: %s\n", w)
	}
	for _, w := range reply.Warnings {
		fmt.Fprintf(stderr, "warning: %s\n", w)
	}
	if opts.timings {
		printTimings(stderr, reply.Timings)
	}
	// The table goes to standard output unless the document does.
	table := stdout
	if opts.out == stdoutPath || opts.json {
		table = stderr
	}
	// Every file is written as one set: all of them, or none.
	var files atomicfile.Set
	defer files.Abort()
	var written []string
	if opts.plot != "" {
		paths, err := analyzePlots(ctx, h, &files, opts.plot, plotFormat, data, name, reply.Doc)
		if err != nil {
			return err
		}
		written = append(written, paths...)
	}
	doc, err := reply.Document()
	if err != nil {
		return err
	}
	if !bytes.HasSuffix(doc, []byte("\n")) {
		doc = append(doc, '\n')
	}
	switch {
	case opts.out == stdoutPath:
		if _, err := stdout.Write(doc); err != nil {
			return err
		}
		if n := len(reply.Artifacts); n > 0 {
			fmt.Fprintf(stderr, "note: the stage returned %d file(s); give -o FILE to write them beside the result\n", n)
		}
	case opts.out != "":
		if err := files.AddBytes(opts.out, doc); err != nil {
			return err
		}
		written = append(written, opts.out)
		// Stages never write files; their artifacts go beside the result.
		for _, a := range reply.Artifacts {
			to := filepath.Join(filepath.Dir(opts.out), a.Name)
			if err := files.AddBytes(to, a.Data); err != nil {
				return err
			}
			written = append(written, to)
		}
	default:
		if n := len(reply.Artifacts); n > 0 {
			fmt.Fprintf(stderr, "note: the stage returned %d file(s); give -o FILE to write them beside the result\n", n)
		}
	}
	if err := files.Commit(); err != nil {
		return err
	}
	if opts.json && opts.out != stdoutPath {
		if _, err := stdout.Write(doc); err != nil {
			return err
		}
	}
	if opts.quiet {
		return nil
	}
	if !opts.json {
		if err := printCases(table, name, sec, reply.Doc); err != nil {
			return err
		}
	}
	for _, p := range written {
		wrote(table, p)
	}
	return nil
}

// analysisID is the id under which the plots stage sees the result it
// draws.
const analysisID = "analysis"

// mainPictures are the kinds of picture analyze may put at the path given
// to --plot, in order of preference: the first the plots stage drew goes
// there, the others beside it.
var mainPictures = []string{"cp", "polar", "section"}

// analyzePlots draws the result through the built-in plots stage (in its
// own process, like every stage) and writes its pictures: the first of
// mainPictures drawn to path, the others beside it (path-polar,
// path-section, path-streamlines). It returns the paths written.
func analyzePlots(ctx context.Context, h *host.Host, files *atomicfile.Set, path, format string, section []byte, name string, result *stage.ResultDoc) ([]string, error) {
	params, _ := json.Marshal(map[string]string{"format": format})
	reply, err := h.Runner(host.Builtin("plots")).Run(ctx, stage.Request{
		Section: section, Params: params, SectionName: name,
		DepResults: map[string]*stage.ResultDoc{analysisID: result},
	})
	if err != nil {
		return nil, stageError(err)
	}
	kinds := make([]string, len(reply.Artifacts))
	for i, a := range reply.Artifacts {
		kinds[i] = builtin.PictureKind(a.Name, format, analysisID)
	}
	main := ""
	for _, m := range mainPictures {
		if slices.Contains(kinds, m) {
			main = m
			break
		}
	}
	if main == "" {
		return nil, fmt.Errorf("--plot %s: the plots stage drew nothing for this result", path)
	}
	var paths []string
	for i, a := range reply.Artifacts {
		to := plot.Beside(path, main, kinds[i])
		if err := files.AddBytes(to, a.Data); err != nil {
			return nil, err
		}
		paths = append(paths, to)
	}
	return paths, nil
}

// readInput reads the input file path, or stdin for "-", whole (before
// any stage starts: go-plugin hands stdin to the stage process), within
// the input limits of cmd's command line: input-bytes and input-lines.
func readInput(cmd *cobra.Command, path string) ([]byte, string, error) {
	lim, err := limitsOf(cmd)
	if err != nil {
		return nil, "", err
	}
	if path == "-" {
		data, err := limits.Read(cmd.InOrStdin(), "stdin", lim.InputBytes, lim.InputLines)
		if err != nil {
			return nil, "", badInputf("%v", err)
		}
		return data, "stdin", nil
	}
	data, err := limits.ReadFile(path, lim.InputBytes, lim.InputLines)
	if err != nil {
		return nil, "", badInput(err)
	}
	return data, path, nil
}

// analyzeParams builds the stage's parameter object from --params and
// --alpha. Angles are passed only to a stage that declares alpha_deg.
func analyzeParams(opts analyzeOptions, alphaSet, takesAlpha bool, lim limits.Limits) ([]byte, error) {
	params := map[string]json.RawMessage{}
	if n := int64(len(opts.params)); lim.JSONBytes > 0 && n > lim.JSONBytes {
		return nil, badInput(&limits.Error{File: "--params", Limit: limits.JSONBytes, Value: lim.JSONBytes, What: limits.Size(n)})
	}
	if err := limits.CheckDepth([]byte(opts.params), lim.JSONDepth); err != nil {
		return nil, badInputf("--params: %v", err)
	}
	if strings.TrimSpace(opts.params) != "" {
		dec := json.NewDecoder(strings.NewReader(opts.params))
		if err := dec.Decode(&params); err != nil || params == nil || dec.More() {
			return nil, badInputf("--params %q: want a JSON object", opts.params)
		}
	}
	if _, given := params["alpha_deg"]; given && alphaSet {
		return nil, badInputf("--alpha and --params both set alpha_deg")
	}
	if !takesAlpha {
		if alphaSet {
			return nil, badInputf("--alpha: the stage takes no angles of attack")
		}
		return json.Marshal(params)
	}
	if _, given := params["alpha_deg"]; !given {
		alphas, err := builtin.ParseAngles(opts.alpha)
		if err != nil {
			return nil, badInputf("--alpha %q: %v", opts.alpha, err)
		}
		b, err := json.Marshal(alphas)
		if err != nil {
			return nil, err
		}
		params["alpha_deg"] = b
	}
	return json.Marshal(params)
}

// printTimings prints the stage's phase times, in a fixed order.
func printTimings(w io.Writer, t map[string]time.Duration) {
	for _, k := range []string{"build", "factor", "solve", "total"} {
		if d, ok := t[k]; ok {
			fmt.Fprintf(w, "%s %.3f ms\n", k, float64(d)/float64(time.Millisecond))
		}
	}
}

// printCases prints the scalars and a table of the cases.
func printCases(w io.Writer, name string, sec *section.Section, doc *stage.ResultDoc) error {
	title := sec.Name
	if title == "" {
		title = name
	}
	fmt.Fprintf(w, "%s: %s %s, %d nodes\n", title, doc.Stage, doc.Version, len(sec.Nodes))
	keys := make([]string, 0, len(doc.Scalars))
	for k := range doc.Scalars {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		fmt.Fprintf(w, "  %s = %.6g\n", k, doc.Scalars[k])
	}
	if len(doc.Cases) == 0 {
		return nil
	}
	checkSet := map[string]bool{}
	for _, c := range doc.Cases {
		if c != nil {
			for k := range c.Checks {
				checkSet[k] = true
			}
		}
	}
	checks := make([]string, 0, len(checkSet))
	for k := range checkSet {
		checks = append(checks, k)
	}
	sort.Strings(checks)
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', tabwriter.AlignRight)
	fmt.Fprint(tw, "alpha_deg\tcl\tcm_c4\t")
	for _, k := range checks {
		fmt.Fprintf(tw, "%s\t", k)
	}
	fmt.Fprintln(tw)
	for i, c := range doc.Cases {
		if c == nil {
			fmt.Fprintf(tw, "case %d\tfailed\t(see warnings)\t\n", i)
			continue
		}
		fmt.Fprintf(tw, "%.2f\t%.4f\t%.4f\t", c.AlphaDeg, c.CL, c.CMc4)
		for _, k := range checks {
			if v, ok := c.Checks[k]; ok {
				fmt.Fprintf(tw, "%.3g\t", v)
			} else {
				fmt.Fprint(tw, "-\t")
			}
		}
		fmt.Fprintln(tw)
	}
	return tw.Flush()
}
