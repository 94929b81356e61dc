package main

import (
	"github.com/spf13/cobra"

	"github.com/foilwright/foilwright/plugins/builtin"
	"github.com/foilwright/foilwright/plugins/sdk"
)

// newStageServeCmd builds the hidden command that serves a built-in stage
// to a host: "foilwright __stage NAME". It writes nothing to stdout before
// serving (stdout carries the handshake) and skips the root's hooks.
func newStageServeCmd() *cobra.Command {
	return &cobra.Command{
		Use:               "__stage NAME",
		Short:             "Serve a built-in stage to a foilwright host (internal)",
		Hidden:            true,
		Args:              cobra.ExactArgs(1),
		PersistentPreRunE: func(*cobra.Command, []string) error { return nil },
		RunE: func(cmd *cobra.Command, args []string) error {
			s, ok := builtin.Lookup(args[0])
			if !ok {
				return badInputf("unknown built-in stage %q", args[0])
			}
			sdk.Serve(s)
			return nil
		},
	}
}
