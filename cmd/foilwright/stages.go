package main

import (
	"github.com/foilwright/foilwright/internal/limits"

	"context"
	"encoding/json"
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"github.com/foilwright/foilwright/pipeline"
	"github.com/foilwright/foilwright/plugins/builtin"
	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
)

func newStagesCmd() *cobra.Command {
	var pipe string
	var hf hostFlags
	var asJSON, quiet bool
	cmd := &cobra.Command{
		Use:   "stages [--pipeline FILE]",
		Short: "List the built-in analysis stages, or those a pipeline file configures",
		Long: `stages lists the analysis stages built into foilwright. Each runs as a separate
process; "stages describe" shows a stage's parameters, their defaults and ranges.
With --pipeline it lists the stages a pipeline file configures instead: each
id, what runs it (a built-in, or an external executable, started to ask its
name and version, and checked against its sha256 pin), and what it runs after.
With -q it prints nothing: the exit status says whether every stage answered.`,
		Args:    cobra.NoArgs,
		Example: "  foilwright stages\n  foilwright stages --pipeline examples/rotor/pipeline.json\n  foilwright stages describe vortex-panel",
		RunE: func(cmd *cobra.Command, args []string) error {
			w := cmd.OutOrStdout()
			if quiet {
				w = io.Discard
			}
			if pipe != "" {
				return listPipelineStages(cmd.Context(), w, cmd.ErrOrStderr(), pipe, hf, asJSON)
			}
			return listStages(cmd.Context(), w, asJSON)
		},
	}
	cmd.Flags().StringVar(&pipe, "pipeline", "", "list the stages this pipeline file configures")
	cmd.MarkFlagFilename("pipeline", "json")
	jsonFlag(cmd, &asJSON, "print the list as JSON")
	quietFlag(cmd, &quiet, "print nothing; the exit status says whether every stage answered")
	hf.register(cmd)
	cmd.AddCommand(newStagesDescribeCmd(), newStagesCheckCmd())
	return cmd
}

// stageEntryJSON is one stage of the list stages --json prints.
type stageEntryJSON struct {
	ID      string   `json:"id,omitempty"`
	Name    string   `json:"name"`
	Version string   `json:"version"`
	Summary string   `json:"summary,omitempty"`
	RunBy   string   `json:"run_by,omitempty"`
	Pinned  bool     `json:"sha256_pinned,omitempty"`
	After   []string `json:"after,omitempty"`
}

// listPipelineStages lists the stages of a pipeline file, starting each
// external one to ask for its name and version.
func listPipelineStages(ctx context.Context, w, stderr io.Writer, path string, hf hostFlags, asJSON bool) error {
	p, err := pipeline.Load(path, known)
	if err != nil {
		return badInput(err)
	}
	h, err := hf.newHost(stderr, limits.Default())
	if err != nil {
		return err
	}
	defer h.Close()
	list := []stageEntryJSON{}
	for _, st := range p.Plan().Stages {
		spec, by := host.Builtin(st.Stage), "built-in"
		if st.Exec != "" {
			spec, by = host.Spec{Path: st.Exec, SHA256: st.SHA256}, st.Stage
		}
		r := h.Runner(spec)
		info, err := r.Describe(ctx)
		r.Close()
		if err != nil {
			return stageError(err)
		}
		list = append(list, stageEntryJSON{ID: st.ID, Name: info.Name, Version: info.Version, RunBy: by, Pinned: st.SHA256 != "", After: st.After})
	}
	if asJSON {
		return writeJSON(w, list)
	}
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "ID\tSTAGE\tVERSION\tRUN BY\tAFTER")
	for _, e := range list {
		by := e.RunBy
		if e.Pinned {
			by += " (sha256 pinned)"
		}
		after := strings.Join(e.After, ", ")
		if after == "" {
			after = "-"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\n", e.ID, e.Name, e.Version, by, after)
	}
	return tw.Flush()
}

