package main

import (
	"os"
	"strings"
	"testing"
	"time"

	"github.com/foilwright/foilwright/internal/reliability"
)

// asCLIEnv makes the test binary act as foilwright (TestMain), so that the
// campaign runs it as a user runs the command, with no build.
const asCLIEnv = "FOILWRIGHT_TEST_AS_CLI"

// TestReliabilityCampaign runs the fast part of the reliability campaign
// of issue 11 (internal/reliability): every bad input of every reader and
// of the pipeline file, every stage fault, Ctrl-C at three moments,
// concurrent runs into one folder, verify of a tampered run, and symbolic
// links and special files as outputs, each as its own process against this
// test binary acting as foilwright. Every case must end as documented:
// bad input exits 2 naming the file and line (or the file, key or flag),
// faults end within their limits with a clear message, nothing is left
// half written, no target is replaced, no process is left behind, and (not
// under the race detector) no case takes more than 5 s or 1 GiB. The large
// inputs run in scripts/reliability.sh.
func TestReliabilityCampaign(t *testing.T) {
	if testing.Short() {
		t.Skip("the campaign starts some 250 processes")
	}
	self, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	cases, err := reliability.Build(reliability.Options{Dir: t.TempDir(), Server: self, Device: os.Geteuid() == 0})
	if err != nil {
		t.Fatal(err)
	}
	r := &reliability.Runner{Binary: self, Server: self, Env: []string{asCLIEnv + "=1"}, Timeout: 90 * time.Second,
		Cap: reliability.CapBytes, NoCost: raceEnabled}
	jobs := 4
	if raceEnabled {
		// The race detector's shadow memory passes any data limit, and every
		// process is several times slower: a fifth of the inputs, a third
		// of the faults and every trial.
		r.Cap, jobs = 0, 2
		var some []*reliability.Case
		for i, c := range cases {
			if c.Group == reliability.GroupTrial || c.Group == reliability.GroupFault && i%3 == 0 || c.Group == reliability.GroupInput && i%5 == 0 {
				some = append(some, c)
			}
		}
		cases = some
	}
	outs, err := reliability.RunAll(r, cases, jobs, nil)
	if err != nil {
		t.Fatal(err)
	}
	var tables strings.Builder
	reliability.WriteTables(&tables, outs)
	t.Logf("reliability campaign, %d cases:\n%s", len(outs), tables.String())
	for _, o := range outs {
		if v := reliability.Judge(o); !v.Clean() {
			t.Errorf("%s/%s (%s): %s", o.Case.Group, o.Case.Name, o.Case.What, strings.Join(v.Reasons, "; "))
		}
	}
}
