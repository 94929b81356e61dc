// Command solverbench measures the vortex-panel solver (package
// plugins/builtin/vortexpanel) against its numpy peer
// (scripts/peer/vortex_numpy.py, the same method vectorised, on the system's
// OpenBLAS) and against the machine's limit, in one run, and checks that
// both give the same results. scripts/solver-bench.sh builds and runs it.
//
// Timings are taken in turns: in each round, for each panel count, a few
// full solutions (build, factor, solve for the angles) by the Go solver in
// this process (for its phases) and by this program run as a child process
// with -serve (the Go column), then as many by the numpy peer (a child
// process answering on a pipe), then by each further Go peer (-go-peer,
// e.g. this program built with -tags openblas, or at an earlier commit,
// run with -serve). After each peer's turn the
// driver pauses (-settle), because OpenBLAS's idle threads keep spinning
// for about a tenth of a second after a call and would take a core from
// the next program timed. Each figure is the median over the rounds of the
// per-round medians, with the range of the per-round figures as its
// spread.
//
// The limit of a panel count N is ⅔N³ flops of LU at the best dense-LU rate
// measured (OpenBLAS dgetrf on one and on two threads, by the small C
// program scripts/peer/dgetrf_rate.c, and numpy.linalg.solve on a large
// system) plus N² kernel evaluations at the best rate the Go build reached
// (N² over the build time, the fastest seen at any size). Beside it, the
// dgetrf column gives OpenBLAS dgetrf's own time at the order of each
// panel count's system (best of one and two threads): at a few hundred
// rows the library runs far below its large-matrix rate, so the limit
// there is below what any factorisation was seen to reach.
//
//	go run ./internal/solverbench -check            # numpy and Go agree?
//	go run ./internal/solverbench -rounds 7 -dgetrf /tmp/dgetrf_rate
package main

import (
	"bufio"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/plugins/builtin/vortexpanel"
)

func main() {
	o := options{}
	flag.StringVar(&o.python, "python", "/usr/bin/python3", "Python with numpy for the peer")
	flag.StringVar(&o.peer, "numpy", "scripts/peer/vortex_numpy.py", "the numpy peer script")
	flag.Func("go-peer", "`NAME=PATH`: another build of this program to time beside this one (run with -serve); repeatable", func(v string) error {
		name, path, ok := strings.Cut(v, "=")
		if !ok || name == "" || path == "" {
			return errors.New("want NAME=PATH")
		}
		o.goPeers = append(o.goPeers, goPeer{name, path})
		return nil
	})
	flag.StringVar(&o.dgetrf, "dgetrf", "", "the compiled dgetrf_rate program (OpenBLAS LU rate); empty: numpy only")
	flag.StringVar(&o.panelList, "panels", "100,200,400,800,1600", "panel counts")
	flag.IntVar(&o.angles, "angles", 41, "angles of attack per solution, evenly spaced in [-10°, 10°]")
	flag.IntVar(&o.rounds, "rounds", 7, "rounds of interleaved timings")
	flag.IntVar(&o.reps, "reps", 3, "solutions per program, panel count and round")
	flag.DurationVar(&o.settle, "settle", 200*time.Millisecond, "pause after each peer's turn, for its idle threads to stop spinning (OpenBLAS's spin for about 0.1 s)")
	flag.BoolVar(&o.check, "check", false, "only compare the results of Go and numpy")
	flag.BoolVar(&o.serve, "serve", false, "answer timing requests on stdin (as a peer of another run)")
	flag.Parse()
	var err error
	switch {
	case o.serve:
		err = serve(os.Stdin, os.Stdout)
	case o.check:
		err = check(o, os.Stdout)
	default:
		err = bench(o, os.Stdout)
	}
	if err != nil {
		fmt.Fprintln(os.Stderr, "solverbench:", err)
		os.Exit(1)
	}
}

// goPeer is another build of this program, timed beside this one.
type goPeer struct{ name, path string }

type options struct {
	goPeers                         []goPeer
	python, peer, dgetrf, panelList string
	angles, rounds, reps            int
	settle                          time.Duration
	check, serve                    bool
}

