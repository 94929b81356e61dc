package sdk

import (
	"os"
	"runtime/debug"
	"testing"
	"time"

	"github.com/hashicorp/go-hclog"
)

func TestWatchParentFiresWhenParentChanges(t *testing.T) {
	gone := make(chan struct{})
	// A ppid that is not ours stands for a host that died: the real parent
	// differs from it on the first poll.
	go watchParent(os.Getppid()+100000, 5*time.Millisecond, func() { close(gone) })
	select {
	case <-gone:
	case <-time.After(2 * time.Second):
		t.Fatal("watchParent did not notice the parent change")
	}
}

func TestWatchParentQuietWhileParentLives(t *testing.T) {
	fired := make(chan struct{}, 1)
	go watchParent(os.Getppid(), 5*time.Millisecond, func() { fired <- struct{}{} })
	select {
	case <-fired:
		t.Fatal("watchParent fired with the parent alive")
	case <-time.After(100 * time.Millisecond):
	}
	done := make(chan struct{})
	go func() { watchParent(1, time.Millisecond, func() { t.Error("fired for ppid 1") }); close(done) }()
	select {
	case <-done: // returns at once: nothing to watch
	case <-time.After(time.Second):
		t.Fatal("watchParent(1) did not return")
	}
}

func TestLoggerLevelFromEnv(t *testing.T) {
	t.Setenv("FOILWRIGHT_STAGE_LOG", "debug")
	l := Logger()
	if l.GetLevel() != hclog.Debug {
		t.Errorf("level %v, want debug", l.GetLevel())
	}
}

// TestGCPercent checks that a stage process gets stageGCPercent when its
// environment leaves GOGC unset, and keeps the runtime's when it sets it.
func TestGCPercent(t *testing.T) {
	old := debug.SetGCPercent(100)
	defer debug.SetGCPercent(old)
	setGCPercent(func(string) (string, bool) { return "", false })
	if got := debug.SetGCPercent(100); got != stageGCPercent {
		t.Errorf("GOGC unset: the collector's target is %d, want %d", got, stageGCPercent)
	}
	setGCPercent(func(k string) (string, bool) { return "150", k == "GOGC" })
	if got := debug.SetGCPercent(100); got != 100 {
		t.Errorf("GOGC set: the collector's target was changed to %d", got)
	}
}
