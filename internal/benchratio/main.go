// Command benchratio reads `go test -bench` output on stdin and prints, for
// every benchmark family with sub-benchmarks named n=SIZE, the time per
// operation at each size, the ratio to the previous size, and the ratios that
// linear, n·log n and cubic growth would give, so that a scaling target
// ("no faster than n log n") can be read off one run. Families named
// .../sweep=K or other keys are printed as plain tables.
//
//	go test -run '^$' -bench . ./geometry | go run ./internal/benchratio
package main

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"os"
	"regexp"
	"sort"
	"strconv"
	"strings"
)

var line = regexp.MustCompile(`^(Benchmark\S+?)(?:-\d+)?\s+\d+\s+([\d.]+) ns/op(?:\s+([\d.]+) B/op)?(?:\s+([\d.]+) allocs/op)?`)

type row struct {
	n      float64
	label  string
	ns, by float64
}

func main() {
	if err := run(os.Stdin, os.Stdout); err != nil {
		fmt.Fprintln(os.Stderr, "benchratio:", err)
		os.Exit(1)
	}
}

func run(r io.Reader, w io.Writer) error {
	families := map[string][]row{}
	var order []string
	pkg := ""
	sc := bufio.NewScanner(r)
	for sc.Scan() {
		text := sc.Text()
		if strings.HasPrefix(text, "pkg: ") {
			pkg = strings.TrimPrefix(text, "pkg: ")
			continue
		}
		m := line.FindStringSubmatch(text)
		if m == nil {
			continue
		}
		name := m[1]
		fam, size := name, ""
		if i := strings.LastIndex(name, "/n="); i >= 0 {
			fam, size = name[:i], name[i+3:]
		}
		n, _ := strconv.ParseFloat(size, 64)
		ns, _ := strconv.ParseFloat(m[2], 64)
		by, _ := strconv.ParseFloat(m[3], 64)
		key := pkg + " " + fam
		if _, ok := families[key]; !ok {
			order = append(order, key)
		}
		families[key] = append(families[key], row{n: n, label: size, ns: ns, by: by})
	}
	if err := sc.Err(); err != nil {
		return err
	}
	for _, key := range order {
		rows := families[key]
		sort.SliceStable(rows, func(i, j int) bool { return rows[i].n < rows[j].n })
		fmt.Fprintf(w, "%s\n", key)
		fmt.Fprintf(w, "  %-10s %14s %12s %8s %8s %8s %8s\n", "n", "time/op", "B/op", "ratio", "n", "nlogn", "n³")
		for i, r := range rows {
			ratio, lin, nlogn, cube := "", "", "", ""
			if i > 0 && rows[i-1].n > 0 && r.n > 0 {
				p := rows[i-1]
				ratio = fmt.Sprintf("%.2f", r.ns/p.ns)
				lin = fmt.Sprintf("%.2f", r.n/p.n)
				nlogn = fmt.Sprintf("%.2f", r.n*math.Log(r.n)/(p.n*math.Log(p.n)))
				cube = fmt.Sprintf("%.1f", math.Pow(r.n/p.n, 3))
			}
			fmt.Fprintf(w, "  %-10s %14s %12.0f %8s %8s %8s %8s\n", r.label, human(r.ns), r.by, ratio, lin, nlogn, cube)
		}
	}
	return nil
}

func human(ns float64) string {
	switch {
	case ns >= 1e9:
		return fmt.Sprintf("%.3f s", ns/1e9)
	case ns >= 1e6:
		return fmt.Sprintf("%.3f ms", ns/1e6)
	case ns >= 1e3:
		return fmt.Sprintf("%.3f µs", ns/1e3)
	}
	return fmt.Sprintf("%.0f ns", ns)
}
