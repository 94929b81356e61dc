package pipeline

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"runtime"
	"slices"
	"sort"
	"strings"

	"github.com/foilwright/foilwright/export"
	"github.com/foilwright/foilwright/internal/digest"
	"github.com/foilwright/foilwright/internal/enum"
	"github.com/foilwright/foilwright/internal/limits"
	"github.com/foilwright/foilwright/plugins/stage"
	"github.com/foilwright/foilwright/prep"
	"github.com/tidwall/gjson"
)

// FormatVersion is the pipeline file format this package reads, the value of
// the "foilwright" key.
const FormatVersion = 1

// Pictures of outputs.plots. Pictures of analysis results come from the
// built-in "plots" stage, which a pipeline lists among its stages.
const (
	PlotPrep     = "prep"     // per section: points against the curve, deviation, nodes, section
	PlotStations = "stations" // per run: chord, twist, thickness and fit RMS against the station
)

// On-error policies of a stage.
const (
	// OnErrorStop fails the section when the stage fails: its later stages
	// do not run. Other sections are not affected.
	OnErrorStop = "stop"
	// OnErrorContinue records the failure and goes on with the stages that
	// do not depend on the failed one.
	OnErrorContinue = "continue"
)

// MaxTimeoutS is the largest timeout_s a stage may ask for (one day).
const MaxTimeoutS = 86400

// A Pipeline is a parsed, checked pipeline file.
type Pipeline struct {
	File    string // the name it was parsed under, used in messages
	Path    string // absolute path of the file, "" when parsed from memory
	Dir     string // the folder inputs, stages and the run folder are relative to
	SHA256  string // hex digest of the file's bytes
	Name    string
	Inputs  []InputSpec
	Prepare prep.Settings
	Stages  []Stage // in file order
	Outputs Outputs
	// Compare is the top-level "compare" block, or nil.
	Compare *CompareSpec

	order []int      // Stages indexes in dependency order
	pos   *positions // of the file, for messages about it after parsing
}

// An InputSpec is one entry of "inputs".
type InputSpec struct {
	Name    string   // section name; "" means the first file's base name
	Files   []string // paths or globs as written
	Paths   []string // the matching files, sorted, without repeats; slash-separated, relative to Dir unless absolute
	PerFile bool     // one section per file instead of one section from all files
	Station *float64 // spanwise position of a blade station, if given
	Read    prep.Settings
	// Compare is the input's own "compare" block, or nil.
	Compare *CompareSpec
}

// A Stage is one entry of "stages".
type Stage struct {
	ID       string
	Stage    string   // as written: a built-in name or an executable path
	Exec     string   // absolute path of the executable; "" for a built-in stage
	SHA256   string   // pinned executable digest, lower-case hex, or ""
	Params   []byte   // the "params" object, raw as written ("{}" when absent)
	After    []string // ids of the stages whose results this stage sees
	OnError  string   // OnErrorStop or OnErrorContinue
	TimeoutS float64  // 0 means the stage runner's default
	// Env names variables of foilwright's environment the stage may see,
	// besides the minimal ones every stage gets.
	Env []string
	// Pins are more files the stage depends on (a wrapper's binary, a
	// model file), by path as written, with the sha256 each must have.
	Pins []Pin
	// Keep is the detail of the stage's result document written to the
	// run folder: stage.KeepAll (the default), KeepCases or KeepScalars.
	// The stages that run after it and the exports see all of it.
	Keep string

	index    int // in file order
	paramsAt int // byte offset of the params object in the file; -1 when absent
}

// A Pin is a file a stage depends on and the sha256 it must have.
type Pin struct {
	Path   string `json:"path"` // as written in the pipeline file
	SHA256 string `json:"sha256"`
}

// Outputs is the "outputs" entry.
type Outputs struct {
	Folder    string   // run folder, relative to Dir unless absolute
	Documents []string // DocSection, DocNodes, DocResults (all three by default)
	Plots     []string // PlotPrep, PlotStations
	// PlotFormat is the picture format of Plots, "svg" (default) or "png".
	PlotFormat string
	// Exports are the exports of each section (export.Kinds, written to
	// <section>/export/) and of the run (ExportStationsDXF,
	// ExportStationsCSV, at the root of the run folder).
	Exports []string
	// ExportFrame is the frame of the geometric exports: "" (the part
	// frame, or the chord frame for a section in chord units), or one of
	// export.Frames.
	ExportFrame string
}

