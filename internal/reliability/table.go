package reliability

import (
	"fmt"
	"io"
	"regexp"
	"strings"
	"time"
)

// Thresholds of the tables.
const (
	SlowAfter   = 5 * time.Second // a bad input must be refused sooner
	MemoryLimit = 1 << 30         // peak resident memory a case may reach, bytes
)

var (
	ownTrace    = regexp.MustCompile(`(?m)^(goroutine \d+ \[|panic: |fatal error: |runtime: out of memory)`)
	stageTrace  = regexp.MustCompile(`(?m)^\s*\| *(goroutine \d+ \[|\S+\.go:\d+ \+0x)`)
	rawRPCError = regexp.MustCompile(`rpc error: code = `)
)

// A Verdict is how one outcome is judged.
type Verdict struct {
	Status  string   // the outcome's row of the status rows
	Flags   []string // the other rows it counts in
	Reasons []string // what is wrong, for the details; empty when clean
}

// Clean reports whether the outcome is what the case wants.
func (v Verdict) Clean() bool { return len(v.Reasons) == 0 }

// Status rows of the tables.
const (
	StatusLine      = "clean exit 2 naming file and line"
	StatusName      = "clean exit 2 naming file, key or flag"
	StatusNameless  = "exit 2 naming neither file nor flag"
	StatusMisleads  = "exit 2 with a misleading message"
	StatusTrace     = "Go stack trace"
	StatusStageTr   = "Go stack trace passed on from a stage"
	StatusExit1     = "exit 1"
	StatusExit0     = "exit 0"
	StatusKilled    = "no exit: ended by the campaign's limits or a signal"
	StatusClean     = "ended as documented, with a clear message"
	StatusWrongExit = "wrong exit status"

	FlagPartial  = "left partial output"
	FlagReplaced = "replaced the output target itself"
	FlagSlow     = "slower than its limit"
	FlagMemory   = "peak memory over 1 GiB"
	FlagLeft     = "left processes behind"
	FlagRaw      = "raw rpc error or misleading message"
	FlagProblems = "failed its own checks"
)

// Judge classifies an outcome.
func Judge(o *Outcome) Verdict {
	c := o.Case
	var v Verdict
	reason := func(format string, args ...any) { v.Reasons = append(v.Reasons, fmt.Sprintf(format, args...)) }
	flag := func(f string) { v.Flags = append(v.Flags, f) }
	own, passed := ownTrace.MatchString(o.Stderr), stageTrace.MatchString(o.Stderr)
	misleads := badMessage(c, o.Stderr) || (c.Group != GroupInput && rawRPCError.MatchString(o.Stderr))
	switch {
	case o.Killed || o.Signal != "":
		v.Status = StatusKilled
		reason("ended by %s after %.1f s", orString(o.Signal, "the campaign's time limit"), o.Wall.Seconds())
	case own:
		v.Status = StatusTrace
		reason("a Go stack trace on stderr (exit %d)", o.Exit)
	case passed:
		v.Status = StatusStageTr
		reason("a stage's Go stack trace on stderr (exit %d)", o.Exit)
	case c.Group == GroupInput && o.Exit == 2:
		switch {
		case misleads:
			v.Status = StatusMisleads
			reason("misleading message: %s", firstLine(o.Stderr))
		case namesLine(c, o.Stderr):
			v.Status = StatusLine
		case namesAny(c, o.Stderr):
			v.Status = StatusName
		default:
			v.Status = StatusNameless
			reason("the message names none of %s: %s", strings.Join(c.Names, ", "), firstLine(o.Stderr))
		}
	case c.Group == GroupInput && o.Exit == 1:
		v.Status = StatusExit1
		reason("exit 1, want 2: %s", firstLine(o.Stderr))
	case c.Group == GroupInput && o.Exit == 0:
		v.Status = StatusExit0
		reason("exit 0, want 2")
	case c.Group == GroupInput:
		v.Status = fmt.Sprintf("exit %d", o.Exit)
		reason("exit %d, want 2", o.Exit)
	case o.Exit != c.Want:
		v.Status = StatusWrongExit
		reason("exit %d, want %d: %s", o.Exit, c.Want, firstLine(o.Stderr))
	default:
		v.Status = StatusClean
		if c.Want != 0 && len(c.Names) > 0 && !namesAll(c, o.Stdout+o.Stderr) {
			reason("the message does not name %s: %s", strings.Join(c.Names, ", "), firstLine(o.Stderr))
		}
	}
	if misleads && v.Status != StatusMisleads {
		flag(FlagRaw)
		reason("misleading message: %s", firstLine(o.Stderr))
	}
	if len(o.New) > 0 {
		flag(FlagPartial)
		reason("left %s", strings.Join(o.New, ", "))
	}
	if len(o.Changed) > 0 {
		flag(FlagReplaced)
		reason("changed %s", strings.Join(o.Changed, ", "))
	}
	limit := SlowAfter
	if c.Limit > 0 {
		limit = c.Limit + Grace
	}
	if o.Killed || o.Wall > limit && !o.noCost {
		flag(FlagSlow)
		reason("took %.1f s (limit %.1f s)", o.Wall.Seconds(), limit.Seconds())
	}
	if o.MaxRSS > MemoryLimit && !o.noCost {
		flag(FlagMemory)
		reason("peak memory %.2f GiB", float64(o.MaxRSS)/(1<<30))
	}
	if len(o.Left) > 0 {
		flag(FlagLeft)
		reason("left %d process(es): %s", len(o.Left), strings.Join(o.Left, "; "))
	}
	if len(o.Problems) > 0 {
		flag(FlagProblems)
		v.Reasons = append(v.Reasons, o.Problems...)
	}
	return v
}

