package pipeline

import (
	"bufio"
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"sync"
)

// The journal of a run: the manifest written as the run goes. Its first
// line says what run it belongs to (the tool, the pipeline file, the
// stages, the plan and the shard); each later line is one finished
// section, appended in one write as the section ends, in the order the
// sections end. A crash leaves it complete up to the last finished
// section (a torn last line is read past), so a resumed run knows what is
// done, and the manifest is assembled from it at the end (assemble.go)
// without holding every section in memory.
//
// A run's journal lives in its staging folder and is removed once the
// manifest is written; a shard keeps its journal in its part of the run
// folder, for Merge.

// JournalName is the journal's file name in a staging folder or a shard's
// part of a run folder.
const JournalName = "journal.jsonl"

// JournalFormat is the value of the journal header's "format" key.
const JournalFormat = "foilwright.journal/1"

// runHead is what makes a run the run it is, besides its sections: runs
// that differ in it do not share sections (resume) or parts (merge).
type runHead struct {
	Tool     Tool          `json:"tool"`
	Pipeline PipelineRef   `json:"pipeline"`
	Stages   []StageRecord `json:"stages"`
	// Plan is the digest of the plan (Plan.Digest) and Sections its
	// number of sections.
	Plan     string `json:"plan"`
	Sections int    `json:"sections"`
}

// journalHeader is the first line of a journal.
type journalHeader struct {
	Format string `json:"format"`
	runHead
	Shard *Shard `json:"shard,omitempty"`
	// Attempt counts the attempts at the run: 1, then one more for each
	// resumed run.
	Attempt int `json:"attempt"`
}

// A journalEntry is one finished section.
type journalEntry struct {
	Index   int               `json:"i"`       // in the plan
	Attempt int               `json:"attempt"` // the attempt that made the section
	Record  SectionRecord     `json:"record"`
	Outputs map[string]string `json:"outputs,omitempty"`
	Timing  SectionTiming     `json:"timing"`
	// Summary and Input are the section's report beside its record.
	Summary string `json:"summary,omitempty"`
	Input   bool   `json:"input,omitempty"`
	// Compare is the section's verdict against its design, when it was
	// compared.
	Compare *Verdict `json:"compare,omitempty"`
	// Row is the section's row of the batch table.
	Row []Cell `json:"row,omitempty"`
	// Section is the section document, kept only when the run's stations
	// picture or exports need it.
	Section json.RawMessage `json:"section,omitempty"`
}

// report rebuilds the section's report.
func (e *journalEntry) report() SectionReport {
	return SectionReport{Name: e.Record.Name, Status: e.Record.Status, Err: e.Record.Err, Input: e.Input,
		Summary: e.Summary, Stages: e.Record.Stages, Compare: e.Compare}
}

// where is an entry's place in the journal file.
type where struct {
	off int64
	n   int32
}

// journal is a journal open for appending, with the place of each
// section's entry by plan index (n 0: none).
type journal struct {
	mu    sync.Mutex
	f     *os.File
	path  string
	size  int64
	at    []where
	head  journalHeader
	count int // entries
}

// createJournal writes a new journal at path with header h and the
// entries fill adds (kept from an earlier attempt, already checked), and
// opens it for appending. It is written beside and renamed: a crash
// leaves the earlier journal or the new one, never half of it.
func createJournal(path string, h journalHeader, fill func(add func(*journalEntry) error) error) (*journal, error) {
	tmp := path + ".tmp"
	f, err := os.OpenFile(tmp, os.O_RDWR|os.O_CREATE|os.O_TRUNC, 0o644)
	if err != nil {
		return nil, fmt.Errorf("pipeline: journal: %w", err)
	}
	j := &journal{f: f, path: path, head: h, at: make([]where, h.Sections)}
	fail := func(err error) (*journal, error) {
		f.Close()
		os.Remove(tmp)
		return nil, err
	}
	var b bytes.Buffer
	if err := appendLine(&b, h); err != nil {
		return fail(err)
	}
	if _, err := f.Write(b.Bytes()); err != nil {
		return fail(fmt.Errorf("pipeline: journal: %w", err))
	}
	j.size = int64(b.Len())
	if fill != nil {
		if err := fill(j.add); err != nil {
			return fail(err)
		}
	}
	if err := os.Rename(tmp, path); err != nil {
		return fail(fmt.Errorf("pipeline: journal: %w", err))
	}
	return j, nil
}

func appendLine(b *bytes.Buffer, v any) error {
	data, err := json.Marshal(v)
	if err != nil {
		return fmt.Errorf("pipeline: journal: %w", err)
	}
	b.Write(data)
	b.WriteByte('\n')
	return nil
}

