package host

import (
	"encoding/json"
	"fmt"
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
}

func newRing(max int) *ring { return &ring{max: max} }

func (r *ring) Write(p []byte) (int, error) {
	r.mu.Lock()
	defer r.mu.Unlock()
	n := len(p)
	if len(p) >= r.max {
		p = p[len(p)-r.max:]
		r.buf = append(r.buf[:0], p...)
		return n, nil
	}
	if over := len(r.buf) + len(p) - r.max; over > 0 {
		r.buf = append(r.buf[:0], r.buf[over:]...)
	}
	r.buf = append(r.buf, p...)
	return n, nil
}

func (r *ring) String() string {
	r.mu.Lock()
	defer r.mu.Unlock()
	return string(r.buf)
}

// lines returns the most telling lines of the tail, for an error message:
// from the last Go panic or fatal error if there is one, else the last
// lines, at most tailLines of them. hclog JSON lines are shown as
// "level: message key=value ...".
func (r *ring) lines() string {
	all := strings.Split(strings.TrimRight(r.String(), "\n"), "\n")
	if len(all) == 1 && all[0] == "" {
		return ""
	}
	start := max(0, len(all)-tailLines)
	for i := len(all) - 1; i >= 0; i-- {
		if strings.HasPrefix(all[i], "panic: ") || strings.HasPrefix(all[i], "fatal error: ") {
			start = i
			break
		}
	}
	out := all[start:min(len(all), start+tailLines)]
	for i, l := range out {
		out[i] = readable(l)
	}
	return strings.Join(out, "\n")
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
