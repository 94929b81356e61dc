package main

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/spf13/cobra"
	"golang.org/x/term"

	"github.com/foilwright/foilwright/internal/atomicfile"
	"github.com/foilwright/foilwright/plot"
)

// stdoutPath is the output path that means standard output. It is never
// the name of a file.
const stdoutPath = "-"

// writeOutput writes through fill to the file path atomically, or to
// stdout when path is "-".
func writeOutput(stdout io.Writer, path string, fill func(io.Writer) error) error {
	if path == stdoutPath {
		return fill(stdout)
	}
	return atomicfile.Write(path, fill)
}

// writeBytes writes b to the file path atomically, or to stdout for "-".
func writeBytes(stdout io.Writer, path string, b []byte) error {
	return writeOutput(stdout, path, func(w io.Writer) error { _, err := w.Write(b); return err })
}

// isTerminal reports whether w is a terminal. Tests replace it.
var isTerminal = func(w io.Writer) bool {
	f, ok := w.(*os.File)
	return ok && term.IsTerminal(int(f.Fd()))
}

// outputFlag registers -o/--output for the main output of cmd, with
// completion of file names of the extensions given (any file when none),
// and the earlier --out as a hidden, deprecated alias.
func outputFlag(cmd *cobra.Command, p *string, usage string, exts ...string) {
	cmd.Flags().StringVarP(p, "output", "o", "", usage)
	deprecatedAlias(cmd.Flags(), "out", "output")
	if len(exts) > 0 {
		cmd.MarkFlagFilename("output", exts...)
	} else {
		cmd.MarkFlagFilename("output")
	}
}

// quietFlag registers -q/--quiet with the given meaning.
func quietFlag(cmd *cobra.Command, p *bool, usage string) {
	cmd.Flags().BoolVarP(p, "quiet", "q", false, usage)
}

// jsonFlag registers --json with the given meaning.
func jsonFlag(cmd *cobra.Command, p *bool, usage string) {
	cmd.Flags().BoolVar(p, "json", false, usage)
}

// oneStdout checks the outputs of a command, given as flag name and value
// pairs: at most one may be "-" (standard output), so that two documents
// never share one stream.
func oneStdout(pairs ...string) error {
	var on []string
	for i := 0; i+1 < len(pairs); i += 2 {
		if pairs[i+1] == stdoutPath {
			on = append(on, pairs[i])
		}
	}
	if len(on) > 1 {
		return badInputf("%s all write to standard output (-): give all but one a file", strings.Join(on, " and "))
	}
	return nil
}

// fileOnly refuses "-" for an output that is a set of files (pictures, a
// folder).
func fileOnly(flag, value string) error {
	if value == stdoutPath {
		return badInputf("%s -: this output is a file (or several), not a stream; give a path", flag)
	}
	return nil
}

// wrote tells the user a file was written, unless it went to stdout.
func wrote(w io.Writer, path string) {
	if path != "" && path != stdoutPath {
		fmt.Fprintf(w, "wrote %s\n", path)
	}
}

// outputs writes a command's files as one: every target is checked before
// any work (a FIFO, a device, a symbolic link, a folder or a path in a
// missing folder is refused with exit status 2), each file goes to a
// temporary beside its target, and commit renames them all, so a failure
// leaves none of them. "-" means standard output, written at once.
type outputs struct {
	stdout io.Writer
	set    atomicfile.Set
}

// newOutputs checks targets and returns the set to write them with.
func newOutputs(stdout io.Writer, targets ...string) (*outputs, error) {
	if err := atomicfile.CheckTargets(targets...); err != nil {
		return nil, err
	}
	return &outputs{stdout: stdout}, nil
}

// write adds a file written through fill; "-" writes to standard output
// at once.
func (o *outputs) write(path string, fill func(io.Writer) error) error {
	if path == stdoutPath {
		return fill(o.stdout)
	}
	return o.set.Add(path, fill)
}

// picture adds a picture, in the format its path's extension names.
func (o *outputs) picture(f *plot.Figure, path string) error {
	format, err := plot.FormatOf(path)
	if err != nil {
		o.set.Abort()
		return err
	}
	data, err := plot.Encode(f, format)
	if err != nil {
		o.set.Abort()
		return err
	}
	return o.set.Add(path, func(w io.Writer) error { _, err := io.Copy(w, bytes.NewReader(data)); return err })
}

// commit renames every file into place; abort drops them.
func (o *outputs) commit() error { return o.set.Commit() }
func (o *outputs) abort()        { o.set.Abort() }