func listStages(ctx context.Context, w io.Writer, asJSON bool) error {
	list := []stageEntryJSON{}
	for _, name := range builtin.Names() {
		s, _ := builtin.Lookup(name)
		info, err := s.Describe(ctx)
		if err != nil {
			return err
		}
		list = append(list, stageEntryJSON{Name: info.Name, Version: info.Version, Summary: info.Summary})
	}
	if asJSON {
		return writeJSON(w, list)
	}
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "STAGE\tVERSION\tSUMMARY")
	for _, e := range list {
		fmt.Fprintf(tw, "%s\t%s\t%s\n", e.Name, e.Version, e.Summary)
	}
	return tw.Flush()
}

type describeOptions struct {
	json   bool
	quiet  bool
	sha256 string
	host   hostFlags
}

func newStagesDescribeCmd() *cobra.Command {
	var opts describeOptions
	cmd := &cobra.Command{
		Use:   "describe NAME|PATH",
		Short: "Show a stage's parameters, defaults, ranges and scalars",
		Long: `describe starts the stage as a child process and shows what it answers: its
version, parameters (type, default, range, unit) and the scalars its results
carry. NAME is a built-in stage; a PATH (containing a slash) is an external
stage executable.`,
		Args:    cobra.ExactArgs(1),
		Example: "  foilwright stages describe thin-aerofoil\n  foilwright stages describe ./my-stage --sha256 3f1c...",
		ValidArgsFunction: func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
			return builtin.Names(), cobra.ShellCompDirectiveDefault // a built-in name, or a path
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			w := cmd.OutOrStdout()
			if opts.quiet {
				w = io.Discard
			}
			return describeStage(cmd.Context(), w, cmd.ErrOrStderr(), args[0], opts)
		},
	}
	jsonFlag(cmd, &opts.json, "print the description as JSON")
	quietFlag(cmd, &opts.quiet, "print nothing; the exit status says whether the stage started and answered")
	cmd.Flags().StringVar(&opts.sha256, "sha256", "", "hex sha256 the external stage executable must have")
	cmd.RegisterFlagCompletionFunc("sha256", noFiles)
	opts.host.register(cmd)
	return cmd
}

// stageSpec turns a stage argument into a host.Spec: a path for anything
// with a slash, else a built-in name, which must exist.
func stageSpec(name, sha string) (host.Spec, error) {
	if strings.ContainsRune(name, '/') {
		return host.Spec{Path: name, SHA256: sha}, nil
	}
	if sha != "" {
		return host.Spec{}, badInputf("--sha256 pins an external stage executable; %q is a built-in stage", name)
	}
	if _, ok := builtin.Lookup(name); !ok {
		return host.Spec{}, badInputf("unknown stage %q (built-in stages: %s; an external stage is given by a path)", name, strings.Join(builtin.Names(), ", "))
	}
	return host.Builtin(name), nil
}

func describeStage(ctx context.Context, stdout, stderr io.Writer, name string, opts describeOptions) error {
	spec, err := stageSpec(name, opts.sha256)
	if err != nil {
		return err
	}
	h, err := opts.host.newHost(stderr, limits.Default())
	if err != nil {
		return err
	}
	defer h.Close()
	info, err := h.Runner(spec).Describe(ctx)
	if err != nil {
		return stageError(err)
	}
	if opts.json {
		return writeInfoJSON(stdout, info)
	}
	return writeInfo(stdout, info)
}

