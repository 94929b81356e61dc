package main

import (
	"bytes"
	"fmt"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
)

// runCLI runs the command line in process and returns its streams and exit
// status.
func runCLI(t *testing.T, args ...string) (stdout, stderr string, code int) {
	t.Helper()
	var out, errb bytes.Buffer
	code = execute(args, strings.NewReader(""), &out, &errb)
	return out.String(), errb.String(), code
}

func TestExitStatuses(t *testing.T) {
	for _, tc := range []struct {
		name string
		args []string
		code int
		msg  string
	}{
		{"unknown command", []string{"bogus"}, exitUsage, `unknown command "bogus"`},
		{"bad flag", []string{"version", "--nope"}, exitUsage, "unknown flag"},
		{"extra args", []string{"version", "x"}, exitUsage, "unknown command"},
		{"bad naca code", []string{"shape", "naca4", "24x2"}, exitUsage, `"24x2"`},
		{"panels out of range", []string{"shape", "naca4", "0012", "--panels", "8"}, exitUsage, `"8" for "--panels"`},
		{"ok", []string{"version"}, exitOK, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, stderr, code := runCLI(t, tc.args...)
			if code != tc.code {
				t.Errorf("exit %d, want %d (stderr %q)", code, tc.code, stderr)
			}
			if !strings.Contains(stderr, tc.msg) {
				t.Errorf("stderr %q lacks %q", stderr, tc.msg)
			}
		})
	}
}

func TestShapeNACA4(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "s.json")
	dat := filepath.Join(dir, "s.dat")
	if _, stderr, code := runCLI(t, "shape", "naca4", "0012", "--sharp", "--panels", "161", "-o", out, "--nodes", dat); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	f, err := os.Open(out)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	s, err := section.Read(f, out)
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Nodes) != 162 || s.Name != "NACA 0012" || s.TrailingEdge.Kind != "sharp" {
		t.Errorf("got %d nodes, name %q, TE %+v", len(s.Nodes), s.Name, s.TrailingEdge)
	}
	listing, _ := os.ReadFile(dat)
	lines := strings.Split(strings.TrimSpace(string(listing)), "\n")
	if lines[0] != "NACA 0012" || len(lines) != 163 {
		t.Errorf("node listing: first line %q, %d lines", lines[0], len(lines))
	}
}

func TestFailedWriteKeepsOutput(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "s.json")
	os.WriteFile(out, []byte("earlier good output"), 0o644)
	if _, _, code := runCLI(t, "shape", "naca4", "00x2", "-o", out); code != exitUsage {
		t.Fatalf("exit %d, want %d", code, exitUsage)
	}
	if got, _ := os.ReadFile(out); string(got) != "earlier good output" {
		t.Errorf("earlier output changed to %q", got)
	}
}

func TestShapeKarmanTrefftz(t *testing.T) {
	out, stderr, code := runCLI(t, "shape", "karman-trefftz", "--centre", "-0.1,0.05", "--te-angle", "8", "--panels", "64")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	s, err := section.Read(strings.NewReader(out), "stdout")
	if err != nil {
		t.Fatal(err)
	}
	// Normalised: the trailing edge at (1, 0) closes the loop, the leading
	// edge node is the one nearest the origin.
	if len(s.Nodes) != 65 || s.Nodes[0] != s.Nodes[64] || s.Nodes[0].Dist(geometry.Point{X: 1}) > 1e-12 {
		t.Errorf("nodes: %d, first %v, last %v", len(s.Nodes), s.Nodes[0], s.Nodes[64])
	}
	if _, _, code := runCLI(t, "shape", "kt", "--centre", "0.1,0"); code != exitUsage {
		t.Errorf("centre inside the circle: exit %d, want %d", code, exitUsage)
	}
	if _, _, code := runCLI(t, "shape", "kt", "--centre", "x"); code != exitUsage {
		t.Errorf("bad centre: exit %d, want %d", code, exitUsage)
	}
}

