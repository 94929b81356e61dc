package limits

import "fmt"

// A DepthError reports JSON text nested deeper than a limit, at the byte
// offset of the bracket that goes past it.
type DepthError struct {
	Depth  int // the limit
	Offset int // byte offset of the opening bracket past the limit
}

func (e *DepthError) Error() string {
	return fmt.Sprintf("arrays and objects nested more than %d deep: over the %s limit (raise it with --limit %s=N, at most %d)", e.Depth, JSONDepth, JSONDepth, MaxJSONDepth)
}

// Unwrap lets errors.Is find ErrLimit.
func (e *DepthError) Unwrap() error { return ErrLimit }

// CheckDepth scans JSON text once, without parsing it, and returns a
// *DepthError when its arrays and objects nest deeper than maxDepth
// (zero: no limit). Brackets inside strings do not count; the text need
// not be valid JSON (its parser reports that).
func CheckDepth(data []byte, maxDepth int) error {
	if maxDepth <= 0 {
		return nil
	}
	depth := 0
	inString := false
	for i := 0; i < len(data); i++ {
		c := data[i]
		if inString {
			switch c {
			case '\\':
				i++
			case '"':
				inString = false
			}
			continue
		}
		switch c {
		case '"':
			inString = true
		case '[', '{':
			depth++
			if depth > maxDepth {
				return &DepthError{Depth: maxDepth, Offset: i}
			}
		case ']', '}':
			depth--
		}
	}
	return nil
}
