package host_test

import (
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"testing"

	"github.com/foilwright/foilwright/internal/digest"
	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
)

// TestRunsFrom: an interpreted stage runs from its interpreter and the
// files it declares; the host names and hashes all of them.
func TestRunsFrom(t *testing.T) {
	sh, err := exec.LookPath("sh")
	if err != nil {
		t.Skip("no sh in PATH")
	}
	shReal, _ := filepath.EvalSymlinks(sh)
	dir := t.TempDir()
	write := func(name, data string, mode os.FileMode) string {
		p := filepath.Join(dir, filepath.FromSlash(name))
		os.MkdirAll(filepath.Dir(p), 0o755)
		if err := os.WriteFile(p, []byte(data), mode); err != nil {
			t.Fatal(err)
		}
		return p
	}
	exe := write("stage", "#!/usr/bin/env -S sh -e\necho\n", 0o755)
	lib := write("lib/a.js", "module.exports = 1\n", 0o644)
	write("mods/x/index.js", "x\n", 0o644)
	h := newHost(t, host.Options{})
	got, err := h.RunsFrom(host.Spec{Path: exe}, stage.Info{Files: []string{"lib/a.js", "mods"}})
	if err != nil {
		t.Fatal(err)
	}
	shSum, _ := digest.File(shReal)
	libSum, _ := digest.File(lib)
	modSum, _, _ := digest.Tree(filepath.Join(dir, "mods"))
	want := []host.FileDigest{{Path: shReal, SHA256: shSum}, {Path: "lib/a.js", SHA256: libSum}, {Path: "mods", SHA256: modSum}}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("RunsFrom = %v\nwant %v", got, want)
	}
	if b, err := h.RunsFrom(host.Builtin("vortex-panel"), stage.Info{Files: []string{"x"}}); b != nil || err != nil {
		t.Errorf("a built-in runs from %v, %v", b, err)
	}
	for _, bad := range []string{"../stage", "/etc/passwd", "missing.js", `lib\a.js`} {
		if _, err := h.RunsFrom(host.Spec{Path: exe}, stage.Info{Files: []string{bad}}); !errors.Is(err, host.ErrDeclaredFile) {
			t.Errorf("declared %q: got %v, want ErrDeclaredFile", bad, err)
		}
	}
	noShebang := write("bin", "\x7fELF", 0o755)
	if got, err := h.RunsFrom(host.Spec{Path: noShebang}, stage.Info{}); err != nil || len(got) != 0 {
		t.Errorf("a binary runs from %v, %v", got, err)
	}
}