func TestAnalyzePlot(t *testing.T) {
	dir := t.TempDir()
	sec := filepath.Join(dir, "s.json")
	if _, stderr, code := runCLI(t, "shape", "naca4", "2412", "-o", sec); code != 0 {
		t.Fatal(stderr)
	}
	pic := filepath.Join(dir, "cp.png")
	if _, stderr, code := runCLI(t, "analyze", sec, "--alpha", "0,4,8", "--plot", pic); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	for _, name := range []string{"cp.png", "cp-polar.png", "cp-section.png"} {
		f, err := os.Open(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		if _, err := png.Decode(f); err != nil {
			t.Errorf("%s: %v", name, err)
		}
		f.Close()
	}
	if _, _, code := runCLI(t, "analyze", sec, "--plot", filepath.Join(dir, "cp.gif")); code != exitUsage {
		t.Errorf("--plot cp.gif: exit %d, want %d", code, exitUsage)
	}
}

func TestPointsAndShapePlots(t *testing.T) {
	dir := t.TempDir()
	for _, args := range [][]string{
		{"points", "../../examples/tunnel-model/probe.csv", "--plot", filepath.Join(dir, "points.png")},
		{"shape", "naca4", "4415", "-o", filepath.Join(dir, "s.json"), "--plot", filepath.Join(dir, "shape.png")},
	} {
		if _, stderr, code := runCLI(t, args...); code != 0 {
			t.Fatalf("%v: exit %d: %s", args, code, stderr)
		}
	}
	for _, name := range []string{"points.png", "shape.png"} {
		f, err := os.Open(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		if _, err := png.Decode(f); err != nil {
			t.Errorf("%s: %v", name, err)
		}
		f.Close()
	}
}

func TestStagesOfPipeline(t *testing.T) {
	out, stderr, code := runCLI(t, "stages", "--pipeline", "../../examples/tunnel-model/pipeline.json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	for _, want := range []string{"vortex  vortex-panel   0.1.0    built-in  -", "plots   plots", "vortex, thin, source"} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
	if _, _, code := runCLI(t, "stages", "--pipeline", "nope.json"); code != exitUsage {
		t.Errorf("missing pipeline file: exit %d, want %d", code, exitUsage)
	}
}

func TestRunProgressLines(t *testing.T) {
	// Off a terminal, progress is one line per section on stderr; --quiet
	// silences it.
	dir := t.TempDir()
	pipe := filepath.Join(dir, "p.json")
	os.WriteFile(filepath.Join(dir, "probe.csv"), must(os.ReadFile("../../examples/tunnel-model/probe.csv")), 0o644)
	os.WriteFile(pipe, []byte(`{"foilwright": 1, "name": "progress", "inputs": [{"name": "a", "files": ["probe.csv"]}, {"name": "b", "files": ["probe.csv"]}],
  "stages": [{"id": "thin", "stage": "thin-aerofoil"}], "outputs": {"folder": "out"}}`), 0o644)
	_, stderr, code := runCLI(t, "run", pipe)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if !strings.Contains(stderr, "[1/2] ok ") || !strings.Contains(stderr, "[2/2] ok ") || !strings.Contains(stderr, "s left)") {
		t.Errorf("progress lines missing:\n%s", stderr)
	}
	stdout, stderr, code := runCLI(t, "run", pipe, "--replace", "--quiet")
	if code != 0 || strings.Contains(stderr, "[1/2]") || stdout != "" {
		t.Errorf("--quiet: exit %d, stdout %q, stderr %q", code, stdout, stderr)
	}
	if _, _, code := runCLI(t, "run", pipe); code != exitUsage {
		t.Errorf("run into a folder holding an earlier run without --replace: exit %d, want %d", code, exitUsage)
	}
}

func must(b []byte, err error) []byte {
	if err != nil {
		panic(err)
	}
	return b
}

func TestPrepBadInput(t *testing.T) {
	dir := t.TempDir()
	write := func(name, text string) string {
		p := filepath.Join(dir, name)
		os.WriteFile(p, []byte(text), 0o644)
		return p
	}
	var circle, square strings.Builder
	circle.WriteString("# units: mm\n")
	square.WriteString("# units: mm\n")
	for i := range 60 {
		a := 2 * math.Pi * float64(i) / 60
		fmt.Fprintf(&circle, "%.6f %.6f\n", 50*math.Cos(a), 50*math.Sin(a))
	}
	for i := range 15 {
		f := float64(i) / 15
		fmt.Fprintf(&square, "%g 0\n1 %g\n%g 1\n0 %g\n", f, f, 1-f, 1-f)
	}
	probe := "../../examples/tunnel-model/probe.csv"
	out := write("out.json", "earlier good output")
	for _, tc := range []struct {
		name string
		args []string
		msg  string
	}{
		{"circle", []string{write("circle.txt", circle.String())}, "--le-at"},
		{"square", []string{write("square.txt", square.String())}, "--le-at"},
		{"empty", []string{write("empty.txt", "")}, "empty"},
		{"no units", []string{write("nounits.txt", "0 0\n1 0\n1 1\n0 1\n0.5 0.5\n0.2 0.1\n0.3 0.7\n0.9 0.4\n")}, "unit"},
		{"panels", []string{probe, "--panels", "8"}, `"8" for "--panels"`},
		{"noise", []string{probe, "--noise", "50"}, "noise"},
		{"bad noise", []string{probe, "--noise", "lots"}, "--noise"},
		{"too few points", []string{write("few.txt", "# units: mm\n0 0\n1 0\n1 1\n0 1\n")}, "too few"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, stderr, code := runCLI(t, append(append([]string{"prep"}, tc.args...), "-o", out)...)
			if code != exitUsage {
				t.Errorf("exit %d, want %d (%s)", code, exitUsage, stderr)
			}
			if !strings.Contains(stderr, tc.msg) {
				t.Errorf("stderr %q lacks %q", stderr, tc.msg)
			}
			if got, _ := os.ReadFile(out); string(got) != "earlier good output" {
				t.Errorf("earlier output changed")
			}
		})
	}
}

func TestPointsBadInput(t *testing.T) {
	dir := t.TempDir()
	write := func(name string, data []byte) string {
		p := filepath.Join(dir, name)
		os.WriteFile(p, data, 0o644)
		return p
	}
	stl := make([]byte, 84) // header + a count of 3 facets, but no facets
	stl[80] = 3
	for _, tc := range []struct {
		name string
		args []string
		msg  string // part of the message: file, line, reason
	}{
		{"empty", []string{write("empty.csv", nil)}, "empty.csv: file is empty"},
		{"no numbers", []string{write("words.csv", []byte("# units: mm\nsome words\nmore words\n"))}, "words.csv"},
		{"one coordinate", []string{write("one.csv", []byte("# units: mm\n1 2\n3 4\n5\n"))}, "one.csv:4"},
		{"NaN", []string{write("nan.csv", []byte("# units: mm\n1 2\nNaN 4\n"))}, "nan.csv:3"},
		{"binary, not STL", []string{write("blob.bin", []byte{0x89, 'P', 'N', 'G', 0, 1, 2, 3, 0xff, 0xfe, 0, 0})}, "blob.bin"},
		{"truncated STL", []string{write("cut.stl", stl), "--cut", "z=0", "--units", "mm"}, "truncated"},
		{"DXF without entities", []string{write("empty.dxf", []byte("  0\nSECTION\n  2\nENTITIES\n  0\nENDSEC\n  0\nEOF\n"))}, "empty.dxf"},
		{"unknown unit", []string{write("ok.csv", []byte("0 0\n1 0\n")), "--units", "furlong"}, "furlong"},
		{"column out of range", []string{write("cols.csv", []byte("# units: mm\n1 2\n3 4\n")), "--columns", "2,5"}, "cols.csv"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			out := filepath.Join(dir, "out-"+strings.ReplaceAll(tc.name, " ", "-")+".csv")
			_, stderr, code := runCLI(t, append(append([]string{"points"}, tc.args...), "-o", out)...)
			if code != exitUsage {
				t.Errorf("exit %d, want %d (%s)", code, exitUsage, stderr)
			}
			if !strings.Contains(stderr, tc.msg) {
				t.Errorf("stderr %q lacks %q", stderr, tc.msg)
			}
			if _, err := os.Stat(out); err == nil {
				t.Error("an output file was written")
			}
		})
	}
}
