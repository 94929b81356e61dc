package host

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"sort"
	"strings"
	"sync"
)

// StderrTail is the number of bytes of a stage's stderr the host keeps for
// error messages.
const StderrTail = 8 << 10

// tailLines is the most lines of stderr an error message shows.
const tailLines = 12

// ring keeps the last max bytes written to it. It is safe for concurrent
// use.
type ring struct {
	mu  sync.Mutex
	max int
	buf []byte

	// A Go crash report (panic, fatal error) is kept apart from the tail
	// as it is written: the goroutine dump that follows it is often longer
	// than the tail.
	partial []byte   // the line being written
	crashed []string // lines from the first crash line, at most crashLines

	// onLine, when set, gets every complete line (at most 4096 bytes of
	// it), after the ring's lock is released.
	onLine func(string)
	done   []string
}

// crashLines is the most lines of a crash report kept.
const crashLines = 400

func newRing(max int) *ring { return &ring{max: max} }

func (r *ring) Write(p []byte) (int, error) { return r.write(p, r.onLine != nil) }

// quiet returns a writer into r whose lines are not passed to onLine (the
// stage's standard streams as go-plugin forwards them, not its log).
func (r *ring) quiet() io.Writer { return quietRing{r} }

type quietRing struct{ r *ring }

func (q quietRing) Write(p []byte) (int, error) { return q.r.write(p, false) }

func (r *ring) write(p []byte, collect bool) (int, error) {
	r.mu.Lock()
	r.scan(p, collect)
	lines := r.done
	r.done = nil
	n := r.keep(p)
	r.mu.Unlock()
	for _, l := range lines {
		r.onLine(l)
	}
	return n, nil
}

// keep appends p to the tail, dropping the oldest bytes beyond max.
func (r *ring) keep(p []byte) int {
	n := len(p)
	if len(p) >= r.max {
		p = p[len(p)-r.max:]
		r.buf = append(r.buf[:0], p...)
		return n
	}
	if over := len(r.buf) + len(p) - r.max; over > 0 {
		r.buf = append(r.buf[:0], r.buf[over:]...)
	}
	r.buf = append(r.buf, p...)
	return n
}

// scan follows the lines written for the start of a Go crash report, and
// collects them for onLine when collect is set.
func (r *ring) scan(p []byte, collect bool) {
	for len(p) > 0 {
		i := bytes.IndexByte(p, '\n')
		if i < 0 {
			if len(r.partial) < 4096 {
				r.partial = append(r.partial, p[:min(len(p), 4096-len(r.partial))]...)
			}
			return
		}
		if len(r.partial) < 4096 {
			r.partial = append(r.partial, p[:min(i, 4096-len(r.partial))]...)
		}
		line := string(r.partial)
		r.partial = r.partial[:0]
		p = p[i+1:]
		if collect {
			r.done = append(r.done, line)
		}
		switch {
		case r.crashed != nil && len(r.crashed) < crashLines:
			r.crashed = append(r.crashed, line)
		case r.crashed == nil && crashStart(line):
			r.crashed = []string{line}
		}
	}
}

// crashStart reports whether line begins a Go crash report.
func crashStart(line string) bool {
	return strings.HasPrefix(line, "panic: ") || strings.HasPrefix(line, "fatal error: ") || strings.HasPrefix(line, "runtime: out of memory")
}

func (r *ring) String() string {
	r.mu.Lock()
	defer r.mu.Unlock()
	return string(r.buf)
}

// lines returns the most telling lines of the tail, for an error message:
// the last lines, at most tailLines of them, hclog JSON lines shown as
// "level: message key=value ...". A Go panic or fatal error is summed up
// as its message and the first function of the stage's own code it went
// through, not as a stack dump.
func (r *ring) lines() string {
	all := strings.Split(strings.TrimRight(r.String(), "\n"), "\n")
	if len(all) == 1 && all[0] == "" {
		return ""
	}
	r.mu.Lock()
	crashed := append([]string(nil), r.crashed...)
	r.mu.Unlock()
	if crashed != nil {
		var before []string
		for i, l := range all {
			if l == crashed[0] {
				before = all[:i]
				break
			}
		}
		return strings.Join(append(keepBefore(before), crash(crashed)...), "\n")
	}
	out := all[max(0, len(all)-tailLines):]
	for i, l := range out {
		out[i] = readable(l)
	}
	return strings.Join(out, "\n")
}

// keepBefore returns, readable, up to three lines logged before a crash.
func keepBefore(ls []string) []string {
	var out []string
	for _, l := range ls[max(0, len(ls)-3):] {
		if l = readable(l); strings.TrimSpace(l) != "" {
			out = append(out, l)
		}
	}
	return out
}

// crash sums up a Go crash report: the panic or fatal-error lines up to
// the first goroutine header, then "at FUNCTION (FILE:LINE)" for the first
// frame outside the Go runtime.
func crash(ls []string) []string {
	var out []string
	i := 0
	for ; i < len(ls) && !strings.HasPrefix(ls[i], "goroutine ") && len(out) < 4; i++ {
		if l := strings.TrimSpace(ls[i]); l != "" && !strings.HasPrefix(l, "[signal") {
			out = append(out, ls[i])
		}
	}
	for ; i+1 < len(ls); i++ {
		fn, file := strings.TrimSpace(ls[i]), strings.TrimSpace(ls[i+1])
		if strings.HasPrefix(ls[i], "goroutine ") || !strings.HasPrefix(ls[i+1], "\t") {
			continue
		}
		if strings.HasPrefix(fn, "runtime.") || strings.HasPrefix(fn, "panic(") {
			continue
		}
		if k := strings.LastIndex(file, " +0x"); k > 0 {
			file = file[:k]
		}
		if k := strings.LastIndex(fn, "("); k > 0 {
			fn = fn[:k]
		}
		out = append(out, fmt.Sprintf("at %s (%s)", fn, file))
		break
	}
	return out
}

// readable turns an hclog JSON line into "level: message k=v ..."; other
// lines are returned as they are.
func readable(line string) string {
	if !strings.HasPrefix(line, "{") {
		return line
	}
	var m map[string]any
	if json.Unmarshal([]byte(line), &m) != nil {
		return line
	}
	msg, ok := m["@message"].(string)
	if !ok {
		return line
	}
	level, _ := m["@level"].(string)
	keys := make([]string, 0, len(m))
	for k := range m {
		if !strings.HasPrefix(k, "@") && k != "stack" {
			keys = append(keys, k)
		}
	}
	sort.Strings(keys)
	var b strings.Builder
	fmt.Fprintf(&b, "%s: %s", level, msg)
	for _, k := range keys {
		fmt.Fprintf(&b, " %s=%v", k, m[k])
	}
	return b.String()
}
