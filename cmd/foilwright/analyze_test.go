package main

import (
	"bytes"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/reliability"
	"github.com/foilwright/foilwright/plugins/builtin"
	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
)

// TestMain lets the test binary serve built-in stages: the host starts
// "/proc/self/exe __stage NAME", which is this binary. For the reliability
// campaign it also serves the campaign's fault stages and helpers, and
// acts as foilwright itself when asCLIEnv is set.
func TestMain(m *testing.M) {
	if len(os.Args) > 1 && os.Args[1] == "__stage" {
		os.Exit(execute(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
	}
	if reliability.Serve(os.Args[1:]) {
		os.Exit(0)
	}
	if os.Getenv(asCLIEnv) == "1" {
		os.Exit(execute(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
	}
	if os.Getenv("GORACE") == "" {
		os.Setenv("GORACE", "atexit_sleep_ms=0") // race-enabled stages exit at once
	}
	os.Exit(m.Run())
}

// run executes the command line and returns its exit status and streams.
func run(t *testing.T, stdin string, args ...string) (int, string, string) {
	t.Helper()
	var out, errb bytes.Buffer
	code := execute(args, strings.NewReader(stdin), &out, &errb)
	return code, out.String(), errb.String()
}

// writeSection writes a NACA 4-digit section document (NACA Report 824
// equations, shape.NACA4) with 2·perSurface cosine-spaced panels.
func writeSection(t *testing.T, dir, code string, perSurface int) string {
	t.Helper()
	n, err := shape.ParseNACA4(code)
	if err != nil {
		t.Fatal(err)
	}
	n.SharpTE = true
	var b bytes.Buffer
	if err := section.Write(&b, &section.Section{Format: section.Format, Name: "naca" + code, Units: "chord", Nodes: n.Loop(perSurface)}); err != nil {
		t.Fatal(err)
	}
	p := filepath.Join(dir, "naca"+code+".json")
	if err := os.WriteFile(p, b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

func TestAnalyzeEveryBuiltin(t *testing.T) {
	dir := t.TempDir()
	sec := writeSection(t, dir, "2412", 60)
	for _, name := range builtin.Names() {
		if name == "plots" {
			continue // draws the results of other stages; TestAnalyzePlot runs it
		}
		t.Run(name, func(t *testing.T) {
			code, out, errs := run(t, "", "analyze", sec, "--stage", name, "--alpha", "-4:12:1", "--timings")
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			if !strings.Contains(out, "naca2412: "+name) || !strings.Contains(out, "alpha_deg") {
				t.Errorf("table header missing:\n%s", out)
			}
			for _, a := range []string{"-4.00", "0.00", "12.00"} {
				if !strings.Contains(out, a) {
					t.Errorf("no row for alpha %s:\n%s", a, out)
				}
			}
			if lines := strings.Count(out, "\n"); lines < 17 {
				t.Errorf("%d lines, want a row per angle:\n%s", lines, out)
			}
			for _, k := range []string{"total "} {
				if !strings.Contains(errs, k) || !strings.Contains(errs, " ms\n") {
					t.Errorf("--timings printed %q", errs)
				}
			}
		})
	}
}

func TestAnalyzeJSONAndOutputFile(t *testing.T) {
	dir := t.TempDir()
	sec := writeSection(t, dir, "0012", 40)
	outFile := filepath.Join(dir, "result.json")
	code, out, errs := run(t, "", "analyze", sec, "--stage", "vortex-panel", "--alpha", "0,2,4", "--json", "-o", outFile)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	doc, err := stage.DecodeResult([]byte(out))
	if err != nil {
		t.Fatal(err)
	}
	if doc.Stage != "vortex-panel" || len(doc.Cases) != 3 || doc.Cases[2].AlphaDeg != 4 || len(doc.Cases[0].Cp) != 81 {
		t.Errorf("result: stage %q, %d cases", doc.Stage, len(doc.Cases))
	}
	// A symmetric section: cl(−α) = −cl(α), so cl(0) = 0 (exact by symmetry).
	if c := doc.Cases[0].CL; c > 1e-9 || c < -1e-9 {
		t.Errorf("NACA 0012 at 0°: cl = %g, want 0", c)
	}
	written, err := os.ReadFile(outFile)
	if err != nil || string(written) != out {
		t.Errorf("-o file differs from --json output (%v)", err)
	}

	// Section from stdin, --params turning the pressure distribution off.
	data, _ := os.ReadFile(sec)
	code, out, errs = run(t, string(data), "analyze", "-", "--params", `{"cp": false}`, "--json")
	if code != 0 {
		t.Fatalf("stdin: exit %d: %s", code, errs)
	}
	var raw map[string]json.RawMessage
	if err := json.Unmarshal([]byte(out), &raw); err != nil || strings.Contains(out, `"cp": [`) {
		t.Errorf("cp false still wrote a pressure distribution (%v)", err)
	}
}

func TestAnalyzeBadInput(t *testing.T) {
	dir := t.TempDir()
	sec := writeSection(t, dir, "0012", 20)
	write := func(name, body string) string {
		p := filepath.Join(dir, name)
		os.WriteFile(p, []byte(body), 0o644)
		return p
	}
	malformed := write("malformed.json", "{\"format\": \"foilwright.section/1\",\n\"nodes\": [[1, 0], [0, 0]\n")
	few := write("few.json", `{"format": "foilwright.section/1", "nodes": [[1, 0], [0, 0.1], [0, -0.1], [1, 0]]}`)
	for _, tc := range []struct {
		name string
		args []string
		want string
	}{
		{"alpha above 90", []string{"analyze", sec, "--alpha", "0:95:5"}, `--alpha "0:95:5": angle 95 is outside [-90, 90] degrees`},
		{"alpha below -90", []string{"analyze", sec, "--alpha", "-91"}, "angle -91 is outside"},
		{"alpha not numeric", []string{"analyze", sec, "--alpha", "0,four"}, `"four" is not a number`},
		{"alpha bad range", []string{"analyze", sec, "--alpha", "4:0:1"}, "step 1 does not lead from 4 to 0"},
		{"unknown stage", []string{"analyze", sec, "--stage", "lifting-line"}, `unknown stage "lifting-line" (built-in stages: `},
		{"missing file", []string{"analyze", filepath.Join(dir, "none.json")}, "none.json: no such file"},
		{"malformed section", []string{"analyze", malformed}, "malformed.json:3: not a foilwright section document"},
		{"too few nodes", []string{"analyze", few, "--stage", "vortex-panel"}, `stage "vortex-panel" on ` + few + `: run: vortexpanel: too few nodes`},
		{"bad params", []string{"analyze", sec, "--params", "[1]"}, "want a JSON object"},
		{"unknown param", []string{"analyze", sec, "--params", `{"panels": 10}`}, `parameter "panels": unknown parameter`},
		{"alpha twice", []string{"analyze", sec, "--alpha", "1", "--params", `{"alpha_deg": [2]}`}, "both set alpha_deg"},
		{"missing external stage", []string{"analyze", sec, "--stage", "./no-such-stage"}, "stage executable not found"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			code, _, errs := run(t, "", tc.args...)
			if code != exitUsage || !strings.Contains(errs, tc.want) {
				t.Errorf("exit %d, stderr %q; want 2 and %q", code, errs, tc.want)
			}
		})
	}
}

func TestStagesCommands(t *testing.T) {
	code, out, errs := run(t, "", "stages")
	if code != 0 {
		t.Fatalf("stages: exit %d: %s", code, errs)
	}
	for _, name := range builtin.Names() {
		if !strings.Contains(out, name) {
			t.Errorf("stages does not list %s:\n%s", name, out)
		}
	}
	code, out, errs = run(t, "", "stages", "describe", "vortex-panel")
	if code != 0 {
		t.Fatalf("describe: exit %d: %s", code, errs)
	}
	for _, want := range []string{"alpha_deg", "numbers", "[0]", "[-90, 90], 1..1000 values", "degrees", "SCALARS", "condition"} {
		if !strings.Contains(out, want) {
			t.Errorf("describe lacks %q:\n%s", want, out)
		}
	}
	code, out, _ = run(t, "", "stages", "describe", "vortex-panel", "--json")
	var info struct {
		Name       string `json:"name"`
		Parameters []struct {
			Name string   `json:"name"`
			Max  *float64 `json:"max"`
		} `json:"parameters"`
	}
	if err := json.Unmarshal([]byte(out), &info); code != 0 || err != nil || info.Name != "vortex-panel" || *info.Parameters[0].Max != 90 {
		t.Errorf("describe --json: exit %d, %v, %+v", code, err, info)
	}
	if code, _, errs := run(t, "", "stages", "describe", "nope"); code != exitUsage || !strings.Contains(errs, `unknown stage "nope"`) {
		t.Errorf("describe nope: exit %d, %q", code, errs)
	}
}

// TestStageCommandByHand runs "__stage" without the host's handshake
// cookie: go-plugin refuses and exits 1, printing nothing on stdout.
func TestStageCommandByHand(t *testing.T) {
	self, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(self, "__stage", "vortex-panel")
	cmd.Env = []string{"GORACE=atexit_sleep_ms=0"}
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	err = cmd.Run()
	if ee, ok := err.(*exec.ExitError); !ok || ee.ExitCode() != 1 {
		t.Fatalf("exit: %v", err)
	}
	if out.Len() != 0 || !strings.Contains(errb.String(), "This binary is a plugin") {
		t.Errorf("stdout %q, stderr %q", out.String(), errb.String())
	}
}

// TestExternalStage runs a built-in through a wrapper script as an
// external stage executable, pinned by its sha256.
func TestExternalStage(t *testing.T) {
	self, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	script := filepath.Join(dir, "my-stage")
	if err := os.WriteFile(script, []byte("#!/bin/sh\nexec \""+self+"\" __stage thin-aerofoil\n"), 0o755); err != nil {
		t.Fatal(err)
	}
	sum, err := host.FileSHA256(script)
	if err != nil {
		t.Fatal(err)
	}
	sec := writeSection(t, dir, "4412", 30)
	code, out, errs := run(t, "", "analyze", sec, "--stage", script, "--sha256", sum, "--alpha", "2")
	if code != 0 || !strings.Contains(out, "thin-aerofoil") {
		t.Fatalf("pinned external stage: exit %d\n%s%s", code, out, errs)
	}
	code, out, errs = run(t, "", "stages", "describe", script)
	if code != 0 || !strings.Contains(out, "thin-aerofoil") || !strings.Contains(out, "alpha_l0_deg") {
		t.Errorf("describe external: exit %d\n%s%s", code, out, errs)
	}
	wrong := strings.Repeat("0", 64)
	code, _, errs = run(t, "", "analyze", sec, "--stage", script, "--sha256", wrong)
	if code != exitUsage || !strings.Contains(errs, "sha256 of "+script+" is "+sum+", but "+wrong+" is pinned") {
		t.Errorf("wrong pin: exit %d, %q", code, errs)
	}
	code, _, errs = run(t, "", "analyze", sec, "--stage", "vortex-panel", "--sha256", wrong)
	if code != exitUsage || !strings.Contains(errs, "pins an external stage") {
		t.Errorf("pin on a built-in: exit %d, %q", code, errs)
	}
}

// TestStagesCheck: stages check runs the conformance suite on a stage as
// a process: a wrapper script around a built-in conforms and runs from
// its interpreter; a stage that cannot do the good call fails (1); a
// missing executable or a wrong pin is bad input (2).
func TestStagesCheck(t *testing.T) {
	self, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	script := filepath.Join(dir, "my-stage")
	if err := os.WriteFile(script, []byte("#!/bin/sh\nexec \""+self+"\" __stage thin-aerofoil\n"), 0o755); err != nil {
		t.Fatal(err)
	}
	code, out, errs := run(t, "", "stages", "check", script, "--params", `{"alpha_deg": [0, 4]}`)
	if code != 0 || !strings.Contains(out, "thin-aerofoil") || !strings.Contains(out, "ok: keeps the stage protocol") || !strings.Contains(out, "runs from") {
		t.Errorf("check: exit %d\n%s%s", code, out, errs)
	}
	code, out, _ = run(t, "", "stages", "check", script, "--json")
	var rep struct {
		Conforms bool
		RunsFrom []struct{ Path, SHA256 string } `json:"runs_from"`
	}
	if code != 0 || json.Unmarshal([]byte(out), &rep) != nil || !rep.Conforms || len(rep.RunsFrom) != 1 || !filepath.IsAbs(rep.RunsFrom[0].Path) {
		t.Errorf("check --json: exit %d\n%s", code, out)
	}
	// A section this stage refuses (too few nodes to find a camber line):
	// the good calls fail.
	bad := filepath.Join(dir, "tiny.json")
	os.WriteFile(bad, []byte(`{"format": "foilwright.section/1", "nodes": [[1, 0], [0, 0.1], [0, -0.1], [1, 0]]}`), 0o644)
	if code, out, errs := run(t, "", "stages", "check", script, "--section", bad); code != exitFailed || !strings.Contains(out, "FAIL first run") || !strings.Contains(errs, "does not keep the stage protocol") {
		t.Errorf("a failing check: exit %d\n%s%s", code, out, errs)
	}
	if code, _, errs := run(t, "", "stages", "check", filepath.Join(dir, "none")); code != exitUsage || !strings.Contains(errs, "does not exist") {
		t.Errorf("missing: exit %d, %q", code, errs)
	}
	if code, _, errs := run(t, "", "stages", "check", script, "--sha256", strings.Repeat("0", 64)); code != exitUsage || !strings.Contains(errs, "is pinned") {
		t.Errorf("wrong pin: exit %d, %q", code, errs)
	}
	if code, _, errs := run(t, "", "stages", "check", script, "--params", "[1]"); code != exitUsage || !strings.Contains(errs, "want a JSON object") {
		t.Errorf("bad params: exit %d, %q", code, errs)
	}
}
