package reliability

import (
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
	"time"
)

// TestJudge checks the rows a verdict lands in, on outcomes made by hand.
func TestJudge(t *testing.T) {
	in := &Case{Name: "x", Group: GroupInput, Want: 2, Names: []string{"probe.csv", "--columns"}}
	fault := &Case{Name: "f", Group: GroupFault, Want: 1, Names: []string{"stage.sh"}, Limit: time.Second}
	for _, tc := range []struct {
		name   string
		o      Outcome
		status string
		flags  []string
		clean  bool
	}{
		{"line", Outcome{Case: in, Exit: 2, Stderr: "foilwright: probe.csv:12: not a number"}, StatusLine, nil, true},
		{"line word", Outcome{Case: in, Exit: 2, Stderr: "foilwright: probe.csv: line 12 is bad"}, StatusLine, nil, true},
		{"flag", Outcome{Case: in, Exit: 2, Stderr: "foilwright: --columns 5,6: out of range"}, StatusName, nil, true},
		{"nameless", Outcome{Case: in, Exit: 2, Stderr: "foilwright: bad"}, StatusNameless, nil, false},
		{"own trace", Outcome{Case: in, Exit: 2, Stderr: "fatal error: runtime: out of memory\n\ngoroutine 1 [running]:\n"}, StatusTrace, nil, false},
		{"stage trace", Outcome{Case: in, Exit: 1, Stderr: "stage crashed\n  | goroutine 7 [running]:\n  | main.f()\n"}, StatusStageTr, nil, false},
		{"panic line only", Outcome{Case: fault, Exit: 1, Stderr: "stage.sh crashed\n  | panic: boom\n  | at main.f (main.go:12)\n"}, StatusClean, nil, true},
		{"exit 0", Outcome{Case: in, Exit: 0, New: []string{"out.json"}}, StatusExit0, []string{FlagPartial}, false},
		{"slow and big", Outcome{Case: in, Exit: 2, Stderr: "probe.csv:1: x", Wall: 6 * time.Second, MaxRSS: 2 << 30}, StatusLine, []string{FlagSlow, FlagMemory}, false},
		{"no cost under race", Outcome{Case: in, Exit: 2, Stderr: "probe.csv:1: x", Wall: 6 * time.Second, MaxRSS: 2 << 30, noCost: true}, StatusLine, nil, true},
		{"killed", Outcome{Case: fault, Exit: -1, Killed: true, Wall: 90 * time.Second}, StatusKilled, []string{FlagSlow}, false},
		{"raw rpc", Outcome{Case: fault, Exit: 1, Stderr: "stage.sh: rpc error: code = Unavailable"}, StatusClean, []string{FlagRaw}, false},
		{"fault past its limit", Outcome{Case: fault, Exit: 1, Stderr: "stage.sh: timed out", Wall: 5 * time.Second, Left: []string{"pid 1"}}, StatusClean, []string{FlagSlow, FlagLeft}, false},
		{"wrong exit", Outcome{Case: fault, Exit: 0}, StatusWrongExit, nil, false},
	} {
		v := Judge(&tc.o)
		if v.Status != tc.status || !reflect.DeepEqual(v.Flags, tc.flags) {
			t.Errorf("%s: %s %q, want %s %q (%v)", tc.name, v.Status, v.Flags, tc.status, tc.flags, v.Reasons)
		}
		if v.Clean() != tc.clean {
			t.Errorf("%s: clean %v, want %v: %v", tc.name, v.Clean(), tc.clean, v.Reasons)
		}
	}
}

// TestSnapshotDiff: new files, changed files, removed files and files
// that changed kind are told apart; allowed paths are left out.
func TestSnapshotDiff(t *testing.T) {
	dir := t.TempDir()
	write := func(name, data string) { os.WriteFile(filepath.Join(dir, name), []byte(data), 0o644) }
	write("keep.txt", "a")
	write("change.txt", "a")
	write("gone.txt", "a")
	write("kind.txt", "a")
	os.Mkdir(filepath.Join(dir, "run"), 0o755)
	before := takeSnapshot(dir)
	write("change.txt", "b")
	os.Remove(filepath.Join(dir, "gone.txt"))
	os.Remove(filepath.Join(dir, "kind.txt"))
	os.Symlink("keep.txt", filepath.Join(dir, "kind.txt"))
	write("new.txt", "n")
	write("run/out.json", "x")
	added, changed := diff(before, takeSnapshot(dir), []string{"run/**"})
	if !reflect.DeepEqual(added, []string{"new.txt"}) || !reflect.DeepEqual(changed, []string{"change.txt", "gone.txt (removed)", "kind.txt"}) {
		t.Errorf("added %q, changed %q", added, changed)
	}
}

// TestBuild builds the fast catalogue and checks its size and names.
func TestBuild(t *testing.T) {
	cases, err := Build(Options{Dir: t.TempDir(), Server: "/bin/true"})
	if err != nil {
		t.Fatal(err)
	}
	count := map[Group]int{}
	readers := map[string]bool{}
	for _, c := range cases {
		count[c.Group]++
		if c.Group == GroupInput {
			readers[c.Reader] = true
			if c.Want != 2 || len(c.Names) == 0 {
				t.Errorf("%s: want %d, names %q", c.Name, c.Want, c.Names)
			}
		}
		if c.Slow {
			t.Errorf("%s is slow, in the fast catalogue", c.Name)
		}
	}
	if count[GroupInput] < 128 || count[GroupFault] < 23 || count[GroupTrial] < 10 {
		t.Errorf("catalogue: %v", count)
	}
	for _, r := range []string{"delimited", "listing", "dxf", "stl", "section", "pipeline", "manifest", "flags", "special"} {
		if !readers[r] {
			t.Errorf("no bad input for %s", r)
		}
	}
	if !strings.HasSuffix(cases[0].Dir, filepath.Join("input", cases[0].Name)) {
		t.Errorf("case folder %s", cases[0].Dir)
	}
}
