package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"github.com/foilwright/foilwright/prep"
)

// Tests of the command line as a whole (issue 12): one output flag, --json
// and -q, defaults shown as values, flag groups, completion, streams.

// allCommands returns every command a user can run, by path.
func allCommands() map[string]*cobra.Command {
	var started bool
	root := newRootCmd(&started)
	root.InitDefaultHelpCmd()
	root.InitDefaultCompletionCmd()
	out := map[string]*cobra.Command{}
	var walk func(c *cobra.Command)
	walk = func(c *cobra.Command) {
		if c.Hidden || c.Name() == "help" {
			return
		}
		out[c.CommandPath()] = c
		for _, sub := range c.Commands() {
			walk(sub)
		}
	}
	walk(root)
	return out
}

// commandsWithOutput are the commands that write something of their own:
// each has -o/--output, --json and -q.
var commandsWithOutput = []string{
	"foilwright points", "foilwright prep", "foilwright shape naca4", "foilwright shape karman-trefftz",
	"foilwright analyze", "foilwright run", "foilwright export", "foilwright export stations",
	"foilwright compare",
}

func TestOutputJSONQuietEverywhere(t *testing.T) {
	cmds := allCommands()
	for _, path := range commandsWithOutput {
		c := cmds[path]
		if c == nil {
			t.Fatalf("no command %q", path)
		}
		o := c.Flags().Lookup("output")
		if o == nil || o.Shorthand != "o" {
			t.Errorf("%s: no -o/--output", path)
		}
		if old := c.Flags().Lookup("out"); old == nil || !old.Hidden || len(old.Annotations[deprecatedAnnotation]) == 0 {
			t.Errorf("%s: the earlier --out is not a hidden, deprecated alias", path)
		}
	}
	// --json and -q wherever a command has output (version prints only
	// what it is asked for: it has --json).
	for path, c := range cmds {
		if !c.Runnable() || strings.HasPrefix(path, "foilwright completion") {
			continue
		}
		if c.Flags().Lookup("json") == nil {
			t.Errorf("%s: no --json", path)
		}
		if q := c.Flags().Lookup("quiet"); path != "foilwright version" && (q == nil || q.Shorthand != "q") {
			t.Errorf("%s: no -q/--quiet", path)
		}
	}
}

// The earlier --out still works, with a note on standard error; standard
// output carries only the document.
func TestDeprecatedOut(t *testing.T) {
	out := filepath.Join(t.TempDir(), "s.json")
	stdout, stderr, code := runCLI(t, "shape", "naca4", "0012", "--out", out, "-q")
	if code != 0 || stdout != "" || !strings.Contains(stderr, "note: --out is deprecated; use --output") {
		t.Errorf("exit %d, stdout %q, stderr %q", code, stdout, stderr)
	}
	if _, err := os.Stat(out); err != nil {
		t.Error(err)
	}
}

// "-o -" is standard output, never a file named "-".
func TestDashIsStandardOutput(t *testing.T) {
	dir := t.TempDir()
	t.Chdir(dir)
	sec := filepath.Join(dir, "s.json")
	if _, stderr, code := runCLI(t, "shape", "naca4", "2412", "-o", sec, "-q"); code != 0 {
		t.Fatal(stderr)
	}
	for _, args := range [][]string{
		{"analyze", sec, "--alpha", "0,4", "-o", "-"},
		{"shape", "naca4", "0012", "-o", "-"},
		{"prep", "../../examples/tunnel-model/probe.csv", "-o", "-"},
		{"points", "../../examples/tunnel-model/probe.csv", "-o", "-"},
		{"export", sec, "--to", "dxf", "--frame", "chord", "-o", "-"},
	} {
		if args[0] == "prep" || args[0] == "points" {
			args[1] = filepath.Join(origDir, args[1])
		}
		stdout, stderr, code := runCLI(t, args...)
		if code != 0 {
			t.Errorf("%v: exit %d: %s", args, code, stderr)
			continue
		}
		if _, err := os.Stat(filepath.Join(dir, "-")); err == nil {
			t.Fatalf("%v: wrote a file named -", args)
		}
		// The document alone on standard output; the report on standard error.
		switch args[0] {
		case "analyze", "shape", "prep":
			if !json.Valid([]byte(stdout)) {
				t.Errorf("%v: standard output is not one JSON document:\n%.300s", args, stdout)
			}
		case "points":
			if !strings.HasPrefix(stdout, "x,y,file,line\n") {
				t.Errorf("%v: standard output %.100q", args, stdout)
			}
		case "export":
			if !strings.HasPrefix(stdout, "999\nwritten by foilwright\n") || !strings.Contains(stderr, "wrote standard output") {
				t.Errorf("%v: stdout %.60q, stderr %q", args, stdout, stderr)
			}
		}
	}
}

