package enum

import "testing"

func TestOr(t *testing.T) {
	for _, tc := range []struct {
		in   []string
		want string
	}{
		{nil, ""},
		{[]string{"a"}, "a"},
		{[]string{"a", "b"}, "a or b"},
		{[]string{"mm", "in", "m", "chord"}, "mm, in, m or chord"},
	} {
		if got := Or(tc.in...); got != tc.want {
			t.Errorf("Or(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
	type unit string
	if got := Strings([]unit{"mm", "in"}); len(got) != 2 || got[0] != "mm" || got[1] != "in" {
		t.Errorf("Strings = %q", got)
	}
}

func TestHelp(t *testing.T) {
	cs := []Choice{{"auto", "keep it"}, {"keep", ""}, {"close", "blend it shut"}}
	if got, want := Help(cs), "auto (keep it), keep or close (blend it shut)"; got != want {
		t.Errorf("Help = %q, want %q", got, want)
	}
	if got := Names(cs); len(got) != 3 || got[2] != "close" {
		t.Errorf("Names = %q", got)
	}
	if !Has(cs, "keep") || Has(cs, "sharpen") {
		t.Error("Has")
	}
}
