package host_test

import (
	"testing"

	"github.com/foilwright/foilwright/plugins/host"
)

// BenchmarkStart measures starting a stage process: exec, handshake,
// Dispense and Describe, then Kill.
func BenchmarkStart(b *testing.B) {
	h, err := host.New(host.Options{})
	if err != nil {
		b.Fatal(err)
	}
	defer h.Close()
	for b.Loop() {
		r := h.Runner(host.Builtin("echo"))
		if _, err := r.Describe(b.Context()); err != nil {
			b.Fatal(err)
		}
		r.Close()
	}
}

// BenchmarkWarmRun measures one call to a running stage, reply checked.
func BenchmarkWarmRun(b *testing.B) {
	h, err := host.New(host.Options{})
	if err != nil {
		b.Fatal(err)
	}
	defer h.Close()
	r := h.Runner(host.Builtin("echo"))
	if _, err := r.Run(b.Context(), request("")); err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if _, err := r.Run(b.Context(), request("")); err != nil {
			b.Fatal(err)
		}
	}
}
