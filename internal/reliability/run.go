package reliability

import (
	"bufio"
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"time"
)

// CapBytes is the data-segment limit every case runs under (not under the
// race detector, whose shadow memory it would refuse): a defect that eats
// memory stops there and counts as over 1 GiB.
const CapBytes = 3 << 30

// Runner runs cases against a foilwright binary.
type Runner struct {
	// Binary is the foilwright executable under test.
	Binary string
	// Server serves the fault stages and the memory cap ("__limit"); it
	// may be Binary's test binary or the campaign's command.
	Server string
	// Env is added to the environment of every command (e.g. what makes a
	// test binary act as foilwright).
	Env []string
	// Timeout ends a command that runs longer (the case counts as hung).
	Timeout time.Duration
	// Cap is the data-segment limit of each command; 0 means none.
	Cap uint64
	// NoCost leaves time and memory out of the verdicts (a binary built
	// with the race detector is several times slower and larger); a case
	// that hangs still ends at Timeout.
	NoCost bool
}

// An Outcome is what one case gave.
type Outcome struct {
	Case   *Case
	Exit   int    // exit status; -1 when ended by a signal
	Signal string // the signal that ended it, if any
	Killed bool   // ended by the runner after Timeout
	Wall   time.Duration
	MaxRSS int64 // peak resident memory of the command and the children it waited for, bytes
	Stdout string
	Stderr string
	// New and Changed are paths of the case folder created, or changed,
	// removed or replaced by another kind of file, by the run.
	New, Changed []string
	// Left are the processes the case left behind (ended since).
	Left []string
	// Problems are what the case's own checks found.
	Problems []string

	before snapshot
	noCost bool
}

const keepOutput = 64 << 10 // bytes of stdout and stderr an outcome keeps

// Run runs c and returns its outcome; an error means the campaign itself
// failed (a Before step).
func (r *Runner) Run(c *Case) (*Outcome, error) {
	if c.Before != nil {
		if err := c.Before(r); err != nil {
			return nil, fmt.Errorf("%s: set up: %w", c.Name, err)
		}
	}
	o := &Outcome{Case: c, before: takeSnapshot(c.Dir)}
	if c.Exec != nil {
		c.Exec(r, o)
	} else {
		one := r.command(c, c.Args, c.Interrupt)
		one.before = o.before
		o = one
	}
	o.noCost = r.NoCost
	r.finish(o)
	return o, nil
}

// finish collects what the run left: changes to the case folder and
// processes, and the case's own checks.
func (r *Runner) finish(o *Outcome) {
	c := o.Case
	// Processes: give what was killed a moment to go.
	deadline := time.Now().Add(2 * time.Second)
	var left []proc
	for {
		left = marked(c.Dir, r.exes(), "")
		if len(left) == 0 || time.Now().After(deadline) {
			break
		}
		time.Sleep(50 * time.Millisecond)
	}
	for _, p := range left {
		o.Left = append(o.Left, fmt.Sprintf("pid %d: %s", p.pid, strings.Join(p.args, " ")))
		p.kill()
	}
	after := takeSnapshot(c.Dir)
	o.New, o.Changed = diff(o.before, after, c.Expected)
	if run := filepath.Join(c.Dir, "run"); allows(c.Expected, "run/x") {
		o.Problems = append(o.Problems, runFolderProblems(run)...)
	}
	if c.Check != nil {
		o.Problems = append(o.Problems, c.Check(r, o)...)
	}
}

// exes are the executables of the campaign's processes, resolved.
func (r *Runner) exes() []string {
	var out []string
	for _, p := range []string{r.Binary, r.Server} {
		if e, err := filepath.EvalSymlinks(p); err == nil {
			out = append(out, e)
		}
	}
	return out
}

