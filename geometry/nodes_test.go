package geometry

import (
	"bytes"
	"math"
	"strings"
	"testing"
)

func TestWriteNodes(t *testing.T) {
	var b bytes.Buffer
	if err := WriteNodes(&b, "NACA 0012", []Point{{1, 0}, {0.5, 0.06}, {0, 0}}); err != nil {
		t.Fatal(err)
	}
	if got, want := b.String(), "NACA 0012\n1 0\n0.5 0.06\n0 0\n"; got != want {
		t.Errorf("got %q, want %q", got, want)
	}
	if err := WriteNodes(&b, "x", []Point{{math.Inf(1), 0}}); err == nil || !strings.Contains(err.Error(), "not finite") {
		t.Errorf("infinite node: err = %v", err)
	}
}