// Exports of the whole run (outputs.exports), beside the per-section
// kinds of export.Kinds.
const (
	ExportStationsDXF = "stations-dxf" // stations.dxf: the stations in space, for a CAD loft
	ExportStationsCSV = "stations-csv" // stations.csv
)

// ExportKinds returns the names outputs.exports accepts.
func ExportKinds() []string {
	return append(enum.Names(export.Kinds()), ExportStationsDXF, ExportStationsCSV)
}

// HasExport reports whether exports lists kind.
func (o Outputs) HasExport(kind string) bool { return slices.Contains(o.Exports, kind) }

// HasPlot reports whether plots lists name.
func (o Outputs) HasPlot(name string) bool {
	for _, p := range o.Plots {
		if p == name {
			return true
		}
	}
	return false
}

// Has reports whether documents lists kind.
func (o Outputs) Has(kind string) bool {
	for _, d := range o.Documents {
		if d == kind {
			return true
		}
	}
	return false
}

// ParseOptions say where a pipeline file's relative paths start, which
// stage names are built in, and how large the file may be.
type ParseOptions struct {
	// Dir is the folder relative paths start from; "" means the current folder.
	Dir string
	// Known reports whether name is a built-in stage. Nil knows none.
	Known func(name string) bool
	// Describe, when set, returns the description of a built-in stage, so
	// that its parameters are checked with the file, before anything runs.
	Describe func(name string) (stage.Info, bool)
	// MaxBytes and MaxDepth bound the file's size and the nesting of its
	// arrays and objects; zero means the defaults of package limits.
	MaxBytes int64
	MaxDepth int
}

func (o ParseOptions) maxBytes() int64 {
	if o.MaxBytes > 0 {
		return o.MaxBytes
	}
	return limits.Default().JSONBytes
}

func (o ParseOptions) maxDepth() int {
	if o.MaxDepth > 0 {
		return o.MaxDepth
	}
	return limits.Default().JSONDepth
}

// Load reads and parses the pipeline file at path; relative paths in it
// start from the file's folder. It returns the error of reading the file as
// is, and an ErrorList for a file that does not pass the checks.
func Load(path string, known func(name string) bool) (*Pipeline, error) {
	return LoadWith(path, ParseOptions{Known: known})
}

// LoadWith is Load with options; their Dir is replaced by the file's
// folder. The file is read with the json-bytes limit of opts.
func LoadWith(path string, opts ParseOptions) (*Pipeline, error) {
	data, err := limits.ReadJSON(path, opts.maxBytes())
	if err != nil {
		return nil, err
	}
	abs, err := filepath.Abs(path)
	if err != nil {
		return nil, err
	}
	opts.Dir = filepath.Dir(abs)
	p, err := Parse(data, path, opts)
	if err != nil {
		return nil, err
	}
	p.Path = abs
	return p, nil
}

// Parse checks the pipeline file data, named file in messages, and returns
// it parsed. Globs are expanded and every file is checked to exist. It
// returns an ErrorList holding every problem found, each with its key path
// and line:column.
func Parse(data []byte, file string, opts ParseOptions) (*Pipeline, error) {
	sum := digest.Bytes(data)
	// A UTF-8 byte-order mark, as some editors write, is not JSON: read
	// past it (positions count from after it, as editors show them).
	data = bytes.TrimPrefix(data, []byte("\ufeff"))
	c := &collector{file: file, pos: newPositions(data)}
	if max := opts.maxBytes(); int64(len(data)) > max {
		c.add(-1, "", "%s: over the %s limit of %s (raise it with --limit %s=SIZE)", limits.Size(int64(len(data))), limits.JSONBytes, limits.Size(max), limits.JSONBytes)
		return nil, c.err()
	}
	// gjson's validation and the walk below recurse once per level, and a
	// key path grows with each: refuse deep nesting first, in one pass.
	var de *limits.DepthError
	if err := limits.CheckDepth(data, opts.maxDepth()); errors.As(err, &de) {
		c.add(de.Offset, "", "%v", err)
		return nil, c.err()
	}
	if !gjson.ValidBytes(data) {
		c.syntaxError(data)
		return nil, c.err()
	}
	root := gjson.ParseBytes(data)
	root.Index = len(data) - len(bytes.TrimLeft(data, " \t\r\n")) // Parse leaves it 0 after leading blanks
	p := &parser{c: c, opts: opts, p: &Pipeline{File: file, Dir: opts.Dir, SHA256: sum, pos: c.pos}}
	p.parse(root)
	if err := c.err(); err != nil {
		return nil, err
	}
	return p.p, nil
}

