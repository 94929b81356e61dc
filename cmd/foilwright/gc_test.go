package main

import (
	"path/filepath"
	"runtime/debug"
	"testing"

	"github.com/foilwright/foilwright/prep"
)

func TestSmallInputGC(t *testing.T) {
	unset := func(string) (string, bool) { return "", false }
	gogc := func(k string) (string, bool) { return "150", k == "GOGC" }
	files := func(sizes ...int) []prep.File {
		var fs []prep.File
		for _, n := range sizes {
			fs = append(fs, prep.File{Path: "f", Data: make([]byte, n)})
		}
		return fs
	}
	for _, tc := range []struct {
		name  string
		files []prep.File
		env   func(string) (string, bool)
		want  bool
	}{
		{"small", files(200_000), unset, true},
		{"at the limit over two files", files(smallInput-10, 10), unset, true},
		{"one byte beyond", files(smallInput-10, 11), unset, false},
		{"large", files(20_000_000), unset, false},
		{"GOGC set", files(200_000), gogc, false},
	} {
		if got := small(tc.files, tc.env); got != tc.want {
			t.Errorf("%s: small = %v, want %v", tc.name, got, tc.want)
		}
	}
}

// TestPrepRestoresGC checks that prep, run in process, leaves the
// collector's target as it found it.
func TestPrepRestoresGC(t *testing.T) {
	old := debug.SetGCPercent(123)
	defer debug.SetGCPercent(old)
	out := filepath.Join(t.TempDir(), "s.json")
	if _, stderr, code := runCLI(t, "prep", filepath.Join("..", "..", "examples", "cad-export", "section.dxf"), "-q", "-o", out); code != exitOK {
		t.Fatalf("prep: exit %d: %s", code, stderr)
	}
	if got := debug.SetGCPercent(old); got != 123 {
		t.Errorf("after prep the collector's target is %d, want 123", got)
	}
}
