package main

import (
	"os"
	"strings"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"github.com/foilwright/foilwright/internal/limits"
)

// LimitsEnv is the environment variable that sets limits for every
// command, as --limit does (the flag wins).
const LimitsEnv = "FOILWRIGHT_LIMITS"

// limitFlag is the root's --limit NAME=VALUE, repeatable; it starts from
// the defaults and LimitsEnv.
type limitFlag struct {
	lim  limits.Limits
	set  []string
	env  error
	seen bool
}

func newLimitFlag() *limitFlag {
	f := &limitFlag{lim: limits.Default()}
	if s := os.Getenv(LimitsEnv); s != "" {
		if err := f.lim.Set(s); err != nil {
			f.env = badInputf("%s: %v", LimitsEnv, err)
		}
	}
	return f
}

func (f *limitFlag) String() string { return strings.Join(f.set, ",") }
func (f *limitFlag) Type() string   { return "NAME=VALUE" }
func (f *limitFlag) Set(s string) error {
	if err := f.lim.Set(s); err != nil {
		return err
	}
	f.set = append(f.set, s)
	return nil
}

var _ pflag.Value = (*limitFlag)(nil)

// limitGroup is the help group of --limit.
const limitGroup = "limit"

// registerLimits adds --limit to the root, for every command, listed in a
// help group of its own.
func registerLimits(root *cobra.Command) {
	root.PersistentFlags().Var(newLimitFlag(), "limit",
		"raise or lower a limit, NAME=VALUE (repeatable): "+strings.Join(limits.Names(), ", ")+
			`; sizes take KiB, MiB, GiB; "none" removes one (README, "Limits")`)
	root.PersistentFlags().SetAnnotation("limit", groupAnnotation, []string{limitGroup})
	root.RegisterFlagCompletionFunc("limit", func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
		var out []string
		for _, n := range limits.Names() {
			out = append(out, n+"=")
		}
		return out, cobra.ShellCompDirectiveNoSpace | cobra.ShellCompDirectiveNoFileComp
	})
}

// limitsOf returns the limits of the command line cmd belongs to.
func limitsOf(cmd *cobra.Command) (limits.Limits, error) {
	fl := cmd.Root().PersistentFlags().Lookup("limit")
	if fl == nil {
		return limits.Default(), nil
	}
	f := fl.Value.(*limitFlag)
	return f.lim, f.env
}
