// Package limits names the limits foilwright puts on what it reads and on
// the stages it runs, with their defaults, parses settings of them
// ("input-bytes=1GiB"), reads input through a bounded reader, and checks
// the nesting depth of JSON text before it is parsed.
//
// Each limit has a name used on the command line (--limit NAME=VALUE) and
// in messages; a message that reports a limit says how to raise it. The
// list is written once, here (List), and shown in the README's section
// "Limits".
package limits

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
)

// Name is the name of a limit.
type Name string

// The limits.
const (
	// InputBytes is the most bytes read from one input file or standard
	// input (point files, section documents).
	InputBytes Name = "input-bytes"
	// InputLines is the most lines of one text input.
	InputLines Name = "input-lines"
	// JSONBytes is the most bytes of a pipeline file, a manifest or the
	// --params object.
	JSONBytes Name = "json-bytes"
	// JSONDepth is the deepest nesting of arrays and objects in a
	// pipeline file, a manifest, --params or a stage's result document.
	JSONDepth Name = "json-depth"
	// StageNodes, when set, is the most section nodes any stage is sent;
	// unset, each stage's own maximum (its description) holds.
	StageNodes Name = "stage-nodes"
	// ResultBytes is the most bytes of one stage reply: the result
	// document and its artifacts.
	ResultBytes Name = "result-bytes"
	// StageMemory is the data memory of each stage process (heap and
	// other private writable memory), where the system can limit it.
	StageMemory Name = "stage-memory"
)

// MaxJSONDepth is the largest JSONDepth that may be set: parameters are
// written again, indented, into a run's manifest, which grows with the
// square of their depth (1000 levels: about 2 MB), and encoding/json
// refuses 10000 levels.
const MaxJSONDepth = 1000

// Limits holds a value for each limit. Zero means no limit, except
// JSONDepth (at least 1) and StageNodes (zero: each stage's own).
type Limits struct {
	InputBytes  int64
	InputLines  int64
	JSONBytes   int64
	JSONDepth   int
	StageNodes  int
	ResultBytes int64
	StageMemory int64
}

// An Info describes one limit.
type Info struct {
	Name    Name
	Default string // as a person reads it
	Unit    string // "bytes", "lines", "levels", "nodes"
	Doc     string
}

var infos = []Info{
	{InputBytes, "128 MiB", "bytes", "bytes read from one input file or standard input"},
	{InputLines, "500000", "lines", "lines of one text input (binary STL is bounded by input-bytes only)"},
	{JSONBytes, "16 MiB", "bytes", "bytes of a pipeline file, a manifest or --params"},
	{JSONDepth, "64", "levels", "nesting of arrays and objects in a pipeline file, a manifest, --params or a stage's result (at most 1000)"},
	{StageNodes, "each stage's own", "nodes", "section nodes sent to a stage; a stage states its own maximum (stages describe)"},
	{ResultBytes, "32 MiB", "bytes", "bytes of one stage reply: the result document and its artifacts"},
	{StageMemory, "768 MiB", "bytes", "data memory of each stage process (Linux: RLIMIT_DATA; none elsewhere)"},
}

// List returns the limits in the order the README shows them.
func List() []Info { return append([]Info(nil), infos...) }

// Default returns the default limits.
func Default() Limits {
	return Limits{
		InputBytes:  128 << 20,
		InputLines:  500_000,
		JSONBytes:   16 << 20,
		JSONDepth:   64,
		ResultBytes: 32 << 20,
		StageMemory: 768 << 20,
	}
}

// Names returns the names of the limits, sorted.
func Names() []string {
	var ns []string
	for _, in := range infos {
		ns = append(ns, string(in.Name))
	}
	sort.Strings(ns)
	return ns
}

// Set applies settings of the form "NAME=VALUE", several separated by
// commas. A size takes the suffixes KiB, MiB, GiB and TiB (or k, M, G,
// T, also powers of 1024); "none" removes a limit (not json-depth).
func (l *Limits) Set(settings string) error {
	for _, s := range strings.Split(settings, ",") {
		s = strings.TrimSpace(s)
		if s == "" {
			continue
		}
		name, value, ok := strings.Cut(s, "=")
		if !ok {
			return fmt.Errorf("limit %q: want NAME=VALUE, NAME one of %s", s, strings.Join(Names(), ", "))
		}
		if err := l.set(Name(strings.TrimSpace(name)), strings.TrimSpace(value)); err != nil {
			return err
		}
	}
	return nil
}

