package main

import (
	"errors"
	"io"
	"strings"
	"time"

	"github.com/hashicorp/go-hclog"
	"github.com/spf13/cobra"

	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
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

// newHost returns a stage host configured by the flags, logging to stderr.
func (f *hostFlags) newHost(stderr io.Writer) (*host.Host, error) {
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
		Logger: hclog.New(&hclog.LoggerOptions{
			Name:   "foilwright",
			Level:  level,
			Output: stderr,
		}),
	})
}

// stageError marks stage failures caused by the user's input (bad section
// or parameters, missing or mispinned executable) for exit status 2.
func stageError(err error) error {
	for _, target := range []error{stage.ErrBadInput, host.ErrNotFound, host.ErrNotExecutable, host.ErrChecksum} {
		if errors.Is(err, target) {
			return badInput(err)
		}
	}
	return err
}
