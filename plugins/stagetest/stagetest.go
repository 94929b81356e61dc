// Package stagetest checks that a stage keeps the contract of package
// stage, as testing/fstest does for file systems. A stage author calls
// Run from a test:
//
//	func TestConformance(t *testing.T) {
//		stagetest.Run(t, myStage{})
//	}
//
// Run checks the stage as a plain Go value, through real gRPC with the
// in-process harness Connect, which uses the same adapters as a stage
// process but no handshake, environment or process, and with its Run calls
// as frames (ConnectFrames).
//
// A stage in any language is checked as an executable, started as
// foilwright starts it (CheckExecutable; "foilwright stages check PATH"
// on the command line):
//
//	func TestExecutable(t *testing.T) {
//		stagetest.RunExecutable(t, "./my-stage")
//	}
package stagetest

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"net"
	"reflect"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/hashicorp/go-plugin"

	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
)

// Options tune Check. The zero value checks with Section(80) and no
// parameters.
type Options struct {
	// Section is a section document the stage accepts; nil means
	// Section(80).
	Section []byte
	// Params are parameters for the runs that must succeed; nil means {}.
	Params []byte
	// Concurrent is how many calls run at once in the concurrency check;
	// 0 means 4, or Info.MaxConcurrency if that is smaller. Negative skips
	// the check.
	Concurrent int
	// Timeout limits each call; 0 means 30 s.
	Timeout time.Duration
	// Host configures the host CheckExecutable starts the stage with (its
	// timeouts, limits and logger); the zero value is the host's
	// defaults. Check does not use it.
	Host host.Options
}

// Section returns a section document of a NACA 0012 section with a sharp
// trailing edge and 2·perSurface panels spaced by the cosine law, in the
// node order of package geometry. The shape is that of NACA Report 824's
// equations (shape.NACA4).
func Section(perSurface int) []byte {
	n := shape.NACA4{Thickness: 0.12, SharpTE: true}
	s := &section.Section{Format: section.Format, Name: "naca0012", Units: "chord", Nodes: n.Loop(perSurface)}
	var b bytes.Buffer
	if err := section.Write(&b, s); err != nil {
		panic("stagetest: " + err.Error())
	}
	return b.Bytes()
}

// Run checks impl with the default Options, directly and through the
// in-process gRPC harness, reporting each failure with t.Error.
func Run(t *testing.T, impl stage.Stage) { RunOptions(t, impl, Options{}) }

// RunOptions is Run with options.
func RunOptions(t *testing.T, impl stage.Stage, opts Options) {
	t.Helper()
	t.Run("direct", func(t *testing.T) {
		if err := Check(t.Context(), impl, opts); err != nil {
			t.Error(err)
		}
	})
	t.Run("grpc", func(t *testing.T) {
		if err := Check(t.Context(), Connect(t, impl), opts); err != nil {
			t.Error(err)
		}
	})
	t.Run("frames", func(t *testing.T) {
		if err := Check(t.Context(), ConnectFrames(t, impl), opts); err != nil {
			t.Error(err)
		}
	})
}

// Connect serves impl over real gRPC inside the test process, through the
// same adapters a stage process uses, and returns a client for it. The
// connection is closed when t's test ends. A panic that escapes impl's
// goroutines takes the test binary down, as it would take a stage process.
func Connect(t testing.TB, impl stage.Stage) stage.Stage {
	t.Helper()
	client, server := plugin.TestPluginGRPCConn(t, false, stage.PluginMap(impl))
	_ = server // stopped by the client's Close, through go-plugin's controller
	t.Cleanup(func() { client.Close() })
	raw, err := client.Dispense(stage.PluginName)
	if err != nil {
		t.Fatalf("stagetest: dispense: %v", err)
	}
	s, ok := raw.(stage.Stage)
	if !ok {
		t.Fatalf("stagetest: dispensed %T, not a stage.Stage", raw)
	}
	return s
}

// ConnectFrames is Connect with the Run calls sent as frames
// (stage.Frames) on an in-memory connection served by stage.ServeFrames,
// as the host sends them to a stage process served by plugins/sdk; calls
// that find the channel busy, and every call after one that ended
// half-way, go over gRPC.
func ConnectFrames(t testing.TB, impl stage.Stage) stage.Stage {
	t.Helper()
	s := Connect(t, impl)
	c, ok := s.(*stage.Client)
	if !ok {
		t.Fatalf("stagetest: dispensed %T, not a *stage.Client", s)
	}
	hostEnd, stageEnd := net.Pipe()
	done := make(chan struct{})
	go func() {
		defer close(done)
		stage.ServeFrames(stageEnd, impl, nil, maxFrame)
	}()
	t.Cleanup(func() {
		hostEnd.Close()
		stageEnd.Close()
		<-done
	})
	c.SetFrames(stage.NewFrames(hostEnd, func() { hostEnd.SetDeadline(time.Unix(1, 0)) }))
	return s
}