func orString(s, alt string) string {
	if s == "" {
		return alt
	}
	return s
}

// namesLine reports whether stderr names the case's first file with a line
// number (file:12, file:12:5, or the file and "line 12").
func namesLine(c *Case, stderr string) bool {
	if len(c.Names) == 0 {
		return false
	}
	f := c.Names[0]
	if regexp.MustCompile(regexp.QuoteMeta(f) + `:\d+`).MatchString(stderr) {
		return true
	}
	return strings.Contains(stderr, f) && regexp.MustCompile(`\bline \d+`).MatchString(stderr)
}

func namesAny(c *Case, s string) bool {
	for _, n := range c.Names {
		if strings.Contains(s, n) {
			return true
		}
	}
	return false
}

func namesAll(c *Case, s string) bool {
	for _, n := range c.Names {
		if !strings.Contains(s, n) {
			return false
		}
	}
	return true
}

// tally counts verdicts by row.
type tally struct {
	n     int
	rows  map[string]int
	order []string
}

func newTally() *tally { return &tally{rows: map[string]int{}} }

func (t *tally) add(v Verdict) {
	t.n++
	t.rows[v.Status]++
	for _, f := range v.Flags {
		t.rows[f]++
	}
}

func (t *tally) get(row string) int { return t.rows[row] }

// WriteTables writes the tables of the outcomes: the bad inputs as issue 11
// has it, then the stage faults and the trials.
func WriteTables(w io.Writer, outs []*Outcome) {
	groups := map[Group]*tally{GroupInput: newTally(), GroupFault: newTally(), GroupTrial: newTally()}
	for _, o := range outs {
		groups[o.Case.Group].add(Judge(o))
	}
	in := groups[GroupInput]
	fmt.Fprintf(w, "| outcome over %d bad inputs | count |\n| --- | --- |\n", in.n)
	fmt.Fprintf(w, "| clean exit 2 naming file and line / naming file, key or flag | %d / %d |\n", in.get(StatusLine), in.get(StatusName))
	fmt.Fprintf(w, "| exit 2 naming neither / with a misleading message | %d / %d |\n", in.get(StatusNameless), in.get(StatusMisleads))
	fmt.Fprintf(w, "| Go stack trace | %d, and %d passed on from stages |\n", in.get(StatusTrace), in.get(StatusStageTr))
	fmt.Fprintf(w, "| exit 1 / exit 0 where bad input should give 2 | %d / %d |\n", in.get(StatusExit1), in.get(StatusExit0))
	fmt.Fprintf(w, "| ended by the campaign's limits or a signal | %d |\n", in.get(StatusKilled))
	fmt.Fprintf(w, "| left partial output / replaced the output target itself | %d / %d |\n", in.get(FlagPartial), in.get(FlagReplaced))
	fmt.Fprintf(w, "| slower than 5 s / peak memory over 1 GiB | %d / %d |\n", in.get(FlagSlow), in.get(FlagMemory))
	for _, g := range []Group{GroupFault, GroupTrial} {
		t := groups[g]
		title := map[Group]string{GroupFault: "stage faults", GroupTrial: "trials (Ctrl-C, concurrent runs, verify, special files)"}[g]
		fmt.Fprintf(w, "\n| outcome over %d %s | count |\n| --- | --- |\n", t.n, title)
		fmt.Fprintf(w, "| %s | %d |\n", StatusClean, t.get(StatusClean))
		fmt.Fprintf(w, "| %s / Go stack trace (own / passed on) | %d / %d / %d |\n", StatusWrongExit, t.get(StatusWrongExit), t.get(StatusTrace), t.get(StatusStageTr))
		fmt.Fprintf(w, "| %s | %d |\n", StatusKilled, t.get(StatusKilled))
		fmt.Fprintf(w, "| %s / %s | %d / %d |\n", FlagSlow, FlagLeft, t.get(FlagSlow), t.get(FlagLeft))
		fmt.Fprintf(w, "| %s / %s | %d / %d |\n", FlagPartial, FlagReplaced, t.get(FlagPartial), t.get(FlagReplaced))
		fmt.Fprintf(w, "| %s / %s | %d / %d |\n", FlagRaw, FlagMemory, t.get(FlagRaw), t.get(FlagMemory))
		fmt.Fprintf(w, "| %s | %d |\n", FlagProblems, t.get(FlagProblems))
	}
}

// WriteDetails writes one line per outcome that is not clean, with its
// reasons, and the slowest and largest cases.
func WriteDetails(w io.Writer, outs []*Outcome) {
	for _, o := range outs {
		v := Judge(o)
		if v.Clean() {
			continue
		}
		fmt.Fprintf(w, "%s/%s (%s): %s\n", o.Case.Group, o.Case.Name, o.Case.What, strings.Join(v.Reasons, "; "))
	}
}

// Totals returns the number of outcomes that are not clean.
func Totals(outs []*Outcome) (bad int) {
	for _, o := range outs {
		if !Judge(o).Clean() {
			bad++
		}
	}
	return bad
}