// syntaxError reports where data stops being JSON. gjson gives no position,
// so encoding/json is asked.
func (c *collector) syntaxError(data []byte) {
	var v any
	err := json.Unmarshal(data, &v)
	var se *json.SyntaxError
	switch {
	case len(strings.TrimSpace(string(data))) == 0:
		c.add(-1, "", "file is empty")
	case errors.As(err, &se):
		off := int(se.Offset)
		if off > 0 && off <= len(data) && se.Error() != "unexpected end of JSON input" {
			off-- // Offset is just past the offending byte
		}
		c.add(off, "", "invalid JSON: %s", se.Error())
	case err != nil:
		c.add(-1, "", "invalid JSON: %v", err)
	default:
		c.add(-1, "", "invalid JSON")
	}
}

// parser holds the state of one parse.
type parser struct {
	c    *collector
	opts ParseOptions
	p    *Pipeline
}

var (
	topKeys    = keySet("foilwright", "name", "inputs", "prepare", "stages", "outputs", "compare")
	inputKeys  = keySet("name", "files", "per_file", "station", "format", "columns", "units", "cut", "band", "flat_tol", "compare")
	stageKeys  = keySet("id", "stage", "sha256", "params", "after", "on_error", "timeout_s", "env", "pins", "keep")
	outputKeys = keySet("folder", "documents", "plots", "plot_format", "exports", "export_frame")
	// inputAllowed also admits the prepare keys an input may not set, so
	// that they get a message of their own.
	inputAllowed = func() map[string]bool {
		m := keySet()
		for k := range inputKeys {
			m[k] = true
		}
		for _, k := range prepKeys {
			m[k.name] = true
		}
		return m
	}()
	readingList = func() string {
		var names []string
		for _, k := range prepKeys {
			if k.reading {
				names = append(names, k.name)
			}
		}
		return strings.Join(names, ", ")
	}()
	prepareSet = func() map[string]bool {
		m := map[string]bool{}
		for _, k := range prepKeys {
			m[k.name] = true
		}
		return m
	}()
)

func keySet(keys ...string) map[string]bool {
	m := map[string]bool{}
	for _, k := range keys {
		m[k] = true
	}
	return m
}

// safeName is the form of section names, stage ids and the pipeline name:
// they become folder and file names.
var safeName = nameForm{most: 64}

// nameForm is the form ^[A-Za-z0-9][A-Za-z0-9._-]{0,most−1}$ of a name
// that becomes a file name, checked by hand: as a regular expression the
// bounded repetition compiles into most copies of its class, thousands of
// allocations in the start-up of every command (pipeline's init took
// 2900 allocations and half a millisecond, most of it these).
type nameForm struct{ most int }

// MatchString reports whether s has the form.
func (f nameForm) MatchString(s string) bool {
	if len(s) == 0 || len(s) > f.most {
		return false
	}
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case 'A' <= c && c <= 'Z', 'a' <= c && c <= 'z', '0' <= c && c <= '9':
		case i > 0 && (c == '.' || c == '_' || c == '-'):
		default:
			return false
		}
	}
	return true
}

var hexDigest = regexp.MustCompile(`^[0-9a-fA-F]{64}$`)

func (ps *parser) parse(root gjson.Result) {
	c := ps.c
	vals := map[string]gjson.Result{}
	if !c.wantObject("", root, topKeys, func(k, _ string, v gjson.Result) { vals[k] = v }) {
		return
	}
	if v, ok := vals["foilwright"]; !ok {
		c.add(root.Index, "", `missing key "foilwright" (the file format version, %d)`, FormatVersion)
	} else if n, ok := c.wantInt("foilwright", v, math.MinInt32, math.MaxInt32); ok && n != FormatVersion {
		c.add(v.Index, "foilwright", "file format version %d is not supported (this foilwright reads %d)", n, FormatVersion)
	}
	if v, ok := vals["name"]; !ok {
		c.add(root.Index, "", `missing key "name"`)
	} else if s, ok := c.wantString("name", v, true); ok {
		if !safeName.MatchString(s) {
			c.add(v.Index, "name", "%q is not a usable name (letters, digits, '.', '_', '-'; up to 64, starting with a letter or digit)", s)
		} else {
			ps.p.Name = s
		}
	}
	if v, ok := vals["prepare"]; ok {
		ps.p.Prepare = ps.settings("prepare", v)
	}
	if v, ok := vals["compare"]; ok {
		ps.p.Compare = ps.compareBlock("compare", v)
	}
	if v, ok := vals["inputs"]; !ok {
		c.add(root.Index, "", `missing key "inputs"`)
	} else {
		ps.inputs(v)
	}
	if v, ok := vals["stages"]; ok {
		ps.stages(v)
	}
	ps.outputs(vals["outputs"])
}

