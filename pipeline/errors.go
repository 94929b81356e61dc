package pipeline

import (
	"errors"
	"fmt"
	"sort"
	"strings"
	"unicode/utf8"
)

// MaxErrors is the number of errors an ErrorList prints; the rest are
// counted.
const MaxErrors = 20

// An Error is one problem in a pipeline file, at a 1-based line and column
// (columns count characters). Path is the key path, as in
// "stages[1].params"; it is empty for errors about the file as a whole.
type Error struct {
	File string
	Line int
	Col  int
	Path string
	Msg  string

	offset int // byte offset, for sorting
}

func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d:%d", e.Line, e.Col)
	}
	if e.Path != "" {
		b.WriteString(": ")
		b.WriteString(e.Path)
	}
	b.WriteString(": ")
	b.WriteString(e.Msg)
	return b.String()
}

// An ErrorList is every problem found in a pipeline file, in file order.
type ErrorList []*Error

// Error prints up to MaxErrors errors, one a line, and counts the rest.
func (l ErrorList) Error() string {
	var b strings.Builder
	for i, e := range l {
		if i == MaxErrors {
			fmt.Fprintf(&b, "\n(and %d more error(s))", len(l)-MaxErrors)
			break
		}
		if i > 0 {
			b.WriteByte('\n')
		}
		b.WriteString(e.Error())
	}
	return b.String()
}

// Errors returned by Run and Verify, tested with errors.Is.
var (
	// ErrFolderNotEmpty means the run folder holds files and replacing it was not asked for.
	ErrFolderNotEmpty = errors.New("pipeline: run folder is not empty")
	// ErrPipelineChanged means the pipeline file a manifest records is missing or was changed.
	ErrPipelineChanged = errors.New("pipeline: pipeline file changed since the run")
	// ErrInputChanged means an input file a manifest records is missing, new or was changed.
	ErrInputChanged = errors.New("pipeline: input changed since the run")
	// ErrNotManifest means a file is not a foilwright run manifest.
	ErrNotManifest = errors.New("pipeline: not a foilwright manifest")
	// ErrFolderLocked means another run is writing the run folder.
	ErrFolderLocked = errors.New("pipeline: run folder is in use")
	// ErrFolderUnsafe means the run folder may not be written or replaced
	// as a whole: it is a symbolic link or not a folder, or it holds what
	// an earlier run did not write.
	ErrFolderUnsafe = errors.New("pipeline: run folder cannot be replaced")
	// ErrBadInput marks a run that failed because of its input: a section
	// whose files could not be read or prepared, stage parameters a stage
	// refuses, a section a stage refuses.
	ErrBadInput = errors.New("pipeline: bad input")
)

// positions turns byte offsets of one file into line:column.
type positions struct {
	data  []byte
	lines []int // byte offset of the start of each line
}

func newPositions(data []byte) *positions {
	p := &positions{data: data, lines: []int{0}}
	for i, c := range data {
		if c == '\n' {
			p.lines = append(p.lines, i+1)
		}
	}
	return p
}

// at returns the 1-based line and character column of byte offset off.
func (p *positions) at(off int) (line, col int) {
	if off < 0 {
		off = 0
	}
	if off > len(p.data) {
		off = len(p.data)
	}
	i := sort.Search(len(p.lines), func(i int) bool { return p.lines[i] > off }) - 1
	return i + 1, utf8.RuneCount(p.data[p.lines[i]:off]) + 1
}

// collector gathers the errors of one file.
type collector struct {
	file string
	pos  *positions
	errs ErrorList
	// keyAt is the offset of the key whose value a wantObject visit is at.
	keyAt int
}

// add records an error at byte offset off (negative: no position).
func (c *collector) add(off int, path, format string, args ...any) {
	e := &Error{File: c.file, Path: path, Msg: fmt.Sprintf(format, args...), offset: off}
	if off >= 0 {
		e.Line, e.Col = c.pos.at(off)
	}
	c.errs = append(c.errs, e)
}

// err returns the errors sorted by position, or nil.
func (c *collector) err() error {
	if len(c.errs) == 0 {
		return nil
	}
	sort.SliceStable(c.errs, func(i, j int) bool { return c.errs[i].offset < c.errs[j].offset })
	return c.errs
}
