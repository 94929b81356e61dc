package reliability

import (
	"context"
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"os/signal"
	"strconv"
	"strings"
	"syscall"
	"time"

	"github.com/hashicorp/go-plugin"

	"github.com/foilwright/foilwright/plugins/sdk"
	"github.com/foilwright/foilwright/plugins/stage"
)

// A fault is a stage that misbehaves in one way. The campaign's binary
// serves it as "BIN __fault NAME CASEDIR"; CASEDIR marks every process of
// a case (the stage and the grandchildren it starts), so that processes
// left behind can be found and ended.
type fault struct {
	name string
	what string // what it does, for the report
	// before runs before the stage serves (a start fault); it may not
	// return.
	before func()
	// describe replaces Describe when not nil.
	describe func(ctx context.Context, info stage.Info) (stage.Info, error)
	// run replaces the good Run when not nil.
	run func(ctx context.Context, req stage.Request, good func() (stage.Result, error)) (stage.Result, error)
}

// SecretEnv is a variable the campaign sets in foilwright's environment; a
// stage must not see it (stages get a minimal environment).
const SecretEnv = "FOILWRIGHT_CAMPAIGN_SECRET"

// secretValue is SecretEnv's value.
const secretValue = "campaign-secret-7c1d"

var faults = map[string]fault{}

func addFault(f fault) { faults[f.name] = f }

// caseDir is the CASEDIR argument of the running fault stage.
var caseDir string

// grandchild starts a process of the campaign's binary that sleeps for an
// hour, marked with the case folder, and does not wait for it.
func grandchild() {
	self, err := os.Executable()
	if err != nil {
		return
	}
	cmd := exec.Command(self, "__sleep", caseDir)
	if cmd.Start() == nil {
		go cmd.Wait()
	}
}

func forever() { select {} }

