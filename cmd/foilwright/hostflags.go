package main

import (
	"io"
	"strings"
	"time"

	"github.com/hashicorp/go-hclog"
	"github.com/spf13/cobra"

	"github.com/foilwright/foilwright/internal/limits"
	"github.com/foilwright/foilwright/plugins/host"
)

// hostFlags are the flags of every command that runs stages.
type hostFlags struct {
	startTimeout time.Duration
	callTimeout  time.Duration
	logLevel     string
	mtls         bool
}

// stageGroup is the help group of the stage-host flags.
const stageGroup = "stage"

// register adds the stage-host flags to cmd, listed together in its help.
func (f *hostFlags) register(cmd *cobra.Command) {
	fs := cmd.Flags()
	fs.DurationVar(&f.startTimeout, "stage-start-timeout", host.DefaultStartTimeout, "time a stage process may take to start")
	fs.DurationVar(&f.callTimeout, "stage-timeout", host.DefaultCallTimeout, "time one stage call may take")
	fs.StringVar(&f.logLevel, "log-level", "off", "level of the stages' log shown on stderr: trace, debug, info, warn, error or off")
	fs.BoolVar(&f.mtls, "stage-mtls", false, "secure the connection to each stage with mutual TLS")
	for _, name := range []string{"stage-start-timeout", "stage-timeout", "log-level", "stage-mtls"} {
		fs.SetAnnotation(name, groupAnnotation, []string{stageGroup})
	}
	cmd.RegisterFlagCompletionFunc("log-level", fixedCompletions("trace", "debug", "info", "warn", "error", "off"))
	cmd.RegisterFlagCompletionFunc("stage-start-timeout", fixedCompletions("10s", "30s", "1m"))
	cmd.RegisterFlagCompletionFunc("stage-timeout", fixedCompletions("30s", "2m", "10m", "1h"))
}

// newHost returns a stage host configured by the flags and the limits
// (stage-nodes, result-bytes, stage-memory, json-depth), logging to stderr.
func (f *hostFlags) newHost(stderr io.Writer, lim limits.Limits) (*host.Host, error) {
	level := hclog.LevelFromString(f.logLevel)
	if level == hclog.NoLevel {
		return nil, badInputf("--log-level %q: want trace, debug, info, warn, error or off", f.logLevel)
	}
	if f.startTimeout <= 0 || f.callTimeout <= 0 {
		return nil, badInputf("--stage-start-timeout and --stage-timeout must be positive")
	}
	stageLevel := strings.ToLower(f.logLevel)
	if level == hclog.Off {
		stageLevel = "warn" // still kept for crash reports
	}
	return host.New(host.Options{
		StartTimeout:  f.startTimeout,
		CallTimeout:   f.callTimeout,
		AutoMTLS:      f.mtls,
		StageLogLevel: stageLevel,
		MaxNodes:      lim.StageNodes,
		MaxReply:      int(lim.ResultBytes),
		Memory:        lim.StageMemory,
		JSONDepth:     lim.JSONDepth,
		Logger: hclog.New(&hclog.LoggerOptions{
			Name:   "foilwright",
			Level:  level,
			Output: stderr,
		}),
	})
}

// stageError returns a stage's error as is: exitStatus tells the failures
// caused by the input (a section or parameters the stage refuses, a
// missing or mispinned executable) by their sentinels.
func stageError(err error) error { return err }
