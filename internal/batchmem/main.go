//go:build unix

// Command batchmem runs a pipeline file as `foilwright run` does, in its
// own process, and prints what the run cost that process: the peak
// resident memory of the process that holds the run (not of its stage
// processes, which it starts from the foilwright executable given with
// -stages), measured by the system after the run is committed, and the
// wall time. scripts/batch-memory.sh runs it on blade batches of 1 000
// and 10 000 sections and prints the memory per section and the ratio.
//
//	go run ./internal/batchmem -pipeline batch/pipeline.json -o run -stages ./foilwright -jobs 2
//
// It prints one line of JSON: sections, ok, wall_s, peak_rss_kib and
// cpu_s (the processor time of this process, its stages apart).
package main

import (
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"os"
	"os/signal"
	"runtime"
	"runtime/pprof"
	"syscall"
	"time"

	"github.com/foilwright/foilwright/pipeline"
	"github.com/foilwright/foilwright/plugins/builtin"
	"github.com/foilwright/foilwright/plugins/host"
)

func main() {
	pipe := flag.String("pipeline", "", "the pipeline file")
	out := flag.String("o", "", "the run folder (must be new or empty)")
	jobs := flag.Int("jobs", 1, "sections made at once")
	self := flag.String("stages", "", "the foilwright executable that serves the built-in stages")
	memprof := flag.String("memprofile", "", "write a heap profile (what is live, and where it was allocated) at the end of the run")
	flag.Parse()
	if *memprof != "" {
		runtime.MemProfileRate = 4096 // fine enough to see a few hundred bytes per section
	}
	if *pipe == "" || *out == "" || *self == "" {
		fmt.Fprintln(os.Stderr, "batchmem: give -pipeline, -o and -stages")
		os.Exit(2)
	}
	if err := run(*pipe, *out, *self, *jobs, *memprof); err != nil {
		fmt.Fprintln(os.Stderr, "batchmem:", err)
		os.Exit(1)
	}
}

func run(pipe, out, self string, jobs int, memprof string) error {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	known := func(name string) bool { _, ok := builtin.Lookup(name); return ok }
	p, err := pipeline.LoadWith(pipe, pipeline.ParseOptions{Known: known})
	if err != nil {
		return err
	}
	sum, err := host.FileSHA256(self)
	if err != nil {
		return err
	}
	h, err := host.New(host.Options{Self: self})
	if err != nil {
		return err
	}
	start := time.Now()
	s, err := pipeline.Run(ctx, p.Plan(), pipeline.RunOptions{Folder: out, Jobs: jobs,
		Preparer: pipeline.Chain{}, NewRunner: pipeline.HostRunners(h, sum)})
	h.Close()
	if err != nil {
		return err
	}
	wall := time.Since(start).Seconds()
	if memprof != "" {
		f, err := os.Create(memprof)
		if err != nil {
			return err
		}
		runtime.GC()
		if err := pprof.Lookup("heap").WriteTo(f, 0); err != nil {
			f.Close()
			return err
		}
		if err := f.Close(); err != nil {
			return err
		}
	}
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return err
	}
	ok := 0
	for _, r := range s.Sections {
		if r.Status == pipeline.StatusOK {
			ok++
		}
	}
	return json.NewEncoder(os.Stdout).Encode(map[string]any{
		"sections": len(s.Sections), "ok": ok, "wall_s": wall, "peak_rss_kib": ru.Maxrss,
		"cpu_s": time.Duration(ru.Utime.Nano() + ru.Stime.Nano()).Seconds(),
	})
}
