package pipeline

import (
	"os"
	"testing"
)

// BenchmarkParse parses and checks the full example file, globs included.
func BenchmarkParse(b *testing.B) {
	data, err := os.ReadFile("testdata/good.json")
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if _, err := Parse(data, "good.json", ParseOptions{Dir: "testdata", Known: builtins}); err != nil {
			b.Fatal(err)
		}
	}
}
