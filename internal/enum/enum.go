// Package enum words the lists of allowed names (input formats, spacing
// laws, trailing-edge treatments, units) for messages and help texts, so
// that each list is written once, by the package that owns it.
package enum

import "strings"

// Or joins names the way messages give a choice: "a", "a or b",
// "a, b or c".
func Or(names ...string) string {
	switch len(names) {
	case 0:
		return ""
	case 1:
		return names[0]
	}
	return strings.Join(names[:len(names)-1], ", ") + " or " + names[len(names)-1]
}

// Strings converts a list of string-like names to plain strings.
func Strings[S ~string](names []S) []string {
	out := make([]string, len(names))
	for i, n := range names {
		out[i] = string(n)
	}
	return out
}

// A Choice is one allowed name with what it does, for help texts; Doc may
// be empty.
type Choice struct{ Name, Doc string }

// Names returns the names of cs.
func Names(cs []Choice) []string {
	out := make([]string, len(cs))
	for i, c := range cs {
		out[i] = c.Name
	}
	return out
}

// Help words cs for a flag's help text: "a (what a does), b or c (what c
// does)".
func Help(cs []Choice) string {
	items := make([]string, len(cs))
	for i, c := range cs {
		items[i] = c.Name
		if c.Doc != "" {
			items[i] += " (" + c.Doc + ")"
		}
	}
	return Or(items...)
}

// Has reports whether name is one of cs.
func Has(cs []Choice, name string) bool {
	for _, c := range cs {
		if c.Name == name {
			return true
		}
	}
	return false
}
