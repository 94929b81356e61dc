package main

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"

	"github.com/foilwright/foilwright/internal/atomicfile"
	"github.com/foilwright/foilwright/internal/limits"
	"github.com/foilwright/foilwright/pipeline"
	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
)

// TestExitStatusRule is the regression test of defect 15 of issue 11: exit
// statuses disagreed (on_error "continue" failures gave 0; the same bad
// input gave 2 in prep and 1 in run). One function, exitStatus, decides
// for every command.
func TestExitStatusRule(t *testing.T) {
	for _, tc := range []struct {
		name        string
		err         error
		started     bool
		interrupted bool
		want        int
	}{
		{"ok", nil, true, false, exitOK},
		{"ok although interrupted", nil, true, true, exitOK},
		{"usage before the command started", errors.New("unknown flag"), false, false, exitUsage},
		{"marked bad input", badInputf("--panels 8"), true, false, exitUsage},
		{"a limit", &limits.Error{File: "f", Limit: limits.InputBytes}, true, false, exitUsage},
		{"a refused target", &atomicfile.TargetError{Path: "x", Err: atomicfile.ErrNotRegular}, true, false, exitUsage},
		{"folder in use", fmt.Errorf("%w: x", pipeline.ErrFolderLocked), true, false, exitUsage},
		{"pipeline file", pipeline.ErrorList{&pipeline.Error{File: "p.json"}}, true, false, exitUsage},
		{"section input", fmt.Errorf("2 of 3 did not complete (%w)", pipeline.ErrBadInput), true, false, exitUsage},
		{"stage refuses the section", &host.Error{Err: stage.BadInputf("too few nodes")}, true, false, exitUsage},
		{"too many nodes", &host.Error{Err: host.ErrTooManyNodes}, true, false, exitUsage},
		{"stage crashed", &host.Error{Err: host.ErrCrashed}, true, false, exitFailed},
		{"stage timed out", &host.Error{Err: host.ErrTimeout}, true, false, exitFailed},
		{"sections failed", errors.New("1 of 2 section(s) did not complete"), true, false, exitFailed},
		{"a bug", recovered("boom"), true, false, exitFailed},
		{"interrupted", errors.New("context canceled"), true, true, exitInterrupted},
		{"interrupted before it started", errors.New("x"), false, true, exitInterrupted},
	} {
		if got := exitStatus(tc.err, tc.started, tc.interrupted); got != tc.want {
			t.Errorf("%s: %d, want %d", tc.name, got, tc.want)
		}
	}
	if msg := panicky().Error(); !strings.Contains(msg, "internal error") || !strings.Contains(msg, "foilwright.panicky (foilwright/exit_test.go:") {
		t.Errorf("internal error %q does not say where", msg)
	}
}

// panicky panics as a command with a bug would, and recovers as execute
// does.
func panicky() (err error) {
	defer func() {
		if v := recover(); v != nil {
			err = recovered(v)
		}
	}()
	var m map[string]int
	m["boom"]++
	return nil
}

// TestSameBadInputSameStatus: a file prep refuses with 2 gives 2 in run
// too, with the file and line; a stage that fails with on_error
// "continue" gives 1, not 0.
func TestSameBadInputSameStatus(t *testing.T) {
	dir := t.TempDir()
	bad := filepath.Join(dir, "bad.csv")
	os.WriteFile(bad, []byte("# units: mm\n1 2\n3 4\nNaN 5\n"), 0o644)
	_, stderr, code := runCLI(t, "prep", bad, "-o", filepath.Join(dir, "s.json"))
	if code != exitUsage || !strings.Contains(stderr, "bad.csv:4") {
		t.Errorf("prep: exit %d, %s", code, stderr)
	}
	pipe := filepath.Join(dir, "pipeline.json")
	os.WriteFile(pipe, []byte(`{"foilwright": 1, "name": "p", "inputs": [{"files": ["bad.csv"]}], "outputs": {"folder": "run"}}`), 0o644)
	stdout, stderr, code := runCLI(t, "run", pipe, "-q")
	if code != exitUsage || !strings.Contains(stdout+stderr, "bad.csv:4") {
		t.Errorf("run: exit %d, %s%s", code, stdout, stderr)
	}

	probe := "../../examples/tunnel-model/probe.csv"
	data, _ := os.ReadFile(probe)
	os.WriteFile(filepath.Join(dir, "probe.csv"), data, 0o644)
	os.WriteFile(pipe, []byte(`{"foilwright": 1, "name": "p", "inputs": [{"files": ["probe.csv"]}],
	  "stages": [{"id": "big", "stage": "thin-aerofoil", "on_error": "continue"}], "outputs": {"folder": "run2"}}`), 0o644)
	stdout, stderr, code = runCLI(t, "--limit", "result-bytes=100", "run", pipe)
	if code != exitFailed || !strings.Contains(stdout, "partial") {
		t.Errorf("a stage failing with on_error continue: exit %d, want %d\n%s%s", code, exitFailed, stdout, stderr)
	}
}

// TestUsageHintNamesTheCommand: the hint after a usage error names the
// command that was used.
func TestUsageHintNamesTheCommand(t *testing.T) {
	_, stderr, code := runCLI(t, "prep")
	if code != exitUsage || !strings.Contains(stderr, "Run 'foilwright prep --help' for usage.") {
		t.Errorf("exit %d, %q", code, stderr)
	}
}