// settings reads the "prepare" object.
func (ps *parser) settings(path string, v gjson.Result) prep.Settings {
	var s prep.Settings
	ps.c.wantObject(path, v, prepareSet, func(k, kpath string, val gjson.Result) {
		prepKeys[prepKeyIndex[k]].read(ps.c, kpath, val, &s)
	})
	return s
}

func (ps *parser) inputs(v gjson.Result) {
	c := ps.c
	names := map[string]string{} // section name → path of the input that made it
	n := 0
	c.wantArray("inputs", v, func(i int, ipath string, in gjson.Result) {
		n++
		var spec InputSpec
		vals := map[string]gjson.Result{}
		if !c.wantObject(ipath, in, inputAllowed, func(k, kpath string, val gjson.Result) {
			if !inputKeys[k] {
				c.add(c.keyAt, kpath, "%q cannot be set per input; set it in \"prepare\" (an input may set %s)", k, readingList)
				return
			}
			vals[k] = val
		}) {
			return
		}
		// Reading overrides: the same keys and checks as in "prepare".
		for k, val := range vals {
			if i, ok := prepKeyIndex[k]; ok && prepKeys[i].reading {
				prepKeys[i].read(c, joinKey(ipath, k), val, &spec.Read)
			}
		}
		nameBad := false
		if val, ok := vals["name"]; ok {
			nameBad = true
			if s, ok := c.wantString(ipath+".name", val, true); ok {
				if !safeName.MatchString(s) {
					c.add(val.Index, ipath+".name", "%q is not a usable section name (letters, digits, '.', '_', '-'; up to 64, starting with a letter or digit)", s)
				} else {
					spec.Name, nameBad = s, false
				}
			}
		}
		if val, ok := vals["per_file"]; ok {
			spec.PerFile, _ = c.wantBool(ipath+".per_file", val)
		}
		if val, ok := vals["station"]; ok {
			if x, ok := c.wantNumber(ipath+".station", val, anyFinite); ok {
				spec.Station = &x
			}
		}
		if val, ok := vals["compare"]; ok {
			spec.Compare = ps.compareBlock(ipath+".compare", val)
		}
		ps.checkCompare(in, ipath, mergeCompare(ps.p.Compare, spec.Compare))
		val, ok := vals["files"]
		if !ok {
			c.add(in.Index, ipath, `missing key "files"`)
			return
		}
		ps.files(ipath+".files", val, &spec)
		ps.p.Inputs = append(ps.p.Inputs, spec)
		if len(spec.Paths) == 0 || nameBad {
			return
		}
		for _, name := range sectionNames(spec) {
			if !safeName.MatchString(name) {
				c.add(in.Index, ipath, "section name %q made from the file name is not usable; give the input a \"name\"", name)
				continue
			}
			if strings.EqualFold(name, ManifestName) {
				c.add(in.Index, ipath, "section name %q is the manifest's file name; give the input another \"name\"", name)
				continue
			}
			// Folder names may not differ only in case (case-insensitive file systems).
			if other, dup := names[strings.ToLower(name)]; dup {
				c.add(in.Index, ipath, "section name %q is also made by %s; give each input its own \"name\"", name, other)
				continue
			}
			names[strings.ToLower(name)] = ipath
		}
	})
	if v.IsArray() && n == 0 {
		c.add(v.Index, "inputs", "no inputs")
	}
}

