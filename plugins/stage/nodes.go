package stage

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"strconv"

	"github.com/tidwall/gjson"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
)

// ErrNoNodes means a section document has no "nodes" array of [x, y]
// pairs.
var ErrNoNodes = errors.New("stage: the section document has no nodes")

// SplitNodes takes the "nodes" out of a section document: it returns the
// document without that key (every other byte as it was) and the nodes.
// It returns an error wrapping ErrNoNodes when doc is not a JSON object
// whose "nodes" is an array of [x, y] number pairs.
func SplitNodes(doc []byte) (rest []byte, nodes []geometry.Point, err error) {
	if !gjson.ValidBytes(doc) {
		return nil, nil, fmt.Errorf("%w: the document is not valid JSON", ErrNoNodes)
	}
	obj := gjson.ParseBytes(doc)
	if !obj.IsObject() {
		return nil, nil, fmt.Errorf("%w: the document is not a JSON object", ErrNoNodes)
	}
	// The span of the "nodes" member: from its key to the end of its
	// value, with the comma before it (or after it, when it comes first).
	start, end, found := -1, -1, false
	prevEnd := -1 // end of the member before, -1 at the first
	var bad error
	obj.ForEach(func(k, v gjson.Result) bool {
		if found {
			if prevEnd < 0 { // nodes came first: take the comma after it
				end = k.Index
			}
			return false
		}
		if k.String() == "nodes" {
			found = true
			start, end = k.Index, v.Index+len(v.Raw)
			if prevEnd >= 0 {
				start = prevEnd
			}
			nodes, bad = parseNodes(v)
			return bad == nil
		}
		prevEnd = v.Index + len(v.Raw)
		return true
	})
	if bad != nil {
		return nil, nil, bad
	}
	if !found {
		return nil, nil, fmt.Errorf("%w: no \"nodes\" key", ErrNoNodes)
	}
	rest = make([]byte, 0, len(doc)-(end-start))
	rest = append(append(rest, doc[:start]...), doc[end:]...)
	return rest, nodes, nil
}

func parseNodes(v gjson.Result) ([]geometry.Point, error) {
	if !v.IsArray() {
		return nil, fmt.Errorf("%w: \"nodes\" is not an array", ErrNoNodes)
	}
	var nodes []geometry.Point
	var err error
	v.ForEach(func(_, p gjson.Result) bool {
		var xy [2]float64
		n := 0
		if p.IsArray() {
			p.ForEach(func(_, c gjson.Result) bool {
				if n < 2 && c.Type == gjson.Number {
					xy[n], err = strconv.ParseFloat(c.Raw, 64)
				} else {
					err = errors.New("not a number")
				}
				n++
				return err == nil
			})
		}
		if err != nil || n != 2 || !finite(xy[0]) || !finite(xy[1]) {
			err = fmt.Errorf("%w: node %d is %.40s, want [x, y] with finite numbers", ErrNoNodes, len(nodes), p.Raw)
			return false
		}
		nodes = append(nodes, geometry.Point{X: xy[0], Y: xy[1]})
		return true
	})
	if err != nil {
		return nil, err
	}
	if nodes == nil {
		nodes = []geometry.Point{}
	}
	return nodes, nil
}

// JoinNodes returns the section document rest (a JSON object without
// "nodes", as SplitNodes leaves it) with "nodes" added as its last key.
func JoinNodes(rest []byte, nodes []geometry.Point) []byte {
	end := bytes.LastIndexByte(rest, '}')
	if end < 0 {
		return rest
	}
	b := make([]byte, 0, len(rest)+len(nodes)*44+16)
	b = append(b, rest[:end]...)
	if trimmed := bytes.TrimRight(b, " \t\r\n"); len(trimmed) > 0 && trimmed[len(trimmed)-1] != '{' {
		b = append(trimmed, ',')
	} else {
		b = trimmed
	}
	b = append(b, "\n  \"nodes\": ["...)
	for i, p := range nodes {
		if i > 0 {
			b = append(b, ',')
		}
		b = append(b, "\n    ["...)
		b = appendFloat(b, p.X)
		b = append(b, ", "...)
		b = appendFloat(b, p.Y)
		b = append(b, ']')
	}
	b = append(b, "\n  ]\n"...)
	return append(b, rest[end:]...)
}

// decodePacked decodes a section document without "nodes" and gives it
// the nodes of a packed request.
func decodePacked(rest []byte, nodes []geometry.Point, name string) (*section.Section, error) {
	var s section.Section
	if err := json.Unmarshal(rest, &s); err != nil {
		return nil, fmt.Errorf("%s: %w: %v", name, section.ErrNotSection, err)
	}
	if s.Format != section.Format {
		return nil, fmt.Errorf("%s: %w: format %q, want %q", name, section.ErrNotSection, s.Format, section.Format)
	}
	if s.Nodes != nil {
		return nil, fmt.Errorf("%s: the section document has \"nodes\" and the request packed nodes too", name)
	}
	for i, p := range nodes {
		if !p.IsFinite() {
			return nil, fmt.Errorf("%s: node %d: %w", name, i, geometry.ErrNonFinite)
		}
	}
	s.Nodes = append([]geometry.Point(nil), nodes...)
	return &s, nil
}
