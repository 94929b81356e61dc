package host_test

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"strconv"
	"strings"
	"time"

	"github.com/hashicorp/go-plugin"
	"google.golang.org/grpc/peer"

	"github.com/foilwright/foilwright/plugins/sdk"
	"github.com/foilwright/foilwright/plugins/stage"
)

// The test binary serves the toy stages below when started as
// "TESTBINARY __stage NAME" with the handshake cookie set (PLUGINS.md §3),
// so the fault tests run real processes without building anything.

// toy is a stage made of a run function, for host tests.
type toy struct {
	name   string
	params []stage.Param
	run    func(ctx context.Context, req stage.Request, v stage.Values) (stage.Result, error)
}

func (t toy) info() stage.Info {
	return stage.Info{Name: t.name, Version: "1.0.0", Summary: "toy stage for host tests", Params: t.params}
}

func (t toy) Describe(context.Context) (stage.Info, error) { return t.info(), nil }

// smallToy describes a maximum of 5 nodes.
type smallToy struct{ toy }

func (t smallToy) Describe(context.Context) (stage.Info, error) {
	info := t.info()
	info.MaxNodes = 5
	return info, nil
}

func (t toy) Run(ctx context.Context, req stage.Request) (stage.Result, error) {
	v, err := stage.Validate(t.params, req.Params)
	if err != nil {
		return stage.Result{}, err
	}
	return t.run(ctx, req, v)
}

// okResult is a valid result document of info with one case whose cl is
// the length of the section document.
func okResult(info stage.Info, req stage.Request) (stage.Result, error) {
	d := stage.NewResultDoc(info)
	d.AddCase(stage.Case{AlphaDeg: 0, CL: float64(len(req.Section))})
	d.SetScalar("pid", float64(os.Getpid()))
	b, err := d.Encode()
	return stage.Result{JSON: b, Timings: map[string]time.Duration{"total": time.Millisecond}}, err
}

var toys = map[string]toy{}

func addToy(t toy) { toys[t.name] = t }

