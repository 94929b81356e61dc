package builtin_test

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/plugins/builtin"
	"github.com/foilwright/foilwright/plugins/stage"
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

// ellipse is a section document of n+1 nodes round an ellipse of
// thickness 0.12 (closed).
func ellipse(n int) []byte {
	var b strings.Builder
	b.WriteString(`{"format": "foilwright.section/1", "name": "e", "units": "chord", "nodes": [`)
	for i := 0; i <= n; i++ {
		th := 2 * math.Pi * float64(i) / float64(n)
		if i > 0 {
			b.WriteByte(',')
		}
		fmt.Fprintf(&b, "[%.9f,%.9f]", 0.5+0.5*math.Cos(th), 0.06*math.Sin(th))
	}
	b.WriteString("]}")
	return []byte(b.String())
}

// TestStagesRefuseTooManyNodes is the regression test of defect 5 of issue
// 11: the built-in stages accepted any section size (100 000 nodes to
// thin-aerofoil took 18.5 GB and two minutes; the panel stages died out of
// memory). Each describes its maximum and refuses a larger section as bad
// input before decoding it; the stage-nodes limit, passed by the host in
// stage.MaxNodesEnv, replaces the maximum.
func TestStagesRefuseTooManyNodes(t *testing.T) {
	for _, name := range builtin.Names() {
		s, _ := builtin.Lookup(name)
		info, err := s.Describe(context.Background())
		if err != nil {
			t.Fatal(err)
		}
		if info.MaxNodes < 2001 {
			t.Errorf("%s: describes at most %d nodes; prep makes up to 2001", name, info.MaxNodes)
			continue
		}
		big := ellipse(info.MaxNodes) // MaxNodes+1 nodes
		_, err = s.Run(context.Background(), stage.Request{Section: big, SectionName: "big.json"})
		if !errors.Is(err, stage.ErrBadInput) || !strings.Contains(err.Error(), fmt.Sprintf("%d nodes", info.MaxNodes+1)) {
			t.Errorf("%s: %d nodes: %v, want bad input naming the count", name, info.MaxNodes+1, err)
		}
	}
	t.Setenv(stage.MaxNodesEnv, "100")
	s, _ := builtin.Lookup("vortex-panel")
	info, _ := s.Describe(context.Background())
	if info.MaxNodes != 100 {
		t.Errorf("with %s=100 vortex-panel describes %d", stage.MaxNodesEnv, info.MaxNodes)
	}
	if _, err := s.Run(context.Background(), stage.Request{Section: ellipse(100), SectionName: "e.json"}); !errors.Is(err, stage.ErrBadInput) {
		t.Errorf("101 nodes past a limit of 100: %v", err)
	}
}
