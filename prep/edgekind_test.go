package prep

import (
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry/clean"
)

// The warning names the kinds the points leave open besides the one the
// section states (which may differ from the one the end analysis chose:
// a base thinner than the frame's sharp gap is stated sharp), and is
// empty when nothing else is as likely.
func TestEdgeKindWarning(t *testing.T) {
	for _, tc := range []struct {
		name   string
		edge   *clean.Edge
		stated string
		want   []string // substrings; nil: no warning
		not    []string
	}{
		{"no edge", nil, "sharp", nil, nil},
		{"decided", &clean.Edge{Kind: clean.EdgeSharp}, "sharp", nil, nil},
		{"blunt rival", &clean.Edge{Kind: clean.EdgeSharp, Rivals: []string{clean.EdgeBlunt}}, "sharp", []string{"stated sharp", "a blunt end"}, []string{"rounded"}},
		{"rival stated", &clean.Edge{Kind: clean.EdgeBlunt, Rivals: []string{clean.EdgeSharp}}, "sharp", nil, nil},
		{"two rivals", &clean.Edge{Kind: clean.EdgeRounded, Rivals: []string{clean.EdgeSharp, clean.EdgeBlunt}}, "rounded", []string{"stated rounded", "a sharp or blunt end"}, nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got := edgeKindWarning(tc.edge, tc.stated)
			if tc.want == nil {
				if got != "" {
					t.Errorf("got %q, want no warning", got)
				}
				return
			}
			for _, w := range tc.want {
				if !strings.Contains(got, w) {
					t.Errorf("got %q, want it to contain %q", got, w)
				}
			}
			for _, w := range tc.not {
				if strings.Contains(got, w) {
					t.Errorf("got %q, want it without %q", got, w)
				}
			}
		})
	}
}
