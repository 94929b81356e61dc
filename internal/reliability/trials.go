package reliability

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"time"
)

// shq quotes s for sh.
func shq(s string) string { return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'" }

// wrapper writes an executable shell script name in the folder of c that
// runs the fault stage fault: with exec (the shell becomes the stage) or
// without (the shell waits for the stage, keeping its stdout open).
func (b *builder) wrapper(c *Case, name, fault string, exec bool) string {
	line := fmt.Sprintf("%s __fault %s %s", shq(b.opts.Server), fault, shq(c.Dir))
	var script string
	if exec {
		script = "#!/bin/sh\nexec " + line + "\n"
	} else {
		script = "#!/bin/sh\n" + line + "\nstatus=$?\nexit $status\n"
	}
	p := b.file(c, name, []byte(script))
	if err := os.Chmod(p, 0o755); err != nil && b.err == nil {
		b.err = err
	}
	return p
}

// faultPipeline is a pipeline of one section through the stage ./stage.sh.
func faultPipeline(extra string) string {
	return swap(`{"id": "thin", "stage": "thin-aerofoil", "params": {"alpha_deg": [0, 4]}}`,
		`{"id": "fault", "stage": "./stage.sh"`+extra+`}`)
}

// Stage limits the fault cases give foilwright.
const (
	faultStart = 2 * time.Second
	faultCall  = time.Second
)

var faultFlags = []string{"--stage-start-timeout", "2s", "--stage-timeout", "1s"}

// faultCase is "run pipeline.json" with the fault stage behind ./stage.sh.
func (b *builder) faultCase(name, fault string, want int, exec bool) *Case {
	c := b.add(&Case{Name: name, Group: GroupFault, Reader: "stage", What: faults[fault].what,
		Args: append([]string{"run", "pipeline.json"}, faultFlags...), Names: []string{"stage.sh"}, Want: want,
		Limit: faultStart + faultCall, Expected: []string{"run/**"}})
	if !exec {
		c.What += ", behind a shell wrapper without exec"
	}
	b.file(c, "pipeline.json", []byte(faultPipeline("")))
	b.file(c, "probe.csv", []byte(goodCSV()))
	b.wrapper(c, "stage.sh", fault, exec)
	return c
}

func (b *builder) faults() {
	for _, f := range []struct {
		name, fault string
		want        int
		exec        bool
	}{
		{"ok", "ok", 0, true},
		{"crash-run", "crash-run", 1, true},
		{"crash-describe", "crash-describe", 1, true},
		{"panic-run", "panic-run", 1, true},
		{"hang-start", "hang-start", 1, true},
		{"hang-describe", "hang-describe", 1, true},
		{"hang-run", "hang-run", 1, true},
		{"ignore-sigterm", "ignore-sigterm", 1, true},
		{"stdout-before", "stdout-before", 1, true},
		{"stdout-during", "stdout-during", 0, true},
		{"exit-0", "exit-0", 1, true},
		{"bad-version", "bad-version", 1, true},
		{"bad-info", "bad-info", 1, true},
		{"reply-oversize", "reply-oversize", 1, true},
		{"result-large", "result-large", 1, true},
		{"result-not-json", "result-not-json", 1, true},
		{"result-wrong-format", "result-wrong-format", 1, true},
		{"result-nan", "result-nan", 1, true},
		{"result-deep", "result-deep", 1, true},
		{"artifact-escape", "artifact-escape", 1, true},
		{"grandchild", "grandchild", 0, true},
		{"grandchild-hang", "grandchild-hang", 1, true},
		{"memory-hog", "memory-hog", 1, true},
		{"stderr-flood", "stderr-flood", 0, true},
		{"wrapper-ok", "ok", 0, false},
		{"wrapper-hang-start", "hang-start", 1, false},
		{"wrapper-hang-run", "hang-run", 1, false},
		{"wrapper-crash-run", "crash-run", 1, false},
	} {
		c := b.faultCase(f.name, f.fault, f.want, f.exec)
		if f.fault == "stderr-flood" {
			// What is tried is that 4 MiB of log lines neither block nor
			// break the call, not how fast the host reads them: under the
			// race detector on a busy machine reading them takes longer
			// than the other cases' one-second call limit.
			c.Args = []string{"run", "pipeline.json", "--stage-start-timeout", "2s", "--stage-timeout", "20s"}
			c.Limit = faultStart + 20*time.Second
		}
	}
	c := b.faultCase("env", "env", 0, true)
	c.What = "a stage that reports whether it sees a variable of foilwright's environment"
	envCase := c
	c.Check = func(r *Runner, o *Outcome) []string {
		data, _ := os.ReadFile(filepath.Join(envCase.Dir, "run", "mid", "results", "fault.json"))
		if strings.Contains(string(data), secretValue) {
			return []string{"the stage saw " + SecretEnv}
		}
		return nil
	}
	c = b.faultCase("pin-mismatch", "ok", 2, true)
	c.What = "a stage whose sha256 is not the pinned one"
	b.file(c, "pipeline.json", []byte(faultPipeline(`, "sha256": "`+strings.Repeat("0", 64)+`"`)))
	c = b.faultCase("timeout-twice", "hang-run", 1, true)
	c.What = "a stage that hangs on two sections (the second needs a new process)"
	b.file(c, "pipeline.json", []byte(strings.Replace(faultPipeline(`, "on_error": "continue"`),
		`[{"name": "mid", "files": ["probe.csv"]}]`, `[{"name": "a", "files": ["probe.csv"]}, {"name": "b", "files": ["probe.csv"]}]`, 1)))
	c.Limit = faultStart + 2*faultCall + faultStart
	for _, f := range []struct{ name, fault string }{{"analyze-hang-start", "hang-start"}, {"analyze-crash-run", "crash-run"}, {"analyze-hang-run", "hang-run"}} {
		c := b.add(&Case{Name: f.name, Group: GroupFault, Reader: "stage", What: faults[f.fault].what + ", through analyze",
			Args:  append([]string{"analyze", "section.json", "--stage", "./stage.sh", "-o", "res.json"}, faultFlags...),
			Names: []string{"stage.sh"}, Want: 1, Limit: faultStart + faultCall})
		b.file(c, "section.json", []byte(goodSection()))
		b.seed(c, "res.json")
		b.wrapper(c, "stage.sh", f.fault, true)
	}
	c = b.add(&Case{Name: "timeout-builtin", Group: GroupFault, Reader: "stage",
		What: "vortex-panel past --stage-timeout 30ms, six times", Want: 1, Names: []string{"vortex-panel"},
		Args:  []string{"analyze", "section.json", "--stage", "vortex-panel", "--alpha", "-20:20:0.05", "--stage-timeout", "30ms", "-o", "res.json"},
		Limit: faultStart, Forbid: []string{"rpc error", "DeadlineExceeded"}, Exec: repeat(6)})
	b.file(c, "section.json", []byte(sectionNodes(manyNodes(1200))))
	b.seed(c, "res.json")
}

// repeat runs a case's command n times; the outcome is the worst of them.
func repeat(n int) func(r *Runner, o *Outcome) {
	return func(r *Runner, o *Outcome) {
		for i := range n {
			one := r.command(o.Case, o.Case.Args, 0)
			if i == 0 || one.Exit != o.Case.Want || badMessage(o.Case, one.Stderr) && !badMessage(o.Case, o.Stderr) {
				before := o.before
				*o = *one
				o.before = before
			}
			o.Wall = max(o.Wall, one.Wall)
			o.MaxRSS = max(o.MaxRSS, one.MaxRSS)
		}
	}
}

// badMessage reports whether stderr holds what c forbids.
func badMessage(c *Case, stderr string) bool {
	for _, f := range c.Forbid {
		if strings.Contains(stderr, f) {
			return true
		}
	}
	return false
}

// twelve is the good pipeline with twelve sections (one per copy of the
// probe file).
func twelve(stage string) string {
	t := strings.Replace(pipelineText, `[{"name": "mid", "files": ["probe.csv"]}]`, `[{"files": ["probes/*.csv"], "per_file": true}]`, 1)
	if stage != "" {
		t = strings.Replace(t, `{"id": "thin", "stage": "thin-aerofoil", "params": {"alpha_deg": [0, 4]}}`, stage, 1)
	}
	return t
}

func (b *builder) twelveProbes(c *Case) {
	for i := range 12 {
		b.file(c, fmt.Sprintf("probes/s%02d.csv", i), []byte(goodCSV()))
	}
}

func (b *builder) trials() {
	// Ctrl-C while a stage starts, while it runs, and while a run
	// replaces an earlier one.
	c := b.add(&Case{Name: "ctrl-c-start", Group: GroupTrial, Reader: "interrupt", What: "Ctrl-C while a stage hangs in its start",
		Args: []string{"run", "pipeline.json", "--stage-start-timeout", "60s"}, Interrupt: 1500 * time.Millisecond, Want: 130,
		Limit: 1500 * time.Millisecond, Names: []string{}, Expected: []string{"run/**"}})
	b.file(c, "pipeline.json", []byte(faultPipeline("")))
	b.file(c, "probe.csv", []byte(goodCSV()))
	b.wrapper(c, "stage.sh", "hang-start", true)
	c = b.add(&Case{Name: "ctrl-c-wrapper-start", Group: GroupTrial, Reader: "interrupt", What: "Ctrl-C while a stage behind a shell wrapper without exec hangs in its start",
		Args: []string{"run", "pipeline.json", "--stage-start-timeout", "60s"}, Interrupt: 1500 * time.Millisecond, Want: 130,
		Limit: 1500 * time.Millisecond, Names: []string{}, Expected: []string{"run/**"}})
	b.file(c, "pipeline.json", []byte(faultPipeline("")))
	b.file(c, "probe.csv", []byte(goodCSV()))
	b.wrapper(c, "stage.sh", "hang-start", false)
	c = b.add(&Case{Name: "ctrl-c-run", Group: GroupTrial, Reader: "interrupt", What: "Ctrl-C while a stage hangs in Run",
		Args: []string{"run", "pipeline.json", "--stage-timeout", "60s"}, Interrupt: 2500 * time.Millisecond, Want: 130,
		Limit: 2500 * time.Millisecond, Names: []string{}, Expected: []string{"run/**"}})
	b.file(c, "pipeline.json", []byte(faultPipeline("")))
	b.file(c, "probe.csv", []byte(goodCSV()))
	b.wrapper(c, "stage.sh", "hang-run", true)

	c = b.add(&Case{Name: "ctrl-c-replace", Group: GroupTrial, Reader: "interrupt", What: "Ctrl-C while a run of 12 sections replaces an earlier one",
		Args: []string{"run", "pipeline.json", "--replace"}, Interrupt: 2 * time.Second, Want: 130, Limit: 2 * time.Second,
		Names: []string{}, Expected: []string{"run/**", "pipeline.json"}})
	b.twelveProbes(c)
	b.wrapper(c, "stage.sh", "slow", true)
	b.earlierRun(c, twelve(`{"id": "thin", "stage": "./stage.sh"}`))

	c = b.add(&Case{Name: "replace-fails", Group: GroupTrial, Reader: "replace", What: "a replacement run whose stage crashes on every section",
		Args: []string{"run", "pipeline.json", "--replace", "--stage-start-timeout", "5s"}, Want: 1, Limit: 20 * time.Second,
		Names: []string{}, Expected: []string{"run/**", "pipeline.json"}})
	b.twelveProbes(c)
	b.wrapper(c, "stage.sh", "crash-run", true)
	b.earlierRun(c, twelve(`{"id": "thin", "stage": "./stage.sh"}`))

	c = b.add(&Case{Name: "verify-tampered", Group: GroupTrial, Reader: "verify", What: "verify a run folder with two outputs altered and one deleted",
		Args: []string{"run", "--verify", "run/manifest.json"}, Want: 1, Limit: 20 * time.Second,
		Names: []string{"mid/section.json", "mid/nodes.dat", "mid/results/thin.json"}})
	b.file(c, "pipeline.json", []byte(pipelineText))
	b.file(c, "probe.csv", []byte(goodCSV()))
	tampered := c
	c.Before = func(r *Runner) error {
		if err := r.setup(tampered, "run", "pipeline.json"); err != nil {
			return err
		}
		run := filepath.Join(tampered.Dir, "run", "mid")
		for _, p := range []string{"section.json", "results/thin.json"} {
			f, err := os.OpenFile(filepath.Join(run, p), os.O_APPEND|os.O_WRONLY, 0)
			if err != nil {
				return err
			}
			f.WriteString(" ")
			f.Close()
		}
		return os.Remove(filepath.Join(run, "nodes.dat"))
	}

	c = b.add(&Case{Name: "concurrent-runs", Group: GroupTrial, Reader: "concurrent", What: "two runs into one new folder, ten times",
		Want: 0, Limit: 30 * time.Second, Names: []string{}, Expected: []string{"*"}, Exec: concurrent(10)})
	b.file(c, "a.json", []byte(strings.Replace(pipelineText, `"alpha_deg": [0, 4]`, `"alpha_deg": [0]`, 1)))
	b.file(c, "b.json", []byte(strings.Replace(pipelineText, `"alpha_deg": [0, 4]`, `"alpha_deg": [2]`, 1)))
	b.file(c, "probe.csv", []byte(goodCSV()))

	b.specialTargets()
}

// earlierRun makes c's folder hold the pipeline text as pipeline.json
// (the one the case runs) and, before the case, a good run of twelve
// sections into "run" made by the built-in stage; the case checks that
// the earlier run is intact afterwards.
func (b *builder) earlierRun(c *Case, text string) {
	b.file(c, "pipeline.json", []byte(text))
	b.file(c, "first.json", []byte(twelve("")))
	c.Before = func(r *Runner) error { return r.setup(c, "run", "first.json") }
	c.Check = func(r *Runner, o *Outcome) []string { return intactRun(filepath.Join(c.Dir, "run"), o.before) }
}

// specialTargets are outputs that are not regular files, and run folders
// with symbolic links.
func (b *builder) specialTargets() {
	target := func(name, what string, args []string, make func(c *Case)) *Case {
		c := b.add(&Case{Name: name, Group: GroupTrial, Reader: "special", What: what, Args: args, Want: 2, Names: []string{}})
		b.file(c, "probe.csv", []byte(goodCSV()))
		b.file(c, "section.json", []byte(goodSection()))
		b.seed(c, "out.json")
		make(c)
		return c
	}
	target("out-fifo", "prep -o onto a FIFO", []string{"prep", "probe.csv", "-o", "out.fifo"}, func(c *Case) {
		mkfifo(filepath.Join(c.Dir, "out.fifo"))
		c.Names = []string{"out.fifo"}
	})
	target("out-symlink", "prep -o onto a symbolic link to a file", []string{"prep", "probe.csv", "-o", "link.json"}, func(c *Case) {
		os.Symlink("out.json", filepath.Join(c.Dir, "link.json"))
		c.Names = []string{"link.json"}
	})
	target("out-dangling", "prep -o onto a symbolic link to nothing", []string{"prep", "probe.csv", "-o", "dangling.json"}, func(c *Case) {
		os.Symlink("nowhere/x.json", filepath.Join(c.Dir, "dangling.json"))
		c.Names = []string{"dangling.json"}
	})
	target("out-folder", "prep -o onto a folder", []string{"prep", "probe.csv", "-o", "sub"}, func(c *Case) {
		os.MkdirAll(filepath.Join(c.Dir, "sub"), 0o755)
		b.file(c, "sub/keep.txt", []byte("keep\n"))
		c.Names = []string{"sub"}
	})
	if b.opts.Device {
		target("out-device", "prep -o onto a character device made in the case folder", []string{"prep", "probe.csv", "-o", "null.dev"}, func(c *Case) {
			if err := mknodNull(filepath.Join(c.Dir, "null.dev")); err != nil && b.err == nil {
				b.err = err
			}
			c.Names = []string{"null.dev"}
		})
	}
	target("nodes-fifo", "prep --nodes onto a FIFO", []string{"prep", "probe.csv", "-o", "out.json", "--nodes", "n.fifo"}, func(c *Case) {
		mkfifo(filepath.Join(c.Dir, "n.fifo"))
		c.Names = []string{"n.fifo"}
	})
	target("out-missing-folder", "prep --nodes n.dat -o nodir/o.json", []string{"prep", "probe.csv", "--nodes", "n.dat", "-o", "nodir/o.json"}, func(c *Case) {
		c.Names = []string{"nodir"}
	})
	target("analyze-out-fifo", "analyze -o onto a FIFO", []string{"analyze", "section.json", "--stage", "thin-aerofoil", "-o", "res.fifo"}, func(c *Case) {
		mkfifo(filepath.Join(c.Dir, "res.fifo"))
		c.Names = []string{"res.fifo"}
	})
	target("shape-out-symlink", "shape -o onto a symbolic link", []string{"shape", "naca4", "0012", "-o", "link.json"}, func(c *Case) {
		os.Symlink("out.json", filepath.Join(c.Dir, "link.json"))
		c.Names = []string{"link.json"}
	})
	target("run-folder-symlink", "a run folder that is a symbolic link to another folder", []string{"run", "pipeline.json"}, func(c *Case) {
		b.file(c, "pipeline.json", []byte(pipelineText))
		b.file(c, "elsewhere/keep.txt", []byte("keep\n"))
		os.Symlink("elsewhere", filepath.Join(c.Dir, "run"))
		c.Names = []string{"run"}
	})
	target("replace-symlinks-inside", "--replace of a run folder holding symbolic links out of it", []string{"run", "pipeline.json", "--replace"}, func(c *Case) {
		b.file(c, "pipeline.json", []byte(pipelineText))
		b.file(c, "outside/thin.json", []byte("victim\n"))
		b.file(c, "victim.dat", []byte("victim\n"))
		c.Names = []string{"nodes.dat"}
		c.Before = func(r *Runner) error {
			if err := r.setup(c, "run", "pipeline.json"); err != nil {
				return err
			}
			mid := filepath.Join(c.Dir, "run", "mid")
			os.Remove(filepath.Join(mid, "nodes.dat"))
			if err := os.Symlink("../../victim.dat", filepath.Join(mid, "nodes.dat")); err != nil {
				return err
			}
			os.RemoveAll(filepath.Join(mid, "results"))
			return os.Symlink("../../outside", filepath.Join(mid, "results"))
		}
	})
}

// concurrent runs two pipelines (a.json, b.json) into one new folder at
// the same moment, n times, each time in a fresh sub-folder; exactly one
// of each pair should succeed and the folder should be the run of that
// one, whole.
func concurrent(n int) func(r *Runner, o *Outcome) {
	return func(r *Runner, o *Outcome) {
		c := o.Case
		for i := range n {
			sub := *c
			sub.Dir = filepath.Join(c.Dir, fmt.Sprintf("t%d", i))
			os.MkdirAll(sub.Dir, 0o755)
			for _, f := range []string{"a.json", "b.json", "probe.csv"} {
				data, _ := os.ReadFile(filepath.Join(c.Dir, f))
				os.WriteFile(filepath.Join(sub.Dir, f), data, 0o644)
			}
			var wg sync.WaitGroup
			outs := make([]*Outcome, 2)
			for k, p := range []string{"a.json", "b.json"} {
				wg.Go(func() { outs[k] = r.command(&sub, []string{"run", p}, 0) })
			}
			wg.Wait()
			ok := 0
			for _, x := range outs {
				o.Wall = max(o.Wall, x.Wall)
				o.MaxRSS = max(o.MaxRSS, x.MaxRSS)
				if x.Exit == 0 {
					ok++
				} else if o.Stderr == "" {
					o.Stderr = x.Stderr
				}
				o.Killed = o.Killed || x.Killed
			}
			switch ok {
			case 2:
				o.Problems = append(o.Problems, fmt.Sprintf("trial %d: both runs exited 0", i))
			case 0:
				o.Problems = append(o.Problems, fmt.Sprintf("trial %d: neither run exited 0 (%s)", i, firstLine(outs[0].Stderr)))
			}
			for _, p := range runFolderProblems(filepath.Join(sub.Dir, "run")) {
				o.Problems = append(o.Problems, fmt.Sprintf("trial %d: %s", i, p))
			}
		}
	}
}

func firstLine(s string) string {
	s, _, _ = strings.Cut(strings.TrimSpace(s), "\n")
	return s
}