// origDir is the package folder, where the tests start.
var origDir, _ = os.Getwd()

// Two documents never share standard output; with the listing on standard
// output prep writes just the listing.
func TestOneDocumentPerStream(t *testing.T) {
	probe := "../../examples/tunnel-model/probe.csv"
	if _, stderr, code := runCLI(t, "prep", probe, "-o", "-", "--nodes", "-"); code != exitUsage || !strings.Contains(stderr, "--output and --nodes all write to standard output") {
		t.Errorf("-o - --nodes -: exit %d, %s", code, stderr)
	}
	if _, stderr, code := runCLI(t, "prep", probe, "--json", "--nodes", "-"); code != exitUsage {
		t.Errorf("--json --nodes -: exit %d, %s", code, stderr)
	}
	stdout, stderr, code := runCLI(t, "prep", probe, "-q", "--nodes", "-")
	if code != 0 {
		t.Fatal(stderr)
	}
	lines := strings.Split(strings.TrimSpace(stdout), "\n")
	if lines[0] != "probe" || strings.Contains(stdout, "{") || len(lines) < 100 {
		t.Errorf("standard output is not the listing alone:\n%.300s", stdout)
	}
	for _, l := range lines[1:] {
		if len(strings.Fields(l)) != 2 {
			t.Fatalf("listing line %q", l)
		}
	}
}

// On a terminal, prep and shape without -o print the summary, not the
// section document, and say how to write it.
func TestNoDocumentOnTerminal(t *testing.T) {
	defer func(f func(io.Writer) bool) { isTerminal = f }(isTerminal)
	isTerminal = func(io.Writer) bool { return true }
	for _, args := range [][]string{{"prep", "../../examples/tunnel-model/probe.csv"}, {"shape", "naca4", "2412"}} {
		stdout, stderr, code := runCLI(t, args...)
		if code != 0 || strings.Contains(stdout, `"nodes"`) || !strings.Contains(stdout, "panels") || !strings.Contains(stderr, "give -o FILE") {
			t.Errorf("%v: exit %d, stdout %.200q, stderr %q", args, code, stdout, stderr)
		}
	}
	if _, stderr, code := runCLI(t, "export", "x.json", "--to", "csv"); code != exitUsage || !strings.Contains(stderr, "give -o FILE") {
		t.Errorf("export on a terminal without -o: exit %d, %s", code, stderr)
	}
}

func TestVersionFlagAndJSON(t *testing.T) {
	stdout, _, code := runCLI(t, "--version")
	if code != 0 || !strings.HasPrefix(stdout, "foilwright 0.") {
		t.Errorf("--version: exit %d, %q", code, stdout)
	}
	stdout, _, _ = runCLI(t, "version", "--json")
	var v versionInfo
	if err := json.Unmarshal([]byte(stdout), &v); err != nil || v.Version == "" || v.Go == "" {
		t.Errorf("version --json: %q, %v", stdout, err)
	}
}

func TestJSONReports(t *testing.T) {
	stdout, _, code := runCLI(t, "stages", "--json")
	var list []stageEntryJSON
	if code != 0 || json.Unmarshal([]byte(stdout), &list) != nil || len(list) < 4 || list[0].Name == "" {
		t.Errorf("stages --json: exit %d, %q", code, stdout)
	}
	// The rotor names its custom stage's executable, which a clean clone
	// has not built: plan a copy with the stage built beside it.
	dir := t.TempDir()
	copyExample(t, dir)
	stdout, _, code = runCLI(t, "run", filepath.Join(dir, "examples", "rotor", "pipeline.json"), "--plan", "--json")
	var plan planReportJSON
	if code != 0 || json.Unmarshal([]byte(stdout), &plan) != nil || len(plan.Sections) != 5 || *plan.Sections[2].Station != 700 {
		t.Errorf("run --plan --json: exit %d, %q", code, stdout)
	}
	if stdout, _, code := runCLI(t, "stages", "-q"); code != 0 || stdout != "" {
		t.Errorf("stages -q: exit %d, %q", code, stdout)
	}
}

