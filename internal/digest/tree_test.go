package digest

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"os"
	"path/filepath"
	"testing"
)

// TestTree checks a tree digest against the definition, written out: the
// sha256 of sha256sum's listing of the files, sorted by path, a symbolic
// link as the digest of its target.
func TestTree(t *testing.T) {
	dir := t.TempDir()
	write := func(name, data string) {
		p := filepath.Join(dir, filepath.FromSlash(name))
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, []byte(data), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	write("b.js", "abc")
	write("a/z.json", "")
	write("a/y.txt", "y\n")
	if err := os.MkdirAll(filepath.Join(dir, "empty"), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink("../b.js", filepath.Join(dir, "a", "link")); err != nil {
		t.Fatal(err)
	}
	listing := fmt.Sprintf("%s  a/link\n%s  a/y.txt\n%s  a/z.json\n%s  b.js\n",
		Bytes([]byte("symlink ../b.js")), Bytes([]byte("y\n")),
		"e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855",
		"ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad") // FIPS 180-2 B.1
	sum := sha256.Sum256([]byte(listing))
	want := hex.EncodeToString(sum[:])
	got, n, err := Tree(dir)
	if err != nil || got != want || n != 4 {
		t.Errorf("Tree = %s, %d, %v; want %s, 4", got, n, err, want)
	}
	if p, err := Path(dir); err != nil || p != want {
		t.Errorf("Path(folder) = %s, %v", p, err)
	}
	if p, err := Path(filepath.Join(dir, "b.js")); err != nil || p != Bytes([]byte("abc")) {
		t.Errorf("Path(file) = %s, %v", p, err)
	}
	// Any change shows: content, name, link target.
	write("a/y.txt", "y!\n")
	if again, _, _ := Tree(dir); again == want {
		t.Error("a changed file left the tree digest as it was")
	}
}
