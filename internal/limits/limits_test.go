package limits

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

func TestSet(t *testing.T) {
	l := Default()
	if err := l.Set("input-bytes=1GiB, input-lines=5000,stage-memory=none,json-depth=100,stage-nodes=40001,result-bytes=8M"); err != nil {
		t.Fatal(err)
	}
	want := Default()
	want.InputBytes, want.InputLines, want.StageMemory, want.JSONDepth, want.StageNodes, want.ResultBytes = 1<<30, 5000, 0, 100, 40001, 8<<20
	if l != want {
		t.Errorf("got %+v, want %+v", l, want)
	}
	for _, bad := range []string{"input-bytes", "inputbytes=1", "input-bytes=-1", "input-bytes=lots", "json-depth=0", "json-depth=none", "json-depth=1001", "result-bytes=3GiB"} {
		if err := l.Set(bad); err == nil {
			t.Errorf("Set(%q) accepted", bad)
		}
	}
	if err := l.Set("input-byte=1"); err == nil || !strings.Contains(err.Error(), "input-bytes") {
		t.Errorf("unknown name: %v, want the list of names", err)
	}
}

func TestReadFileBytes(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "big.csv")
	os.WriteFile(p, bytes.Repeat([]byte("1,2\n"), 1000), 0o644)
	if _, err := ReadFile(p, 4000, 0); err != nil {
		t.Fatalf("at the limit: %v", err)
	}
	_, err := ReadFile(p, 3999, 0)
	var le *Error
	if !errors.As(err, &le) || le.Limit != InputBytes || !errors.Is(err, ErrLimit) {
		t.Fatalf("over the limit: %v", err)
	}
	for _, want := range []string{"big.csv", "input-bytes", "--limit input-bytes="} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("%q lacks %q", err, want)
		}
	}
}

func TestReadFileLines(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "big.csv")
	os.WriteFile(p, bytes.Repeat([]byte("1,2\n"), 1000), 0o644)
	if _, err := ReadFile(p, 0, 1000); err != nil {
		t.Fatalf("at the limit: %v", err)
	}
	if _, err := ReadFile(p, 0, 999); err == nil || !strings.Contains(err.Error(), "more than 999 lines") {
		t.Fatalf("over the limit: %v", err)
	}
	// A last line without a newline counts.
	os.WriteFile(p, []byte("1,2\n3,4"), 0o644)
	if _, err := ReadFile(p, 0, 1); err == nil {
		t.Error("two lines passed a limit of one")
	}
	// Binary data (a NUL byte near the start) has no lines to count.
	bin := append([]byte{0, 1, 2}, bytes.Repeat([]byte{'\n'}, 5000)...)
	os.WriteFile(p, bin, 0o644)
	if _, err := ReadFile(p, 0, 10); err != nil {
		t.Errorf("binary file: %v", err)
	}
}

func TestReadEndlessStream(t *testing.T) {
	if runtime.GOOS != "linux" {
		t.Skip("needs /dev/zero")
	}
	_, err := ReadFile("/dev/zero", 1<<20, 1000)
	var le *Error
	if !errors.As(err, &le) || le.Limit != InputBytes {
		t.Fatalf("/dev/zero: %v", err)
	}
	_, err = Read(strings.NewReader(strings.Repeat("1,2\n", 100)), "stdin", 0, 10)
	if err == nil || !strings.Contains(err.Error(), "stdin: more than 10 lines") {
		t.Errorf("stdin: %v", err)
	}
}

func TestReadFileFolder(t *testing.T) {
	_, err := ReadFile(t.TempDir(), 0, 0)
	if err == nil || !strings.Contains(err.Error(), "is a folder") {
		t.Errorf("folder: %v", err)
	}
}

func TestReadJSON(t *testing.T) {
	p := filepath.Join(t.TempDir(), "pipeline.json")
	os.WriteFile(p, []byte(`{"a": 1}`+strings.Repeat(" ", 100)), 0o644)
	if _, err := ReadJSON(p, 200); err != nil {
		t.Fatal(err)
	}
	_, err := ReadJSON(p, 50)
	var le *Error
	if !errors.As(err, &le) || le.Limit != JSONBytes {
		t.Errorf("over json-bytes: %v", err)
	}
}

func TestCheckDepth(t *testing.T) {
	for _, tc := range []struct {
		text  string
		depth int
		off   int // -1: passes
	}{
		{`[[1]]`, 2, -1},
		{`[[1]]`, 1, 1},
		{`{"a": {"b": [1]}}`, 3, -1},
		{`{"a": {"b": [1]}}`, 2, 12},
		{`{"a": "[[[[[[", "b": "\"[[["}`, 1, -1},
		{`[1], [[2]]`, 1, 6}, // not JSON, still scanned
		{strings.Repeat("[", 100000), 64, 64},
	} {
		err := CheckDepth([]byte(tc.text), tc.depth)
		var de *DepthError
		switch {
		case tc.off < 0 && err != nil:
			t.Errorf("%.40s (depth %d): %v", tc.text, tc.depth, err)
		case tc.off >= 0 && (!errors.As(err, &de) || de.Offset != tc.off):
			t.Errorf("%.40s (depth %d): %v, want offset %d", tc.text, tc.depth, err, tc.off)
		}
	}
}

func TestSize(t *testing.T) {
	for n, want := range map[int64]string{256 << 20: "256 MiB", 3 << 29: "1.5 GiB", 1 << 30: "1 GiB", 1000: "1000 bytes", 64 << 10: "64 KiB"} {
		if got := Size(n); got != want {
			t.Errorf("Size(%d) = %q, want %q", n, got, want)
		}
	}
}
