// Package par runs the iterations of a loop on several goroutines that take
// the indices in turn, and returns when every iteration has run, without
// waiting for a goroutine that the scheduler had not started by then: on a
// machine shared with other jobs, the calling goroutine does all the work
// rather than wait for a helper that never got a core. A Team keeps its
// helpers between loops.
package par

import (
	"runtime"
	"sync/atomic"
	"time"
)

// For calls body(w, i) for every i in [0, n), on the calling goroutine
// (w = 0) and up to workers−1 others (w = 1, 2, …), each taking the next
// index as it finishes one. It returns when every call has returned. A
// worker's calls run one after another, so body may keep per-worker
// scratch indexed by w.
func For(n, workers int, body func(w, i int)) {
	if n <= 0 {
		return
	}
	workers = min(workers, n)
	if workers < 2 {
		for i := range n {
			body(0, i)
		}
		return
	}
	var next, done atomic.Int64
	finished := make(chan struct{})
	run := func(w int) {
		for {
			i := int(next.Add(1) - 1)
			if i >= n {
				return
			}
			body(w, i)
			if done.Add(1) == int64(n) {
				close(finished)
			}
		}
	}
	for w := 1; w < workers; w++ {
		go run(w)
	}
	run(0)
	<-finished
}

// A Team is a set of helper goroutines kept between loops, for a caller
// that runs many short loops in a row (the steps of a factorisation):
// starting goroutines for each loop would cost a wake-up of a parked
// thread every time, tens of microseconds on a virtual machine. Between
// loops a helper spins, yielding the processor to other goroutines
// (runtime.Gosched), for up to spinFor; then it parks until the next loop,
// so that it does not take a core from other programs while the caller
// works alone. A Team's methods must be called from one goroutine.
type Team struct {
	workers int
	cur     atomic.Pointer[loop]
	stop    atomic.Bool
	parked  atomic.Int32
	wake    chan struct{}
}

// spinFor is how long an idle helper spins before it parks.
const spinFor = 50 * time.Microsecond

// loop is one For of a Team.
type loop struct {
	n          int64
	body       func(w, i int)
	next, done atomic.Int64
	finished   chan struct{}
}

// run takes indices of l until none is left.
func (l *loop) run(w int) {
	for {
		i := l.next.Add(1) - 1
		if i >= l.n {
			return
		}
		l.body(w, int(i))
		if l.done.Add(1) == l.n {
			close(l.finished)
		}
	}
}

// NewTeam starts workers−1 helpers (none if workers < 2).
func NewTeam(workers int) *Team {
	t := &Team{workers: max(workers, 1), wake: make(chan struct{}, max(workers, 1))}
	for w := 1; w < t.workers; w++ {
		go t.help(w)
	}
	return t
}

// help is the loop of helper w.
func (t *Team) help(w int) {
	var last *loop
	idleSince := time.Now()
	for !t.stop.Load() {
		if l := t.cur.Load(); l != nil && l != last {
			last = l
			l.run(w)
			idleSince = time.Now()
			continue
		}
		if time.Since(idleSince) < spinFor {
			runtime.Gosched()
			continue
		}
		// Park, announcing it first and looking again after, so that a
		// loop published meanwhile is not missed (For wakes parked helpers
		// after publishing).
		t.parked.Add(1)
		if l := t.cur.Load(); l != nil && l != last || t.stop.Load() {
			t.parked.Add(-1)
			continue
		}
		<-t.wake
		t.parked.Add(-1)
		idleSince = time.Now()
	}
}

// For is par.For on the team: body(w, i) for every i in [0, n), on the
// caller (w = 0) and the helpers, returning when every call has returned
// and never waiting for a helper that has not taken an index.
func (t *Team) For(n int, body func(w, i int)) {
	if n <= 0 {
		return
	}
	if t.workers < 2 || n < 2 {
		for i := range n {
			body(0, i)
		}
		return
	}
	l := &loop{n: int64(n), body: body, finished: make(chan struct{})}
	t.cur.Store(l)
	for range t.parked.Load() {
		select {
		case t.wake <- struct{}{}:
		default:
		}
	}
	l.run(0)
	<-l.finished
}

// Close lets the helpers return, without waiting for them.
func (t *Team) Close() {
	t.stop.Store(true)
	for range t.workers {
		select {
		case t.wake <- struct{}{}:
		default:
		}
	}
}

// A Task is a call started on another goroutine that the caller may take
// back: Wait runs it on the caller when no goroutine has begun it by then
// (on a machine shared with other jobs, the helper may not get a core),
// and otherwise waits for it to end. Each call runs exactly once.
type Task struct {
	f       func()
	claimed atomic.Bool
	done    chan struct{}
}

// Start starts f on a new goroutine and returns its Task.
func Start(f func()) *Task {
	t := &Task{f: f, done: make(chan struct{})}
	go t.take()
	return t
}

// take runs the call unless another goroutine has taken it, and reports
// whether it did.
func (t *Task) take() bool {
	if !t.claimed.CompareAndSwap(false, true) {
		return false
	}
	t.f()
	close(t.done)
	return true
}

// Wait returns once the call has run: on the caller, when no goroutine
// had begun it; else when the goroutine that did is done.
func (t *Task) Wait() {
	if !t.take() {
		<-t.done
	}
}