// Defaults are shown as values: no "(0: 6)" standing for something else.
func TestDefaultsShownAsValues(t *testing.T) {
	bad := regexp.MustCompile(`[(;] ?0: |\(0 = |\(default: default\)|0: default`)
	for path, c := range allCommands() {
		var b bytes.Buffer
		c.SetOut(&b)
		c.SetErr(&b)
		if err := c.Help(); err != nil {
			t.Fatal(err)
		}
		if m := bad.FindString(b.String()); m != "" {
			t.Errorf("%s: help shows a default as %q:\n%s", path, m, b.String())
		}
	}
	help, _, _ := runCLI(t, "prep", "--help")
	for _, want := range []string{"(default 6)", "--merge-tol length", "(default auto)", "(default all)", "--te-blend-length length", "(default 0.1c)", "(default 0.5)", "--panels count", "(default 0.0001)"} {
		if !strings.Contains(help, want) {
			t.Errorf("prep --help lacks %q", want)
		}
	}
}

// shape's flags are its subcommands' own, not listed as global; the
// stage-process flags are listed in a group of their own.
func TestFlagGroups(t *testing.T) {
	help, _, _ := runCLI(t, "shape", "naca4", "--help")
	if strings.Contains(help, "Global Flags") || !strings.Contains(help, "--panels") {
		t.Errorf("shape naca4 --help:\n%s", help)
	}
	stageFlags := []string{"--stage-start-timeout", "--stage-timeout", "--log-level", "--stage-mtls"}
	for _, args := range [][]string{{"analyze"}, {"run"}, {"stages"}, {"stages", "describe"}} {
		help, _, _ := runCLI(t, append(args, "--help")...)
		i := strings.Index(help, "\nStage process flags:\n")
		if i < 0 {
			t.Errorf("%v: no stage process group:\n%s", args, help)
			continue
		}
		for _, f := range stageFlags {
			if strings.Index(help, f) < i {
				t.Errorf("%v: %s listed outside its group", args, f)
			}
		}
	}
	help, _, _ = runCLI(t, "prep", "--help")
	if i := strings.Index(help, "\nGeometry chain flags:\n"); i < 0 || strings.Index(help, "--outlier-sigma") < i {
		t.Errorf("prep --help: the chain's flags are not in their group")
	}
}

// Every flag that takes a value completes it: a list of values, file
// names of the right kind, or at least no file names for a number.
func TestCompletionForEveryValue(t *testing.T) {
	for path, c := range allCommands() {
		c.Flags().VisitAll(func(f *pflag.Flag) {
			if f.Hidden || f.Value.Type() == "bool" || f.Name == "help" {
				return
			}
			_, hasFunc := c.GetFlagCompletionFunc(f.Name)
			_, files := f.Annotations[cobra.BashCompFilenameExt]
			_, dirs := f.Annotations[cobra.BashCompSubdirsInDir]
			if !hasFunc && !files && !dirs {
				t.Errorf("%s --%s: no completion", path, f.Name)
			}
		})
		if c.Runnable() && c.Args != nil && c.ValidArgsFunction == nil && len(c.ValidArgs) == 0 && !strings.HasPrefix(path, "foilwright completion") {
			if err := c.Args(c, nil); err != nil { // takes arguments
				t.Errorf("%s: no completion of its arguments", path)
			}
		}
	}
	stdout, _, _ := runCLI(t, "__complete", "prep", "x.csv", "--spacing", "")
	if !strings.Contains(stdout, "half-cosine") || !strings.Contains(stdout, ":4") {
		t.Errorf("completion of --spacing: %q", stdout)
	}
	stdout, _, _ = runCLI(t, "__complete", "export", "s.json", "--to", "")
	if !strings.Contains(stdout, "polar-csv") {
		t.Errorf("completion of --to: %q", stdout)
	}
}

