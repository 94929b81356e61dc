// Command callbench measures what a stage call costs beyond the solver's
// own time, and a batch of calls through stage processes against the same
// calls made in process; scripts/calls-bench.sh builds it (and, with
// BASELINE, the same driver on an earlier tree), runs the two in turns and
// prints the table.
//
// One run of the driver is one round:
//
//   - overhead: each section of -sections goes through the three analysis
//     stages (vortex-panel and thin-aerofoil at 8 angles, source-panel at
//     0°, pressures and loads on, as in the rotor example) as child
//     processes, -reps calls each after an untimed warm-up; a call's
//     overhead is its wall time as the caller sees it, reply decoded,
//     less the solver's own time the stage reports (its build, factor and
//     solve phases);
//   - batch: -batch calls, a NACA 2412 of 160 panels at 17 angles, spread
//     over the three stages in turn, once in process (the stage's Run
//     called directly, its reply decoded as the host does) and once
//     through stage processes started beforehand; odd rounds run the
//     child processes first;
//   - transport: the batch's vortex-panel request -batch times to a stage
//     process that answers every call with the reply it computed for the
//     first (a built-in stage wrapped as "replay-NAME"): what a call
//     through a child process costs with no solver at all;
//   - null: -batch health checks of that stage process (go-plugin's gRPC
//     health service, a few bytes each way): the round trip between the
//     two processes with nothing to encode, the floor under every call.
//
// It prints the round as one JSON line. With -table it reads the lines of
// two trees (-before, -after) and the run folders they wrote, and prints
// the medians over rounds with their ranges.
//
//	callbench -sections r300/section.json,r700/section.json -round 1 >> after.jsonl
//	callbench -table -before before.jsonl -after after.jsonl -folders-before run-b -folders-after run-a
package main

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"time"

	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/plugins/builtin"
	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/sdk"
	"github.com/foilwright/foilwright/plugins/stage"
)

func main() {
	// The host starts this program again as the built-in stages, and as
	// the replaying stage of the transport figure.
	if len(os.Args) == 3 && os.Args[1] == "__stage" {
		name := os.Args[2]
		if inner, ok := strings.CutPrefix(name, replayPrefix); ok {
			if s, ok := builtin.Lookup(inner); ok {
				sdk.Serve(&replay{inner: s, name: name})
				os.Exit(0)
			}
		}
		if s, ok := builtin.Lookup(name); ok {
			sdk.Serve(s)
			os.Exit(0)
		}
		os.Exit(1)
	}
	var o options
	flag.StringVar(&o.sections, "sections", "", "comma-separated section documents for the overhead calls")
	flag.IntVar(&o.reps, "reps", 3, "timed calls per section and stage")
	flag.IntVar(&o.batch, "batch", 200, "calls per batch")
	flag.IntVar(&o.round, "round", 0, "round number; odd rounds run the batch through child processes first")
	flag.StringVar(&o.only, "only", "", `run only one batch, "in" (in process) or "sub" (through child processes), and print nothing: for counting instructions (scripts/calls-instr.sh)`)
	flag.BoolVar(&o.table, "table", false, "print the table from -before and -after")
	flag.StringVar(&o.before, "before", "", "rounds of the earlier tree (JSON lines)")
	flag.StringVar(&o.after, "after", "", "rounds of this tree (JSON lines)")
	flag.StringVar(&o.foldersBefore, "folders-before", "", "run folder the earlier tree wrote")
	flag.StringVar(&o.foldersAfter, "folders-after", "", "run folder this tree wrote")
	flag.Parse()
	var err error
	if o.table {
		err = table(o, os.Stdout)
	} else {
		err = round(o, os.Stdout)
	}
	if err != nil {
		fmt.Fprintln(os.Stderr, "callbench:", err)
		os.Exit(1)
	}
}

type options struct {
	sections                    string
	reps, batch, round          int
	only                        string
	table                       bool
	before, after               string
	foldersBefore, foldersAfter string
}

