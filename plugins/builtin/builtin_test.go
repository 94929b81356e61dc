package builtin_test

import (
	"context"
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
			params := []byte(`{"alpha_deg": [-4, 0, 6]}`)
			if info, _ := s.Describe(context.Background()); len(info.Params) > 0 {
				if _, ok := info.Param("alpha_deg"); !ok {
					params = []byte(`{}`)
				}
			}
			stagetest.RunOptions(t, s, stagetest.Options{Params: params})
		})
	}
}
