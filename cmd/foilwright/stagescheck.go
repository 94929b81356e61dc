package main

import (
	"context"
	"encoding/json"
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"github.com/foilwright/foilwright/internal/limits"
	"github.com/foilwright/foilwright/plugins/builtin"
	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stagetest"
)

type checkOptions struct {
	json, quiet bool
	sha256      string
	params      string
	section     string
	host        hostFlags
}

func newStagesCheckCmd() *cobra.Command {
	var opts checkOptions
	cmd := &cobra.Command{
		Use:   "check PATH|NAME",
		Short: "Check that a stage executable keeps the stage protocol (the conformance suite)",
		Long: `check starts a stage as foilwright does (a child process of its own, the
handshake, the minimal environment) and runs the conformance suite on it:
its description is well formed and repeatable; on a good section it answers
a valid result document naming itself, with only the scalars it declares,
the same bytes on repeated, defaulted and concurrent calls; it fills in its
defaults and refuses unknown, mistyped and out-of-range parameters and bad
sections itself (ERROR_CODE_BAD_INPUT), packed or not as it describes
itself; a call through the host gives the same document; the files it
declares it runs from exist; it returns promptly when a call is cancelled
and ends within a second when asked. It lists what the stage runs from
(the interpreter its "#!" line names and the files it declares, with their
sha256), ready for a pipeline's "pins".

PATH (with a slash) is a stage executable in any language; NAME a built-in
stage. The good section is a NACA 0012 of 160 panels unless --section gives
one (a stage that needs more of the document than its nodes, such as its
properties, needs a section made by prep); --params gives the parameters of
the good calls. Exit status 0 when the stage conforms, 1 when a check
failed, 2 when it cannot be started as given (missing, not executable, not
the pinned one).`,
		Args:    cobra.ExactArgs(1),
		Example: "  foilwright stages check ./examples/print-check/stage.js --params '{\"chord_mm\": 120}'\n  foilwright stages check ./blade-stiffness --section runs/rotor/r700/section.json\n  foilwright stages check vortex-panel",
		ValidArgsFunction: func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
			return builtin.Names(), cobra.ShellCompDirectiveDefault // a built-in name, or a path
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			w := cmd.OutOrStdout()
			if opts.quiet {
				w = io.Discard
			}
			var section []byte
			if opts.section != "" {
				var err error
				if section, _, err = readInput(cmd, opts.section); err != nil {
					return err
				}
			}
			return checkStage(cmd.Context(), w, cmd.ErrOrStderr(), args[0], section, opts)
		},
	}
	jsonFlag(cmd, &opts.json, "print the report as JSON")
	quietFlag(cmd, &opts.quiet, "print nothing; the exit status says whether the stage conforms")
	cmd.Flags().StringVar(&opts.sha256, "sha256", "", "hex sha256 the stage executable must have")
	cmd.RegisterFlagCompletionFunc("sha256", noFiles)
	cmd.Flags().StringVar(&opts.params, "params", "", "parameters of the good calls, a JSON object (default {})")
	cmd.RegisterFlagCompletionFunc("params", noFiles)
	cmd.Flags().StringVar(&opts.section, "section", "", "a section document the stage accepts (default: a NACA 0012 of 160 panels)")
	cmd.MarkFlagFilename("section", "json")
	opts.host.register(cmd)
	return cmd
}

// checkReportJSON is the report stages check --json prints.
type checkReportJSON struct {
	Stage    string            `json:"stage"`
	Name     string            `json:"name"`
	Version  string            `json:"version"`
	Packed   bool              `json:"packed"`
	RunsFrom []host.FileDigest `json:"runs_from"`
	Conforms bool              `json:"conforms"`
	Failures []string          `json:"failures"`
	Notes    []string          `json:"notes"`
	StopMS   float64           `json:"stop_ms"`
}

func checkStage(ctx context.Context, stdout, stderr io.Writer, name string, section []byte, opts checkOptions) error {
	spec, err := stageSpec(name, opts.sha256)
	if err != nil {
		return err
	}
	var params []byte
	if opts.params != "" {
		params = []byte(opts.params)
		var obj map[string]json.RawMessage
		if err := json.Unmarshal(params, &obj); err != nil || obj == nil {
			return badInputf("--params: want a JSON object, got %q", opts.params)
		}
	}
	// The host as the flags and limits configure it, for its options.
	h, err := opts.host.newHost(stderr, limits.Default())
	if err != nil {
		return err
	}
	ho := h.Options()
	h.Close()
	rep, err := stagetest.CheckSpec(ctx, spec, stagetest.Options{Section: section, Params: params, Host: ho})
	if err != nil {
		return stageError(err)
	}
	out := checkReportJSON{Stage: name, Name: rep.Info.Name, Version: rep.Info.Version, Packed: rep.Info.Packed,
		RunsFrom: rep.RunsFrom, Conforms: rep.Err() == nil, Failures: []string{}, Notes: rep.Notes,
		StopMS: float64(rep.Stop.Microseconds()) / 1000}
	if out.RunsFrom == nil {
		out.RunsFrom = []host.FileDigest{}
	}
	if out.Notes == nil {
		out.Notes = []string{}
	}
	for _, f := range rep.Failures {
		out.Failures = append(out.Failures, strings.TrimPrefix(f.Error(), "stagetest: "))
	}
	if opts.json {
		if err := writeJSON(stdout, out); err != nil {
			return err
		}
	} else if err := writeCheck(stdout, out); err != nil {
		return err
	}
	if !out.Conforms {
		return fmt.Errorf("%s does not keep the stage protocol: %d check(s) failed", name, len(out.Failures))
	}
	return nil
}

func writeCheck(w io.Writer, r checkReportJSON) error {
	how := "arrays as JSON text"
	if r.Packed {
		how = "arrays packed"
	}
	fmt.Fprintf(w, "%s: %s %s (%s)\n", r.Stage, r.Name, r.Version, how)
	if len(r.RunsFrom) > 0 {
		fmt.Fprintln(w, "runs from (besides the executable):")
		tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
		for _, f := range r.RunsFrom {
			fmt.Fprintf(tw, "  %s\t%s\n", f.Path, f.SHA256)
		}
		if err := tw.Flush(); err != nil {
			return err
		}
	}
	for _, f := range r.Failures {
		fmt.Fprintf(w, "FAIL %s\n", f)
	}
	for _, n := range r.Notes {
		fmt.Fprintf(w, "note: %s\n", n)
	}
	if r.Conforms {
		fmt.Fprintf(w, "ok: keeps the stage protocol (ended %.0f ms after it was asked to)\n", r.StopMS)
	}
	return nil
}
