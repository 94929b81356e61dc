package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"syscall"

	"github.com/spf13/cobra"
)

// Exit statuses (DESIGN.md): 0 success, 1 processing failed, 2 bad usage or
// unreadable input, 130 interrupted (common practice for SIGINT).
const (
	exitOK     = 0
	exitFailed = 1
	exitUsage  = 2
	// exitOutOfTolerance: the comparison ran and a measured point lies
	// outside its tolerance (compare, and run with a compare block).
	exitOutOfTolerance = 3
	exitInterrupted    = 130
)

// newRootCmd builds the command tree. started is set when a RunE begins, so
// that errors before it (unknown command, bad flag, wrong argument count) are
// told apart as usage errors.
func newRootCmd(started *bool) *cobra.Command {
	root := &cobra.Command{
		Use:   "foilwright",
		Short: "Clean, normalise and analyse measured lifting-section coordinates",
		Long: `foilwright turns coordinates of a wing, blade or model section that are not fit
to use (probed on a measuring machine, cut from a 3D scan, exported from CAD)
into a clean, closed, smooth, normalised and repanelled section, says how far it
departs from every measured point and how it maps back to the part, reports its
geometry, and passes it to analysis stages.

Results are inviscid estimates: check them against test data, and defer to the
applicable codes and licensed engineering practice before anything is built
from them.`,
		SilenceUsage:  true,
		SilenceErrors: true,
		Version:       currentVersion().String(),
		// Notes on deprecated flags go to standard error.
		PersistentPreRunE: warnDeprecated,
	}
	root.SetVersionTemplate("foilwright {{.Version}}\n")
	root.SetUsageFunc(usage)
	root.CompletionOptions.HiddenDefaultCmd = false
	registerLimits(root)
	for _, c := range []*cobra.Command{
		newInspectCmd(),
		newPointsCmd(),
		newPrepCmd(),
		newRunCmd(),
		newMergeCmd(),
		newJobScriptCmd(),
		newShapeCmd(),
		newVersionCmd(),
		newAnalyzeCmd(),
		newExportCmd(),
		newStagesCmd(),
		newStageServeCmd(),
		newCompareCmd(),
	} {
		root.AddCommand(c)
	}
	markStarted(root, started)
	return root
}

// markStarted wraps the RunE of cmd and its children so that *started is set
// before the command's own work begins.
func markStarted(cmd *cobra.Command, started *bool) {
	if run := cmd.RunE; run != nil {
		cmd.RunE = func(c *cobra.Command, args []string) error {
			*started = true
			return run(c, args)
		}
	}
	for _, c := range cmd.Commands() {
		markStarted(c, started)
	}
}

// execute runs the command line args and returns the exit status, by the
// one rule of exitStatus. A panic in a command is reported as an internal
// error (exit 1), never as a Go stack dump.
func execute(args []string, stdin io.Reader, stdout, stderr io.Writer) (code int) {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	var started bool
	root := newRootCmd(&started)
	root.SetArgs(args)
	root.SetIn(stdin)
	root.SetOut(stdout)
	root.SetErr(stderr)
	var cmd *cobra.Command
	err := func() (err error) {
		defer func() {
			if v := recover(); v != nil {
				err = recovered(v)
			}
		}()
		cmd, err = root.ExecuteContextC(ctx)
		return err
	}()
	code = exitStatus(err, started, ctx.Err() != nil)
	if err == nil {
		return code
	}
	if code == 130 && errors.Is(err, context.Canceled) {
		// The command stopped because of the signal and has nothing else
		// to say; "context canceled" would only puzzle.
		fmt.Fprintln(stderr, "foilwright: interrupted")
		return code
	}
	fmt.Fprintf(stderr, "foilwright: %v\n", err)
	if !started {
		path := root.CommandPath()
		if cmd != nil {
			path = cmd.CommandPath()
		}
		usageHint(stderr, path)
	}
	return code
}