// files expands the paths and globs of one input.
func (ps *parser) files(path string, v gjson.Result, spec *InputSpec) {
	c := ps.c
	seen := map[string]bool{}
	n := 0
	c.wantArray(path, v, func(_ int, ipath string, f gjson.Result) {
		n++
		s, ok := c.wantString(ipath, f, true)
		if !ok {
			return
		}
		spec.Files = append(spec.Files, s)
		full := ps.abs(s)
		var matches []string
		if strings.ContainsAny(s, "*?[") {
			m, err := filepath.Glob(full)
			if err != nil {
				c.add(f.Index, ipath, "bad pattern %q: %v", s, err)
				return
			}
			for _, p := range m {
				if st, err := os.Stat(p); err == nil && st.Mode().IsRegular() {
					matches = append(matches, p)
				}
			}
			if len(matches) == 0 {
				c.add(f.Index, ipath, "no file matches %q", s)
				return
			}
		} else {
			st, err := os.Stat(full)
			switch {
			case errors.Is(err, os.ErrNotExist):
				c.add(f.Index, ipath, "file %q not found", s)
				return
			case err != nil:
				c.add(f.Index, ipath, "file %q: %v", s, err)
				return
			case !st.Mode().IsRegular():
				c.add(f.Index, ipath, "%q is not a regular file", s)
				return
			}
			matches = []string{full}
		}
		sort.Strings(matches)
		for _, m := range matches {
			rel := ps.rel(m)
			if !seen[rel] {
				seen[rel] = true
				spec.Paths = append(spec.Paths, rel)
			}
		}
	})
	if v.IsArray() && n == 0 {
		c.add(v.Index, path, "no files")
	}
	sort.Strings(spec.Paths)
}

// abs resolves a path of the pipeline file.
func (ps *parser) abs(s string) string {
	s = filepath.FromSlash(s)
	if filepath.IsAbs(s) {
		return filepath.Clean(s)
	}
	return filepath.Join(ps.opts.Dir, s)
}

// rel gives the recorded form of a file path: slash-separated and relative
// to the pipeline's folder when it is inside it.
func (ps *parser) rel(p string) string {
	base := ps.opts.Dir
	if base == "" {
		base = "."
	}
	if r, err := filepath.Rel(base, p); err == nil && r != ".." && !strings.HasPrefix(r, ".."+string(filepath.Separator)) {
		return filepath.ToSlash(r)
	}
	if a, err := filepath.Abs(p); err == nil {
		return filepath.ToSlash(a)
	}
	return filepath.ToSlash(p)
}

// sectionNames returns the names of the sections an input makes.
func sectionNames(spec InputSpec) []string {
	stem := func(p string) string {
		b := filepath.Base(filepath.FromSlash(p))
		return strings.TrimSuffix(b, filepath.Ext(b))
	}
	if !spec.PerFile {
		if spec.Name != "" {
			return []string{spec.Name}
		}
		return []string{stem(spec.Paths[0])}
	}
	names := make([]string, len(spec.Paths))
	for i, p := range spec.Paths {
		names[i] = stem(p)
		if spec.Name != "" {
			names[i] = spec.Name + "-" + names[i]
		}
	}
	return names
}

// afterRef is one entry of a stage's "after", and where it is written.
type afterRef struct {
	id   string
	path string
	off  int
}

// stages reads the "stages" array: each stage, then the dependencies
// (known ids, no stage after itself, no cycles) and their order.
func (ps *parser) stages(v gjson.Result) {
	ids := map[string]int{} // id → offset of its first use
	var refs [][]afterRef   // per stage
	idsOK := true
	ps.c.wantArray("stages", v, func(_ int, ipath string, st gjson.Result) {
		s, ar := ps.stage(ipath, st, ids)
		idsOK = idsOK && s.ID != ""
		ps.p.Stages = append(ps.p.Stages, s)
		refs = append(refs, ar)
	})
	if !ps.checkAfter(ids, refs) || !idsOK {
		return
	}
	ps.order(ids, refs)
}