// roundResult is what one round measured, in milliseconds.
type roundResult struct {
	// Overhead holds every timed call's wall time less the solver's own
	// time, by stage.
	Overhead map[string][]float64 `json:"overhead_ms"`
	// Solver holds the solver's own time of the same calls.
	Solver  map[string][]float64 `json:"solver_ms"`
	BatchIn float64              `json:"batch_in_ms"`
	// BatchSub is the same batch through stage processes.
	BatchSub float64 `json:"batch_sub_ms"`
	// Replay is -batch calls of the batch's vortex-panel request to a
	// stage process that answers every call with the reply it computed
	// for the first: the transport alone (encoding, the round trip, the
	// host's decoding and checks).
	Replay float64 `json:"replay_ms,omitempty"`
	// Null is -batch health checks of the replaying stage's process:
	// the round trip alone.
	Null float64 `json:"null_ms,omitempty"`
	// BatchInCPU and BatchSubCPU are the processor time of the two
	// batches: this process's threads in process; this process's and the
	// three stage processes' through child processes (Linux; zero
	// elsewhere). On a shared machine they say what the calls cost where
	// wall times say how the machine was shared.
	BatchInCPU  float64 `json:"batch_in_cpu_ms,omitempty"`
	BatchSubCPU float64 `json:"batch_sub_cpu_ms,omitempty"`
	// ReplayCPU is the processor time of the transport's calls, this
	// process's and the replaying stage's.
	ReplayCPU float64 `json:"replay_cpu_ms,omitempty"`
	// Calls is the number of calls of a batch (-batch).
	Calls int `json:"calls,omitempty"`
}

// replayPrefix starts the name of a replaying stage: replayPrefix + the
// built-in stage it wraps.
const replayPrefix = "replay-"

// replay is a stage that computes its first reply with a built-in stage
// and answers every later call with that reply (named after itself), so
// that a call costs the transport and nothing else.
type replay struct {
	inner stage.Stage
	name  string
	mu    sync.Mutex
	reply *stage.Result
}

func (r *replay) Describe(ctx context.Context) (stage.Info, error) {
	info, err := r.inner.Describe(ctx)
	info.Name = r.name
	return info, err
}

func (r *replay) Run(ctx context.Context, req stage.Request) (stage.Result, error) {
	r.mu.Lock()
	defer r.mu.Unlock()
	if r.reply == nil {
		res, err := r.inner.Run(ctx, req)
		if err != nil {
			return res, err
		}
		if res.Doc == nil {
			return res, errors.New("replay: the stage answered JSON text, not a packed document")
		}
		doc := *res.Doc
		doc.Stage = r.name
		res.Doc = &doc
		r.reply = &res
	}
	return *r.reply, nil
}

// calls are the three analysis stages with the rotor example's parameters.
var calls = []struct{ stage, params string }{
	{"vortex-panel", `{"alpha_deg": [-4, -2, 0, 2, 4, 6, 8, 10]}`},
	{"thin-aerofoil", `{"alpha_deg": [-4, -2, 0, 2, 4, 6, 8, 10]}`},
	{"source-panel", `{"alpha_deg": [0]}`},
}