// add appends e in one write.
func (j *journal) add(e *journalEntry) error {
	var b bytes.Buffer
	if err := appendLine(&b, e); err != nil {
		return err
	}
	j.mu.Lock()
	defer j.mu.Unlock()
	if _, err := j.f.Write(b.Bytes()); err != nil {
		return fmt.Errorf("pipeline: journal: %w", err)
	}
	j.at[e.Index] = where{j.size, int32(b.Len())}
	j.size += int64(b.Len())
	j.count++
	return nil
}

// has reports whether section i has an entry.
func (j *journal) has(i int) bool { return j.at[i].n > 0 }

// entry reads the entry of section i; ok is false when it has none.
func (j *journal) entry(i int) (e journalEntry, ok bool, err error) {
	w := j.at[i]
	if w.n == 0 {
		return e, false, nil
	}
	buf := make([]byte, w.n)
	if _, err := j.f.ReadAt(buf, w.off); err != nil {
		return e, false, fmt.Errorf("pipeline: journal: %w", err)
	}
	if err := json.Unmarshal(buf, &e); err != nil {
		return e, false, fmt.Errorf("pipeline: journal %s: %w", j.path, err)
	}
	return e, true, nil
}

// each calls f with every entry in plan order, one at a time.
func (j *journal) each(f func(e *journalEntry) error) error {
	for i := range j.at {
		e, ok, err := j.entry(i)
		if err != nil {
			return err
		}
		if ok {
			if err := f(&e); err != nil {
				return err
			}
		}
	}
	return nil
}

func (j *journal) close() error {
	if j == nil || j.f == nil {
		return nil
	}
	err := j.f.Close()
	j.f = nil
	return err
}

// errNoJournal means a folder holds no journal.
var errNoJournal = errors.New("no journal")

// readJournal reads the journal at path: its header and its entries, in
// the order they were written, each with its place. A torn or unreadable
// line ends it (a crash in the middle of a write); torn says so. The
// header goes to head first; the entries are read one at a time and handed to f, so that a long journal
// is never held whole; f returns false to stop.
func readJournal(path string, head func(h journalHeader), f func(e *journalEntry, at where) bool) (h journalHeader, torn bool, err error) {
	file, err := os.Open(path)
	if errors.Is(err, os.ErrNotExist) {
		return h, false, errNoJournal
	}
	if err != nil {
		return h, false, err
	}
	defer file.Close()
	r := bufio.NewReaderSize(file, 1<<16)
	line, err := r.ReadBytes('\n')
	if err != nil || json.Unmarshal(line, &h) != nil || h.Format != JournalFormat {
		return h, false, fmt.Errorf("%s: not a foilwright journal", path)
	}
	if h.Sections < 0 || h.Sections > 1<<31 {
		return h, false, fmt.Errorf("%s: not a foilwright journal", path)
	}
	if head != nil {
		head(h)
	}
	off := int64(len(line))
	for {
		line, err := r.ReadBytes('\n')
		if len(line) == 0 && err == io.EOF {
			return h, false, nil
		}
		if err != nil { // a last line without its newline: torn
			return h, true, nil
		}
		var e journalEntry
		if json.Unmarshal(line, &e) != nil || e.Index < 0 || e.Index >= h.Sections {
			return h, true, nil
		}
		if !f(&e, where{off, int32(len(line))}) {
			return h, false, nil
		}
		off += int64(len(line))
	}
}

// openJournal opens the journal at path for reading its entries by plan
// index (the last entry of a section wins), as Merge reads a shard's.
func openJournal(path string) (*journal, error) {
	j := &journal{path: path}
	h, _, err := readJournal(path, func(h journalHeader) { j.at = make([]where, h.Sections) },
		func(e *journalEntry, w where) bool {
			if j.at[e.Index].n == 0 {
				j.count++
			}
			j.at[e.Index] = w
			return true
		})
	if err != nil {
		return nil, err
	}
	j.head = h
	if j.f, err = os.Open(path); err != nil {
		return nil, err
	}
	return j, nil
}

// sortedByFolder returns the plan indexes of the sections in the order of
// their folders' paths, "name/": the order of their outputs in the
// manifest's sorted "outputs".
func sortedByFolder(pl *Plan, idx []int) []int {
	s := slices.Clone(idx)
	slices.SortFunc(s, func(a, b int) int {
		return strings.Compare(pl.Sections[a].Name+"/", pl.Sections[b].Name+"/")
	})
	return s
}

// journalPath is the journal of a folder.
func journalPath(folder string) string { return filepath.Join(folder, JournalName) }