// maxFrame is the largest message of ConnectFrames's channel: that of a
// stage served by plugins/sdk.
const maxFrame = 64 << 20

// Check runs the conformance checks on s and returns every failure found,
// joined, or nil:
//
//   - Describe returns a well-formed Info (stage.CheckInfo), the same each
//     time;
//   - Run on a good section returns a valid result document naming the
//     stage and version, with only declared scalars and plain artifact
//     names, the same bytes every time, also when parameters equal to the
//     defaults are given explicitly and when calls run concurrently;
//   - unknown, mistyped and out-of-range parameters, parameters that are
//     not an object, and sections that are not section documents or have
//     fewer than three nodes are refused with stage.ErrBadInput;
//   - a cancelled call returns promptly.
func Check(ctx context.Context, s stage.Stage, opts Options) error {
	c := &checker{ctx: ctx, s: s, opts: opts}
	if c.opts.Section == nil {
		c.opts.Section = Section(80)
	}
	if c.opts.Params == nil {
		c.opts.Params = []byte("{}")
	}
	if c.opts.Timeout <= 0 {
		c.opts.Timeout = 30 * time.Second
	}
	c.run()
	return errors.Join(c.errs...)
}

type checker struct {
	ctx  context.Context
	s    stage.Stage
	opts Options
	info stage.Info
	errs []error
}

func (c *checker) fail(format string, args ...any) {
	c.errs = append(c.errs, fmt.Errorf("stagetest: "+format, args...))
}

func (c *checker) call(section, params []byte) (stage.Result, error) {
	ctx, cancel := context.WithTimeout(c.ctx, c.opts.Timeout)
	defer cancel()
	return c.s.Run(ctx, stage.Request{Section: section, Params: params, SectionName: "stagetest.json"})
}

func (c *checker) run() {
	info, err := c.s.Describe(c.ctx)
	if err != nil {
		c.fail("Describe: %v", err)
		return
	}
	c.info = info
	if err := stage.CheckInfo(info); err != nil {
		c.fail("Describe: %v", err)
	}
	if again, err := c.s.Describe(c.ctx); err != nil || !reflect.DeepEqual(normalInfo(again), normalInfo(info)) {
		c.fail("Describe is not repeatable: %+v, then %+v (%v)", info, again, err)
	}

	good, ok := c.good("first run", c.opts.Params)
	if !ok {
		return
	}
	if again, ok := c.good("second run", c.opts.Params); ok && !bytes.Equal(text(again), text(good)) {
		c.fail("Run is not deterministic: two runs of the same request gave different result documents")
	}
	c.checkDefaults(good)
	c.checkBadParams()
	c.checkBadSections()
	c.checkConcurrent(good)
	c.checkCancel()
}

// text is the result document of res as JSON text, for comparisons.
func text(res stage.Result) []byte {
	b, err := res.Document()
	if err != nil {
		return []byte(err.Error())
	}
	return b
}

// normalInfo makes empty and nil slices compare equal.
func normalInfo(in stage.Info) stage.Info {
	if len(in.Params) == 0 {
		in.Params = nil
	}
	if len(in.Scalars) == 0 {
		in.Scalars = nil
	}
	for i := range in.Params {
		if len(in.Params[i].Choices) == 0 {
			in.Params[i].Choices = nil
		}
	}
	return in
}

