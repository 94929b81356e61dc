package layers

import (
	"bufio"
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// table reads imports.txt: for each package of the module (a path below
// the module), the packages of ours it may import.
func table(t *testing.T) (map[string][]string, string) {
	t.Helper()
	data, err := os.ReadFile("imports.txt")
	if err != nil {
		t.Fatal(err)
	}
	allowed := map[string][]string{}
	sc := bufio.NewScanner(bytes.NewReader(data))
	for sc.Scan() {
		f := strings.Fields(sc.Text())
		if len(f) == 0 || strings.HasPrefix(f[0], "#") {
			continue
		}
		if _, dup := allowed[f[0]]; dup {
			t.Errorf("imports.txt lists %s twice", f[0])
		}
		allowed[f[0]] = f[1:]
	}
	return allowed, string(data)
}

// permits reports whether the pattern (a package, or dir/* for every
// package below dir) covers pkg.
func permits(pattern, pkg string) bool {
	if dir, ok := strings.CutSuffix(pattern, "/*"); ok {
		return strings.HasPrefix(pkg, dir+"/")
	}
	return pattern == pkg
}

// TestImportDirection lists every package of the module with its imports
// (go list) and checks each import of ours against the table.
func TestImportDirection(t *testing.T) {
	allowed, _ := table(t)
	root, err := exec.Command("go", "list", "-m", "-f", "{{.Dir}} {{.Path}}").Output()
	if err != nil {
		t.Fatalf("go list -m: %v", err)
	}
	dir, module, _ := strings.Cut(strings.TrimSpace(string(root)), " ")
	cmd := exec.Command("go", "list", "-f", "{{.ImportPath}}{{range .Imports}} {{.}}{{end}}", "./...")
	cmd.Dir = dir
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("go list: %v", err)
	}
	seen := map[string]bool{}
	for _, line := range strings.Split(strings.TrimSpace(string(out)), "\n") {
		f := strings.Fields(line)
		pkg, ok := strings.CutPrefix(f[0], module+"/")
		if !ok {
			continue
		}
		seen[pkg] = true
		may, listed := allowed[pkg]
		if !listed {
			t.Errorf("%s is not in internal/layers/imports.txt: add its row (and to DEVELOPERS.md)", pkg)
			continue
		}
		for _, imp := range f[1:] {
			dep, ours := strings.CutPrefix(imp, module+"/")
			if !ours {
				continue
			}
			ok := false
			for _, p := range may {
				ok = ok || permits(p, dep)
			}
			if !ok {
				t.Errorf("%s imports %s, against the arrows of internal/layers/imports.txt", pkg, dep)
			}
		}
	}
	for pkg := range allowed {
		if !seen[pkg] {
			t.Errorf("internal/layers/imports.txt lists %s, which is no package of the module", pkg)
		}
	}
}

// TestDevelopersShowsTable checks that DEVELOPERS.md shows the table as it
// is.
func TestDevelopersShowsTable(t *testing.T) {
	_, text := table(t)
	doc, err := os.ReadFile(filepath.Join("..", "..", "DEVELOPERS.md"))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(doc, []byte("```\n"+text+"```\n")) {
		t.Error("DEVELOPERS.md does not show internal/layers/imports.txt as it is (in a ``` block): copy it over")
	}
}

func TestPermits(t *testing.T) {
	for _, tc := range []struct {
		pattern, pkg string
		want         bool
	}{
		{"geometry", "geometry", true},
		{"geometry", "geometry/curve", false},
		{"geometry/*", "geometry/curve", true},
		{"geometry/*", "geometry", false},
		{"plugins/*", "plugins/builtin/solver", true},
	} {
		if got := permits(tc.pattern, tc.pkg); got != tc.want {
			t.Errorf("permits(%q, %q) = %v", tc.pattern, tc.pkg, got)
		}
	}
}
