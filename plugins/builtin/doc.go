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
// Every stage documents its scalars (per result) in Info.Scalars and its
// checks (per case) below.
//
// vortex-panel: scalars panels (count), condition (condition number
// estimate of the influence matrix), blunt (1 for a blunt trailing edge
// closed by a source base panel, else 0); checks cl_pressure (Cl from the
// integrated surface pressure), cl_diff (Kutta–Joukowski Cl minus
// cl_pressure), cd_pressure (pressure drag, zero in exact potential flow),
// stagnation_x, and base_source for a blunt trailing edge.
//
// source-panel: scalars panels, condition and closure_max (the largest
// closed-body source sum |Σλs/Σ|λ|s| over the cases); checks closure (the
// source sum of the case, zero for exact closure) and cd_pressure. Its
// lift is a discretisation figure (no circulation) that vanishes as panels
// are added; the pressure is given at the panel midpoints. An open trailing
// edge is closed by a straight base panel unless close_te is false.
//
// thin-aerofoil: scalars cl_alpha (per radian), alpha_l0_deg, cm_c4 and
// camber_samples; per case a0, a1, a2 (the Fourier coefficients A₀, A₁, A₂)
// and x_cp (centre of pressure, chord fractions, where Cl ≠ 0), and the
// load ΔCp along the chord instead of a surface pressure distribution. Its
// timings are build (camber line from the nodes), factor (spline fit and
// Fourier integrals) and solve.
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