func round(o options, w io.Writer) error {
	ctx := context.Background()
	// The stages are this executable by its path, not /proc/self/exe,
	// which under valgrind is valgrind's own tool.
	exe, err := filepath.Abs(os.Args[0])
	if err != nil {
		return err
	}
	// A minute to start: under valgrind a stage starts in seconds, more
	// on a busy machine.
	h, err := host.New(host.Options{Self: exe, StartTimeout: time.Minute})
	if err != nil {
		return err
	}
	defer h.Close()
	runners := map[string]*host.Runner{}
	for _, c := range calls {
		runners[c.stage] = h.Runner(host.Builtin(c.stage))
		if _, err := runners[c.stage].Describe(ctx); err != nil {
			return err
		}
	}
	res := roundResult{Overhead: map[string][]float64{}, Solver: map[string][]float64{}, Calls: o.batch}

	var files []string
	if o.sections != "" {
		files = strings.Split(o.sections, ",")
	}
	for _, f := range files {
		data, err := os.ReadFile(f)
		if err != nil {
			return err
		}
		req := request(data)
		req.SectionName = filepath.Base(filepath.Dir(f))
		for _, c := range calls {
			req.Params = []byte(c.params)
			r := runners[c.stage]
			if _, err := r.Run(ctx, req); err != nil { // warm-up
				return fmt.Errorf("%s on %s: %w", c.stage, f, err)
			}
			for range o.reps {
				t := time.Now()
				reply, err := r.Run(ctx, req)
				wall := time.Since(t)
				if err != nil {
					return err
				}
				own := reply.Timings["build"] + reply.Timings["factor"] + reply.Timings["solve"]
				res.Overhead[c.stage] = append(res.Overhead[c.stage], ms(wall-own))
				res.Solver[c.stage] = append(res.Solver[c.stage], ms(own))
			}
		}
	}

	if o.batch > 0 {
		reqs := batchRequests(o.batch)
		stages := make([]stage.Stage, len(calls))
		subs := make([]*host.Runner, len(calls))
		for i, c := range calls {
			stages[i], _ = builtin.Lookup(c.stage)
			subs[i] = runners[c.stage]
		}
		self := os.Getpid()
		in := func() error {
			c := cpuTime(self)
			t := time.Now()
			for i, req := range reqs {
				out, err := stages[i%len(stages)].Run(ctx, req)
				if err != nil {
					return err
				}
				if len(out.JSON) > 0 { // a reply as JSON text is decoded by the host
					if _, err := stage.DecodeResult(out.JSON); err != nil {
						return err
					}
				}
			}
			res.BatchIn = ms(time.Since(t))
			res.BatchInCPU = ms(cpuTime(self) - c)
			return nil
		}
		subCPU := func() time.Duration {
			d := cpuTime(self)
			for _, r := range subs {
				d += cpuTime(r.Pid())
			}
			return d
		}
		sub := func() error {
			c := subCPU()
			t := time.Now()
			for i, req := range reqs {
				if _, err := subs[i%len(subs)].Run(ctx, req); err != nil {
					return err
				}
			}
			res.BatchSub = ms(time.Since(t))
			res.BatchSubCPU = ms(subCPU() - c)
			return nil
		}
		// One untimed call of each, then the batches in this round's order.
		for i := range calls {
			if _, err := stages[i].Run(ctx, reqs[i]); err != nil {
				return err
			}
			if _, err := subs[i].Run(ctx, reqs[i]); err != nil {
				return err
			}
		}
		replayed := h.Runner(host.Builtin(replayPrefix + calls[0].stage))
		rep := func() error {
			if _, err := replayed.Run(ctx, reqs[0]); err != nil { // computes the reply
				return err
			}
			c := cpuTime(self) + cpuTime(replayed.Pid())
			t := time.Now()
			for _, req := range reqs {
				if _, err := replayed.Run(ctx, req); err != nil {
					return err
				}
			}
			res.Replay = ms(time.Since(t))
			res.ReplayCPU = ms(cpuTime(self) + cpuTime(replayed.Pid()) - c)
			return nil
		}
		null := func() error {
			if err := replayed.Ping(ctx); err != nil {
				return err
			}
			t := time.Now()
			for range reqs {
				if err := replayed.Ping(ctx); err != nil {
					return err
				}
			}
			res.Null = ms(time.Since(t))
			return nil
		}
		order := []func() error{in, sub, rep, null}
		if o.round%2 == 1 {
			order = []func() error{null, rep, sub, in}
		}
		switch o.only {
		case "in":
			return in()
		case "sub":
			return sub()
		case "":
		default:
			return fmt.Errorf("-only %q: want in or sub", o.only)
		}
		for _, f := range order {
			if err := f(); err != nil {
				return err
			}
		}
	}
	b, err := json.Marshal(res)
	if err != nil {
		return err
	}
	_, err = fmt.Fprintf(w, "%s\n", b)
	return err
}

