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

func (f *hostFlags) register(cmd *cobra.Command) {
	cmd.Flags().DurationVar(&f.startTimeout, "stage-start-timeout", host.DefaultStartTimeout, "time a stage process may take to start")
	cmd.Flags().DurationVar(&f.callTimeout, "stage-timeout", host.DefaultCallTimeout, "time one stage call may take")
	cmd.Flags().StringVar(&f.logLevel, "log-level", "off", "level of the stages' log shown on stderr: trace, debug, info, warn, error or off")
	cmd.Flags().BoolVar(&f.mtls, "stage-mtls", false, "secure the connection to each stage with mutual TLS")
	cmd.RegisterFlagCompletionFunc("log-level", cobra.FixedCompletions(
		[]string{"trace", "debug", "info", "warn", "error", "off"}, cobra.ShellCompDirectiveNoFileComp))
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