func (o options) panels() ([]int, error) {
	var out []int
	for f := range strings.SplitSeq(o.panelList, ",") {
		n, err := strconv.Atoi(strings.TrimSpace(f))
		if err != nil || n < 16 {
			return nil, fmt.Errorf("-panels: want panel counts of at least 16, got %q", f)
		}
		out = append(out, n)
	}
	return out, nil
}

// section is a test section of the comparison.
type section struct {
	name  string
	nodes func(panels int) ([]geometry.Point, error)
}

var naca2412 = shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}

// sections are the sections compared: a sharp trailing edge (the timed
// one), a blunt one (base panel with a source) and a cusp (extrapolation
// rows).
var sections = []section{
	{"NACA 2412 sharp", func(n int) ([]geometry.Point, error) { return naca2412.Nodes(n), nil }},
	{"NACA 2412 blunt", func(n int) ([]geometry.Point, error) {
		s := naca2412
		s.SharpTE = false
		return s.Nodes(n), nil
	}},
	{"Joukowski cusp", func(n int) ([]geometry.Point, error) {
		return shape.KarmanTrefftz{Centre: geometry.Point{X: -0.08, Y: 0.06}}.Normalized(n)
	}},
}

// writeNodes writes nodes as "x y" lines with every digit into dir.
func writeNodes(dir, name string, nodes []geometry.Point) (string, error) {
	path := filepath.Join(dir, name)
	var b strings.Builder
	for _, p := range nodes {
		fmt.Fprintf(&b, "%.17g %.17g\n", p.X, p.Y)
	}
	return path, os.WriteFile(path, []byte(b.String()), 0o644)
}

// sweep returns count angles (radians) evenly spaced in [-10°, 10°].
func sweep(count int) []float64 {
	a := make([]float64, count)
	for i := range a {
		a[i] = (-10 + 20*float64(i)/float64(max(count-1, 1))) * math.Pi / 180
	}
	return a
}

// solveGo is one full solution: build, factor, and the results of every angle.
func solveGo(nodes []geometry.Point, alphas []float64) (*vortexpanel.Solver, []vortexpanel.Case, error) {
	sv, err := vortexpanel.New(nodes)
	if err != nil {
		return nil, nil, err
	}
	cases, err := sv.Solve(alphas)
	return sv, cases, err
}

// check solves every section at every panel count with both programs and
// prints the largest relative differences of Cl, Cm and Cp. Cl and Cm must
// agree to 1e-10. Cp is printed with the condition number κ: at the nodes
// of a sharp trailing edge it carries κ times the rounding of the
// influence coefficients (whose ln(r₁/r₂) terms are multiplied by up to
// x/s), so two correct programs agree there only to about κ·1e-13.
func check(o options, w io.Writer) error {
	panels, err := o.panels()
	if err != nil {
		return err
	}
	dir, err := os.MkdirTemp("", "solverbench")
	if err != nil {
		return err
	}
	defer os.RemoveAll(dir)
	alphasDeg := []float64{-10, -4, 0, 3.5, 10}
	alphas := make([]float64, len(alphasDeg))
	args := []string{o.peer, "solve", ""}
	for i, a := range alphasDeg {
		alphas[i] = a * math.Pi / 180
		args = append(args, strconv.FormatFloat(a, 'g', -1, 64))
	}
	fmt.Fprintf(w, "Go (factorisation: %s) against numpy, %d angles: largest relative differences\n", factorisation(), len(alphas))
	fmt.Fprintf(w, "%-16s %6s  %9s  %9s  %9s  %9s  %9s\n", "section", "panels", "Cl", "Cm", "Cp", "Cp inner", "κ")
	worst := 0.0
	for _, s := range sections {
		for _, n := range panels {
			nodes, err := s.nodes(n)
			if err != nil {
				return err
			}
			path, err := writeNodes(dir, "nodes.dat", nodes)
			if err != nil {
				return err
			}
			sv, cases, err := solveGo(nodes, alphas)
			if err != nil {
				return fmt.Errorf("%s, %d panels: %w", s.name, n, err)
			}
			args[2] = path
			out, err := exec.Command(o.python, args...).Output()
			if err != nil {
				return fmt.Errorf("numpy peer: %w", exitDetail(err))
			}
			var py struct {
				Cl, Cm []float64
				Cp     [][]float64
			}
			if err := json.Unmarshal(out, &py); err != nil {
				return fmt.Errorf("numpy peer: %w", err)
			}
			if len(py.Cl) != len(cases) || len(py.Cm) != len(cases) || len(py.Cp) != len(cases) {
				return fmt.Errorf("numpy peer: %d cases, want %d", len(py.Cl), len(cases))
			}
			var dcl, dcm, dcp, dinner float64
			for k, c := range cases {
				dcl = max(dcl, relDiff(c.Cl, py.Cl[k], 0))
				dcm = max(dcm, relDiff(c.Cm, py.Cm[k], 0))
				if len(py.Cp[k]) != len(c.Cp) {
					return fmt.Errorf("numpy peer: %d Cp values, want %d", len(py.Cp[k]), len(c.Cp))
				}
				scale := 0.0
				for _, v := range c.Cp {
					scale = max(scale, math.Abs(v))
				}
				for i, v := range c.Cp {
					d := math.Abs(v-py.Cp[k][i]) / scale
					dcp = max(dcp, d)
					if i >= 5 && i <= len(c.Cp)-6 { // away from the trailing edge
						dinner = max(dinner, d)
					}
				}
			}
			worst = max(worst, dcl, dcm)
			fmt.Fprintf(w, "%-16s %6d  %9.2g  %9.2g  %9.2g  %9.2g  %9.2g\n", s.name, n, dcl, dcm, dcp, dinner, sv.Cond())
		}
	}
	fmt.Fprintln(w, "(Cp relative to its largest magnitude; inner: all but the five nodes at each side of the trailing edge)")
	if !(worst <= 1e-10) {
		return fmt.Errorf("Go and numpy differ in Cl or Cm by %.2g (relative), more than 1e-10", worst)
	}
	fmt.Fprintf(w, "Cl and Cm agree within 1e-10 (largest difference %.2g)\n", worst)
	return nil
}