// The node listing prep writes reads back without a unit (it is
// normalised), to the same nodes.
func TestListingReadsBack(t *testing.T) {
	dir := t.TempDir()
	dat, sec := filepath.Join(dir, "n.dat"), filepath.Join(dir, "n.json")
	if _, stderr, code := runCLI(t, "shape", "naca4", "0012", "--sharp", "--nodes", dat, "-o", sec, "-q"); code != 0 {
		t.Fatal(stderr)
	}
	back := filepath.Join(dir, "back.json")
	stdout, stderr, code := runCLI(t, "prep", dat, "--noise", "0", "-o", back)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if !strings.Contains(stdout, "chord 1 c,") || strings.Contains(stdout, "chord chord") {
		t.Errorf("summary of a chord-unit input:\n%s", stdout)
	}
	// The symmetric section comes back in its own frame: leading edge at
	// the origin, unit chord, no twist; with its area (NACA Report 824
	// equations through the same nodes).
	a, b := loadSection(t, sec), loadSection(t, back)
	if _, err := prep.NodeProperties(a); err != nil {
		t.Fatal(err)
	}
	fr := b.Frame
	if b.Units != "chord" || math.Abs(fr.Chord-1) > 1e-9 || math.Abs(fr.TwistDeg) > 1e-7 || math.Hypot(fr.LE[0], fr.LE[1]) > 1e-9 {
		t.Errorf("read back in %q, frame %+v; want chord units and the identity", b.Units, fr)
	}
	if d := math.Abs(a.Properties.Area - b.Properties.Area); d > 1e-6 {
		t.Errorf("area %g read back as %g", a.Properties.Area, b.Properties.Area)
	}
}

// Without a unit, the message names the flag that gives one.
func TestNoUnitsNamesTheFlag(t *testing.T) {
	f := filepath.Join(t.TempDir(), "p.txt")
	os.WriteFile(f, []byte("0 0\n10 1\n20 0\n10 -1\n5 0.8\n15 0.7\n5 -0.8\n15 -0.7\n"), 0o644)
	_, stderr, code := runCLI(t, "prep", f, "-o", filepath.Join(t.TempDir(), "s.json"))
	if code != exitUsage || !strings.Contains(stderr, "give it with --units") {
		t.Errorf("exit %d: %s", code, stderr)
	}
}

// analyze --plot writes the picture asked for under its name, whatever
// the stage draws: thin-aerofoil gives no Cp, so the polar goes there.
func TestAnalyzePlotName(t *testing.T) {
	dir := t.TempDir()
	sec := filepath.Join(dir, "s.json")
	if _, stderr, code := runCLI(t, "shape", "naca4", "2412", "-o", sec, "-q"); code != 0 {
		t.Fatal(stderr)
	}
	pic := filepath.Join(dir, "thin.svg")
	stdout, stderr, code := runCLI(t, "analyze", sec, "--stage", "thin-aerofoil", "--alpha", "0,4", "--plot", pic)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	data, err := os.ReadFile(pic)
	if err != nil || !bytes.Contains(data, []byte("Lift and moment")) {
		t.Errorf("thin.svg: %v (not the polar)", err)
	}
	if _, err := os.Stat(filepath.Join(dir, "thin-polar.svg")); err == nil {
		t.Error("the polar was also written beside")
	}
	for _, want := range []string{"wrote " + pic, "wrote " + filepath.Join(dir, "thin-section.svg")} {
		if !strings.Contains(stdout, want) {
			t.Errorf("stdout lacks %q:\n%s", want, stdout)
		}
	}
	if _, stderr, code := runCLI(t, "analyze", sec, "--plot", "-"); code != exitUsage {
		t.Errorf("--plot -: exit %d, %s", code, stderr)
	}
}

