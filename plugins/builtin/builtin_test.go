package builtin_test

import (
	"testing"

	"github.com/foilwright/foilwright/plugins/builtin"
	"github.com/foilwright/foilwright/plugins/stagetest"
)

func TestConformance(t *testing.T) {
	for _, name := range builtin.Names() {
		t.Run(name, func(t *testing.T) {
			s, ok := builtin.Lookup(name)
			if !ok {
				t.Fatalf("Lookup(%q) failed", name)
			}
			stagetest.RunOptions(t, s, stagetest.Options{Params: []byte(`{"alpha_deg": [-4, 0, 6]}`)})
		})
	}
}
