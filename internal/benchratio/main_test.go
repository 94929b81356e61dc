package main

import (
	"strings"
	"testing"
)

func TestRatios(t *testing.T) {
	in := `pkg: example/geometry
BenchmarkClean/n=1e4-2         	     100	   1000000 ns/op	  2048 B/op	      10 allocs/op
BenchmarkClean/n=1e5-2         	      10	  12000000 ns/op	 20480 B/op	     100 allocs/op
BenchmarkOther-2               	    1000	      5000 ns/op
`
	var out strings.Builder
	if err := run(strings.NewReader(in), &out); err != nil {
		t.Fatal(err)
	}
	got := out.String()
	// 12 ms / 1 ms = 12.00; n ratio 10; n log n ratio 10·ln(1e5)/ln(1e4) = 12.50.
	for _, want := range []string{"example/geometry BenchmarkClean", "12.00", "10.00", "12.50", "12.000 ms", "example/geometry BenchmarkOther"} {
		if !strings.Contains(got, want) {
			t.Errorf("output lacks %q:\n%s", want, got)
		}
	}
}
