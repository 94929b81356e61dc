package pipeline

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"testing"
)

// FuzzParse checks that Parse never panics, that every error it reports
// lies inside the file, and that a file it accepts can be planned.
func FuzzParse(f *testing.F) {
	files, _ := filepath.Glob("testdata/*.json")
	for _, name := range files {
		data, err := os.ReadFile(name)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(data)
	}
	f.Add([]byte(`  "just a string"`))
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) > 1<<16 {
			t.Skip()
		}
		p, err := Parse(data, "fuzz.json", ParseOptions{Dir: "testdata", Known: builtins})
		if err == nil {
			pl := p.Plan()
			if len(pl.Stages) != len(p.Stages) || len(pl.Sections) == 0 {
				t.Fatalf("plan of %d stages has %d, and %d sections", len(p.Stages), len(pl.Stages), len(pl.Sections))
			}
			return
		}
		var list ErrorList
		if !errors.As(err, &list) || len(list) == 0 {
			t.Fatalf("error %v (%T) is not an ErrorList", err, err)
		}
		lines := bytes.Count(data, []byte("\n")) + 1
		for _, e := range list {
			if e.offset >= 0 && (e.Line < 1 || e.Line > lines || e.Col < 1) {
				t.Fatalf("error outside the file (%d lines): %v", lines, e)
			}
		}
	})
}

func TestRootNotObject(t *testing.T) {
	_, err := Parse([]byte("\n  \"just a string\""), "p.json", ParseOptions{})
	if want := `p.json:2:3: want object, got string "just a string"`; err == nil || err.Error() != want {
		t.Errorf("got %v, want %s", err, want)
	}
}