// stage reads one entry of "stages", recording its id in ids, and returns
// it with its "after" references. A stage with errors is returned too, as
// far as it was read, so that later stages are numbered right.
func (ps *parser) stage(ipath string, st gjson.Result, ids map[string]int) (Stage, []afterRef) {
	c := ps.c
	s := Stage{Params: []byte("{}"), OnError: OnErrorStop, Keep: stage.KeepAll, paramsAt: -1}
	var ar []afterRef
	vals := map[string]gjson.Result{}
	if !c.wantObject(ipath, st, stageKeys, func(k, _ string, val gjson.Result) { vals[k] = val }) {
		return s, ar
	}
	if val, ok := vals["id"]; !ok {
		c.add(st.Index, ipath, `missing key "id"`)
	} else if id, ok := c.wantString(ipath+".id", val, true); ok {
		s.ID = ps.stageID(ipath, val, id, ids)
	}
	if val, ok := vals["stage"]; !ok {
		c.add(st.Index, ipath, `missing key "stage" (a built-in stage name or an executable path)`)
	} else if name, ok := c.wantString(ipath+".stage", val, true); ok {
		s.Stage = name
		ps.stageTarget(ipath, val, vals["sha256"], &s)
	}
	if val, ok := vals["params"]; ok {
		if c.wantType(ipath+".params", val, "object", val.IsObject()) {
			c.checkDuplicates(ipath+".params", val)
			s.Params = []byte(val.Raw)
			s.paramsAt = val.Index
		}
	}
	if val, ok := vals["env"]; ok {
		c.wantArray(ipath+".env", val, func(_ int, epath string, e gjson.Result) {
			if n, ok := c.wantString(epath, e, true); ok {
				if !envName.MatchString(n) {
					c.add(e.Index, epath, "%q is not a variable name (letters, digits and '_', not starting with a digit)", n)
					return
				}
				s.Env = append(s.Env, n)
			}
		})
	}
	if val, ok := vals["pins"]; ok {
		c.wantObject(ipath+".pins", val, nil, func(file, ppath string, d gjson.Result) {
			ps.pin(ppath, file, d, &s)
		})
	}
	if val, ok := vals["after"]; ok {
		seen := map[string]bool{}
		c.wantArray(ipath+".after", val, func(_ int, apath string, a gjson.Result) {
			id, ok := c.wantString(apath, a, true)
			if !ok {
				return
			}
			if seen[id] {
				c.add(a.Index, apath, "stage %q listed twice", id)
				return
			}
			seen[id] = true
			s.After = append(s.After, id)
			ar = append(ar, afterRef{id, apath, a.Index})
		})
	}
	if val, ok := vals["on_error"]; ok {
		if e, ok := c.wantEnum(ipath+".on_error", val, OnErrorStop, OnErrorContinue); ok {
			s.OnError = e
		}
	}
	if val, ok := vals["timeout_s"]; ok {
		if x, ok := c.wantNumber(ipath+".timeout_s", val, numRange{lo: 0, hi: MaxTimeoutS, loOpen: true}); ok {
			s.TimeoutS = x
		}
	}
	if val, ok := vals["keep"]; ok {
		if k, ok := c.wantEnum(ipath+".keep", val, stage.Keeps()...); ok {
			s.Keep = k
		}
	}
	ps.builtinParams(ipath, &s)
	return s, ar
}

// envName is the form of a variable name a stage may be allowed to see.
var envName = regexp.MustCompile(`^[A-Za-z_][A-Za-z0-9_]*$`)

// pin reads one entry of a stage's "pins": a file and the sha256 it must
// have, or a folder and its tree digest (digest.Tree), checked now (and
// again whenever the file is parsed, as by verify).
func (ps *parser) pin(ppath, file string, d gjson.Result, s *Stage) {
	c := ps.c
	sum, ok := c.wantString(ppath, d, true)
	if !ok {
		return
	}
	if !hexDigest.MatchString(sum) {
		c.add(d.Index, ppath, "want 64 hexadecimal digits, got %q", sum)
		return
	}
	sum = strings.ToLower(sum)
	got, err := digest.Path(ps.abs(file))
	switch {
	case err != nil:
		c.add(c.keyAt, ppath, "pinned file %q: %v", file, err)
	case got != sum:
		kind := "file"
		if fi, err := os.Stat(ps.abs(file)); err == nil && fi.IsDir() {
			kind = "folder"
		}
		c.add(d.Index, ppath, "%s %q has sha256 %s, the pipeline pins %s", kind, file, got, sum)
	default:
		s.Pins = append(s.Pins, Pin{Path: file, SHA256: sum})
	}
}

// builtinParams checks the parameters of a built-in stage against its
// description, when the options give descriptions: the file is checked
// before anything runs.
func (ps *parser) builtinParams(ipath string, s *Stage) {
	if ps.opts.Describe == nil || s.Exec != "" || s.Stage == "" {
		return
	}
	info, ok := ps.opts.Describe(s.Stage)
	if !ok {
		return
	}
	if _, err := stage.Validate(info.Params, s.Params); err != nil {
		off, path := paramPosition(s.Params, s.paramsAt, ipath+".params", err)
		ps.c.add(off, path, "%s", paramMessage(err))
	}
}

// paramPosition finds where the parameter a stage.Validate error names is
// written: the offset of its key in the file (params begins at paramsAt,
// -1 when the stage has no params) and its key path.
func paramPosition(params []byte, paramsAt int, path string, err error) (int, string) {
	var pe *stage.ParamError
	if paramsAt < 0 || !errors.As(err, &pe) {
		return paramsAt, path
	}
	off := paramsAt
	gjson.ParseBytes(params).ForEach(func(k, v gjson.Result) bool {
		if k.Str == pe.Name {
			off = paramsAt + v.Index
			return false
		}
		return true
	})
	return off, joinKey(path, pe.Name)
}

