package main

import (
	"fmt"

	"github.com/spf13/cobra"

	"github.com/foilwright/foilwright/pipeline"
)

type mergeOptions struct {
	replace bool
	quiet   bool
	json    bool
}

func newMergeCmd() *cobra.Command {
	var opts mergeOptions
	cmd := &cobra.Command{
		Use:   "merge RUN_FOLDER",
		Short: "Combine the shards of a run into one run folder and manifest",
		Long: `merge combines the parts that the shards of a run (run --shard K/N, the tasks
of a job array) wrote under RUN_FOLDER/shards into one run folder: the same
files, byte for byte, and the same manifest (timings aside) as the run of the
pipeline on one machine, with the run's stations picture and exports and the
batch table. It refuses, naming what is wrong, when a shard is missing, still
running or has not finished its share (requeue it: run --resume makes only
what is missing), or when the shards were made by different pipeline files,
inputs, foilwright versions or stage executables. Every file is checked
against its shard's record. The merged run replaces RUN_FOLDER as a whole
(the shards' parts go with it); run --verify checks it like any run.

The summary, one line per section, goes to standard output; the exit status
is that of the run on one machine: 0 when every section succeeded, 3 when a
section compared with its design is out of tolerance.`,
		Example: `  foilwright run pipeline.json --shard 0/2 -o runs/batch
  foilwright run pipeline.json --shard 1/2 -o runs/batch
  foilwright merge runs/batch
  foilwright run --verify runs/batch/manifest.json`,
		Args: cobra.ExactArgs(1),
		ValidArgsFunction: func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
			return nil, cobra.ShellCompDirectiveFilterDirs
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			lim, err := limitsOf(cmd)
			if err != nil {
				return err
			}
			sum, err := pipeline.Merge(cmd.Context(), args[0], pipeline.MergeOptions{Replace: opts.replace, Parse: parseOptions(lim)})
			if err != nil {
				return err
			}
			sum.Manifest = displayPath(sum.Manifest)
			switch {
			case opts.quiet:
			case opts.json:
				if err := writeJSON(cmd.OutOrStdout(), summaryJSON(sum)); err != nil {
					return err
				}
			default:
				sum.Write(cmd.OutOrStdout())
			}
			if err := sum.Err(); err != nil {
				return err
			}
			// The exit status of the run on one machine.
			if n := len(sum.OutOfTolerance()); n > 0 {
				return &toleranceError{fmt.Sprintf("%d of %d section(s) out of tolerance against their design", n, len(sum.Sections))}
			}
			return nil
		},
	}
	f := cmd.Flags()
	f.BoolVar(&opts.replace, "replace", false, "replace an earlier run in the folder (the folder must hold only that run and the shards)")
	quietFlag(cmd, &opts.quiet, "print no summary: the exit status and the manifest say how the run went")
	jsonFlag(cmd, &opts.json, "print the summary as JSON")
	return cmd
}