// relDiff is |a−b| relative to the larger of |a|, |b| and floor.
func relDiff(a, b, floor float64) float64 {
	return math.Abs(a-b) / max(math.Abs(a), math.Abs(b), floor, math.SmallestNonzeroFloat64)
}

func exitDetail(err error) error {
	var ee *exec.ExitError
	if errors.As(err, &ee) && len(ee.Stderr) > 0 {
		return fmt.Errorf("%w: %s", err, strings.TrimSpace(string(ee.Stderr)))
	}
	return err
}

// warmup is the least time each program spends solving, untimed, before
// its timed solutions of a turn: the first few solutions after another
// program's turn run with cold caches and, for Go, a heap that has to grow
// back (measured: 0.56–0.73 ms for the first ten at 100 panels, 0.42 ms
// median after).
const warmup = 30 * time.Millisecond

// timeGo returns the wall times of reps full solutions after a warm-up,
// the processor time of each (user and system, all threads of the
// process: what the solution costs the machine, which a load from other
// jobs changes far less than the wall time), and the phases the solver
// timed (build, factor, solve) of each, in seconds.
func timeGo(nodes []geometry.Point, alphas []float64, reps int) (ts, cpu []float64, phases [][3]float64, err error) {
	// Warm up as the numpy peer does: at least three solutions and 30 ms.
	t0 := time.Now()
	for k := 0; k < 3 || time.Since(t0) < warmup; k++ {
		if _, _, err := solveGo(nodes, alphas); err != nil {
			return nil, nil, nil, err
		}
	}
	for range reps {
		c0, t0 := cpuTime(), time.Now()
		sv, _, err := solveGo(nodes, alphas)
		if err != nil {
			return nil, nil, nil, err
		}
		ts = append(ts, time.Since(t0).Seconds())
		cpu = append(cpu, cpuTime()-c0)
		tm := sv.Timings()
		phases = append(phases, [3]float64{tm.Build.Seconds(), tm.Factor.Seconds(), tm.Solve.Seconds()})
	}
	return ts, cpu, phases, nil
}

