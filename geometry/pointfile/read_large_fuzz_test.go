package pointfile

import (
	"bytes"
	"runtime"
	"testing"

	"github.com/foilwright/foilwright/geometry/planar"
)

// FuzzReadLarge repeats a fuzzed chunk up to a few megabytes, optionally as
// UTF-16 text, and reads it in every format: the readers never panic, give
// only *ParseErrors or valid clouds, and take memory in proportion to the
// input (a count in a header, say of STL facets or of a listing's points,
// never sizes an allocation by itself). The other targets skip inputs over
// 64 KiB; this one reaches the sizes where a reader without bounds ran out
// of memory (issue 11).
func FuzzReadLarge(f *testing.F) {
	f.Add([]byte("1.5,2.5\n"), uint16(50000), uint8(0), false)
	f.Add([]byte("  0\nPOINT\n 10\n1\n 20\n2\n"), uint16(20000), uint8(4), false)
	f.Add([]byte("facet normal 0 0 0\nouter loop\nvertex 0 0 0\nvertex 1 0 1\nvertex 0 1 2\nendloop\nendfacet\n"), uint16(10000), uint8(5), false)
	f.Add([]byte("# units: mm\n1;2\n"), uint16(3000), uint8(1), true)
	f.Add([]byte{0xff, 0xff, 0xff, 0x7f}, uint16(60000), uint8(5), false)
	formats := append([]string{""}, Formats()...)
	cut, err := planar.ParseSpec("z=1")
	if err != nil {
		f.Fatal(err)
	}
	f.Fuzz(func(t *testing.T, chunk []byte, copies uint16, format uint8, wide bool) {
		if len(chunk) == 0 || len(chunk)*int(copies) > 8<<20 {
			t.Skip()
		}
		data := bytes.Repeat(chunk, int(copies))
		if wide {
			data = encodeUTF16(string(data), false)
		}
		opts := Options{Format: formats[int(format)%len(formats)], Cut: &cut, Units: "mm"}
		var before, after runtime.MemStats
		runtime.ReadMemStats(&before)
		c, err := Read(bytes.NewReader(data), "fuzz", opts)
		runtime.ReadMemStats(&after)
		if err != nil {
			readFuzzParseError(t, err, "fuzz")
		} else {
			readFuzzCheck(t, c)
		}
		if grown := after.TotalAlloc - before.TotalAlloc; grown > uint64(64*len(data)+(32<<20)) {
			t.Fatalf("reading %d bytes (%s) allocated %d bytes", len(data), opts.Format, grown)
		}
	})
}