// batchRequests returns n requests: a NACA 2412 (NACA Report 824's
// equations) of 160 panels with a sharp trailing edge, at 17 angles.
func batchRequests(n int) []stage.Request {
	foil := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}
	var b bytes.Buffer
	if err := section.Write(&b, &section.Section{Format: section.Format, Name: "naca2412", Units: "chord", Nodes: foil.Loop(80)}); err != nil {
		panic(err)
	}
	// One request, made once (its section parsed once: the driver's
	// instructions per call are the calls'), sent n times.
	req := request(b.Bytes())
	req.Params = []byte(`{"alpha_deg": [-4,-3,-2,-1,0,1,2,3,4,5,6,7,8,9,10,11,12]}`)
	req.SectionName = "naca2412"
	reqs := make([]stage.Request, n)
	for i := range reqs {
		reqs[i] = req
	}
	return reqs
}

// cpuTime returns the processor time the threads of process pid have run
// so far, from /proc/PID/task/*/schedstat (Linux; 0 where there is no
// such file). A thread that ended took its time with it: the drivers'
// and stages' threads live as long as their process.
func cpuTime(pid int) time.Duration {
	if pid <= 0 {
		return 0
	}
	tasks, err := os.ReadDir(fmt.Sprintf("/proc/%d/task", pid))
	if err != nil {
		return 0
	}
	var sum time.Duration
	for _, t := range tasks {
		b, err := os.ReadFile(fmt.Sprintf("/proc/%d/task/%s/schedstat", pid, t.Name()))
		if err != nil {
			continue
		}
		var ns int64
		if _, err := fmt.Sscan(string(b), &ns); err == nil {
			sum += time.Duration(ns)
		}
	}
	return sum
}

func ms(d time.Duration) float64 { return float64(d) / float64(time.Millisecond) }

// table prints the figures of the two trees.
func table(o options, w io.Writer) error {
	before, err := readRounds(o.before)
	if err != nil {
		return err
	}
	after, err := readRounds(o.after)
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "%d rounds before, %d after; medians over rounds, range over rounds in brackets\n\n", len(before), len(after))
	fmt.Fprintln(w, "| figure | target | before | after |")
	fmt.Fprintln(w, "| --- | --- | --- | --- |")
	for _, c := range calls {
		fmt.Fprintf(w, "| %s call beyond the solver's own time, ms (solver ms) | ≤ 1 | %s | %s |\n", c.stage,
			overhead(before, c.stage), overhead(after, c.stage))
	}
	fmt.Fprintf(w, "| any stage call beyond the solver's own time, ms | ≤ 1 | %s | %s |\n", overhead(before, ""), overhead(after, ""))
	fmt.Fprintf(w, "| 200 calls, child process / in process | ≤ 1.1 | %s | %s |\n", ratio(before), ratio(after))
	cpuRatio := func(r roundResult) float64 {
		if r.BatchInCPU > 0 && r.BatchSubCPU > 0 {
			return r.BatchSubCPU / r.BatchInCPU
		}
		return 0
	}
	fmt.Fprintf(w, "| 200 calls, child process / in process, processor time of all processes | | %s | %s |\n", spread(before, cpuRatio), spread(after, cpuRatio))
	fmt.Fprintf(w, "| 200 calls in process, ms | | %s | %s |\n", spread(before, func(r roundResult) float64 { return r.BatchIn }), spread(after, func(r roundResult) float64 { return r.BatchIn }))
	fmt.Fprintf(w, "| 200 calls through child processes, ms | | %s | %s |\n", spread(before, func(r roundResult) float64 { return r.BatchSub }), spread(after, func(r roundResult) float64 { return r.BatchSub }))
	calls := func(r roundResult) float64 {
		if r.Calls > 0 {
			return float64(r.Calls)
		}
		return 200
	}
	perCall := func(r roundResult) float64 { return (r.BatchSub - r.BatchIn) / calls(r) }
	fmt.Fprintf(w, "| 200 calls, what a child process adds per call, ms | | %s | %s |\n", spread(before, perCall), spread(after, perCall))
	replay := func(r roundResult) float64 { return r.Replay / calls(r) }
	fmt.Fprintf(w, "| of which the transport: a call answered with a stored vortex-panel reply, ms | | %s | %s |\n", spread(before, replay), spread(after, replay))
	replayCPU := func(r roundResult) float64 { return r.ReplayCPU / calls(r) }
	fmt.Fprintf(w, "| the same, processor time of both processes per call, ms | | %s | %s |\n", spread(before, replayCPU), spread(after, replayCPU))
	null := func(r roundResult) float64 { return r.Null / calls(r) }
	fmt.Fprintf(w, "| of which the round trip: a null call (health check) to the same process, ms | | %s | %s |\n", spread(before, null), spread(after, null))
	sb, err := folders(o.foldersBefore)
	if err != nil {
		return err
	}
	sa, err := folders(o.foldersAfter)
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "| run folder per section (3 stages, full detail), MB | ≤ 0.2 | %s | %s |\n", sb, sa)
	return nil
}

