package stagetest_test

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/foilwright/foilwright/plugins/sdk"
	"github.com/foilwright/foilwright/plugins/stage"
	"github.com/foilwright/foilwright/plugins/stagetest"
)

// The test binary is the stage executables of the tests below: started by
// the host (the handshake cookie set) under a link named after a stage, it
// serves that stage.
func TestMain(m *testing.M) {
	if os.Getenv(stage.Handshake.MagicCookieKey) == stage.Handshake.MagicCookieValue {
		if s, ok := executables[filepath.Base(os.Args[0])]; ok {
			sdk.Serve(s)
			os.Exit(0)
		}
		os.Exit(3)
	}
	if os.Getenv("GORACE") == "" {
		// A race-enabled stage sleeps a second at exit by default, past
		// StopLimit.
		os.Setenv("GORACE", "atexit_sleep_ms=0")
	}
	os.Exit(m.Run())
}

// packedArea is areaStage taking its arrays packed and declaring a file.
type packedArea struct{ areaStage }

func (packedArea) Describe(context.Context) (stage.Info, error) {
	info := areaInfo
	info.Packed = true
	info.Files = []string{"area.dat"}
	return info, nil
}

var executables = map[string]stage.Stage{
	"area-stage":   areaStage{},
	"packed-stage": packedArea{},
	"lenient-stage": broken{run: func(ctx context.Context, req stage.Request) (stage.Result, error) {
		return areaStage{}.Run(ctx, stage.Request{Section: req.Section, Nodes: req.Nodes})
	}},
	"missing-stage": broken{describe: func(i stage.Info) stage.Info { i.Files = []string{"lib/missing.js"}; return i }},
}

// link makes a link named name to the test binary in a folder of its own,
// with the files given, and returns its path.
func link(t *testing.T, name string, files ...string) string {
	t.Helper()
	self, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	for _, f := range files {
		if err := os.WriteFile(filepath.Join(dir, f), []byte(f), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	p := filepath.Join(dir, name)
	if err := os.Symlink(self, p); err != nil {
		t.Skipf("cannot link the test binary: %v", err)
	}
	return p
}

func TestCheckExecutable(t *testing.T) {
	rep, err := stagetest.CheckExecutable(t.Context(), link(t, "packed-stage", "area.dat"), stagetest.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Err() != nil || len(rep.Notes) != 0 || rep.Info.Name != "area" || !rep.Info.Packed {
		t.Errorf("a conforming stage: %v, notes %q, info %+v", rep.Err(), rep.Notes, rep.Info)
	}
	if len(rep.RunsFrom) != 1 || rep.RunsFrom[0].Path != "area.dat" || len(rep.RunsFrom[0].SHA256) != 64 {
		t.Errorf("runs from %v", rep.RunsFrom)
	}
	if rep.Stop <= 0 || rep.Stop > stagetest.StopLimit {
		t.Errorf("stopped in %v", rep.Stop)
	}
	stagetest.RunExecutable(t, link(t, "area-stage"))
}

func TestCheckExecutableFails(t *testing.T) {
	for _, tc := range []struct{ name, want string }{
		{"lenient-stage", "unknown parameter: got error <nil>"},
		{"missing-stage", `"lib/missing.js"`},
	} {
		rep, err := stagetest.CheckExecutable(t.Context(), link(t, tc.name), stagetest.Options{Timeout: 10 * time.Second})
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if rep.Err() == nil || !strings.Contains(rep.Err().Error(), tc.want) {
			t.Errorf("%s: %v, want a failure containing %q", tc.name, rep.Err(), tc.want)
		}
	}
	if _, err := stagetest.CheckExecutable(t.Context(), filepath.Join(t.TempDir(), "none"), stagetest.Options{}); err == nil || !strings.Contains(err.Error(), "does not exist") {
		t.Errorf("a missing executable: %v", err)
	}
}
