// Package builtin holds the stages built into foilwright and a registry to
// find them by name. Each stage is an adapter: it checks the request,
// decodes the section document, calls a solver package (sourcepanel,
// vortexpanel, thinaerofoil) and writes the result document. The host runs
// them as child processes of the foilwright binary ("foilwright __stage
// NAME"), like any other stage.
//
// Angles cross the stage boundary in degrees (parameter alpha_deg, result
// alpha_deg) and are converted to radians once, here. The section's nodes
// are passed to the solvers as they are: panelling is the job of prep.
//
// # Scalars and checks
//
// Every stage documents its scalars (per result) in Info.Scalars, which
// "stages describe" prints, and its checks (per case) in the doc comment
// of its adapter type. A new built-in stage is a solver package under
// plugins/builtin/NAME/, built on the checks, sentinels, condition error and
// timings of package solver, and an adapter in plugins/builtin/NAME.go
// that registers itself in init.
package builtin

import (
	"context"
	"slices"
	"sort"

	"github.com/foilwright/foilwright/plugins/stage"
)

var registry = map[string]stage.Stage{}

// register adds s under its own name; it panics on a duplicate or
// malformed description, which is a bug in this package.
func register(s stage.Stage) {
	info, err := s.Describe(context.Background())
	if err != nil {
		panic("builtin: " + err.Error())
	}
	if err := stage.CheckInfo(info); err != nil {
		panic("builtin: " + err.Error())
	}
	if _, dup := registry[info.Name]; dup {
		panic("builtin: stage " + info.Name + " registered twice")
	}
	registry[info.Name] = s
}

// Lookup returns the built-in stage called name.
func Lookup(name string) (stage.Stage, bool) {
	s, ok := registry[name]
	return s, ok
}

// Names returns the names of the built-in stages, sorted.
func Names() []string {
	names := make([]string, 0, len(registry))
	for n := range registry {
		names = append(names, n)
	}
	sort.Strings(names)
	return slices.Clip(names)
}