func init() {
	addToy(toy{name: "echo",
		params: []stage.Param{
			{Name: "reply_bytes", Type: stage.Integer, Default: json.RawMessage("0"), Min: stage.Bound(0)},
			{Name: "fail", Type: stage.String, Default: json.RawMessage(`""`), Choices: []string{"", "bad-input", "diverged"}},
			{Name: "sleep_ms", Type: stage.Integer, Default: json.RawMessage("0"), Min: stage.Bound(0), Max: stage.Bound(5000)},
		},
		run: func(ctx context.Context, req stage.Request, v stage.Values) (stage.Result, error) {
			switch v.String("fail") {
			case "bad-input":
				return stage.Result{}, stage.BadInputf("section %s: too few nodes", req.SectionName)
			case "diverged":
				return stage.Result{}, stage.Diverged(errors.New("singular system"))
			}
			if ms := v.Int("sleep_ms"); ms > 0 {
				select {
				case <-time.After(time.Duration(ms) * time.Millisecond):
				case <-ctx.Done():
					return stage.Result{}, ctx.Err()
				}
			}
			res, err := okResult(toys["echo"].info(), req)
			if n := v.Int("reply_bytes"); n > 0 {
				res.Artifacts = []stage.Artifact{{Name: "big.bin", MediaType: "application/octet-stream", Data: make([]byte, n)}}
			}
			return res, err
		}})
	// logs writes log lines to its stderr as a stage in another language
	// does: hclog JSON with JavaScript's three fraction digits, with none,
	// with six, without a timestamp, a prefixed line and plain text.
	addToy(toy{name: "logs", run: func(_ context.Context, req stage.Request, _ stage.Values) (stage.Result, error) {
		fd2 := os.NewFile(2, "stderr") // the process's stderr, not go-plugin's forwarded os.Stderr
		fd2.WriteString(`{"@level":"warn","@message":"three fraction digits","@timestamp":"2026-12-03T21:00:00.123Z","section":"toy.json"}` + "\n" +
			`{"@level":"error","@message":"no fraction","@timestamp":"2026-12-03T21:00:00+01:00"}` + "\n" +
			`{"@level":"info","@message":"six fraction digits","@timestamp":"2026-12-03T21:00:00.123456Z"}` + "\n" +
			`{"@level":"warn","@message":"no timestamp"}` + "\n" +
			`{"@level":"warn","@message":"a timestamp that is not one","@timestamp":"yesterday"}` + "\n" +
			"[WARN] a prefixed line\n" +
			"plain text at debug\n")
		return okResult(toys["logs"].info(), req)
	}})
	addToy(toy{name: "exit", run: func(context.Context, stage.Request, stage.Values) (stage.Result, error) {
		sdk.Logger().Error("giving up", "why", "toy exits on every call")
		time.Sleep(20 * time.Millisecond) // let the log line reach the host
		os.Exit(3)
		return stage.Result{}, nil
	}})
	addToy(toy{name: "panic", run: func(context.Context, stage.Request, stage.Values) (stage.Result, error) {
		var m map[string]int
		m["boom"]++ // assignment to a nil map
		return stage.Result{}, nil
	}})
	addToy(toy{name: "gopanic", run: func(context.Context, stage.Request, stage.Values) (stage.Result, error) {
		done := make(chan struct{})
		go func() { panic("toy panics in a goroutine") }()
		<-done
		return stage.Result{}, nil
	}})
	addToy(toy{name: "grandchild", run: func(_ context.Context, req stage.Request, _ stage.Values) (stage.Result, error) {
		sleeper(pidFile + ".grandchild")
		time.Sleep(50 * time.Millisecond) // let it write its pid
		return okResult(toys["grandchild"].info(), req)
	}})
	addToy(toy{name: "env", run: func(_ context.Context, req stage.Request, _ stage.Values) (stage.Result, error) {
		res, err := okResult(toys["env"].info(), req)
		res.Warnings = os.Environ()
		return res, err
	}})
	// transport says how the call came: over gRPC (the server's context
	// names the peer) or as a frame.
	addToy(toy{name: "transport", run: func(ctx context.Context, req stage.Request, _ stage.Values) (stage.Result, error) {
		res, err := okResult(toys["transport"].info(), req)
		res.Warnings = []string{"frame"}
		if _, ok := peer.FromContext(ctx); ok {
			res.Warnings = []string{"gRPC"}
		}
		return res, err
	}})
	addToy(toy{name: "memory", run: func(context.Context, stage.Request, stage.Values) (stage.Result, error) {
		var keep [][]byte
		for {
			b := make([]byte, 16<<20)
			for i := 0; i < len(b); i += 4096 {
				b[i] = 1
			}
			keep = append(keep, b)
		}
	}})
	addToy(toy{name: "small", run: func(_ context.Context, req stage.Request, _ stage.Values) (stage.Result, error) {
		return okResult(toys["small"].info(), req)
	}})
	addToy(toy{name: "hang", run: func(context.Context, stage.Request, stage.Values) (stage.Result, error) {
		time.Sleep(time.Hour) // ignores its context
		return stage.Result{}, nil
	}})
	addToy(toy{name: "flaky",
		params: []stage.Param{{Name: "marker", Type: stage.String}},
		run: func(_ context.Context, req stage.Request, v stage.Values) (stage.Result, error) {
			// Crashes the first time, when the marker file does not exist yet.
			if _, err := os.Stat(v.String("marker")); err != nil {
				os.WriteFile(v.String("marker"), nil, 0o644)
				os.Exit(4)
			}
			return okResult(toys["flaky"].info(), req)
		}})
	addToy(toy{name: "malformed",
		params: []stage.Param{{Name: "kind", Type: stage.String}},
		run: func(_ context.Context, req stage.Request, v stage.Values) (stage.Result, error) {
			good, _ := okResult(toys["malformed"].info(), req)
			switch v.String("kind") {
			case "truncated":
				return stage.Result{JSON: good.JSON[:len(good.JSON)/2]}, nil
			case "empty":
				return stage.Result{}, nil
			case "format":
				return stage.Result{JSON: []byte(`{"format": "something/2", "stage": "malformed", "version": "1"}`)}, nil
			case "stage":
				return stage.Result{JSON: []byte(`{"format": "foilwright.result/1", "stage": "other", "version": "1", "cases": []}`)}, nil
			case "case":
				return stage.Result{JSON: []byte(`{"format": "foilwright.result/1", "stage": "malformed", "version": "1", "cases": [{"cl": 1}]}`)}, nil
			case "artifact":
				good.Artifacts = []stage.Artifact{{Name: "../escape.svg", MediaType: "image/svg+xml"}}
				return good, nil
			case "deep":
				n := 100000
				return stage.Result{JSON: []byte(`{"format": "foilwright.result/1", "stage": "malformed", "version": "1", "x": ` +
					strings.Repeat("[", n) + strings.Repeat("]", n) + "}")}, nil
			}
			return good, nil
		}})
}