// serve answers "time NODES REPS ANGLES" lines with the times of timeGo,
// the protocol of the numpy peer's serve command: the wall times, then
// "cpu" and the processor times.
func serve(r io.Reader, w io.Writer) error {
	sc := bufio.NewScanner(r)
	cache := map[string][]geometry.Point{}
	for sc.Scan() {
		f := strings.Fields(sc.Text())
		if len(f) != 4 || f[0] != "time" {
			fmt.Fprintf(w, "error want: time NODES REPS ANGLES\n")
			continue
		}
		reps, err1 := strconv.Atoi(f[2])
		count, err2 := strconv.Atoi(f[3])
		if err1 != nil || err2 != nil {
			fmt.Fprintf(w, "error bad counts\n")
			continue
		}
		nodes, ok := cache[f[1]]
		if !ok {
			var err error
			if nodes, err = readNodes(f[1]); err != nil {
				fmt.Fprintf(w, "error %v\n", err)
				continue
			}
			cache[f[1]] = nodes
		}
		ts, cpu, _, err := timeGo(nodes, sweep(count), reps)
		if err != nil {
			fmt.Fprintf(w, "error %v\n", err)
			continue
		}
		fmt.Fprintln(w, formatTimes(ts), "cpu", formatTimes(cpu))
	}
	return sc.Err()
}

func readNodes(path string) ([]geometry.Point, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	var pts []geometry.Point
	for i, line := range strings.Split(strings.TrimSpace(string(data)), "\n") {
		f := strings.Fields(line)
		if len(f) != 2 {
			return nil, fmt.Errorf("%s:%d: want x y", path, i+1)
		}
		x, err1 := strconv.ParseFloat(f[0], 64)
		y, err2 := strconv.ParseFloat(f[1], 64)
		if err1 != nil || err2 != nil {
			return nil, fmt.Errorf("%s:%d: want two numbers", path, i+1)
		}
		pts = append(pts, geometry.Point{X: x, Y: y})
	}
	return pts, nil
}

func formatTimes(ts []float64) string {
	s := make([]string, len(ts))
	for i, t := range ts {
		s[i] = strconv.FormatFloat(t, 'g', 9, 64)
	}
	return strings.Join(s, " ")
}

// peer is a child process answering timing requests line by line.
type peer struct {
	cmd *exec.Cmd
	in  io.WriteCloser
	out *bufio.Scanner
}

func startPeer(name string, args ...string) (*peer, error) {
	cmd := exec.Command(name, args...)
	cmd.Stderr = os.Stderr
	in, err := cmd.StdinPipe()
	if err != nil {
		return nil, err
	}
	out, err := cmd.StdoutPipe()
	if err != nil {
		return nil, err
	}
	if err := cmd.Start(); err != nil {
		return nil, err
	}
	return &peer{cmd: cmd, in: in, out: bufio.NewScanner(out)}, nil
}

// line sends one request line and returns the answer line.
func (p *peer) line(format string, a ...any) (string, error) {
	if _, err := fmt.Fprintf(p.in, format+"\n", a...); err != nil {
		return "", err
	}
	if !p.out.Scan() {
		if err := p.out.Err(); err != nil {
			return "", err
		}
		return "", fmt.Errorf("%s: no answer", p.cmd.Path)
	}
	line := p.out.Text()
	if strings.HasPrefix(line, "error") {
		return "", fmt.Errorf("%s: %s", p.cmd.Path, line)
	}
	return line, nil
}

// ask sends one request line and parses the answer as times in seconds.
func (p *peer) ask(format string, a ...any) ([]float64, error) {
	ts, _, err := p.askCPU(format, a...)
	return ts, err
}

// askCPU is ask for an answer that may carry processor times after the
// wall times ("W… cpu C…", one of each per solution); cpu is nil if it
// does not.
func (p *peer) askCPU(format string, a ...any) (ts, cpu []float64, err error) {
	line, err := p.line(format, a...)
	if err != nil {
		return nil, nil, err
	}
	wall, cpus, hasCPU := strings.Cut(line, " cpu ")
	parse := func(s string) ([]float64, error) {
		var out []float64
		for _, f := range strings.Fields(s) {
			t, err := strconv.ParseFloat(f, 64)
			if err != nil {
				return nil, fmt.Errorf("%s: bad answer %q", p.cmd.Path, line)
			}
			out = append(out, t)
		}
		return out, nil
	}
	if ts, err = parse(wall); err != nil {
		return nil, nil, err
	}
	if hasCPU {
		if cpu, err = parse(cpus); err != nil {
			return nil, nil, err
		}
		if len(cpu) != len(ts) {
			return nil, nil, fmt.Errorf("%s: %d wall and %d processor times in %q", p.cmd.Path, len(ts), len(cpu), line)
		}
	}
	return ts, cpu, nil
}

