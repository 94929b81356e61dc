// Package version holds the version of foilwright, recorded in every section
// document's manifest and reported by the version command and by built-in
// stages.
package version

import "runtime/debug"

// Version is the release version of foilwright. Results and manifests record
// it; change it with every release.
const Version = "0.1.0"

// Revision returns the VCS revision the binary was built from, with a
// "+dirty" suffix for a modified tree, or "" when the build has no VCS
// information (go run, go test).
func Revision() string {
	info, ok := debug.ReadBuildInfo()
	if !ok {
		return ""
	}
	var rev, dirty string
	for _, s := range info.Settings {
		switch s.Key {
		case "vcs.revision":
			rev = s.Value
		case "vcs.modified":
			if s.Value == "true" {
				dirty = "+dirty"
			}
		}
	}
	if rev == "" {
		return ""
	}
	if len(rev) > 12 {
		rev = rev[:12]
	}
	return rev + dirty
}
