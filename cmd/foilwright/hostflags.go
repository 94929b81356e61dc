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

func (f *hostFlags) register(cmd *cobra.Command) {
	cmd.Flags().DurationVar(&f.startTimeout, "stage-start-timeout", host.DefaultStartTimeout, "time a stage process may take to start")
	cmd.Flags().DurationVar(&f.callTimeout, "stage-timeout", host.DefaultCallTimeout, "time one stage call may take")
	cmd.Flags().StringVar(&f.logLevel, "log-level", "off", "level of the stages' log shown on stderr: trace, debug, info, warn, error or off")
	cmd.Flags().BoolVar(&f.mtls, "stage-mtls", false, "secure the connection to each stage with mutual TLS")
	cmd.RegisterFlagCompletionFunc("log-level", cobra.FixedCompletions(
		[]string{"trace", "debug", "info", "warn", "error", "off"}, cobra.ShellCompDirectiveNoFileComp))
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
