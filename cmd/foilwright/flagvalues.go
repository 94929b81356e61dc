package main

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"github.com/foilwright/foilwright/geometry"
)

// Flag values whose default is a word, so that help shows the default as a
// value ("(default auto)") rather than a 0 that stands for something else.

// wordFloat is a number flag whose default is a word: "auto" for a value
// the chain derives from the data, "all" for no limit. set reports whether
// a number was given.
type wordFloat struct {
	word string
	v    float64
	set  bool
	min  float64 // smallest value accepted
	open bool    // min itself excluded
	max  float64 // largest value accepted (0: no limit)
	kind string  // what the value is, for help: "length", "number"
}

func (f *wordFloat) String() string {
	if !f.set {
		return f.word
	}
	return strconv.FormatFloat(f.v, 'g', -1, 64)
}

func (f *wordFloat) Set(s string) error {
	s = strings.TrimSpace(s)
	if strings.EqualFold(s, f.word) {
		f.set = false
		return nil
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return fmt.Errorf("want %s or a number", f.word)
	}
	if v < f.min || (f.open && v == f.min) || (f.max > 0 && v > f.max) {
		return fmt.Errorf("want %s or %s", f.word, f.rangeText())
	}
	f.v, f.set = v, true
	return nil
}

func (f *wordFloat) rangeText() string {
	lo := "at least"
	if f.open {
		lo = "more than"
	}
	if f.max > 0 {
		return fmt.Sprintf("a number %s %g and at most %g", lo, f.min, f.max)
	}
	return fmt.Sprintf("a number %s %g", lo, f.min)
}

func (f *wordFloat) Type() string { return f.kind }

// ptr returns the value, or nil when the word stands.
func (f *wordFloat) ptr() *float64 {
	if !f.set {
		return nil
	}
	v := f.v
	return &v
}

// panelsValue is a panel count or "auto" (chosen for an accuracy target).
type panelsValue struct{ n int }

func (p *panelsValue) String() string {
	if p.n == 0 {
		return "auto"
	}
	return strconv.Itoa(p.n)
}

func (p *panelsValue) Set(s string) error {
	s = strings.TrimSpace(s)
	if strings.EqualFold(s, "auto") {
		p.n = 0
		return nil
	}
	n, err := strconv.Atoi(s)
	if err != nil || n < 16 || n > 2000 {
		return fmt.Errorf("want auto or a whole number from 16 to 2000")
	}
	p.n = n
	return nil
}

func (p *panelsValue) Type() string { return "count" }

// lengthValue is a length with an optional unit ("0.5mm", "0.002c"), kept
// as written for the chain, which converts it once the input's unit is
// known.
type lengthValue struct{ s string }

func (l *lengthValue) String() string { return l.s }

func (l *lengthValue) Set(s string) error {
	if _, err := geometry.ParseLength(s); err != nil {
		return fmt.Errorf("want a number with a unit, e.g. 0.5mm, 0.02in or 0.002c (a bare number is in the input's unit)")
	}
	l.s = strings.TrimSpace(s)
	return nil
}

func (l *lengthValue) Type() string { return "length" }

// noFiles completes a flag's value with nothing (no file names): for
// numbers and free text.
func noFiles(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
	return nil, cobra.ShellCompDirectiveNoFileComp
}

// fixedCompletions completes a flag's value with one of values.
func fixedCompletions(values ...string) func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
	return func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
		return values, cobra.ShellCompDirectiveNoFileComp
	}
}

// deprecatedAlias registers name as a hidden flag that sets the same value
// as the flag use, and tells the user to use the other when it is given.
func deprecatedAlias(f *pflag.FlagSet, name, use string) {
	fl := f.Lookup(use)
	if fl == nil {
		panic("foilwright: alias of an unknown flag " + use)
	}
	f.Var(fl.Value, name, fl.Usage)
	alias := f.Lookup(name)
	alias.DefValue, alias.NoOptDefVal = fl.DefValue, fl.NoOptDefVal
	deprecate(f, name, "use --"+use)
}

// deprecatedAnnotation holds the note given when a deprecated flag is used.
const deprecatedAnnotation = "foilwright_deprecated"

// deprecate hides the flag name from help and completion and has
// warnDeprecated tell the user, on standard error, what to use instead.
// (pflag's own notice would go to the command's output stream, which may
// carry a document.)
func deprecate(f *pflag.FlagSet, name, instead string) {
	f.SetAnnotation(name, deprecatedAnnotation, []string{instead})
	f.MarkHidden(name)
}

// warnDeprecated writes a note on standard error for every deprecated
// flag given to cmd.
func warnDeprecated(cmd *cobra.Command, _ []string) error {
	cmd.Flags().Visit(func(f *pflag.Flag) {
		if msg := f.Annotations[deprecatedAnnotation]; len(msg) > 0 {
			fmt.Fprintf(cmd.ErrOrStderr(), "note: --%s is deprecated; %s\n", f.Name, msg[0])
		}
	})
	return nil
}
