package main

import (
	"fmt"
	"runtime"

	"github.com/spf13/cobra"

	"github.com/foilwright/foilwright/internal/version"
)

// versionInfo is what version prints, and its JSON form.
type versionInfo struct {
	Version  string `json:"version"`
	Revision string `json:"revision,omitempty"`
	OS       string `json:"os"`
	Arch     string `json:"arch"`
	Go       string `json:"go"`
}

func currentVersion() versionInfo {
	return versionInfo{Version: version.Version, Revision: version.Revision(), OS: runtime.GOOS, Arch: runtime.GOARCH, Go: runtime.Version()}
}

// String is the line version and --version print (without "foilwright").
func (v versionInfo) String() string {
	s := v.Version
	if v.Revision != "" {
		s += " (" + v.Revision + ")"
	}
	return fmt.Sprintf("%s %s/%s %s", s, v.OS, v.Arch, v.Go)
}

func newVersionCmd() *cobra.Command {
	var asJSON bool
	cmd := &cobra.Command{
		Use:     "version",
		Short:   "Print the version of foilwright",
		Args:    cobra.NoArgs,
		Example: "  foilwright version\n  foilwright --version\n  foilwright version --json",
		RunE: func(cmd *cobra.Command, args []string) error {
			v := currentVersion()
			if asJSON {
				return writeJSON(cmd.OutOrStdout(), v)
			}
			_, err := fmt.Fprintf(cmd.OutOrStdout(), "foilwright %s\n", v)
			return err
		},
	}
	jsonFlag(cmd, &asJSON, "print the version, revision, platform and Go version as JSON")
	return cmd
}
