// Command prepbench writes the invented scan that scripts/prep-bench.sh
// times `foilwright prep` on: a NACA 2412 section (NACA Report 824
// equations), 152.4 mm chord, rotated 7°, n points evenly spaced along the
// surface in shuffled order with 0.02 mm noise, as delimited text in
// millimetres (the same scan as prep's BenchmarkPrepare).
//
//	go run ./internal/prepbench -n 100000 -o scan.csv
package main

import (
	"flag"
	"fmt"
	"os"

	"github.com/foilwright/foilwright/internal/testfoil"
)

func main() {
	n := flag.Int("n", 10000, "points of the scan")
	out := flag.String("o", "", "file to write (required)")
	flag.Parse()
	if *out == "" || *n < 10 {
		fmt.Fprintln(os.Stderr, "prepbench: -o FILE and -n ≥ 10 are required")
		os.Exit(2)
	}
	if err := write(*out, *n); err != nil {
		fmt.Fprintln(os.Stderr, "prepbench:", err)
		os.Exit(1)
	}
}

func write(path string, n int) error {
	return os.WriteFile(path, testfoil.ScanCSV(n), 0o644)
}