// paramMessage is the reason of a stage.Validate error, without the name
// the key path already gives.
func paramMessage(err error) string {
	var pe *stage.ParamError
	if errors.As(err, &pe) {
		return pe.Reason
	}
	return err.Error()
}

// ParamsError returns the error of stage parameters refused by a stage
// that describes itself (an external stage, known only when it runs): the
// parameter's key path and position in the file, as the checks of Parse
// give them.
func (p *Pipeline) ParamsError(st Stage, err error) error {
	path := fmt.Sprintf("stages[%d].params", st.index)
	off, path := paramPosition(st.Params, st.paramsAt, path, err)
	e := &Error{File: p.File, Path: path, Msg: paramMessage(err), offset: off}
	if off >= 0 && p.pos != nil {
		e.Line, e.Col = p.pos.at(off)
	}
	return ErrorList{e}
}

// stageID checks a stage id against those seen (ids) and records it; it
// returns "" for an id that cannot be used.
func (ps *parser) stageID(ipath string, val gjson.Result, id string, ids map[string]int) string {
	c := ps.c
	first, dup := ids[id]
	caseOf := ""
	for other, off := range ids {
		if !dup && strings.EqualFold(other, id) {
			// results/<id>.json may not differ only in case.
			first, dup, caseOf = off, true, other
		}
	}
	switch {
	case caseOf != "":
		l, col := c.pos.at(first)
		c.add(val.Index, ipath+".id", "stage id %q differs only in case from %q (at %d:%d)", id, caseOf, l, col)
	case !safeName.MatchString(id):
		c.add(val.Index, ipath+".id", "%q is not a usable stage id (letters, digits, '.', '_', '-'; up to 64, starting with a letter or digit)", id)
	case dup:
		l, col := c.pos.at(first)
		c.add(val.Index, ipath+".id", "duplicate stage id %q (first at %d:%d)", id, l, col)
	default:
		ids[id] = val.Index
		return id
	}
	return ""
}

// checkAfter reports "after" references to unknown ids and to the stage
// itself, and returns whether there were none.
func (ps *parser) checkAfter(ids map[string]int, refs [][]afterRef) bool {
	c := ps.c
	valid := true
	for i, ar := range refs {
		for _, r := range ar {
			switch _, ok := ids[r.id]; {
			case r.id == ps.p.Stages[i].ID:
				c.add(r.off, r.path, "stage %q cannot run after itself", r.id)
				valid = false
			case !ok:
				c.add(r.off, r.path, "unknown stage id %q%s", r.id, suggest(r.id, keysOf(ids)))
				valid = false
			}
		}
	}
	return valid
}

// order puts the stages in dependency order, or reports a cycle at the
// "after" entry that closes it.
func (ps *parser) order(ids map[string]int, refs [][]afterRef) {
	c := ps.c
	order, cycle := orderStages(ps.p.Stages)
	if cycle != nil {
		first := cycle[0]
		names := make([]string, len(cycle)+1)
		for k, i := range cycle {
			names[k] = fmt.Sprintf("%q", ps.p.Stages[i].ID)
		}
		names[len(cycle)] = names[0]
		off := ids[ps.p.Stages[first].ID]
		for _, r := range refs[first] {
			if r.id == ps.p.Stages[cycle[1%len(cycle)]].ID {
				off = r.off
			}
		}
		c.add(off, fmt.Sprintf("stages[%d].after", first), "dependency cycle: %s", strings.Join(names, " after "))
		return
	}
	ps.p.order = order
}

func keysOf(m map[string]int) map[string]bool {
	s := map[string]bool{}
	for k := range m {
		s[k] = true
	}
	return s
}