func (p *peer) close() error {
	p.in.Close()
	return p.cmd.Wait()
}

func median(x []float64) float64 {
	s := slices.Clone(x)
	slices.Sort(s)
	n := len(s)
	if n == 0 {
		return math.NaN()
	}
	if n%2 == 1 {
		return s[n/2]
	}
	return (s[n/2-1] + s[n/2]) / 2
}

// stat is a figure per round.
type stat []float64

func (s stat) String() string {
	return fmt.Sprintf("%.3g (%.3g–%.3g)", median(s), slices.Min(s), slices.Max(s))
}

// luRate runs the dgetrf_rate program: the best GFLOP/s of OpenBLAS dgetrf
// on threads threads over the sizes it tries.
func luRate(prog string, threads int) (float64, error) {
	rates, err := luRates(prog, threads, nil)
	if err != nil {
		return 0, err
	}
	best := 0.0
	for _, r := range rates {
		best = max(best, r)
	}
	return best, nil
}

// luRates runs the dgetrf_rate program on threads threads at the given
// orders (its own default sizes if none) and returns the GFLOP/s of each
// order it printed.
func luRates(prog string, threads int, orders []int) (map[int]float64, error) {
	args := []string{strconv.Itoa(threads)}
	for _, n := range orders {
		args = append(args, strconv.Itoa(n))
	}
	out, err := exec.Command(prog, args...).Output()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", prog, exitDetail(err))
	}
	rates := map[int]float64{}
	for line := range strings.Lines(string(out)) {
		f := strings.Fields(line)
		if len(f) != 3 {
			continue
		}
		n, err1 := strconv.Atoi(f[0])
		r, err2 := strconv.ParseFloat(f[2], 64)
		if err1 == nil && err2 == nil && r > 0 {
			rates[n] = r
		}
	}
	if len(rates) == 0 {
		return nil, fmt.Errorf("%s: no rate in %q", prog, out)
	}
	return rates, nil
}