// command runs args for c once, sending SIGINT to its process group after
// interrupt (when not zero).
func (r *Runner) command(c *Case, args []string, interrupt time.Duration) *Outcome {
	o := &Outcome{Case: c}
	rssFile, err := os.CreateTemp("", "reliability-rss-")
	if err != nil {
		o.Problems = append(o.Problems, err.Error())
		return o
	}
	rssFile.Close()
	defer os.Remove(rssFile.Name())
	cmd := exec.Command(r.Server, append([]string{"__limit", strconv.FormatUint(r.Cap, 10), rssFile.Name(), r.Binary}, args...)...)
	cmd.Dir = c.Dir
	cmd.Env = append(append(os.Environ(), SecretEnv+"="+secretValue), r.Env...)
	cmd.SysProcAttr = &syscall.SysProcAttr{Setpgid: true}
	var stdout, stderr capped
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	var stdin io.WriteCloser
	if c.Stdin != nil {
		var err error
		if stdin, err = cmd.StdinPipe(); err != nil {
			o.Problems = append(o.Problems, err.Error())
			return o
		}
	}
	start := time.Now()
	if err := cmd.Start(); err != nil {
		o.Exit = -1
		o.Problems = append(o.Problems, "start: "+err.Error())
		return o
	}
	pgid := cmd.Process.Pid
	var wg sync.WaitGroup
	if stdin != nil {
		wg.Go(func() {
			c.Stdin(stdin)
			stdin.Close()
		})
	}
	ctx, stop := context.WithCancel(context.Background())
	defer stop()
	if c.Feed != "" {
		wg.Go(func() { feed(ctx, filepath.Join(c.Dir, c.Feed)) })
	}
	done := make(chan struct{})
	go func() {
		timeout := r.Timeout
		if timeout <= 0 {
			timeout = time.Minute
		}
		var sigint <-chan time.Time
		if interrupt > 0 {
			sigint = time.After(interrupt)
		}
		kill := time.After(timeout)
		for {
			select {
			case <-done:
				return
			case <-sigint:
				syscall.Kill(-pgid, syscall.SIGINT)
				sigint = nil
			case <-kill:
				o.Killed = true
				syscall.Kill(-pgid, syscall.SIGKILL)
				return
			}
		}
	}()
	err = cmd.Wait()
	close(done)
	stop()
	o.Wall = time.Since(start)
	wg.Wait()
	o.Stdout, o.Stderr = stdout.String(), stderr.String()
	o.Exit = cmd.ProcessState.ExitCode()
	if ws, ok := cmd.ProcessState.Sys().(syscall.WaitStatus); ok && ws.Signaled() {
		o.Signal = ws.Signal().String()
	}
	if b, err := os.ReadFile(rssFile.Name()); err == nil {
		o.MaxRSS, _ = strconv.ParseInt(string(b), 10, 64)
	}
	var ee *exec.ExitError
	if err != nil && !errors.As(err, &ee) {
		o.Problems = append(o.Problems, err.Error())
	}
	return o
}

// feed opens the FIFO path for writing, once a reader has opened it, and
// writes 64 KiB of random text; it gives up when ctx ends.
func feed(ctx context.Context, path string) {
	var f *os.File
	for {
		var err error
		f, err = os.OpenFile(path, os.O_WRONLY|syscall.O_NONBLOCK, 0)
		if err == nil {
			break
		}
		select {
		case <-ctx.Done():
			return
		case <-time.After(10 * time.Millisecond):
		}
	}
	defer f.Close()
	r := rand.New(rand.NewPCG(14, 1))
	b := make([]byte, 64<<10)
	for i := range b {
		b[i] = "0123456789,.\n abc"[r.IntN(17)]
	}
	for len(b) > 0 && ctx.Err() == nil {
		n, err := f.Write(b)
		b = b[n:]
		if err != nil && !errors.Is(err, syscall.EAGAIN) {
			return
		}
		if n == 0 {
			time.Sleep(5 * time.Millisecond)
		}
	}
}

// setup makes a good run of the pipeline file into folder for c, before
// the case runs.
func (r *Runner) setup(c *Case, folder, pipeline string) error {
	o := r.command(c, []string{"run", pipeline}, 0)
	if o.Exit != 0 {
		return fmt.Errorf("earlier run: exit %d: %s", o.Exit, o.Stderr)
	}
	if _, err := os.Stat(filepath.Join(c.Dir, folder, "manifest.json")); err != nil {
		return fmt.Errorf("earlier run: %w", err)
	}
	return nil
}

// capped keeps the first keepOutput bytes written to it.
type capped struct {
	mu sync.Mutex
	b  bytes.Buffer
	n  int64
}

func (c *capped) Write(p []byte) (int, error) {
	c.mu.Lock()
	defer c.mu.Unlock()
	c.n += int64(len(p))
	if room := keepOutput - c.b.Len(); room > 0 {
		c.b.Write(p[:min(len(p), room)])
	}
	return len(p), nil
}

func (c *capped) String() string {
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.b.String()
}

// A snapshot is the state of a folder: for each path (slash-separated,
// relative), its kind and content digest (or link target).
type snapshot map[string]string