func readRounds(path string) ([]roundResult, error) {
	if path == "" {
		return nil, nil
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	var out []roundResult
	sc := bufio.NewScanner(f)
	sc.Buffer(make([]byte, 1<<20), 16<<20)
	for sc.Scan() {
		var r roundResult
		if err := json.Unmarshal(sc.Bytes(), &r); err != nil {
			return nil, fmt.Errorf("%s: %v", path, err)
		}
		out = append(out, r)
	}
	return out, sc.Err()
}

// overhead gives the median over rounds of each round's median overhead of
// stage (every stage when stage is ""), with the solver's median.
func overhead(rs []roundResult, name string) string {
	if len(rs) == 0 {
		return "–"
	}
	var per, solver []float64
	for _, r := range rs {
		var o, s []float64
		for st, v := range r.Overhead {
			if name == "" || st == name {
				o = append(o, v...)
				s = append(s, r.Solver[st]...)
			}
		}
		if len(o) == 0 {
			continue
		}
		per = append(per, median(o))
		solver = append(solver, median(s))
	}
	if len(per) == 0 {
		return "–"
	}
	if name == "" {
		return withRange(per)
	}
	return fmt.Sprintf("%s (%.3g)", withRange(per), median(solver))
}

func ratio(rs []roundResult) string {
	var v []float64
	for _, r := range rs {
		if r.BatchIn > 0 {
			v = append(v, r.BatchSub/r.BatchIn)
		}
	}
	if len(v) == 0 {
		return "–"
	}
	return withRange(v)
}

func spread(rs []roundResult, f func(roundResult) float64) string {
	var v []float64
	for _, r := range rs {
		if x := f(r); x > 0 {
			v = append(v, x)
		}
	}
	if len(v) == 0 {
		return "–"
	}
	return withRange(v)
}

func withRange(v []float64) string {
	return fmt.Sprintf("%.3g (%.3g–%.3g)", median(v), slices.Min(v), slices.Max(v))
}

func median(v []float64) float64 {
	s := slices.Clone(v)
	slices.Sort(s)
	n := len(s)
	if n%2 == 1 {
		return s[n/2]
	}
	return (s[n/2-1] + s[n/2]) / 2
}

// folders sums the bytes of each section folder of a run folder (its
// sub-folders) and gives the range, in MB (10⁶ bytes), with the largest
// section named.
func folders(dir string) (string, error) {
	if dir == "" {
		return "–", nil
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		return "", err
	}
	lo, hi, name := math.Inf(1), 0.0, ""
	for _, e := range entries {
		if !e.IsDir() || strings.HasPrefix(e.Name(), ".") {
			continue
		}
		var n int64
		err := filepath.WalkDir(filepath.Join(dir, e.Name()), func(_ string, d fs.DirEntry, err error) error {
			if err != nil || d.IsDir() {
				return err
			}
			fi, err := d.Info()
			if err == nil {
				n += fi.Size()
			}
			return err
		})
		if err != nil {
			return "", err
		}
		mb := float64(n) / 1e6
		lo = min(lo, mb)
		if mb > hi {
			hi, name = mb, e.Name()
		}
	}
	if name == "" {
		return "", errors.New(dir + ": no section folders")
	}
	return fmt.Sprintf("%.3g–%.3g (largest %s)", lo, hi, name), nil
}