func init() {
	addFault(fault{name: "ok", what: "a well-behaved stage"})
	addFault(fault{name: "crash-run", what: "exits with status 3 during Run",
		run: func(context.Context, stage.Request, func() (stage.Result, error)) (stage.Result, error) {
			sdk.Logger().Error("giving up")
			time.Sleep(20 * time.Millisecond)
			os.Exit(3)
			return stage.Result{}, nil
		}})
	addFault(fault{name: "crash-describe", what: "exits with status 4 in Describe",
		describe: func(context.Context, stage.Info) (stage.Info, error) { os.Exit(4); return stage.Info{}, nil }})
	addFault(fault{name: "panic-run", what: "panics in a goroutine during Run (the process dies with a Go stack trace)",
		run: func(context.Context, stage.Request, func() (stage.Result, error)) (stage.Result, error) {
			done := make(chan struct{})
			go func() { panic("fault stage panics in a goroutine") }()
			<-done
			return stage.Result{}, nil
		}})
	addFault(fault{name: "hang-start", what: "never completes the handshake", before: forever})
	addFault(fault{name: "hang-describe", what: "blocks in Describe",
		describe: func(context.Context, stage.Info) (stage.Info, error) { forever(); return stage.Info{}, nil }})
	addFault(fault{name: "hang-run", what: "blocks in Run, ignoring its deadline",
		run: func(context.Context, stage.Request, func() (stage.Result, error)) (stage.Result, error) {
			forever()
			return stage.Result{}, nil
		}})
	addFault(fault{name: "ignore-sigterm", what: "ignores SIGTERM and blocks in Run",
		before: func() { signal.Ignore(syscall.SIGTERM, syscall.SIGINT) },
		run: func(context.Context, stage.Request, func() (stage.Result, error)) (stage.Result, error) {
			forever()
			return stage.Result{}, nil
		}})
	addFault(fault{name: "stdout-before", what: "writes to stdout before serving",
		before: func() { fmt.Println("hello from a stage that talks too early") }})
	addFault(fault{name: "stdout-during", what: "writes to file descriptor 1 during Run, then answers",
		run: func(_ context.Context, _ stage.Request, good func() (stage.Result, error)) (stage.Result, error) {
			syscall.Write(1, []byte("1|1|unix|/nowhere|grpc\nnoise on stdout\n"))
			return good()
		}})
	addFault(fault{name: "exit-0", what: "exits 0 at once without a handshake",
		before: func() { os.Exit(0) }})
	addFault(fault{name: "bad-version", what: "speaks stage protocol version 99"})
	addFault(fault{name: "bad-info", what: "describes a parameter whose default is out of its range",
		describe: func(_ context.Context, info stage.Info) (stage.Info, error) {
			info.Params = append(info.Params, stage.Param{Name: "panels", Type: stage.Integer, Default: json.RawMessage("5"), Min: stage.Bound(10)})
			return info, nil
		}})
	addFault(fault{name: "reply-oversize", what: "returns an artifact of 100 MiB",
		run: func(_ context.Context, _ stage.Request, good func() (stage.Result, error)) (stage.Result, error) {
			res, err := good()
			res.Artifacts = []stage.Artifact{{Name: "big.bin", MediaType: "application/octet-stream", Data: make([]byte, 100<<20)}}
			return res, err
		}})
	addFault(fault{name: "result-large", what: "returns a valid result document of 48 MiB (warnings)",
		run: func(_ context.Context, _ stage.Request, good func() (stage.Result, error)) (stage.Result, error) {
			res, err := good()
			var doc map[string]any
			json.Unmarshal(res.JSON, &doc)
			w := make([]string, 48<<10)
			for i := range w {
				w[i] = strings.Repeat("x", 1020)
			}
			doc["warnings"] = w
			res.JSON, _ = json.Marshal(doc)
			return res, err
		}})
	addFault(fault{name: "result-not-json", what: "returns a result that is not JSON",
		run: func(context.Context, stage.Request, func() (stage.Result, error)) (stage.Result, error) {
			return stage.Result{JSON: []byte("cl = 0.25\n")}, nil
		}})
	addFault(fault{name: "result-wrong-format", what: "returns a JSON document of another format",
		run: func(context.Context, stage.Request, func() (stage.Result, error)) (stage.Result, error) {
			return stage.Result{JSON: []byte(`{"format": "something/2", "stage": "fault", "version": "1"}`)}, nil
		}})
	addFault(fault{name: "result-nan", what: "returns a result with a bare NaN",
		run: func(context.Context, stage.Request, func() (stage.Result, error)) (stage.Result, error) {
			return stage.Result{JSON: []byte(`{"format": "foilwright.result/1", "stage": "fault", "version": "1.0.0", "scalars": {}, "cases": [{"alpha_deg": 0, "cl": NaN, "cm_c4": 0}], "warnings": []}`)}, nil
		}})
	addFault(fault{name: "result-deep", what: "returns a result nested a million levels deep",
		run: func(context.Context, stage.Request, func() (stage.Result, error)) (stage.Result, error) {
			n := 1 << 20
			b := []byte(`{"format": "foilwright.result/1", "stage": "fault", "version": "1.0.0", "scalars": {}, "cases": [], "warnings": [], "x": `)
			b = append(b, strings.Repeat("[", n)...)
			b = append(b, strings.Repeat("]", n)...)
			return stage.Result{JSON: append(b, '}')}, nil
		}})
	addFault(fault{name: "artifact-escape", what: "returns an artifact named ../../escape.svg",
		run: func(_ context.Context, _ stage.Request, good func() (stage.Result, error)) (stage.Result, error) {
			res, err := good()
			res.Artifacts = []stage.Artifact{{Name: "../../escape.svg", MediaType: "image/svg+xml", Data: []byte("<svg/>")}}
			return res, err
		}})
	addFault(fault{name: "grandchild", what: "starts a grandchild that sleeps for an hour, then answers",
		run: func(_ context.Context, _ stage.Request, good func() (stage.Result, error)) (stage.Result, error) {
			grandchild()
			return good()
		}})
	addFault(fault{name: "grandchild-hang", what: "starts a grandchild, then blocks in Run",
		run: func(context.Context, stage.Request, func() (stage.Result, error)) (stage.Result, error) {
			grandchild()
			forever()
			return stage.Result{}, nil
		}})
	addFault(fault{name: "memory-hog", what: "allocates and touches memory until it is stopped",
		run: func(context.Context, stage.Request, func() (stage.Result, error)) (stage.Result, error) {
			var keep [][]byte
			for {
				b := make([]byte, 64<<20)
				for i := 0; i < len(b); i += 4096 {
					b[i] = 1
				}
				keep = append(keep, b)
			}
		}})
	addFault(fault{name: "stderr-flood", what: "writes 4 MiB to stderr during Run, then answers",
		run: func(_ context.Context, _ stage.Request, good func() (stage.Result, error)) (stage.Result, error) {
			line := []byte(strings.Repeat("noise ", 170) + "\n")
			for n := 0; n < 4<<20; n += len(line) {
				os.Stderr.Write(line)
			}
			return good()
		}})
	addFault(fault{name: "slow", what: "answers after 300 ms",
		run: func(ctx context.Context, _ stage.Request, good func() (stage.Result, error)) (stage.Result, error) {
			select {
			case <-time.After(300 * time.Millisecond):
			case <-ctx.Done():
				return stage.Result{}, ctx.Err()
			}
			return good()
		}})
	addFault(fault{name: "env", what: "reports in its result whether it sees " + SecretEnv,
		run: func(_ context.Context, _ stage.Request, good func() (stage.Result, error)) (stage.Result, error) {
			res, err := good()
			if os.Getenv(SecretEnv) != "" {
				res.Warnings = append(res.Warnings, "saw "+SecretEnv+"="+os.Getenv(SecretEnv))
				var doc map[string]any
				json.Unmarshal(res.JSON, &doc)
				doc["warnings"] = []string{"saw " + os.Getenv(SecretEnv)}
				res.JSON, _ = json.Marshal(doc)
			}
			return res, err
		}})
}