// TestOutputTargetsRefused is the command-line test of defects 3 and 13 of
// issue 11: prep -o onto a FIFO, a symbolic link or a folder left a regular
// file in its place, and prep --nodes n.dat -o nodir/o.json left n.dat. A
// target that may not be written is refused before any work, exit 2, and
// nothing is written.
func TestOutputTargetsRefused(t *testing.T) {
	probe := "../../examples/tunnel-model/probe.csv"
	dir := t.TempDir()
	good := filepath.Join(dir, "good.json")
	os.WriteFile(good, []byte("earlier good output"), 0o644)
	fifo := filepath.Join(dir, "out.fifo")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatal(err)
	}
	link := filepath.Join(dir, "link.json")
	os.Symlink("good.json", link)
	folder := filepath.Join(dir, "folder")
	os.Mkdir(folder, 0o755)
	for _, tc := range []struct {
		name string
		args []string
		msg  string
	}{
		{"fifo", []string{"prep", probe, "-o", fifo}, "out.fifo is a FIFO"},
		{"link", []string{"prep", probe, "-o", link}, "link.json is a symbolic link"},
		{"folder", []string{"prep", probe, "-o", folder}, "folder is a folder"},
		{"nodes onto a fifo", []string{"prep", probe, "-o", good, "--nodes", fifo}, "out.fifo is a FIFO"},
		{"missing folder", []string{"prep", probe, "--nodes", filepath.Join(dir, "n.dat"), "-o", filepath.Join(dir, "nodir", "o.json")}, "folder that does not exist"},
		{"plot sibling onto a link", []string{"prep", probe, "-o", good, "--plot", filepath.Join(dir, "p.svg")}, "p-nodes.svg is a symbolic link"},
		{"shape onto a link", []string{"shape", "naca4", "0012", "-o", link}, "link.json is a symbolic link"},
		{"points onto a fifo", []string{"points", probe, "-o", fifo}, "out.fifo is a FIFO"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if tc.name == "plot sibling onto a link" {
				os.Symlink("good.json", filepath.Join(dir, "p-nodes.svg"))
			}
			before, _ := os.ReadDir(dir)
			_, stderr, code := runCLI(t, tc.args...)
			if code != exitUsage || !strings.Contains(stderr, tc.msg) {
				t.Errorf("exit %d, %q; want %d and %q", code, stderr, exitUsage, tc.msg)
			}
			after, _ := os.ReadDir(dir)
			if len(after) != len(before) {
				t.Errorf("%d entries before, %d after", len(before), len(after))
			}
			if fi, err := os.Lstat(fifo); err != nil || fi.Mode()&os.ModeNamedPipe == 0 {
				t.Error("the FIFO was replaced")
			}
			if fi, err := os.Lstat(link); err != nil || fi.Mode()&os.ModeSymlink == 0 {
				t.Error("the link was replaced")
			}
			if got, _ := os.ReadFile(good); string(got) != "earlier good output" {
				t.Errorf("good.json = %q", got)
			}
		})
	}
}

// TestInputLimits is the regression test of defect 11 of issue 11: prep
// /dev/zero, 2 GB on stdin and a ten-million-line CSV ended in a fatal
// out-of-memory crash. Inputs are read within input-bytes and
// input-lines; the message names the limit and how to raise it. (The full
// sizes run in scripts/reliability.sh.)
func TestInputLimits(t *testing.T) {
	dir := t.TempDir()
	big := filepath.Join(dir, "big.csv")
	os.WriteFile(big, []byte("# units: mm\n"+strings.Repeat("1.5,2.5\n", 5000)), 0o644)
	for _, tc := range []struct {
		name  string
		args  []string
		stdin string
		msg   string
	}{
		{"dev zero", []string{"--limit", "input-bytes=1MiB", "prep", "/dev/zero"}, "", "/dev/zero: more than 1 MiB: over the input-bytes limit of 1 MiB (raise it with --limit input-bytes="},
		{"stdin", []string{"--limit", "input-bytes=64KiB", "prep", "-"}, strings.Repeat("1.5,2.5\n", 20000), "stdin: more than 64 KiB"},
		{"lines", []string{"--limit", "input-lines=1000", "prep", big}, "", "big.csv: more than 1000 lines: over the input-lines limit"},
		{"lines in points", []string{"--limit", "input-lines=1000", "points", big}, "", "over the input-lines limit"},
		{"bad setting", []string{"--limit", "input-bytes=lots", "prep", big}, "", "input-bytes=lots"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var out, errb strings.Builder
			code := execute(append(tc.args, "-o", filepath.Join(dir, "s.json")), strings.NewReader(tc.stdin), &out, &errb)
			if code != exitUsage || !strings.Contains(errb.String(), tc.msg) {
				t.Errorf("exit %d, %q; want %d and %q", code, errb.String(), exitUsage, tc.msg)
			}
		})
	}
	t.Setenv(LimitsEnv, "input-lines=1000")
	if _, stderr, code := runCLI(t, "prep", big); code != exitUsage || !strings.Contains(stderr, "input-lines") {
		t.Errorf("%s: exit %d, %q", LimitsEnv, code, stderr)
	}
}

// TestParamsLimits: --params is bounded like a pipeline file.
func TestParamsLimits(t *testing.T) {
	sec := writeSection(t, t.TempDir(), "0012", 20)
	deep := `{"x": ` + strings.Repeat("[", 100) + strings.Repeat("]", 100) + "}"
	code, _, stderr := run(t, "", "analyze", sec, "--params", deep)
	if code != exitUsage || !strings.Contains(stderr, "--params") || !strings.Contains(stderr, "json-depth") {
		t.Errorf("exit %d, %q", code, stderr)
	}
}
