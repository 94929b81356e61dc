//go:build !linux

package pipeline

import "errors"

// exchange is not available: the commit falls back to two renames.
var exchange = func(a, b string) error { return errors.New("no atomic exchange") }
