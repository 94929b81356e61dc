package reliability

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
	"time"
)

// A Group is a part of the catalogue, with a table of its own.
type Group string

// Groups of the catalogue.
const (
	// GroupInput holds bad inputs: every one must exit 2 naming the file
	// and line, or the file, key or flag.
	GroupInput Group = "input"
	// GroupFault holds stage faults: each must end within its time limits
	// with a clear message, leaving no process and no partial output.
	GroupFault Group = "fault"
	// GroupTrial holds Ctrl-C at three moments, concurrent runs into one
	// folder, and symlinks and special files as outputs.
	GroupTrial Group = "trial"
)

// A Case is one entry of the catalogue: a command line run in a folder of
// its own, what it should give, and what to check afterwards.
type Case struct {
	Name   string
	Group  Group
	Reader string // the reader or part under test: delimited, listing, dxf, stl, section, pipeline, manifest, flags, special
	What   string // one line: what is wrong with the input
	Slow   bool   // only in the full campaign (large inputs, long waits)
	// FastOnly marks a cheap stand-in of a slow case (a limit lowered on
	// the command line), left out of the full campaign.
	FastOnly bool
	Dir      string // the case folder, the command's working folder
	Args     []string
	// Stdin, when set, is written to the command's standard input until it
	// returns or the command stops reading.
	Stdin func(w io.Writer) error
	// Feed, when set, names a FIFO in Dir that the runner fills with 64 KiB
	// of random text while the command runs.
	Feed string
	// Want is the exit status the case should give.
	Want int
	// Names are what the message should name: file base names, keys or
	// flags. The first is the file whose line the message should give.
	Names []string
	// Forbid lists what the message must not say (a misleading message).
	Forbid []string
	// Interrupt, when not zero, sends SIGINT to the command's process
	// group this long after it started (Ctrl-C in a terminal).
	Interrupt time.Duration
	// Expected lists the paths (relative to Dir) a run may create or
	// change; any other change counts as a partial output or a replaced
	// target. "*" allows every change (the case checks what it wants).
	Expected []string
	// Before, when set, runs before the case is measured, to set up an
	// earlier run; an error ends the campaign.
	Before func(r *Runner) error
	// Check, when set, returns the problems it finds after the run.
	Check func(r *Runner, o *Outcome) []string
	// Exec, when set, runs the case instead of the single command (a trial
	// of several processes); it fills the outcome.
	Exec func(r *Runner, o *Outcome)
	// Limit is how long the case may run by design (the stage timeouts it
	// sets); past Limit + Grace it counts as hung.
	Limit time.Duration
}

// Grace is how long past its Limit a case may take before it counts as
// hung.
const Grace = 3 * time.Second

// Options say what Build puts in the catalogue.
type Options struct {
	// Dir is the folder the case folders are made in.
	Dir string
	// Slow includes the large inputs and long trials.
	Slow bool
	// Server is the binary that serves the fault stages ("__fault"); the
	// case folders hold wrapper scripts that run it.
	Server string
	// Device, when set, adds the case of -o onto a character device node
	// made in the case folder. Run it only against a binary that refuses
	// special targets.
	Device bool
}

// builder makes case folders.
type builder struct {
	opts  Options
	cases []*Case
	err   error
}

// add makes the folder of c (Dir/<group>/<name>) and appends c; files are
// written into it by the caller with file.
func (b *builder) add(c *Case) *Case {
	if c.Want == 0 && c.Group == GroupInput {
		c.Want = 2
	}
	c.Dir = filepath.Join(b.opts.Dir, string(c.Group), c.Name)
	if err := os.MkdirAll(c.Dir, 0o755); err != nil && b.err == nil {
		b.err = err
	}
	b.cases = append(b.cases, c)
	return c
}

// file writes data to name in the folder of c.
func (b *builder) file(c *Case, name string, data []byte) string {
	p := filepath.Join(c.Dir, name)
	if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil && b.err == nil {
		b.err = err
	}
	if err := os.WriteFile(p, data, 0o644); err != nil && b.err == nil {
		b.err = err
	}
	return p
}

// Build writes the catalogue's case folders under opts.Dir and returns the
// cases, inputs first, then faults, then trials.
func Build(opts Options) ([]*Case, error) {
	if opts.Server == "" {
		return nil, fmt.Errorf("reliability: no binary to serve the fault stages")
	}
	b := &builder{opts: opts}
	b.inputs()
	b.faults()
	b.trials()
	if b.err != nil {
		return nil, b.err
	}
	var cases []*Case
	for _, c := range b.cases {
		if c.Slow && !opts.Slow || c.FastOnly && opts.Slow {
			continue
		}
		cases = append(cases, c)
	}
	names := map[string]bool{}
	for _, c := range cases {
		key := string(c.Group) + "/" + c.Name
		if names[key] {
			return nil, fmt.Errorf("reliability: case %s twice", key)
		}
		names[key] = true
	}
	return cases, nil
}

func sortedKeys[V any](m map[string]V) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}
