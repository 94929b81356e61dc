package digest

import (
	"os"
	"path/filepath"
	"testing"
)

// TestDigest checks the digests of the empty string and of "abc" against
// FIPS 180-2, Appendix B.1 (and the well-known digest of nothing).
func TestDigest(t *testing.T) {
	const (
		empty = "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855"
		abc   = "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad" // FIPS 180-2 B.1
	)
	if got := Bytes(nil); got != empty {
		t.Errorf("Bytes(nil) = %s", got)
	}
	if got := Bytes([]byte("abc")); got != abc {
		t.Errorf("Bytes(abc) = %s", got)
	}
	path := filepath.Join(t.TempDir(), "abc")
	if err := os.WriteFile(path, []byte("abc"), 0o644); err != nil {
		t.Fatal(err)
	}
	if got, err := File(path); err != nil || got != abc {
		t.Errorf("File = %s, %v", got, err)
	}
	if _, err := File(filepath.Join(t.TempDir(), "missing")); err == nil {
		t.Error("missing file: no error")
	}
}
