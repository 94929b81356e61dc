package pipeline

import (
	"regexp"
	"strings"
	"testing"
)

// TestNameFormMatchesRegexp checks the hand-written name forms against the
// regular expressions they replace, on names at and around every boundary
// (lengths, first character, each class, bytes beyond ASCII, invalid
// UTF-8, line breaks that a "$" could let through).
func TestNameFormMatchesRegexp(t *testing.T) {
	forms := []struct {
		f  nameForm
		re *regexp.Regexp
	}{
		{safeName, regexp.MustCompile(`^[A-Za-z0-9][A-Za-z0-9._-]{0,63}$`)},
		{artifactName, regexp.MustCompile(`^[A-Za-z0-9][A-Za-z0-9._-]{0,127}$`)},
	}
	var names []string
	for _, first := range []string{"a", "Z", "0", "9", ".", "_", "-", " ", "é", "\xff", "/"} {
		for _, rest := range []string{"", "b", "B.c", "x_y-z", "a b", "a/b", "a\n", "\n", "ü", "\xc3", "a\x00", "..", "--"} {
			names = append(names, first+rest)
		}
	}
	for _, n := range []int{0, 1, 2, 63, 64, 65, 127, 128, 129, 300} {
		names = append(names, strings.Repeat("a", n), "a"+strings.Repeat(".", max(n-1, 0)), strings.Repeat("a", n)+"\n")
	}
	names = append(names, "section-01.json", "Cp_alpha-4.csv", "nodes.dat", "a.b/c", "ok\r")
	for _, form := range forms {
		for _, s := range names {
			if got, want := form.f.MatchString(s), form.re.MatchString(s); got != want {
				t.Errorf("nameForm{%d}.MatchString(%q) = %v, the regular expression says %v", form.f.most, s, got, want)
			}
		}
	}
}