// faultStage is the stage a fault serves.
type faultStage struct{ f fault }

func (s faultStage) info() stage.Info {
	return stage.Info{Name: "fault", Version: "1.0.0", Summary: "a stage of the reliability campaign: " + s.f.what,
		Params: []stage.Param{{Name: "alpha_deg", Type: stage.Numbers, Default: json.RawMessage("[0]"), Unit: "degrees", Doc: "ignored"}}}
}

func (s faultStage) Describe(ctx context.Context) (stage.Info, error) {
	if s.f.describe != nil {
		return s.f.describe(ctx, s.info())
	}
	return s.info(), nil
}

func (s faultStage) Run(ctx context.Context, req stage.Request) (stage.Result, error) {
	good := func() (stage.Result, error) {
		d := stage.NewResultDoc(s.info())
		d.AddCase(stage.Case{AlphaDeg: 0, CL: float64(len(req.Section) % 7)})
		b, err := d.Encode()
		return stage.Result{JSON: b}, err
	}
	if s.f.run != nil {
		return s.f.run(ctx, req, good)
	}
	return good()
}

// serveFault serves the fault called name.
func serveFault(name string) {
	f, ok := faults[name]
	if !ok {
		fmt.Fprintf(os.Stderr, "reliability: unknown fault %q\n", name)
		os.Exit(2)
	}
	if f.before != nil {
		f.before()
	}
	if name == "bad-version" {
		hs := stage.Handshake
		hs.ProtocolVersion = 99
		plugin.Serve(&plugin.ServeConfig{
			HandshakeConfig:  hs,
			VersionedPlugins: map[int]plugin.PluginSet{99: stage.PluginMap(faultStage{f})},
			GRPCServer:       sdk.GRPCServer,
		})
		return
	}
	sdk.Serve(faultStage{f})
}

// FaultNames returns the names of the fault stages, sorted.
func FaultNames() []string { return sortedKeys(faults) }

// Serve handles the campaign binary's own commands and reports whether
// args were one of them:
//
//	__fault NAME CASEDIR    serve the fault stage NAME
//	__sleep CASEDIR         sleep for an hour (a stage's grandchild)
//	__limit BYTES RSSFILE PROG ARGS...  run PROG with its data segment limited
//	                        to BYTES (0: no limit) and write its peak memory to RSSFILE
//
// A binary that embeds the campaign calls Serve first thing in main (or
// TestMain) and exits when it returns true.
func Serve(args []string) bool {
	if len(args) < 2 {
		return false
	}
	switch args[0] {
	case "__fault":
		if len(args) > 2 {
			caseDir = args[2]
		}
		serveFault(args[1])
	case "__sleep":
		time.Sleep(time.Hour)
	case "__limit":
		// __limit BYTES RSSFILE PROG ARGS...
		if len(args) < 4 {
			os.Exit(2)
		}
		n, err := strconv.ParseUint(args[1], 10, 64)
		if err != nil {
			os.Exit(2)
		}
		os.Exit(spawn(n, args[2], args[3], args[4:]))
	default:
		return false
	}
	return true
}
