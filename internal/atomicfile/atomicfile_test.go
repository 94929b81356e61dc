package atomicfile

import (
	"errors"
	"io"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

func TestWriteReplaces(t *testing.T) {
	path := filepath.Join(t.TempDir(), "out.json")
	if err := WriteBytes(path, []byte("first")); err != nil {
		t.Fatal(err)
	}
	if err := WriteBytes(path, []byte("second")); err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile(path)
	if err != nil || string(got) != "second" {
		t.Fatalf("got %q, %v; want %q", got, err, "second")
	}
}

func TestFailedWriteKeepsOldFile(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.json")
	if err := WriteBytes(path, []byte("good")); err != nil {
		t.Fatal(err)
	}
	boom := errors.New("boom")
	err := Write(path, func(w io.Writer) error {
		io.WriteString(w, "partial")
		return boom
	})
	if !errors.Is(err, boom) {
		t.Fatalf("err = %v, want %v", err, boom)
	}
	got, _ := os.ReadFile(path)
	if string(got) != "good" {
		t.Fatalf("old file changed to %q", got)
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Fatalf("temporary file left behind: %v", entries)
	}
}

// TestWriteRefusesSpecialTargets is the regression test of defect 3 of
// issue 11: -o onto a FIFO, a symbolic link, a folder or a device left a
// regular file in its place. The device is one the test makes in its own
// folder (root only); the system's /dev/null is never touched.
func TestWriteRefusesSpecialTargets(t *testing.T) {
	dir := t.TempDir()
	good := filepath.Join(dir, "good.json")
	os.WriteFile(good, []byte("earlier"), 0o644)
	targets := map[string]func(p string) error{
		"fifo":     func(p string) error { return syscall.Mkfifo(p, 0o644) },
		"link":     func(p string) error { return os.Symlink("good.json", p) },
		"dangling": func(p string) error { return os.Symlink("nowhere/x.json", p) },
		"folder":   func(p string) error { return os.Mkdir(p, 0o755) },
	}
	if os.Geteuid() == 0 {
		targets["device"] = func(p string) error { return syscall.Mknod(p, syscall.S_IFCHR|0o644, 1<<8|3) }
	}
	for name, make := range targets {
		p := filepath.Join(dir, name)
		if err := make(p); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		before, _ := os.Lstat(p)
		err := WriteBytes(p, []byte("new"))
		var te *TargetError
		if !errors.As(err, &te) || !errors.Is(err, ErrNotRegular) || !strings.Contains(err.Error(), name) {
			t.Errorf("%s: err = %v, want a TargetError naming it", name, err)
		}
		after, _ := os.Lstat(p)
		if after == nil || after.Mode() != before.Mode() {
			t.Errorf("%s: replaced (mode %v → %v)", name, before.Mode(), after)
		}
	}
	if got, _ := os.ReadFile(good); string(got) != "earlier" {
		t.Errorf("the link's target changed to %q", got)
	}
	entries, _ := os.ReadDir(dir)
	for _, e := range entries {
		if strings.Contains(e.Name(), ".tmp-") {
			t.Errorf("temporary file left: %s", e.Name())
		}
	}
}

func TestCheckTargets(t *testing.T) {
	dir := t.TempDir()
	if err := CheckTargets("", "-", filepath.Join(dir, "new.json")); err != nil {
		t.Errorf("new file: %v", err)
	}
	err := CheckTargets(filepath.Join(dir, "nodir", "o.json"))
	if !errors.Is(err, ErrNoFolder) || !strings.Contains(err.Error(), "nodir") {
		t.Errorf("missing folder: %v", err)
	}
}

// TestSetWritesAllOrNothing is the regression test of defect 13 of issue
// 11: a failure after one output was written left that output.
func TestSetWritesAllOrNothing(t *testing.T) {
	dir := t.TempDir()
	a, b := filepath.Join(dir, "a.dat"), filepath.Join(dir, "b.json")
	os.WriteFile(b, []byte("earlier"), 0o644)
	var s Set
	if err := s.AddBytes(a, []byte("nodes")); err != nil {
		t.Fatal(err)
	}
	boom := errors.New("boom")
	if err := s.Add(b, func(w io.Writer) error { io.WriteString(w, "half"); return boom }); !errors.Is(err, boom) {
		t.Fatalf("err = %v", err)
	}
	if _, err := os.Stat(a); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("a.dat was written: %v", err)
	}
	if got, _ := os.ReadFile(b); string(got) != "earlier" {
		t.Errorf("b.json = %q", got)
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Errorf("left %v", entries)
	}
	// A good set commits every file.
	s = Set{}
	if err := s.AddBytes(a, []byte("nodes")); err != nil {
		t.Fatal(err)
	}
	if err := s.AddBytes(b, []byte("section")); err != nil {
		t.Fatal(err)
	}
	if err := s.Commit(); err != nil {
		t.Fatal(err)
	}
	if got, _ := os.ReadFile(b); string(got) != "section" {
		t.Errorf("b.json = %q", got)
	}
	// A target that turned into a FIFO before the commit stops the set.
	s = Set{}
	s.AddBytes(a, []byte("new nodes"))
	s.AddBytes(filepath.Join(dir, "f"), []byte("x"))
	syscall.Mkfifo(filepath.Join(dir, "f"), 0o644)
	if err := s.Commit(); !errors.Is(err, ErrNotRegular) {
		t.Errorf("commit over a FIFO: %v", err)
	}
	if got, _ := os.ReadFile(a); string(got) != "nodes" {
		t.Errorf("a.dat = %q after a refused commit", got)
	}
}
