package main

import (
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"runtime"
	"strings"

	"github.com/foilwright/foilwright/internal/atomicfile"
	"github.com/foilwright/foilwright/internal/limits"
	"github.com/foilwright/foilwright/pipeline"
	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
)

// The exit-status rule (README, "Exit status"), applied by every command
// through exitStatus:
//
//   - 0: everything asked for was done.
//   - 2: bad usage or input: the command line is wrong, or what it names
//     cannot be used as asked: a file that cannot be read, is malformed or
//     passes a limit; parameters a stage refuses; a stage executable that
//     is missing, not executable or not the pinned one; an output target
//     that may not be replaced; a run folder that is not empty or is in
//     use by another run; a manifest whose pipeline or inputs changed.
//     In a run of several sections, a section that failed because of its
//     input counts as such.
//   - 1: processing failed: the work started and did not all succeed
//     (a section or a stage failed, also with on_error "continue"; a stage
//     crashed, timed out or broke its protocol; outputs differ from their
//     manifest; writing failed), or foilwright itself failed (a bug).
//   - 3: measured fine, out of tolerance: a comparison with the design ran
//     and a measured point lies outside its tolerance (compare; run with a
//     compare block, when every section succeeded).
//   - 130: interrupted (Ctrl-C or SIGTERM), whatever else happened.
//
// When both kinds of failure happen in one run, 2 wins: the input must
// be fixed first.

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

// inputCauses are the errors that mean bad usage or input wherever they
// come from.
var inputCauses = []error{
	limits.ErrLimit,
	atomicfile.ErrNotRegular, atomicfile.ErrNoFolder,
	pipeline.ErrFolderNotEmpty, pipeline.ErrFolderLocked, pipeline.ErrFolderUnsafe,
	pipeline.ErrPipelineChanged, pipeline.ErrInputChanged, pipeline.ErrNotManifest,
	pipeline.ErrBadInput, pipeline.ErrNotMergeable, pipeline.ErrNotResumable,
	stage.ErrBadInput,
	host.ErrNotFound, host.ErrNotExecutable, host.ErrChecksum, host.ErrTooManyNodes,
}

// isInputError reports whether err was caused by the input or usage.
func isInputError(err error) bool {
	var in *inputError
	if errors.As(err, &in) {
		return true
	}
	var list pipeline.ErrorList
	if errors.As(err, &list) {
		return true
	}
	for _, target := range inputCauses {
		if errors.Is(err, target) {
			return true
		}
	}
	return false
}

// exitStatus is the one rule that turns a command's outcome into its exit
// status: err is what the command returned, started whether its own work
// began (errors before it are usage errors), interrupted whether a signal
// asked it to stop.
func exitStatus(err error, started, interrupted bool) int {
	switch {
	case err == nil:
		return exitOK
	case interrupted:
		return exitInterrupted
	case !started || isInputError(err):
		return exitUsage
	}
	var tol *toleranceError
	if errors.As(err, &tol) {
		return exitOutOfTolerance
	}
	return exitFailed
}

// internalError is the error of a panic in a command: a bug in
// foilwright, reported with where it happened and no stack dump.
type internalError struct {
	value any
	where string
}

func (e *internalError) Error() string {
	return fmt.Sprintf("internal error (a bug in foilwright; please report it): %v (at %s)", e.value, e.where)
}

// recovered turns a panic value into an internalError naming the function
// of ours that panicked.
func recovered(v any) error {
	pcs := make([]uintptr, 32)
	n := runtime.Callers(3, pcs)
	frames := runtime.CallersFrames(pcs[:n])
	where := "unknown"
	for {
		f, more := frames.Next()
		if strings.Contains(f.Function, "foilwright/foilwright") && !strings.HasSuffix(f.Function, ".recovered") {
			where = fmt.Sprintf("%s (%s:%d)", f.Function[strings.LastIndex(f.Function, "/")+1:], shortFile(f.File), f.Line)
			break
		}
		if !more {
			break
		}
	}
	return &internalError{value: v, where: where}
}

// shortFile is a source path's folder and file name.
func shortFile(p string) string {
	return filepath.Join(filepath.Base(filepath.Dir(p)), filepath.Base(p))
}

// usageHint writes how to get help for the command that failed before it
// started.
func usageHint(w io.Writer, path string) {
	if path == "" {
		path = "foilwright"
	}
	fmt.Fprintf(w, "Run '%s --help' for usage.\n", path)
}
