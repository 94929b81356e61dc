package reliability

import (
	"fmt"
	"io"
	"sync"
)

// RunAll runs the cases, inputs and faults on jobs workers at once and the
// trials one at a time (they start processes of their own and judge by
// time), and returns the outcomes in the order of cases. progress, when
// not nil, gets one line per case.
func RunAll(r *Runner, cases []*Case, jobs int, progress io.Writer) ([]*Outcome, error) {
	outs := make([]*Outcome, len(cases))
	var mu sync.Mutex
	var firstErr error
	run := func(i int) {
		o, err := r.Run(cases[i])
		mu.Lock()
		defer mu.Unlock()
		if err != nil {
			if firstErr == nil {
				firstErr = err
			}
			return
		}
		outs[i] = o
		if progress != nil {
			v := Judge(o)
			mark := "ok "
			if !v.Clean() {
				mark = "BAD"
			}
			fmt.Fprintf(progress, "%s %-6s %-40s exit %3d %6.2f s %7.1f MiB\n", mark, o.Case.Group, o.Case.Name, o.Exit, o.Wall.Seconds(), float64(o.MaxRSS)/(1<<20))
		}
	}
	work := make(chan int)
	var wg sync.WaitGroup
	for range max(jobs, 1) {
		wg.Go(func() {
			for i := range work {
				run(i)
			}
		})
	}
	for i, c := range cases {
		if c.Group != GroupTrial {
			work <- i
		}
	}
	close(work)
	wg.Wait()
	for i, c := range cases {
		if c.Group == GroupTrial {
			run(i)
		}
	}
	if firstErr != nil {
		return nil, firstErr
	}
	return outs, nil
}

// Sweep ends every process whose executable lies in the folder dir (the
// campaign's copy of the binaries) and returns how many there were.
func Sweep(dir string) int {
	ps := marked("", nil, dir)
	for _, p := range ps {
		p.kill()
	}
	return len(ps)
}