func bench(o options, w io.Writer) error {
	panels, err := o.panels()
	if err != nil {
		return err
	}
	if o.rounds < 1 || o.reps < 1 || o.angles < 1 {
		return errors.New("-rounds, -reps and -angles must be positive")
	}
	dir, err := os.MkdirTemp("", "solverbench")
	if err != nil {
		return err
	}
	defer os.RemoveAll(dir)
	py, err := startPeer(o.python, o.peer, "serve")
	if err != nil {
		return err
	}
	defer py.close()
	info, err := py.line("info")
	if err != nil {
		return err
	}
	// The Go column is timed in a child process of this program, as every
	// Go peer is, so that all programs are timed alike: run in this
	// process, beside the driver's own work, the same solver measured
	// 18–35 % slower than in a child process of the same build, in the
	// same rounds (2 cores shared with other jobs). The phases are timed
	// here.
	exe, err := os.Executable()
	if err != nil {
		return err
	}
	own, err := startPeer(exe, "-serve")
	if err != nil {
		return err
	}
	defer own.close()
	pgs := make([]*peer, len(o.goPeers))
	for k, g := range o.goPeers {
		if pgs[k], err = startPeer(g.path, "-serve"); err != nil {
			return err
		}
		defer pgs[k].close()
	}
	alphas := sweep(o.angles)
	nodes := make([][]geometry.Point, len(panels))
	paths := make([]string, len(panels))
	orders := make([]int, len(panels)) // of the linear systems
	for i, n := range panels {
		nodes[i] = naca2412.Nodes(n)
		if paths[i], err = writeNodes(dir, fmt.Sprintf("naca2412-%d.dat", n), nodes[i]); err != nil {
			return err
		}
		sv, err := vortexpanel.New(nodes[i])
		if err != nil {
			return err
		}
		orders[i] = len(nodes[i]) // γ at each node
		if sv.Blunt() {
			orders[i]++ // and the base source
		}
	}
	goT := make([]stat, len(panels))
	phase := make([][3]stat, len(panels))
	npT := make([]stat, len(panels))
	pgT := make([][]stat, len(o.goPeers))
	for k := range pgT {
		pgT[k] = make([]stat, len(panels))
	}
	// Processor times per solution, the medians of each round.
	goC, npC := make([]stat, len(panels)), make([]stat, len(panels))
	pgC := make([][]stat, len(o.goPeers))
	for k := range pgC {
		pgC[k] = make([]stat, len(panels))
	}
	ratio := make([]stat, len(panels))
	bestKernel := 0.0 // kernel evaluations per second
	bestLU := map[string]float64{}
	bestAt := map[int]float64{} // OpenBLAS dgetrf GFLOP/s at each system order
	const luN, luReps = 2000, 3
	fmt.Fprintf(os.Stderr, "solverbench: %d rounds", o.rounds)
	for r := range o.rounds {
		fmt.Fprintf(os.Stderr, " %d", r+1)
		for i, n := range panels {
			_, _, ph, err := timeGo(nodes[i], alphas, o.reps)
			if err != nil {
				return err
			}
			ts, tc, err := own.askCPU("time %s %d %d", paths[i], o.reps, o.angles)
			if err != nil {
				return err
			}
			for k := range 3 {
				var v []float64
				for _, p := range ph {
					v = append(v, p[k])
				}
				phase[i][k] = append(phase[i][k], median(v))
			}
			for _, p := range ph {
				bestKernel = max(bestKernel, float64(n)*float64(n)/p[0])
			}
			tp, cp, err := py.askCPU("time %s %d %d", paths[i], o.reps, o.angles)
			if err != nil {
				return err
			}
			time.Sleep(o.settle)
			g, p := median(ts), median(tp)
			goT[i] = append(goT[i], g)
			npT[i] = append(npT[i], p)
			ratio[i] = append(ratio[i], p/g)
			goC[i] = append(goC[i], median(tc))
			npC[i] = append(npC[i], median(cp)) // NaN if the peer gave none
			for k, pg := range pgs {
				tg, cg, err := pg.askCPU("time %s %d %d", paths[i], o.reps, o.angles)
				if err != nil {
					return err
				}
				time.Sleep(o.settle)
				pgT[k][i] = append(pgT[k][i], median(tg))
				pgC[k][i] = append(pgC[k][i], median(cg))
			}
		}
		// The LU rate, measured between the rounds.
		tl, err := py.ask("lu %d %d", luN, luReps)
		if err != nil {
			return err
		}
		time.Sleep(o.settle)
		bestLU["numpy.linalg.solve"] = max(bestLU["numpy.linalg.solve"], 2.0/3*math.Pow(luN, 3)/slices.Min(tl)/1e9)
		if o.dgetrf != "" && (r == 0 || r == o.rounds-1 || r == o.rounds/2) {
			for _, th := range []int{1, 2} {
				rate, err := luRate(o.dgetrf, th)
				if err != nil {
					return err
				}
				k := fmt.Sprintf("OpenBLAS dgetrf, %d thread(s)", th)
				bestLU[k] = max(bestLU[k], rate)
				at, err := luRates(o.dgetrf, th, orders)
				if err != nil {
					return err
				}
				for n, r := range at {
					bestAt[n] = max(bestAt[n], r)
				}
			}
		}
	}
	fmt.Fprintln(os.Stderr)
	lu := 0.0
	var luKeys []string
	for k, v := range bestLU {
		lu = max(lu, v)
		luKeys = append(luKeys, k)
	}
	slices.Sort(luKeys)
	fmt.Fprintf(w, "vortex-panel solver, NACA 2412 (sharp trailing edge), %d angles; %d rounds of %d solutions per program, interleaved\n",
		o.angles, o.rounds, o.reps)
	fmt.Fprintf(w, "Go: factorisation %s, GOMAXPROCS %d; peer: %s\n", factorisation(), runtime.GOMAXPROCS(0), info)
	fmt.Fprintf(w, "median over rounds (range over rounds)\n\n")
	fmt.Fprintf(w, "dense LU rates (best of the run, GFLOP/s, ⅔N³ flops at N = %d):\n", luN)
	for _, k := range luKeys {
		fmt.Fprintf(w, "  %-32s %6.1f\n", k, bestLU[k])
	}
	fmt.Fprintf(w, "Go kernel evaluations (best build rate of the run): %.3g per second\n", bestKernel)
	fmt.Fprintf(w, "limit = ⅔N³ / %.1f GFLOP/s + N² / %.3g per second\n\n", lu, bestKernel)
	head := "| panels | Go ms | numpy ms | numpy/Go | limit ms | Go/limit |"
	rule := "| ---: | ---: | ---: | ---: | ---: | ---: |"
	if len(bestAt) > 0 {
		head += " dgetrf ms |"
		rule += " ---: |"
	}
	for _, g := range o.goPeers {
		head += fmt.Sprintf(" %s ms | %s/limit |", g.name, g.name)
		rule += " ---: | ---: |"
	}
	fmt.Fprintln(w, head)
	fmt.Fprintln(w, rule)
	ms := func(s stat) stat {
		out := make(stat, len(s))
		for i, v := range s {
			out[i] = v * 1e3
		}
		return out
	}
	for i, n := range panels {
		limit := 2.0/3*math.Pow(float64(n), 3)/(lu*1e9) + float64(n)*float64(n)/bestKernel
		gl := make(stat, len(goT[i]))
		for k, v := range goT[i] {
			gl[k] = v / limit
		}
		fmt.Fprintf(w, "| %d | %v | %v | %v | %.3g | %v |", n, ms(goT[i]), ms(npT[i]), ratio[i], limit*1e3, gl)
		if len(bestAt) > 0 {
			if r := bestAt[orders[i]]; r > 0 {
				fmt.Fprintf(w, " %.3g |", 2.0/3*math.Pow(float64(orders[i]), 3)/(r*1e9)*1e3)
			} else {
				fmt.Fprint(w, " – |")
			}
		}
		for k := range pgs {
			pl := make(stat, len(pgT[k][i]))
			for r, v := range pgT[k][i] {
				pl[r] = v / limit
			}
			fmt.Fprintf(w, " %v | %v |", ms(pgT[k][i]), pl)
		}
		fmt.Fprintln(w)
	}
	if len(bestAt) > 0 {
		fmt.Fprintln(w, "\ndgetrf ms: OpenBLAS dgetrf alone on a random matrix of the system's order, the")
		fmt.Fprintln(w, "best of 1 and 2 threads over the run: what the library's factorisation takes at")
		fmt.Fprintln(w, "that size, against the ⅔N³ at the large-matrix rate that the limit counts.")
	}
	fmt.Fprintln(w, "\nProcessor time per solution, ms: user and system, all threads of the process, the")
	fmt.Fprintln(w, "medians of each round (the numpy peer's includes the time its BLAS threads spin")
	fmt.Fprintln(w, "waiting for work). Under a load from other jobs, wall times and the ratios of")
	fmt.Fprintln(w, "wall times say little; these change less. Ratios: the other program's over Go's,")
	fmt.Fprintln(w, "round by round.")
	fmt.Fprintln(w)
	head = "| panels | Go cpu ms | numpy cpu ms | numpy/Go cpu |"
	rule = "| ---: | ---: | ---: | ---: |"
	for _, g := range o.goPeers {
		head += fmt.Sprintf(" %s cpu ms | %s/Go cpu | %s/Go wall |", g.name, g.name, g.name)
		rule += " ---: | ---: | ---: |"
	}
	fmt.Fprintln(w, head)
	fmt.Fprintln(w, rule)
	over := func(a, b stat) stat {
		out := make(stat, len(a))
		for r := range a {
			out[r] = a[r] / b[r]
		}
		return out
	}
	for i, n := range panels {
		fmt.Fprintf(w, "| %d | %v | %v | %v |", n, ms(goC[i]), ms(npC[i]), over(npC[i], goC[i]))
		for k := range pgs {
			fmt.Fprintf(w, " %v | %v | %v |", ms(pgC[k][i]), over(pgC[k][i], goC[i]), over(pgT[k][i], goT[i]))
		}
		fmt.Fprintln(w)
	}
	fmt.Fprintf(w, "\nGo phases, ms (as the solver times them): build the matrix | factor and estimate the condition | solve for %d angles\n\n", o.angles)
	fmt.Fprintln(w, "| panels | build | factor | solve |")
	fmt.Fprintln(w, "| ---: | ---: | ---: | ---: |")
	for i, n := range panels {
		fmt.Fprintf(w, "| %d | %v | %v | %v |\n", n, ms(phase[i][0]), ms(phase[i][1]), ms(phase[i][2]))
	}
	return nil
}