// sleeper starts "TESTBINARY __sleep PIDFILE" (a grandchild of the host)
// and does not wait for it; the sleeper writes its pid to pidFile.
func sleeper(pidFile string) {
	self, err := os.Executable()
	if err != nil {
		return
	}
	cmd := exec.Command(self, "__sleep", pidFile)
	if cmd.Start() == nil {
		go cmd.Wait()
	}
}

// pidFile is the third argument of a toy stage, a file to write its pid
// to ("" when not given).
var pidFile string

// serveToy serves the toy stage name, or one of the stages that misbehave
// before or during the handshake.
func serveToy(name string) {
	if len(os.Args) > 3 {
		pidFile = os.Args[3]
		os.WriteFile(pidFile, []byte(strconv.Itoa(os.Getpid())), 0o644)
	}
	switch name {
	case "garbage":
		fmt.Println("hello from init")
		sdk.Serve(toys["echo"])
	case "nohandshake":
		fmt.Fprintln(os.Stderr, "this process is not a stage")
		os.Exit(0)
	case "slowstart":
		time.Sleep(time.Hour)
	case "badversion":
		hs := stage.Handshake
		hs.ProtocolVersion = 99
		plugin.Serve(&plugin.ServeConfig{
			HandshakeConfig:  hs,
			VersionedPlugins: map[int]plugin.PluginSet{99: stage.PluginMap(toys["echo"])},
			GRPCServer:       sdk.GRPCServer,
		})
	case "badinfo":
		t := toys["echo"]
		t.params = []stage.Param{{Name: "panels", Type: stage.Integer, Default: json.RawMessage("2.5")}}
		sdk.Serve(t)
	case "wrongname":
		t := toys["echo"]
		t.name = "not-wrongname"
		sdk.Serve(t)
	case "small":
		sdk.Serve(smallToy{toys["small"]})
	default:
		t, ok := toys[name]
		if !ok {
			fmt.Fprintf(os.Stderr, "unknown toy stage %q\n", name)
			os.Exit(2)
		}
		sdk.Serve(t)
	}
}

// pidAlive reports whether pid is a live process (not gone, not a zombie).
func pidAlive(pid int) bool {
	b, err := os.ReadFile("/proc/" + strconv.Itoa(pid) + "/stat")
	if err != nil {
		return false
	}
	// pid (comm) state ...; comm may hold spaces, so split after ')'.
	s := string(b)
	i := strings.LastIndexByte(s, ')')
	return i >= 0 && i+2 < len(s) && s[i+2] != 'Z'
}

// waitGone waits up to d for pid to be gone.
func waitGone(pid int, d time.Duration) bool {
	deadline := time.Now().Add(d)
	for time.Now().Before(deadline) {
		if !pidAlive(pid) {
			return true
		}
		time.Sleep(10 * time.Millisecond)
	}
	return !pidAlive(pid)
}
