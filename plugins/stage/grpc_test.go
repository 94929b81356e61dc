package stage_test

import (
	"bytes"
	"context"
	"reflect"
	"strings"
	"sync"
	"testing"

	"github.com/tidwall/gjson"

	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/plugins/stage"
	"github.com/foilwright/foilwright/plugins/stagetest"
)

// recorder is a stage that keeps the request it got and answers with the
// sample document, as a ResultDoc or as JSON text.
type recorder struct {
	packed, text bool
	mu           sync.Mutex
	got          stage.Request
}

func (r *recorder) Describe(context.Context) (stage.Info, error) {
	return stage.Info{Name: "toy", Version: "1.2", Summary: "records", Packed: r.packed, Files: []string{"lib/a.js", "node_modules"},
		Scalars: []stage.Scalar{{Name: "panels"}, {Name: "condition"}}}, nil
}

func (r *recorder) Run(_ context.Context, req stage.Request) (stage.Result, error) {
	r.mu.Lock()
	r.got = req
	r.mu.Unlock()
	if r.text {
		b, err := sample().Encode()
		return stage.Result{JSON: b}, err
	}
	return stage.Result{Doc: sample()}, nil
}

// TestRequestForEachKindOfStage: through gRPC, a packed stage gets the
// nodes packed and its dependencies decoded; any other gets the whole
// section document and its dependencies as foilwright.result/1 JSON, as
// stages did before packing. Either may answer either way.
func TestRequestForEachKindOfStage(t *testing.T) {
	doc := stagetest.Section(8)
	full, err := section.Read(bytes.NewReader(doc), "s")
	if err != nil {
		t.Fatal(err)
	}
	rest, nodes, err := stage.SplitNodes(doc)
	if err != nil {
		t.Fatal(err)
	}
	dep := sample()
	for _, tc := range []struct {
		name         string
		packed, text bool
		req          stage.Request
	}{
		{"packed stage, split request", true, false, stage.Request{Section: rest, Nodes: nodes, DepResults: map[string]*stage.ResultDoc{"v": dep}}},
		{"packed stage, whole document", true, true, stage.Request{Section: doc, Deps: map[string][]byte{"v": mustV1(t, dep)}}},
		{"packed stage, both", true, false, stage.Request{Section: doc, Nodes: nodes, DepResults: map[string]*stage.ResultDoc{"v": dep}}},
		{"JSON stage, split request", false, true, stage.Request{Section: rest, Nodes: nodes, DepResults: map[string]*stage.ResultDoc{"v": dep}}},
		{"JSON stage, whole document", false, false, stage.Request{Section: doc, Deps: map[string][]byte{"v": mustEncode(t, dep)}}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rec := &recorder{packed: tc.packed, text: tc.text}
			s := stagetest.Connect(t, rec)
			if _, err := s.Describe(t.Context()); err != nil {
				t.Fatal(err)
			}
			res, err := s.Run(t.Context(), tc.req)
			if err != nil {
				t.Fatal(err)
			}
			got := rec.got
			if tc.packed {
				if !reflect.DeepEqual(got.Nodes, nodes) || gjson.GetBytes(got.Section, "nodes").Exists() || got.Deps != nil {
					t.Errorf("packed stage got nodes %d, section %.80s, deps %v", len(got.Nodes), got.Section, got.Deps)
				}
				if !reflect.DeepEqual(got.DepResults["v"], dep) {
					t.Errorf("packed stage got dependency %+v", got.DepResults["v"])
				}
			} else {
				if got.Nodes != nil || got.DepResults != nil || gjson.GetBytes(got.Deps["v"], "format").Str != stage.ResultFormatV1 {
					t.Errorf("JSON stage got nodes %v, dep results %v, deps %.60s", got.Nodes, got.DepResults, got.Deps["v"])
				}
				if d, err := got.Dep("v"); err != nil || !reflect.DeepEqual(d.Cases, dep.Cases) {
					t.Errorf("JSON stage's dependency reads back %+v (%v)", d, err)
				}
			}
			s2, err := got.DecodeSection()
			if err != nil || !reflect.DeepEqual(s2, full) {
				t.Errorf("the stage's section decodes to %+v (%v)", s2, err)
			}
			if tc.text != (res.Doc == nil) || tc.text != (len(res.JSON) > 0) {
				t.Errorf("answered as text %v: Doc %v, %d bytes of JSON", tc.text, res.Doc != nil, len(res.JSON))
			}
			if res.Doc != nil && !reflect.DeepEqual(res.Doc, sample()) {
				t.Errorf("packed answer came back %+v", res.Doc)
			}
			info, _ := s.Describe(t.Context())
			if info.Packed != tc.packed || !reflect.DeepEqual(info.Files, []string{"lib/a.js", "node_modules"}) {
				t.Errorf("description: packed %v, files %q", info.Packed, info.Files)
			}
		})
	}
}

// TestUndescribedClientSendsJSON: a client that has not seen the stage's
// description sends what every stage reads.
func TestUndescribedClientSendsJSON(t *testing.T) {
	rec := &recorder{packed: true}
	s := stagetest.Connect(t, rec)
	rest, nodes, _ := stage.SplitNodes(stagetest.Section(8))
	if _, err := s.Run(t.Context(), stage.Request{Section: rest, Nodes: nodes}); err != nil {
		t.Fatal(err)
	}
	if rec.got.Nodes != nil || !strings.Contains(string(rec.got.Section), `"nodes"`) {
		t.Errorf("got nodes %v, section %.80s", rec.got.Nodes, rec.got.Section)
	}
}

func mustV1(t *testing.T, d *stage.ResultDoc) []byte {
	b, err := d.EncodeV1()
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func mustEncode(t *testing.T, d *stage.ResultDoc) []byte {
	b, err := d.Encode()
	if err != nil {
		t.Fatal(err)
	}
	return b
}