func (l *Limits) set(name Name, value string) error {
	bad := func(why string) error { return fmt.Errorf("limit %s=%s: %s", name, value, why) }
	n, err := parseSize(value)
	if err != nil {
		return bad(err.Error())
	}
	switch name {
	case InputBytes:
		l.InputBytes = n
	case InputLines:
		l.InputLines = n
	case JSONBytes:
		l.JSONBytes = n
	case ResultBytes:
		if n > math.MaxInt32 {
			return bad("want at most 2 GiB (a gRPC message)")
		}
		l.ResultBytes = n
	case StageMemory:
		l.StageMemory = n
	case JSONDepth:
		if n < 1 || n > MaxJSONDepth {
			return bad(fmt.Sprintf("want 1 to %d", MaxJSONDepth))
		}
		l.JSONDepth = int(n)
	case StageNodes:
		if n > math.MaxInt32 {
			return bad("too large")
		}
		l.StageNodes = int(n)
	default:
		return fmt.Errorf("limit %q: unknown, want one of %s", name, strings.Join(Names(), ", "))
	}
	return nil
}

// parseSize reads a count with an optional binary suffix; "none" is 0.
func parseSize(s string) (int64, error) {
	if strings.EqualFold(s, "none") {
		return 0, nil
	}
	mult := int64(1)
	num := s
	for _, u := range []struct {
		suffix string
		mult   int64
	}{{"KiB", 1 << 10}, {"MiB", 1 << 20}, {"GiB", 1 << 30}, {"TiB", 1 << 40}, {"k", 1 << 10}, {"K", 1 << 10}, {"M", 1 << 20}, {"G", 1 << 30}, {"T", 1 << 40}} {
		if strings.HasSuffix(s, u.suffix) {
			num, mult = strings.TrimSpace(strings.TrimSuffix(s, u.suffix)), u.mult
			break
		}
	}
	x, err := strconv.ParseFloat(num, 64)
	if err != nil || x < 0 || math.IsInf(x, 0) || math.IsNaN(x) {
		return 0, errors.New(`want a count such as 1000000, a size such as 512MiB or 2GiB, or "none"`)
	}
	v := x * float64(mult)
	if v >= math.MaxInt64/2 {
		return 0, errors.New("too large")
	}
	if v > 0 && v < 1 {
		v = 1
	}
	return int64(v), nil
}

// Size writes a byte count as a person reads it: "256 MiB", "1.5 GiB",
// "1000 bytes".
func Size(n int64) string {
	switch {
	case n >= 1<<30 && n%(1<<30) == 0:
		return fmt.Sprintf("%d GiB", n>>30)
	case n >= 1<<30:
		return fmt.Sprintf("%.1f GiB", float64(n)/(1<<30))
	case n >= 1<<20 && n%(1<<20) == 0:
		return fmt.Sprintf("%d MiB", n>>20)
	case n >= 1<<20:
		return fmt.Sprintf("%.1f MiB", float64(n)/(1<<20))
	case n >= 1<<10 && n%(1<<10) == 0:
		return fmt.Sprintf("%d KiB", n>>10)
	}
	return fmt.Sprintf("%d bytes", n)
}

// ErrLimit is wrapped by every error that reports a limit reached.
var ErrLimit = errors.New("limit reached")

// An Error reports that an input went past a limit.
type Error struct {
	File  string // what was read: a file name, "stdin", "--params"
	Limit Name
	Value int64  // the limit's value
	What  string // what went past it: "more than 268435456 bytes"
}

func (e *Error) Error() string {
	return fmt.Sprintf("%s: %s: over the %s limit of %s (raise it with --limit %s=VALUE)", e.File, e.What, e.Limit, e.valueString(), e.Limit)
}

func (e *Error) valueString() string {
	switch e.Limit {
	case InputBytes, JSONBytes, ResultBytes, StageMemory:
		return Size(e.Value)
	}
	return strconv.FormatInt(e.Value, 10)
}

// Unwrap lets errors.Is find ErrLimit.
func (e *Error) Unwrap() error { return ErrLimit }
