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

// inputError marks an error caused by the user's input (an unreadable or
// malformed file, a bad value): the command exits with status 2.
type inputError struct{ err error }

func (e *inputError) Error() string { return e.err.Error() }
func (e *inputError) Unwrap() error { return e.err }

// badInput wraps err so that the command exits with status 2. It returns nil
// for a nil err.
func badInput(err error) error {
	if err == nil {
		return nil
	}
	return &inputError{err}
}

// badInputf formats a bad-input error.
func badInputf(format string, args ...any) error {
	return &inputError{fmt.Errorf(format, args...)}
}

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
	for _, c := range []*cobra.Command{
		newInspectCmd(),
		newPointsCmd(),
		newPrepCmd(),
		newRunCmd(),
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

// execute runs the command line args and returns the exit status.
func execute(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	var started bool
	root := newRootCmd(&started)
	root.SetArgs(args)
	root.SetIn(stdin)
	root.SetOut(stdout)
	root.SetErr(stderr)
	err := root.ExecuteContext(ctx)
	if err == nil {
		return exitOK
	}
	fmt.Fprintf(stderr, "foilwright: %v\n", err)
	var in *inputError
	var tol *toleranceError
	switch {
	case ctx.Err() != nil:
		return exitInterrupted
	case errors.As(err, &tol):
		return exitOutOfTolerance
	case !started:
		fmt.Fprintf(stderr, "Run '%s --help' for usage.\n", root.CommandPath())
		return exitUsage
	case errors.As(err, &in):
		return exitUsage
	default:
		return exitFailed
	}
}
