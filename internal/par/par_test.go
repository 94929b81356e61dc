package par

import (
	"runtime"
	"sync"
	"sync/atomic"
	"testing"
	"time"
)

func TestForRunsEveryIndexOnce(t *testing.T) {
	for _, workers := range []int{0, 1, 2, 3, 8} {
		for _, n := range []int{0, 1, 2, 7, 100} {
			counts := make([]atomic.Int32, n)
			var mu sync.Mutex
			perWorker := map[int]int{}
			For(n, workers, func(w, i int) {
				counts[i].Add(1)
				mu.Lock()
				perWorker[w]++
				mu.Unlock()
			})
			for i := range counts {
				if c := counts[i].Load(); c != 1 {
					t.Errorf("workers %d n %d: index %d ran %d times", workers, n, i, c)
				}
			}
			for w := range perWorker {
				if w < 0 || w >= max(workers, 1) {
					t.Errorf("workers %d n %d: worker id %d", workers, n, w)
				}
			}
		}
	}
}

// TestForOnOneProcessor checks that For returns when its helpers can
// hardly start: with one processor, the caller, which does not yield
// between iterations, does the work.
func TestForOnOneProcessor(t *testing.T) {
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(1))
	start := time.Now()
	var byCaller atomic.Int32
	For(50, 4, func(w, i int) {
		if w == 0 {
			byCaller.Add(1)
		}
	})
	if time.Since(start) > 5*time.Second {
		t.Errorf("For took %v", time.Since(start))
	}
	if byCaller.Load() == 0 {
		t.Error("the caller ran nothing")
	}
}

func TestTeam(t *testing.T) {
	for _, workers := range []int{1, 2, 3} {
		team := NewTeam(workers)
		for round := range 200 {
			if round%50 == 49 {
				time.Sleep(time.Millisecond) // long enough for the helpers to park
			}
			n := round % 13
			counts := make([]atomic.Int32, n)
			team.For(n, func(w, i int) {
				if w < 0 || w >= workers {
					t.Errorf("worker id %d", w)
				}
				counts[i].Add(1)
			})
			for i := range counts {
				if c := counts[i].Load(); c != 1 {
					t.Fatalf("workers %d round %d: index %d ran %d times", workers, round, i, c)
				}
			}
		}
		team.Close()
	}
}

// TestTaskRunsOnce checks that a Task's call runs exactly once whether
// its goroutine or the waiter takes it, and that Wait returns after it.
func TestTaskRunsOnce(t *testing.T) {
	for _, procs := range []int{1, 2} {
		func() {
			defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(procs))
			for round := range 500 {
				var runs atomic.Int32
				var out int
				task := Start(func() {
					runs.Add(1)
					out = round + 1
				})
				if round%2 == 0 {
					runtime.Gosched() // give the goroutine a chance to take it
				}
				task.Wait()
				if out != round+1 {
					t.Fatalf("procs %d round %d: Wait returned before the call ended (out %d)", procs, round, out)
				}
				task.Wait() // a second Wait returns at once
				time.Sleep(time.Microsecond)
				if n := runs.Load(); n != 1 {
					t.Fatalf("procs %d round %d: the call ran %d times", procs, round, n)
				}
			}
		}()
	}
}
