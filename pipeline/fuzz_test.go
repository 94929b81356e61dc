package pipeline

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

// FuzzParse checks that Parse never panics, that every error it reports
// lies inside the file, and that a file it accepts can be planned. Inputs
// of any size are tried (the parse is linear in the size and the nesting is
// bounded before anything recurses); FuzzParseNested reaches deep nesting.
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
	f.Add([]byte("\ufeff" + `{"foilwright": 1}`))
	f.Add(bytes.Repeat([]byte("["), 1<<16))
	f.Add([]byte(`{"foilwright": 1, "name": "n", "inputs": [], "stages": [{"id": "a", "stage": "vortex-panel", "params": {"x": ` + strings.Repeat(`{"a": `, 5000) + "1" + strings.Repeat("}", 5000) + `}}]}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		checkParse(t, data)
	})
}

// FuzzParseNested wraps fuzzed JSON in depth levels of arrays or objects
// inside a stage's parameters, repeated copies times: deep and large files
// that the fuzzer's own mutations would take long to reach (a 200 KB file
// nested 10⁵ deep once cost a minute and 15 GB).
func FuzzParseNested(f *testing.F) {
	f.Add([]byte("1"), uint32(10), uint16(1), false)
	f.Add([]byte(`{"a": [1, 2]}`), uint32(100000), uint16(1), true)
	f.Add([]byte(`"x"`), uint32(63), uint16(2000), false)
	f.Add([]byte("[[[["), uint32(60), uint16(3), true)
	f.Fuzz(func(t *testing.T, inner []byte, depth uint32, copies uint16, objects bool) {
		depth %= 1 << 20
		if len(inner)*int(copies) > 1<<22 {
			t.Skip()
		}
		open, close := "[", "]"
		if objects {
			open, close = `{"k": `, "}"
		}
		value := strings.Repeat(open, int(depth)) + string(inner) + strings.Repeat(close, int(depth))
		var b strings.Builder
		b.WriteString(`{"foilwright": 1, "name": "n", "inputs": [{"files": ["a.dat"]}], "stages": [`)
		for i := range max(int(copies), 1) {
			if i > 0 {
				b.WriteString(", ")
			}
			fmt.Fprintf(&b, `{"id": "s%d", "stage": "vortex-panel", "params": {"x": %s}}`, i, value)
		}
		b.WriteString("]}")
		data := []byte(b.String())
		var before, after runtime.MemStats
		runtime.ReadMemStats(&before)
		checkParse(t, data)
		runtime.ReadMemStats(&after)
		// The cost of a parse grows with the size, not with the size
		// times the depth (generous: the errors and the walk allocate).
		if grown := after.TotalAlloc - before.TotalAlloc; grown > uint64(64*len(data)+(8<<20)) {
			t.Fatalf("parsing %d bytes nested %d deep allocated %d bytes", len(data), depth, grown)
		}
	})
}

// checkParse parses data and checks what it gives.
func checkParse(t *testing.T, data []byte) {
	t.Helper()
	{
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
	}
}

func TestRootNotObject(t *testing.T) {
	_, err := Parse([]byte("\n  \"just a string\""), "p.json", ParseOptions{})
	if want := `p.json:2:3: want object, got string "just a string"`; err == nil || err.Error() != want {
		t.Errorf("got %v, want %s", err, want)
	}
}
