package host

import (
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"

	"github.com/foilwright/foilwright/internal/digest"
	"github.com/foilwright/foilwright/plugins/stage"
)

// A FileDigest is a file an external stage runs from, besides its
// executable, and its hex sha256 (the tree digest of a folder,
// digest.Tree).
type FileDigest struct {
	Path   string `json:"path"` // as the stage declared it, or the interpreter's absolute path
	SHA256 string `json:"sha256"`
}

// ErrDeclaredFile means a file a stage declares in its description is
// missing, outside its folder or cannot be hashed.
var ErrDeclaredFile = errors.New("host: a file the stage declares")

// RunsFrom returns what the external stage of spec runs from besides its
// executable, each with its digest: the interpreter its "#!" line names
// (through env, looked up in PATH; symbolic links resolved), then the
// files and folders info.Files declares, relative to the executable's
// folder. A built-in stage runs from foilwright alone: nil. The digests of
// large files are kept by the host for its life (by path, size and
// modification time), so an interpreter is read once.
func (h *Host) RunsFrom(spec Spec, info stage.Info) ([]FileDigest, error) {
	if spec.Path == "" {
		return nil, nil
	}
	exe, err := executable(spec.Path)
	if err != nil {
		return nil, err
	}
	var out []FileDigest
	if interp, err := interpreter(exe); err != nil {
		return nil, err
	} else if interp != "" {
		sum, err := h.fileDigest(interp)
		if err != nil {
			return nil, fmt.Errorf("host: the interpreter of %s: %w", exe, err)
		}
		out = append(out, FileDigest{Path: interp, SHA256: sum})
	}
	dir := filepath.Dir(exe)
	for _, f := range info.Files {
		if !filepath.IsLocal(filepath.FromSlash(f)) || strings.Contains(f, `\`) {
			return nil, fmt.Errorf("%w: %q is not a slash path inside the executable's folder", ErrDeclaredFile, f)
		}
		p := filepath.Join(dir, filepath.FromSlash(f))
		fi, err := os.Stat(p)
		if err != nil {
			return nil, fmt.Errorf("%w: %q: %v", ErrDeclaredFile, f, err)
		}
		var sum string
		if fi.IsDir() {
			sum, _, err = digest.Tree(p)
		} else {
			sum, err = h.fileDigest(p)
		}
		if err != nil {
			return nil, fmt.Errorf("%w: %q: %v", ErrDeclaredFile, f, err)
		}
		out = append(out, FileDigest{Path: f, SHA256: sum})
	}
	return out, nil
}

// fileDigest returns the digest of the file at path, from the host's
// cache when it is there with the same size and modification time.
func (h *Host) fileDigest(path string) (string, error) {
	fi, err := os.Stat(path)
	if err != nil {
		return "", err
	}
	key := fmt.Sprintf("%s\x00%d\x00%d", path, fi.Size(), fi.ModTime().UnixNano())
	h.mu.Lock()
	sum, ok := h.digests[key]
	h.mu.Unlock()
	if ok {
		return sum, nil
	}
	if sum, err = digest.File(path); err != nil {
		return "", err
	}
	h.mu.Lock()
	if h.digests == nil {
		h.digests = map[string]string{}
	}
	h.digests[key] = sum
	h.mu.Unlock()
	return sum, nil
}

// interpreter returns the absolute path of the program the "#!" line of
// the executable exe names ("" when it has none): the program itself, or
// the one an env line names, looked up in PATH; symbolic links resolved.
func interpreter(exe string) (string, error) {
	f, err := os.Open(exe)
	if err != nil {
		return "", err
	}
	defer f.Close()
	head := make([]byte, 512)
	n, err := io.ReadFull(f, head)
	if err != nil && !errors.Is(err, io.ErrUnexpectedEOF) && !errors.Is(err, io.EOF) {
		return "", err
	}
	line, _, _ := strings.Cut(string(head[:n]), "\n")
	if !strings.HasPrefix(line, "#!") {
		return "", nil
	}
	fields := strings.Fields(strings.TrimPrefix(line, "#!"))
	if len(fields) == 0 {
		return "", fmt.Errorf("host: %s: a \"#!\" line that names no program", exe)
	}
	prog := fields[0]
	if filepath.Base(prog) == "env" {
		prog = ""
		for _, a := range fields[1:] {
			if !strings.HasPrefix(a, "-") && !strings.Contains(a, "=") {
				prog = a
				break
			}
		}
		if prog == "" {
			return "", fmt.Errorf("host: %s: %q names no program", exe, line)
		}
	}
	if !strings.ContainsRune(prog, '/') {
		if prog, err = exec.LookPath(prog); err != nil {
			return "", fmt.Errorf("host: %s: its interpreter: %w", exe, err)
		}
	}
	if prog, err = filepath.EvalSymlinks(prog); err != nil {
		return "", fmt.Errorf("host: %s: its interpreter: %w", exe, err)
	}
	return filepath.Abs(prog)
}
