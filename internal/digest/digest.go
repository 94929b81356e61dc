// Package digest is the one place foilwright computes the digests it
// records and checks: the lower-case hex sha256 of bytes or of a file, as
// written in section documents, manifests and stage pins.
package digest

import (
	"crypto/sha256"
	"encoding/hex"
	"io"
	"os"
)

// Bytes returns the hex sha256 of b.
func Bytes(b []byte) string {
	sum := sha256.Sum256(b)
	return hex.EncodeToString(sum[:])
}

// File returns the hex sha256 of the file at path, reading it in pieces.
func File(path string) (string, error) {
	f, err := os.Open(path)
	if err != nil {
		return "", err
	}
	defer f.Close()
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return "", err
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}