// stageTarget resolves s.Stage to a built-in name or an executable and
// checks its pin.
func (ps *parser) stageTarget(ipath string, val, pin gjson.Result, s *Stage) {
	c := ps.c
	if pin.Exists() {
		if d, ok := c.wantString(ipath+".sha256", pin, true); ok {
			if !hexDigest.MatchString(d) {
				c.add(pin.Index, ipath+".sha256", "want 64 hexadecimal digits, got %q", d)
			} else {
				s.SHA256 = strings.ToLower(d)
			}
		}
	}
	if !strings.ContainsAny(s.Stage, `/\`) {
		if ps.opts.Known == nil || !ps.opts.Known(s.Stage) {
			c.add(val.Index, ipath+".stage", "unknown stage %q (not a built-in stage; write a path such as \"./%s\" for an executable)", s.Stage, s.Stage)
		}
		return
	}
	full := ps.abs(s.Stage)
	st, err := os.Stat(full)
	switch {
	case errors.Is(err, os.ErrNotExist):
		c.add(val.Index, ipath+".stage", "stage executable %q not found", s.Stage)
		return
	case err != nil:
		c.add(val.Index, ipath+".stage", "stage executable %q: %v", s.Stage, err)
		return
	case !st.Mode().IsRegular():
		c.add(val.Index, ipath+".stage", "stage executable %q is not a regular file", s.Stage)
		return
	case runtime.GOOS != "windows" && st.Mode().Perm()&0o111 == 0:
		c.add(val.Index, ipath+".stage", "stage %q is not executable", s.Stage)
		return
	}
	s.Exec = full
	if s.SHA256 != "" {
		got, err := digest.File(full)
		if err != nil {
			c.add(val.Index, ipath+".stage", "stage executable %q: %v", s.Stage, err)
		} else if got != s.SHA256 {
			c.add(pin.Index, ipath+".sha256", "stage executable %q has sha256 %s, the pipeline pins %s", s.Stage, got, s.SHA256)
		}
	}
}

func (ps *parser) outputs(v gjson.Result) {
	c := ps.c
	out := Outputs{Documents: Documents(), PlotFormat: "svg"}
	defer func() {
		if out.Folder == "" && ps.p.Name != "" {
			out.Folder = "runs/" + ps.p.Name
		}
		ps.p.Outputs = out
	}()
	if !v.Exists() {
		return
	}
	vals := map[string]gjson.Result{}
	if !c.wantObject("outputs", v, outputKeys, func(k, _ string, val gjson.Result) { vals[k] = val }) {
		return
	}
	if val, ok := vals["folder"]; ok {
		if s, ok := c.wantString("outputs.folder", val, true); ok {
			out.Folder = s
			// A run folder is made or replaced as a whole: it cannot be a
			// file, nor a symbolic link (replacing it would replace the
			// link, not the folder behind it).
			switch fi, err := os.Lstat(ps.abs(s)); {
			case err != nil:
			case fi.Mode()&os.ModeSymlink != 0:
				c.add(val.Index, "outputs.folder", "%q is a symbolic link; name the folder it points to", s)
			case !fi.IsDir():
				c.add(val.Index, "outputs.folder", "%q is a file, not a folder", s)
			}
		}
	}
	if val, ok := vals["documents"]; ok {
		out.Documents = nil
		seen := map[string]bool{}
		c.wantArray("outputs.documents", val, func(_ int, ipath string, d gjson.Result) {
			if e, ok := c.wantEnum(ipath, d, Documents()...); ok {
				if seen[e] {
					c.add(d.Index, ipath, "%q listed twice", e)
					return
				}
				seen[e] = true
				out.Documents = append(out.Documents, e)
			}
		})
	}
	if val, ok := vals["plots"]; ok {
		seen := map[string]bool{}
		c.wantArray("outputs.plots", val, func(_ int, ipath string, d gjson.Result) {
			if e, ok := c.wantEnum(ipath, d, PlotPrep, PlotStations, PlotCompare); ok {
				if seen[e] {
					c.add(d.Index, ipath, "%q listed twice", e)
					return
				}
				seen[e] = true
				out.Plots = append(out.Plots, e)
			}
		})
	}
	if val, ok := vals["plot_format"]; ok {
		if e, ok := c.wantEnum("outputs.plot_format", val, "svg", "png"); ok {
			out.PlotFormat = e
		}
	}
	if val, ok := vals["exports"]; ok {
		seen := map[string]bool{}
		c.wantArray("outputs.exports", val, func(_ int, ipath string, d gjson.Result) {
			if e, ok := c.wantEnum(ipath, d, ExportKinds()...); ok {
				if seen[e] {
					c.add(d.Index, ipath, "%q listed twice", e)
					return
				}
				seen[e] = true
				out.Exports = append(out.Exports, e)
			}
		})
	}
	if val, ok := vals["export_frame"]; ok {
		if e, ok := c.wantEnum("outputs.export_frame", val, export.Frames()...); ok {
			out.ExportFrame = e
		}
	}
}
