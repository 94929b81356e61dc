// Command reliability runs the reliability campaign of issue 11 against a
// foilwright binary and prints its tables (outcome | count) and the cases
// that are not clean. scripts/reliability.sh builds the binaries and runs
// it; see DEVELOPERS.md.
//
//	reliability -foilwright ./foilwright [-fast] [-jobs 2] [-run REGEXP]
package main

import (
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"time"

	"github.com/foilwright/foilwright/internal/reliability"
)

func main() {
	if reliability.Serve(os.Args[1:]) {
		os.Exit(0)
	}
	bin := flag.String("foilwright", "", "the foilwright binary under test (required)")
	dir := flag.String("dir", "", "folder for the case folders (default: a new temporary folder, removed after)")
	fast := flag.Bool("fast", false, "only the fast part (what the test suite runs)")
	jobs := flag.Int("jobs", 2, "cases run at once")
	device := flag.Bool("device", false, "include -o onto a character device made in the case folder (only for a binary that refuses special targets)")
	only := flag.String("run", "", "only the cases whose group/name matches this regular expression")
	timeout := flag.Duration("timeout", 90*time.Second, "time after which a case is ended and counted as hung")
	flag.Parse()
	if *bin == "" {
		fmt.Fprintln(os.Stderr, "reliability: -foilwright is required")
		os.Exit(2)
	}
	self, err := os.Executable()
	check(err)
	abs, err := filepath.Abs(*bin)
	check(err)
	root := *dir
	if root == "" {
		root, err = os.MkdirTemp("", "reliability-")
		check(err)
		defer os.RemoveAll(root)
	}
	cases, err := reliability.Build(reliability.Options{Dir: filepath.Join(root, "cases"), Slow: !*fast, Server: self, Device: *device})
	check(err)
	if *only != "" {
		re := regexp.MustCompile(*only)
		var keep []*reliability.Case
		for _, c := range cases {
			if re.MatchString(string(c.Group) + "/" + c.Name) {
				keep = append(keep, c)
			}
		}
		cases = keep
	}
	r := &reliability.Runner{Binary: abs, Server: self, Timeout: *timeout, Cap: reliability.CapBytes}
	start := time.Now()
	outs, err := reliability.RunAll(r, cases, *jobs, os.Stderr)
	check(err)
	left := reliability.Sweep(filepath.Dir(abs))
	fmt.Printf("reliability campaign: %d cases against %s in %.0f s\n\n", len(outs), abs, time.Since(start).Seconds())
	reliability.WriteTables(os.Stdout, outs)
	fmt.Println()
	if left > 0 {
		fmt.Printf("processes of the binary left at the end (ended now): %d\n\n", left)
	}
	reliability.WriteDetails(os.Stdout, outs)
}

func check(err error) {
	if err != nil {
		fmt.Fprintf(os.Stderr, "reliability: %v\n", err)
		os.Exit(1)
	}
}
