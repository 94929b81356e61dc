// Package sdk is what a stage author imports to serve a stage: Serve runs
// the stage as a foilwright stage process, speaking the protocol of package
// stage over gRPC through go-plugin.
//
// A stage must never print to stdout: stdout carries the handshake. Log
// through Logger, which writes hclog JSON lines to stderr; the host shows
// them at its own log level and keeps the last of them for crash reports.
//
//	func main() {
//		sdk.Serve(myStage{})
//	}
package sdk

import (
	"os"
	"runtime/debug"
	"sync"
	"time"

	"github.com/hashicorp/go-hclog"
	"github.com/hashicorp/go-plugin"
	"google.golang.org/grpc"

	"github.com/foilwright/foilwright/plugins/stage"
)

// MaxMessageSize is the largest request or reply, in bytes, a stage served
// by Serve accepts or sends. gRPC's default of 4 MiB is too small for large
// sections.
const MaxMessageSize = 64 << 20

// ParentPollInterval is how often a stage checks that the host that
// started it is still alive. A stage whose host has gone exits.
const ParentPollInterval = 200 * time.Millisecond

var (
	logOnce sync.Once
	logger  hclog.Logger
)

// Logger returns the stage's logger: hclog JSON lines on stderr, at the level
// named by the environment variable stage.LogLevelEnv (default warn).
func Logger() hclog.Logger {
	logOnce.Do(func() {
		level := hclog.LevelFromString(os.Getenv(stage.LogLevelEnv))
		if level == hclog.NoLevel {
			level = hclog.Warn
		}
		logger = hclog.New(&hclog.LoggerOptions{
			Name:       "stage",
			Level:      level,
			Output:     os.Stderr,
			JSONFormat: true,
		})
	})
	return logger
}

// Serve serves impl as a stage process and returns when the host ends it.
// Each call is protected by a recover: a panic in impl answers that call with
// stage.ErrInternal and a message (the stack goes to the log) and the
// process keeps serving. Unless the environment sets GOGC, Serve sets the
// garbage collector's target to stageGCPercent. Serve exits the process when the host that started
// it dies. It also serves Run calls as frames on the channel the host
// offers through stage.FramesEnv (stage.ServeFrames). Run by hand, without
// the host's handshake, it prints a notice to stderr and exits with status 1.
//
// Nothing may be written to stdout before Serve is called.
func Serve(impl stage.Stage) {
	log := Logger()
	setGCPercent(os.LookupEnv)
	go watchParent(os.Getppid(), ParentPollInterval, func() {
		log.Error("host process went away; exiting")
		os.Exit(3)
	})
	// Run calls as frames beside gRPC, when the host offers the channel
	// (stage.FramesEnv); the hello is written before gRPC serves, so the
	// host finds it once Describe is answered.
	if conn, err := stage.OpenFrames(); err != nil {
		log.Warn("frames channel not served; Run calls come over gRPC", "error", err)
	} else if conn != nil {
		go func() {
			if err := stage.ServeFrames(conn, impl, log, MaxMessageSize); err != nil {
				log.Warn("frames channel broke; Run calls come over gRPC", "error", err)
			}
			conn.Close()
		}()
	}
	plugin.Serve(&plugin.ServeConfig{
		HandshakeConfig: stage.Handshake,
		VersionedPlugins: map[int]plugin.PluginSet{
			stage.ProtocolVersion: {stage.PluginName: &stage.Plugin{Impl: impl, Logger: log}},
		},
		GRPCServer: GRPCServer,
		Logger:     log,
	})
}

// stageGCPercent is the garbage collector's target a stage process runs
// with unless the environment sets GOGC: the heap may grow to five times
// what is live before a collection. A stage process holds little between
// calls (its live heap is a few megabytes) while each call allocates its
// request, its matrices and its reply, so at Go's default of 100 it
// collected every few calls, each collection waking the process's idle
// threads in the middle of a call.
const stageGCPercent = 400

// setGCPercent sets the collector's target to stageGCPercent unless the
// environment (looked up by env) sets GOGC, which the runtime has read.
func setGCPercent(env func(string) (string, bool)) {
	if _, set := env("GOGC"); !set {
		debug.SetGCPercent(stageGCPercent)
	}
}

// streamWorkers is the number of goroutines the stage's gRPC server keeps
// for its calls. go-plugin's own streams (the broker, the copy of stdout
// and stderr) hold one each for the life of the process; the others serve
// Run calls one after another, keeping the stack a solver grew, where a
// goroutine started for each call grew a fresh stack every time (stack
// copies were a tenth of a stage process's processor time outside the
// solver, measured on the vortex-panel stage). A call that finds every
// worker busy gets a goroutine of its own, as without workers.
const streamWorkers = 4

// GRPCServer is the gRPC server factory Serve uses: go-plugin's default
// server with message limits raised to MaxMessageSize, calls served by
// a few long-lived goroutines (streamWorkers) and fixed flow-control
// windows of stage.WindowSize.
func GRPCServer(opts []grpc.ServerOption) *grpc.Server {
	opts = append(opts, grpc.MaxRecvMsgSize(MaxMessageSize), grpc.MaxSendMsgSize(MaxMessageSize),
		grpc.NumStreamWorkers(streamWorkers), grpc.StaticStreamWindowSize(stage.WindowSize), grpc.StaticConnWindowSize(stage.WindowSize))
	return plugin.DefaultGRPCServer(opts)
}

// watchParent calls gone once the parent of the process is no longer ppid
// (the host died and the process was reparented). A process started with
// no real parent (ppid 1) is not watched.
func watchParent(ppid int, every time.Duration, gone func()) {
	if ppid <= 1 {
		return
	}
	t := time.NewTicker(every)
	defer t.Stop()
	for range t.C {
		if os.Getppid() != ppid {
			gone()
			return
		}
	}
}