func takeSnapshot(dir string) snapshot {
	s := snapshot{}
	filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil || p == dir {
			return nil
		}
		rel, _ := filepath.Rel(dir, p)
		rel = filepath.ToSlash(rel)
		fi, err := os.Lstat(p)
		if err != nil {
			return nil
		}
		switch m := fi.Mode(); {
		case m&fs.ModeSymlink != 0:
			t, _ := os.Readlink(p)
			s[rel] = "link " + t
		case m.IsDir():
			s[rel] = "dir"
		case m.IsRegular():
			s[rel] = "file " + fileDigest(p)
		default:
			s[rel] = "special " + m.Type().String()
		}
		return nil
	})
	return s
}

func fileDigest(p string) string {
	f, err := os.Open(p)
	if err != nil {
		return "unreadable"
	}
	defer f.Close()
	h := sha256.New()
	io.Copy(h, f)
	return hex.EncodeToString(h.Sum(nil))
}

// allows reports whether the patterns allow a change of path: a pattern
// is a path, "dir/**" (everything below dir, and dir itself) or "*".
func allows(patterns []string, path string) bool {
	for _, p := range patterns {
		if p == "*" || p == path {
			return true
		}
		if dir, ok := strings.CutSuffix(p, "/**"); ok && (path == dir || strings.HasPrefix(path, dir+"/")) {
			return true
		}
	}
	return false
}

// diff returns the paths after holds that before did not, and those it
// changed or removed, leaving out what allowed permits.
func diff(before, after snapshot, allowed []string) (added, changed []string) {
	for p, v := range after {
		if allows(allowed, p) {
			continue
		}
		w, ok := before[p]
		switch {
		case !ok:
			added = append(added, p)
		case w != v && !(w == "dir" && v == "dir"):
			changed = append(changed, p)
		}
	}
	for p := range before {
		if _, ok := after[p]; !ok && !allows(allowed, p) {
			changed = append(changed, p+" (removed)")
		}
	}
	sort.Strings(added)
	sort.Strings(changed)
	return added, changed
}

// runFolderProblems checks a run folder, if there is one: it must hold a
// manifest, every output the manifest lists with its digest, and nothing
// else (a run committed as a whole).
func runFolderProblems(run string) []string {
	fi, err := os.Lstat(run)
	if err != nil || !fi.IsDir() {
		return nil
	}
	var m struct {
		Outputs map[string]string `json:"outputs"`
	}
	data, err := os.ReadFile(filepath.Join(run, "manifest.json"))
	if err != nil {
		entries, _ := os.ReadDir(run)
		if len(entries) == 0 {
			return nil
		}
		return []string{fmt.Sprintf("run folder holds %d entries and no manifest", len(entries))}
	}
	if err := json.Unmarshal(data, &m); err != nil {
		return []string{"run folder manifest: " + err.Error()}
	}
	var probs []string
	seen := map[string]bool{"manifest.json": true}
	for p, sum := range m.Outputs {
		seen[p] = true
		if got := fileDigest(filepath.Join(run, filepath.FromSlash(p))); got != sum {
			probs = append(probs, fmt.Sprintf("run folder: %s does not match its manifest", p))
		}
	}
	filepath.WalkDir(run, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return nil
		}
		rel, _ := filepath.Rel(run, p)
		if !seen[filepath.ToSlash(rel)] {
			probs = append(probs, fmt.Sprintf("run folder: %s is not in its manifest", filepath.ToSlash(rel)))
		}
		return nil
	})
	sort.Strings(probs)
	return probs
}

// intactRun returns how the run folder departs from the snapshot of the
// case folder before the case ran.
func intactRun(run string, before snapshot) []string {
	after := takeSnapshot(run)
	prefix := filepath.Base(run) + "/"
	var probs []string
	lost, changed := 0, 0
	total := 0
	for p, v := range before {
		rel, ok := strings.CutPrefix(p, prefix)
		if !ok || !strings.HasPrefix(v, "file ") {
			continue
		}
		total++
		switch w, ok := after[rel]; {
		case !ok:
			lost++
		case w != v:
			changed++
		}
	}
	if lost+changed > 0 {
		probs = append(probs, fmt.Sprintf("earlier run damaged: %d of %d files lost, %d changed", lost, total, changed))
	}
	return probs
}

// newBufWriter is a buffered writer of 1 MiB.
func newBufWriter(w io.Writer) *bufio.Writer { return bufio.NewWriterSize(w, 1<<20) }