// The summary names every file as it was given, units go with every
// length, and noise-free points raise no "farther than" warning.
func TestSummaryReadouts(t *testing.T) {
	probe := "../../examples/tunnel-model/probe.csv"
	stdout, _, _ := runCLI(t, "prep", probe, "-o", filepath.Join(t.TempDir(), "s.json"))
	for _, m := range regexp.MustCompile(`[\w./-]*probe\.csv`).FindAllString(stdout, -1) {
		if m != probe {
			t.Errorf("summary names the input as %q, and elsewhere as %q", m, probe)
		}
	}
	for _, want := range []string{"1.81 mm off the local fit"} {
		if !strings.Contains(stdout, want) {
			t.Errorf("summary lacks %q:\n%s", want, stdout)
		}
	}
	for _, want := range []string{`max [0-9.]+ mm at`, `chord ± [0-9.e-]+ mm, twist ± [0-9.e-]+°, LE ± [0-9.e-]+ mm`} {
		if !regexp.MustCompile(want).MatchString(stdout) {
			t.Errorf("summary lacks %q:\n%s", want, stdout)
		}
	}
	// A CAD export: the NACA 2412 equations at 200 mm, noise-free.
	dir := t.TempDir()
	dat := filepath.Join(dir, "cad.dat")
	if _, stderr, code := runCLI(t, "shape", "naca4", "2412", "--panels", "300", "--nodes", dat, "-o", filepath.Join(dir, "n.json"), "-q"); code != 0 {
		t.Fatal(stderr)
	}
	listing, _ := os.ReadFile(dat)
	var csv strings.Builder
	csv.WriteString("# units: mm\n")
	for _, l := range strings.Split(strings.TrimSpace(string(listing)), "\n")[1:] {
		var x, y float64
		if _, err := fmt.Sscan(l, &x, &y); err == nil {
			fmt.Fprintf(&csv, "%.9f %.9f\n", 200*x, 200*y)
		}
	}
	cad := filepath.Join(dir, "cad.csv")
	os.WriteFile(cad, []byte(csv.String()), 0o644)
	stdout, stderr, code := runCLI(t, "prep", cad, "-o", filepath.Join(dir, "cad.json"))
	if code != 0 || strings.Contains(stdout, "farther than") || strings.Contains(stdout, "-0.00") {
		t.Errorf("noise-free input: exit %d\n%s%s", code, stdout, stderr)
	}
}

func TestRateText(t *testing.T) {
	for _, tc := range []struct {
		done, total int
		el          time.Duration
		want        string
	}{
		{1, 10, 5 * time.Millisecond, ""}, // the first tick: no rate yet
		{2, 10, 500 * time.Millisecond, ""},
		{4, 10, 8 * time.Second, " (2.0 s each, about 12 s left)"},
		{10, 10, 20 * time.Second, " (2.0 s each)"},
	} {
		if got := rateText(tc.done, tc.total, tc.el); got != tc.want {
			t.Errorf("rateText(%d, %d, %v) = %q, want %q", tc.done, tc.total, tc.el, got, tc.want)
		}
	}
}

// The trailing-edge reshape and the automatic panel count through prep;
// the earlier --te close still works, with a note.
func TestPrepEdgeAndPanels(t *testing.T) {
	probe := "../../examples/tunnel-model/probe.csv"
	dir := t.TempDir()
	stdout, stderr, code := runCLI(t, "prep", probe, "--te-thickness", "0.2mm", "--te-blend-length", "30mm", "-o", filepath.Join(dir, "a.json"))
	if code != 0 || !strings.Contains(stdout, "thinned to 0.2 mm over 30 mm ahead of the edge (largest shift 0.154 mm)") {
		t.Errorf("exit %d\n%s%s", code, stdout, stderr)
	}
	_, stderr, code = runCLI(t, "prep", probe, "--te", "close", "--te-blend", "0.1", "-o", filepath.Join(dir, "b.json"), "-q")
	if s := loadSection(t, filepath.Join(dir, "b.json")); code != 0 || s.TrailingEdge.Action != "closed" ||
		!strings.Contains(stderr, "--te close is deprecated") || !strings.Contains(stderr, "--te-blend is deprecated") {
		t.Errorf("--te close: exit %d, %+v, %s", code, s.TrailingEdge, stderr)
	}
	if _, stderr, code := runCLI(t, "prep", probe, "--te", "sharpen", "--te-thickness", "0", "-o", "-"); code != exitUsage {
		t.Errorf("--te sharpen with --te-thickness: exit %d, %s", code, stderr)
	}
	a := loadSection(t, filepath.Join(dir, "a.json"))
	_, _, code = runCLI(t, "prep", probe, "--panel-tol", "2e-5", "-o", filepath.Join(dir, "c.json"), "-q")
	c := loadSection(t, filepath.Join(dir, "c.json"))
	if code != 0 || a.Panels.Target != 1e-4 || a.Panels.Deviation > 1e-4 || c.Panels.Deviation > 2e-5 || c.Panels.Count <= a.Panels.Count {
		t.Errorf("panels %+v, with --panel-tol 2e-5 %+v", a.Panels, c.Panels)
	}
}
