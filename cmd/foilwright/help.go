package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
)

// groupAnnotation is the flag annotation naming the help group a flag is
// listed under; flags without it are listed under "Flags".
const groupAnnotation = "foilwright_group"

// groupTitles are the help groups, in the order help lists them.
var groupTitles = []struct{ id, title string }{
	{chainGroup, "Geometry chain flags"},
	{stageGroup, "Stage process flags"},
	{limitGroup, "Limit flags (every command)"},
}

// flagGroup returns the flags of fs in group id ("" for those in none).
func flagGroup(fs *pflag.FlagSet, id string) *pflag.FlagSet {
	out := pflag.NewFlagSet("", pflag.ContinueOnError)
	out.SortFlags = fs.SortFlags
	fs.VisitAll(func(f *pflag.Flag) {
		g := ""
		if v := f.Annotations[groupAnnotation]; len(v) > 0 {
			g = v[0]
		}
		if g == id {
			out.AddFlag(f)
		}
	})
	return out
}

// hasVisible reports whether fs has a flag that help shows.
func hasVisible(fs *pflag.FlagSet) bool {
	found := false
	fs.VisitAll(func(f *pflag.Flag) { found = found || !f.Hidden })
	return found
}

// usage writes the usage of c in cobra's layout, with its local flags in
// groups: those of no group under "Flags", then each group under its
// title.
func usage(c *cobra.Command) error {
	w := c.OutOrStderr()
	fmt.Fprint(w, "Usage:")
	if c.Runnable() {
		fmt.Fprintf(w, "\n  %s", c.UseLine())
	}
	if c.HasAvailableSubCommands() {
		fmt.Fprintf(w, "\n  %s [command]", c.CommandPath())
	}
	if len(c.Aliases) > 0 {
		fmt.Fprintf(w, "\n\nAliases:\n  %s", c.NameAndAliases())
	}
	if c.HasExample() {
		fmt.Fprintf(w, "\n\nExamples:\n%s", c.Example)
	}
	if c.HasAvailableSubCommands() {
		fmt.Fprintf(w, "\n\nAvailable Commands:")
		for _, sub := range c.Commands() {
			if sub.IsAvailableCommand() || sub.Name() == "help" {
				fmt.Fprintf(w, "\n  %-*s %s", sub.NamePadding(), sub.Name(), sub.Short)
			}
		}
	}
	local := c.LocalFlags()
	writeFlags(w, "Flags", flagGroup(local, ""))
	for _, g := range groupTitles {
		writeFlags(w, g.title, flagGroup(local, g.id))
	}
	inherited := c.InheritedFlags()
	writeFlags(w, "Global Flags", flagGroup(inherited, ""))
	for _, g := range groupTitles {
		writeFlags(w, g.title, flagGroup(inherited, g.id))
	}
	if c.HasAvailableSubCommands() {
		fmt.Fprintf(w, "\n\nUse \"%s [command] --help\" for more information about a command.", c.CommandPath())
	}
	fmt.Fprintln(w)
	return nil
}

func writeFlags(w io.Writer, title string, fs *pflag.FlagSet) {
	if !hasVisible(fs) {
		return
	}
	fmt.Fprintf(w, "\n\n%s:\n%s", title, strings.TrimRight(fs.FlagUsages(), " \t\n"))
}