// good runs a request that must succeed and checks its result.
func (c *checker) good(what string, params []byte) (stage.Result, bool) {
	res, err := c.call(c.opts.Section, params)
	if err != nil {
		c.fail("%s: Run on a good section with parameters %s: %v", what, params, err)
		return res, false
	}
	doc := res.Doc
	if doc == nil {
		var err error
		if doc, err = stage.DecodeResult(res.JSON); err != nil {
			c.fail("%s: %v", what, err)
			return res, false
		}
	} else if _, err := doc.Encode(); err != nil {
		c.fail("%s: the result document cannot be written: %v", what, err)
		return res, false
	}
	if doc.Stage != c.info.Name || doc.Version != c.info.Version {
		c.fail("%s: result names stage %q version %q, Describe says %q version %q", what, doc.Stage, doc.Version, c.info.Name, c.info.Version)
	}
	declared := map[string]bool{}
	for _, s := range c.info.Scalars {
		declared[s.Name] = true
	}
	for name := range doc.Scalars {
		if !declared[name] {
			c.fail("%s: scalar %q is not declared in Info.Scalars", what, name)
		}
	}
	nulls := 0
	for _, cs := range doc.Cases {
		if cs == nil {
			nulls++
		}
	}
	if nulls > len(doc.Warnings) {
		c.fail("%s: %d failed (null) case(s) but only %d warning(s)", what, nulls, len(doc.Warnings))
	}
	seen := map[string]bool{}
	for _, a := range res.Artifacts {
		if a.Name == "" || strings.ContainsAny(a.Name, `/\`) || a.Name == "." || a.Name == ".." || seen[a.Name] {
			c.fail("%s: artifact name %q is not a plain, unique file name", what, a.Name)
		}
		if a.MediaType == "" {
			c.fail("%s: artifact %q has no media type", what, a.Name)
		}
		seen[a.Name] = true
	}
	return res, true
}

// checkDefaults gives every defaulted parameter explicitly at its default
// and expects the same result.
func (c *checker) checkDefaults(good stage.Result) {
	var params map[string]json.RawMessage
	if err := json.Unmarshal(c.opts.Params, &params); err != nil || params == nil {
		params = map[string]json.RawMessage{}
	}
	added := false
	for _, p := range c.info.Params {
		if _, given := params[p.Name]; !given && p.Default != nil {
			params[p.Name] = p.Default
			added = true
		}
	}
	if !added {
		return
	}
	b, _ := json.Marshal(params)
	if res, ok := c.good("defaults given explicitly", b); ok && !bytes.Equal(text(res), text(good)) {
		c.fail("parameters given at their defaults (%s) changed the result", b)
	}
}

// with returns the good parameters with name set to the JSON text val.
func (c *checker) with(name, val string) []byte {
	var params map[string]json.RawMessage
	if err := json.Unmarshal(c.opts.Params, &params); err != nil || params == nil {
		params = map[string]json.RawMessage{}
	}
	params[name] = json.RawMessage(val)
	b, _ := json.Marshal(params)
	return b
}

func (c *checker) wantBadInput(what string, section, params []byte) {
	_, err := c.call(section, params)
	if !errors.Is(err, stage.ErrBadInput) {
		c.fail("%s: got error %v, want stage.ErrBadInput", what, err)
	}
}

func (c *checker) checkBadParams() {
	c.wantBadInput("unknown parameter", c.opts.Section, c.with("stagetest_no_such_parameter", "1"))
	c.wantBadInput("parameters not an object", c.opts.Section, []byte("[1, 2]"))
	c.wantBadInput("parameters not JSON", c.opts.Section, []byte("{"))
	for _, p := range c.info.Params {
		wrong := `"stagetest"`
		if p.Type == stage.String {
			wrong = "17"
		}
		c.wantBadInput(fmt.Sprintf("parameter %q of the wrong type", p.Name), c.opts.Section, c.with(p.Name, wrong))
		wrap := func(x float64) string {
			b, _ := json.Marshal(x)
			if p.Type == stage.Numbers {
				return "[" + string(b) + "]"
			}
			return string(b)
		}
		if p.Type != stage.Number && p.Type != stage.Integer && p.Type != stage.Numbers {
			continue
		}
		if p.Min != nil {
			c.wantBadInput(fmt.Sprintf("parameter %q below its minimum", p.Name), c.opts.Section, c.with(p.Name, wrap(*p.Min-1)))
		}
		if p.Max != nil {
			c.wantBadInput(fmt.Sprintf("parameter %q above its maximum", p.Name), c.opts.Section, c.with(p.Name, wrap(*p.Max+1)))
		}
	}
}

func (c *checker) checkBadSections() {
	for _, tc := range []struct{ what, doc string }{
		{"section not JSON", `{"format": "foilwright.section/1", "nodes": [[1, 0], [0`},
		{"section of another format", `{"format": "foilwright.result/1", "nodes": [[1, 0], [0, 0], [1, 0]]}`},
		{"section without nodes", `{"format": "foilwright.section/1"}`},
		{"section with two nodes", `{"format": "foilwright.section/1", "nodes": [[1, 0], [0, 0]]}`},
	} {
		c.wantBadInput(tc.what, []byte(tc.doc), c.opts.Params)
	}
}

func (c *checker) checkConcurrent(good stage.Result) {
	n := c.opts.Concurrent
	if n < 0 {
		return
	}
	if n == 0 {
		n = 4
		if m := c.info.MaxConcurrency; m > 0 && m < n {
			n = m
		}
	}
	results := make([]stage.Result, n)
	errs := make([]error, n)
	var wg sync.WaitGroup
	for i := range n {
		wg.Go(func() { results[i], errs[i] = c.call(c.opts.Section, c.opts.Params) })
	}
	wg.Wait()
	for i := range n {
		if errs[i] != nil {
			c.fail("concurrent call %d: %v", i, errs[i])
		} else if !bytes.Equal(text(results[i]), text(good)) {
			c.fail("concurrent call %d gave a different result document", i)
		}
	}
}

// checkCancel runs with an already cancelled context: the stage may finish
// or return an error, but must return promptly.
func (c *checker) checkCancel() {
	ctx, cancel := context.WithCancel(c.ctx)
	cancel()
	done := make(chan struct{})
	go func() {
		defer close(done)
		c.s.Run(ctx, stage.Request{Section: c.opts.Section, Params: c.opts.Params, SectionName: "stagetest.json"})
	}()
	select {
	case <-done:
	case <-time.After(c.opts.Timeout):
		c.fail("a cancelled call did not return within %v", c.opts.Timeout)
	}
}
