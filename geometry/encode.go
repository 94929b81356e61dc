package geometry

import (
	"bytes"
	"encoding/json"
	"fmt"
	"strconv"
)

// EncodeSection returns the section document s as indented JSON with a
// final newline, like WriteSection, except that "nodes" holds one [x, y]
// pair per line, each coordinate in the shortest form that reads back
// exactly (strconv 'g', −1). The output is deterministic. It sets s.Format
// to SectionFormat when empty, and returns an error for a non-finite value.
func EncodeSection(s *Section) ([]byte, error) {
	if s.Format == "" {
		s.Format = SectionFormat
	}
	head := *s
	head.Nodes = []Point{}
	b, err := json.MarshalIndent(&head, "", "  ")
	if err != nil {
		return nil, fmt.Errorf("geometry: encode section: %w", err)
	}
	const empty = "\"nodes\": []\n}"
	if !bytes.HasSuffix(b, []byte(empty)) {
		return nil, fmt.Errorf("geometry: encode section: unexpected layout")
	}
	b = b[:len(b)-len(empty)]
	b = append(b, "\"nodes\": ["...)
	for i, p := range s.Nodes {
		if !p.IsFinite() {
			return nil, fmt.Errorf("geometry: encode section: node %d (%g, %g): %w", i, p.X, p.Y, ErrNonFinite)
		}
		if i > 0 {
			b = append(b, ',')
		}
		b = append(b, "\n    ["...)
		b = strconv.AppendFloat(b, p.X, 'g', -1, 64)
		b = append(b, ", "...)
		b = strconv.AppendFloat(b, p.Y, 'g', -1, 64)
		b = append(b, ']')
	}
	if len(s.Nodes) > 0 {
		b = append(b, "\n  "...)
	}
	b = append(b, "]\n}\n"...)
	return b, nil
}