func writeInfo(w io.Writer, info stage.Info) error {
	fmt.Fprintf(w, "%s %s\n%s\n", info.Name, info.Version, info.Summary)
	if info.MaxConcurrency > 0 {
		fmt.Fprintf(w, "serves at most %d call(s) at once per process\n", info.MaxConcurrency)
	}
	if info.MaxNodes > 0 {
		fmt.Fprintf(w, "takes sections of at most %d nodes\n", info.MaxNodes)
	}
	fmt.Fprintln(w, "\nPARAMETERS")
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	if len(info.Params) == 0 {
		fmt.Fprintln(tw, "  (none)")
	} else {
		fmt.Fprintln(tw, "  NAME\tTYPE\tDEFAULT\tRANGE\tUNIT\tDESCRIPTION")
	}
	for _, p := range info.Params {
		def := "(required)"
		if p.Default != nil {
			def = string(p.Default)
		}
		unit := p.Unit
		if unit == "" {
			unit = "-"
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\t%s\t%s\n", p.Name, p.Type, def, paramRange(p), unit, p.Doc)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	fmt.Fprintln(w, "\nSCALARS")
	tw = tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	if len(info.Scalars) == 0 {
		fmt.Fprintln(tw, "  (none)")
	}
	for _, s := range info.Scalars {
		fmt.Fprintf(tw, "  %s\t%s\n", s.Name, s.Doc)
	}
	return tw.Flush()
}

// paramRange says which values a parameter accepts.
func paramRange(p stage.Param) string {
	var parts []string
	switch {
	case p.Min != nil && p.Max != nil:
		parts = append(parts, fmt.Sprintf("[%g, %g]", *p.Min, *p.Max))
	case p.Min != nil:
		parts = append(parts, fmt.Sprintf(">= %g", *p.Min))
	case p.Max != nil:
		parts = append(parts, fmt.Sprintf("<= %g", *p.Max))
	}
	if p.MinItems > 0 || p.MaxItems > 0 {
		hi := "any"
		if p.MaxItems > 0 {
			hi = fmt.Sprint(p.MaxItems)
		}
		parts = append(parts, fmt.Sprintf("%d..%s values", p.MinItems, hi))
	}
	if len(p.Choices) > 0 {
		parts = append(parts, strings.Join(p.Choices, "|"))
	}
	if len(parts) == 0 {
		return "-"
	}
	return strings.Join(parts, ", ")
}

// infoJSON is the JSON form of a description printed by describe --json.
type infoJSON struct {
	Name           string       `json:"name"`
	Version        string       `json:"version"`
	Summary        string       `json:"summary"`
	MaxConcurrency int          `json:"max_concurrency"`
	Parameters     []paramJSON  `json:"parameters"`
	Scalars        []scalarJSON `json:"scalars"`
}

type scalarJSON struct {
	Name string `json:"name"`
	Doc  string `json:"doc"`
}

type paramJSON struct {
	Name     string          `json:"name"`
	Type     stage.ParamType `json:"type"`
	Default  json.RawMessage `json:"default,omitempty"`
	Min      *float64        `json:"min,omitempty"`
	Max      *float64        `json:"max,omitempty"`
	MinItems int             `json:"min_items,omitempty"`
	MaxItems int             `json:"max_items,omitempty"`
	Choices  []string        `json:"choices,omitempty"`
	Unit     string          `json:"unit,omitempty"`
	Doc      string          `json:"doc,omitempty"`
}

func writeInfoJSON(w io.Writer, info stage.Info) error {
	out := infoJSON{Name: info.Name, Version: info.Version, Summary: info.Summary, MaxConcurrency: info.MaxConcurrency,
		Parameters: []paramJSON{}, Scalars: []scalarJSON{}}
	for _, s := range info.Scalars {
		out.Scalars = append(out.Scalars, scalarJSON{s.Name, s.Doc})
	}
	for _, p := range info.Params {
		out.Parameters = append(out.Parameters, paramJSON{p.Name, p.Type, p.Default, p.Min, p.Max, p.MinItems, p.MaxItems, p.Choices, p.Unit, p.Doc})
	}
	b, err := json.MarshalIndent(out, "", "  ")
	if err != nil {
		return err
	}
	_, err = fmt.Fprintf(w, "%s\n", b)
	return err
}
