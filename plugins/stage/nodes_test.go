package stage_test

import (
	"bytes"
	"encoding/json"
	"errors"
	"reflect"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/plugins/stage"
)

func TestSplitJoinNodes(t *testing.T) {
	want := []geometry.Point{{X: 1, Y: 0}, {X: 0.5, Y: 0.06}, {X: 0, Y: 0}, {X: 0.5, Y: -0.04}, {X: 1, Y: -1e-18}}
	nodes := `[[1, 0], [0.5, 0.06], [0, 0], [0.5, -0.04], [1, -1e-18]]`
	for _, doc := range []string{
		`{"format": "foilwright.section/1", "name": "a", "nodes": ` + nodes + `}`,
		`{"nodes": ` + nodes + `, "format": "foilwright.section/1", "name": "a"}`,
		`{"format": "foilwright.section/1", "nodes": ` + nodes + `, "name": "a"}`,
		"{\n  \"format\": \"foilwright.section/1\",\n  \"name\": \"a\",\n  \"nodes\": " + nodes + "\n}\n",
	} {
		rest, got, err := stage.SplitNodes([]byte(doc))
		if err != nil {
			t.Fatalf("%s: %v", doc, err)
		}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("%s: nodes %v", doc, got)
		}
		var m map[string]any
		if err := json.Unmarshal(rest, &m); err != nil || len(m) != 2 || m["name"] != "a" || m["nodes"] != nil {
			t.Errorf("%s: rest %s (%v)", doc, rest, err)
		}
		joined := stage.JoinNodes(rest, got)
		s, err := section.Read(bytes.NewReader(joined), "joined")
		if err != nil || !reflect.DeepEqual(s.Nodes, want) || s.Name != "a" {
			t.Errorf("%s: joined %s (%v)", doc, joined, err)
		}
		// A packed request decodes to the same section.
		p, err := stage.Request{Section: rest, Nodes: got}.DecodeSection()
		if err != nil || !reflect.DeepEqual(p, s) {
			t.Errorf("%s: packed request decodes to %+v (%v)", doc, p, err)
		}
	}
	if j := stage.JoinNodes([]byte(`{}`), want[:1]); !strings.Contains(string(j), `"nodes": [`) || !json.Valid(j) {
		t.Errorf("joined into an empty object: %s", j)
	}
}

func TestSplitNodesRejects(t *testing.T) {
	for _, tc := range []struct{ doc, text string }{
		{`{"format": "x"`, "not valid JSON"},
		{`[1, 2]`, "not a JSON object"},
		{`{"format": "x"}`, `no "nodes" key`},
		{`{"nodes": {"x": 1}}`, "is not an array"},
		{`{"nodes": [[0, 0], [1]]}`, "node 1 is [1]"},
		{`{"nodes": [[0, 0], [1, "a"]]}`, "node 1 is"},
		{`{"nodes": [[0, 0], [1, 2, 3]]}`, "node 1 is"},
		{`{"nodes": [[0, 0], [1e999, 0]]}`, "finite"},
	} {
		_, _, err := stage.SplitNodes([]byte(tc.doc))
		if !errors.Is(err, stage.ErrNoNodes) || !strings.Contains(err.Error(), tc.text) {
			t.Errorf("%s: got %v, want ErrNoNodes containing %q", tc.doc, err, tc.text)
		}
	}
}

func TestPackedRequestRejects(t *testing.T) {
	nodes := []geometry.Point{{X: 1, Y: 0}, {X: 0, Y: 0}, {X: 1, Y: 0}}
	for _, tc := range []struct {
		req  stage.Request
		text string
	}{
		{stage.Request{Section: []byte(`{"format": "foilwright.result/1"}`), Nodes: nodes}, "not a foilwright section document"},
		{stage.Request{Section: []byte(`{"format": "foilwright.section/1"`), Nodes: nodes}, "not a foilwright section document"},
		{stage.Request{Section: []byte(`{"format": "foilwright.section/1"}`), Nodes: []geometry.Point{{X: 1}, {X: geometry.Point{}.X / zero}}}, "node 1"},
	} {
		_, err := tc.req.DecodeSection()
		if !errors.Is(err, stage.ErrBadInput) || !strings.Contains(err.Error(), tc.text) {
			t.Errorf("%s: got %v, want ErrBadInput containing %q", tc.req.Section, err, tc.text)
		}
	}
}

var zero = 0.0
