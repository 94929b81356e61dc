package main

import (
	"fmt"
	"runtime"

	"github.com/spf13/cobra"

	"github.com/foilwright/foilwright/internal/version"
)

func newVersionCmd() *cobra.Command {
	return &cobra.Command{
		Use:     "version",
		Short:   "Print the version of foilwright",
		Args:    cobra.NoArgs,
		Example: "  foilwright version",
		RunE: func(cmd *cobra.Command, args []string) error {
			v := version.Version
			if rev := version.Revision(); rev != "" {
				v += " (" + rev + ")"
			}
			_, err := fmt.Fprintf(cmd.OutOrStdout(), "foilwright %s %s/%s %s\n", v, runtime.GOOS, runtime.GOARCH, runtime.Version())
			return err
		},
	}
}
