package pointfile

import (
	"fmt"
	"math"
	"runtime"
	"strconv"
	"strings"

	"github.com/foilwright/foilwright/geometry"
)

// Delimited text: one point per line, fields separated by whitespace, commas,
// semicolons or tabs. With semicolons or tabs a decimal comma is accepted
// ("12,5;3,25"), as spreadsheets in many locales write it (common practice).
// Lines starting with #, // or ; are comments; text lines (a title, a column
// header) are skipped. Every skipped line becomes a Note with its reason.

// detectSeparator returns the field separator of s (' ' for runs of blanks,
// ',', ';' or '\t') and whether a decimal comma is allowed, judged from the
// first lines that start like a number; when no line does (every line
// starts with a label, "PNT1,12.5,3.25,0" as probe programs write), from
// the first lines that hold a digit and are not comments. Characters
// inside double quotes (a quoted file name) do not count.
func detectSeparator(s string) (sep byte, decComma bool) {
	if sep, decComma, seen := separatorOf(s, false); seen > 0 {
		return sep, decComma
	}
	sep, decComma, _ = separatorOf(s, true)
	return sep, decComma
}

// separatorOf is detectSeparator over the first 100 lines that start like a
// number, or (labelled) that hold a digit and are not comments; seen is
// the number of such lines.
func separatorOf(s string, labelled bool) (sep byte, decComma bool, seen int) {
	var semi, tab, comma, commaSpaced, commaInNumber bool
	lines := lineScanner{s: s}
	for seen < 100 {
		line, _, ok := lines.next()
		if !ok {
			break
		}
		t := strings.TrimSpace(line)
		if labelled {
			if t == "" || isComment(t) || strings.IndexAny(t, "0123456789") < 0 {
				continue
			}
		} else if u := strings.TrimLeft(t, "\""); u == "" || !numberStart(u[0]) {
			continue
		}
		seen++
		quoted := false
		for i := 0; i < len(t); i++ {
			if t[i] == '"' {
				quoted = !quoted
			}
			if quoted {
				continue
			}
			switch t[i] {
			case ';':
				semi = true
			case '\t':
				tab = true
			case ',':
				comma = true
				if i > 0 && (t[i-1] == ' ' || t[i-1] == '\t') || i+1 < len(t) && (t[i+1] == ' ' || t[i+1] == '\t') {
					commaSpaced = true
				}
				if i > 0 && i+1 < len(t) && isDigit(t[i-1]) && isDigit(t[i+1]) {
					commaInNumber = true
				}
			}
		}
	}
	switch {
	case semi:
		return ';', true, seen
	case tab && comma && commaInNumber && !commaSpaced:
		return '\t', true, seen
	case comma:
		return ',', false, seen
	case tab:
		return '\t', true, seen
	}
	return ' ', false, seen
}

func isDigit(c byte) bool { return c >= '0' && c <= '9' }

// numberStart reports whether a field starting with c may be a number.
func numberStart(c byte) bool {
	return isDigit(c) || c == '-' || c == '+' || c == '.'
}

// splitFields splits line into fields, appending to fields[:0]. Blank and
// tab separators split at runs of blanks; ',' and ';' split at each
// separator and trim the fields.
func splitFields(line string, sep byte, fields []string) []string {
	fields = fields[:0]
	if sep == ' ' || sep == '\t' {
		i, n := 0, len(line)
		for i < n {
			for i < n && (line[i] == ' ' || line[i] == '\t') {
				i++
			}
			if i >= n {
				break
			}
			j := i
			for j < n && line[j] != ' ' && line[j] != '\t' {
				j++
			}
			fields = append(fields, line[i:j])
			i = j
		}
		return fields
	}
	for {
		k := strings.IndexByte(line, sep)
		if k < 0 {
			return append(fields, strings.TrimSpace(line))
		}
		fields = append(fields, strings.TrimSpace(line[:k]))
		line = line[k+1:]
	}
}

// parseNumber parses field f as a number. ok reports that f is written as
// a number, which includes NaN, Inf and values too large for a float64
// (returned as ±Inf); the caller rejects those.
func parseNumber(f string, decComma bool) (v float64, ok bool) {
	if n := len(f); n >= 2 && f[0] == '"' && f[n-1] == '"' {
		f = f[1 : n-1]
	}
	if f == "" {
		return 0, false
	}
	switch c := f[0]; {
	case numberStart(c), c == 'i', c == 'I', c == 'n', c == 'N':
	default:
		return 0, false
	}
	if decComma && strings.IndexByte(f, ',') >= 0 {
		if len(f) > 64 {
			return 0, false
		}
		var buf [64]byte
		n := copy(buf[:], f)
		for i := range n {
			if buf[i] == ',' {
				buf[i] = '.'
			}
		}
		f = string(buf[:n])
	}
	v, err := strconv.ParseFloat(f, 64)
	if err != nil {
		if ne, isNum := err.(*strconv.NumError); isNum && ne.Err == strconv.ErrRange {
			return v, true
		}
		return 0, false
	}
	return v, true
}

// isComment reports whether the trimmed line t is a comment.
func isComment(t string) bool {
	return t[0] == '#' || t[0] == ';' || strings.HasPrefix(t, "//")
}

// commentUnit returns the unit a comment states, as in "# units: mm",
// "// unit = in" or "# scanner export, units: mm" (the word unit or units
// anywhere in the comment, followed by ':' or '='), or "" when it states
// none.
func commentUnit(t string) string {
	t = strings.TrimLeft(t, "#/; \t")
	low := strings.ToLower(t)
	for from := 0; ; {
		i := strings.Index(low[from:], "unit")
		if i < 0 {
			return ""
		}
		i += from
		from = i + 4
		if i > 0 && isWordByte(low[i-1]) {
			continue // "subunit", "profile_unit"
		}
		rest := t[i+4:]
		if len(rest) > 0 && (rest[0] == 's' || rest[0] == 'S') {
			rest = rest[1:]
		}
		rest = strings.TrimLeft(rest, " \t")
		if rest == "" || (rest[0] != ':' && rest[0] != '=') {
			continue
		}
		f := strings.Fields(rest[1:])
		if len(f) == 0 {
			return ""
		}
		return strings.Trim(f[0], ".,;")
	}
}

// isWordByte reports whether b can be part of a word.
func isWordByte(b byte) bool {
	return b == '_' || b >= 'a' && b <= 'z' || b >= 'A' && b <= 'Z' || b >= '0' && b <= '9'
}

// headerField splits a header field such as "X [mm]" or "y (in)" into
// its lower-case name and unit ("" when there is none).
func headerField(f string) (name, unit string) {
	f = strings.TrimSpace(strings.Trim(strings.TrimSpace(f), "\"'"))
	for _, br := range [...]string{"[]", "()"} {
		if n := len(f); n > 0 && f[n-1] == br[1] {
			if i := strings.LastIndexByte(f, br[0]); i >= 0 {
				return strings.ToLower(strings.TrimSpace(f[:i])), strings.TrimSpace(f[i+1 : n-1])
			}
		}
	}
	return strings.ToLower(f), ""
}

// joinUnits glues a blank-separated unit decoration ("x [mm]") back to
// its name, so that a header splits into one field per column.
func joinUnits(fields []string) []string {
	out := make([]string, 0, len(fields))
	for _, f := range fields {
		if len(out) > 0 && f != "" && (f[0] == '[' || f[0] == '(') {
			out[len(out)-1] += " " + f
			continue
		}
		out = append(out, f)
	}
	return out
}

// parseColumns parses the Columns option: 0-based indices, or names.
func parseColumns(s string) (idx []int, names []string, err error) {
	if strings.TrimSpace(s) == "" {
		return nil, nil, nil
	}
	parts := strings.Split(s, ",")
	if len(parts) < 2 || len(parts) > 3 {
		return nil, nil, fmt.Errorf("geometry: columns %q: want 2 or 3 columns, got %d: %w", s, len(parts), ErrColumnCount)
	}
	for _, p := range parts {
		p = strings.TrimSpace(p)
		if p == "" {
			return nil, nil, fmt.Errorf("geometry: columns %q: empty column: %w", s, ErrColumnRange)
		}
		if k, err := strconv.Atoi(p); err == nil {
			if k < 1 {
				return nil, nil, fmt.Errorf("geometry: columns %q: column %d: columns count from 1: %w", s, k, ErrColumnRange)
			}
			idx = append(idx, k-1)
			continue
		}
		name, _ := headerField(p)
		names = append(names, name)
	}
	if idx != nil && names != nil {
		return nil, nil, fmt.Errorf("geometry: columns %q: mix of numbers and names", s)
	}
	seen := map[string]bool{}
	for _, p := range parts {
		k := strings.ToLower(strings.TrimSpace(p))
		if seen[k] {
			return nil, nil, fmt.Errorf("geometry: columns %q: column %q given twice", s, p)
		}
		seen[k] = true
	}
	return idx, names, nil
}

// delimitedReader holds the state of reading one delimited file.
type delimitedReader struct {
	name     string
	sep      byte
	decComma bool
	cols     []int    // 0-based columns of x, y[, z]; nil until known
	names    []string // column names asked for, until resolved
	explicit bool     // the caller chose the columns
	named    bool     // ... by names, found in a header line, or the header named x, y (z)
	guessed  bool     // no header named the columns and the lines hold more numbers than were read
	started  bool     // a data line has been read
	counted  bool     // a point-count line has been seen
	run      int      // numbers in a row (up to 4) from the first coordinate on the first data line

	header     []string // the last text line before the data, split
	headerLine int
	headerNote int // index of its note, or -1
	title      string
	titleLine  int
	unit       statedUnit
	notes      geometry.Notes
}

// readDelimited reads delimited text s. columns is Options.Columns.
func readDelimited(s, name, columns string) (*geometry.Cloud, statedUnit, error) {
	idx, names, err := parseColumns(columns)
	if err != nil {
		return nil, statedUnit{}, err
	}
	d := &delimitedReader{name: name, cols: idx, names: names, explicit: idx != nil || names != nil, headerNote: -1}
	d.sep, d.decComma = detectSeparator(s)
	n := strings.Count(s, "\n") + 1
	c := &geometry.Cloud{Format: FormatDelimited, Points: make([]geometry.Vec3, 0, n), Origins: make([]geometry.Origin, 0, n)}
	var fields []string
	// line reads one line: a point, a comment, a text line or nothing.
	line := func(line string, no int) error {
		t := strings.TrimSpace(line)
		if t == "" {
			return nil
		}
		if isComment(t) {
			if u := commentUnit(t); u != "" {
				if err := d.unit.set(name, no, u); err != nil {
					return err
				}
			}
			d.notes.Add(name, no, "comment", t)
			return nil
		}
		fields = splitFields(t, d.sep, fields)
		if d.cols == nil {
			isData, err := d.resolve(fields, no, t)
			if err != nil || !isData {
				return err
			}
		}
		p, isData, err := d.point(fields, no)
		if err != nil {
			return err
		}
		if !isData {
			d.text(fields, no, t)
			return nil
		}
		if !d.started {
			if err := d.start(); err != nil {
				return err
			}
		}
		c.Points = append(c.Points, p)
		c.Origins = append(c.Origins, geometry.Origin{File: name, Line: no})
		return nil
	}
	lines := lineScanner{s: s}
	var parts []*dataPart
	for {
		l, no, ok := lines.next()
		if !ok {
			break
		}
		if err := line(l, no); err != nil {
			return nil, d.unit, err
		}
		if d.started && parts == nil {
			// The columns are known: the rest of a long file is read in
			// parts at once, on every CPU (dataParts).
			parts = d.dataParts(c, s, &lines)
			defer waitParts(parts)
		}
	}
	waitParts(parts)
	serial := false
	for _, pt := range parts[min(1, len(parts)):] {
		if pt.ok && !serial {
			// Within the capacity: the points move down in place.
			c.Points = append(c.Points, c.Points[pt.at:pt.at+pt.n]...)
			c.Origins = append(c.Origins, c.Origins[pt.at:pt.at+pt.n]...)
			continue
		}
		// A line other than a point (a comment, a text line, an error):
		// this part and every later one are read line by line, as the
		// whole file would be.
		serial = true
		sc := lineScanner{s: s[:pt.end], pos: pt.start, no: pt.no}
		for {
			l, no, ok := sc.next()
			if !ok {
				break
			}
			if err := line(l, no); err != nil {
				return nil, d.unit, err
			}
		}
	}
	if !d.started {
		return nil, d.unit, &geometry.ParseError{File: name, Err: ErrNoNumbers}
	}
	c.Dim = len(d.cols)
	c.Name = d.title
	c.Notes = d.notes.List(name)
	c.Columns, c.ColumnsGuessed = d.describeColumns(), d.guessed
	if !d.explicit && !d.named && len(d.cols) == 3 && d.run >= 3 && counts(c.Points) {
		// The first column numbers the points (1, 2, 3, … as a probe
		// program or a spreadsheet writes them, common practice): the
		// coordinates are the numbers after it.
		from := d.cols[0] + 1
		cols := make([]string, min(d.run-1, 3))
		for j := range cols {
			cols[j] = strconv.Itoa(from + j + 1)
		}
		c2, unit, err := readDelimited(s, name, strings.Join(cols, ","))
		if err != nil {
			return nil, unit, err
		}
		c2.Columns = fmt.Sprintf("%s (column %d numbers the points 1, 2, 3, …; the numbers after it)", strings.Join(cols, ", "), from)
		return c2, unit, nil
	}
	return c, d.unit, nil
}

// minCounted is the least number of points whose first column, running
// 1, 2, 3, …, is taken for point numbers rather than a coordinate.
const minCounted = 10

// counts reports whether the first coordinate of ps runs on by exactly 1
// from point to point, from any start (point numbers, not a coordinate:
// a section's outline turns back along every axis).
func counts(ps []geometry.Vec3) bool {
	if len(ps) < minCounted {
		return false
	}
	for i, p := range ps {
		if p.X != ps[0].X+float64(i) {
			return false
		}
	}
	return true
}

// describeColumns says which columns were read as the coordinates and
// why, for Cloud.Columns.
func (d *delimitedReader) describeColumns() string {
	nums := make([]string, len(d.cols))
	for i, c := range d.cols {
		nums[i] = strconv.Itoa(c + 1)
	}
	list := strings.Join(nums, ", ")
	axes := "x, y"
	if len(d.cols) == 3 {
		axes = "x, y, z"
	}
	switch {
	case d.explicit:
		return fmt.Sprintf("%s as asked", list)
	case d.named:
		return fmt.Sprintf("%s (named %s by the header)", list, axes)
	case d.guessed:
		return fmt.Sprintf("%s (the first numbers of each line; no header names %s)", list, axes)
	}
	return fmt.Sprintf("%s (the numbers of each line)", list)
}

// headerAxes takes the coordinate columns from the header line before the
// first data line (fields) when it names x and y (and z), as "idx,x,y,z",
// "point;X [mm];Y [mm]" or "x_mm y_mm" do, and every named column holds a
// number on that line. It reports whether it did, and the error of a unit
// decoration that contradicts another.
func (d *delimitedReader) headerAxes(fields []string) (bool, error) {
	if d.header == nil {
		return false, nil
	}
	at := [3]int{-1, -1, -1}
	for i, f := range d.header {
		name, _ := headerField(f)
		a := axisOf(name)
		if a < 0 {
			continue
		}
		if at[a] >= 0 {
			return false, nil // two columns claim one axis: leave it to --columns
		}
		at[a] = i
	}
	if at[0] < 0 || at[1] < 0 {
		return false, nil
	}
	cols := []int{at[0], at[1]}
	if at[2] >= 0 {
		cols = append(cols, at[2])
	}
	for _, c := range cols {
		if c >= len(fields) {
			return false, nil
		}
		if _, num := parseNumber(fields[c], d.decComma); !num {
			return false, nil
		}
	}
	d.cols, d.named = cols, true
	if d.headerNote >= 0 {
		d.notes.Kept()[d.headerNote].Reason = "column header"
	}
	if d.titleLine == d.headerLine {
		d.title = ""
	}
	return true, d.headerUnits()
}

// axisOf returns 0, 1 or 2 when a header name (lower case, unit
// decoration removed) names the x, y or z coordinate, else −1. The name
// may carry a unit ("x_mm", "x mm") or a word such as "coord" ("x-coord",
// "coord x", "pos_y") around the letter.
func axisOf(name string) int {
	var letter string
	for _, tok := range strings.FieldsFunc(name, func(r rune) bool {
		return !(r >= 'a' && r <= 'z' || r >= '0' && r <= '9' || r == 'µ')
	}) {
		switch tok {
		case "mm", "cm", "m", "in", "inch", "inches", "um", "µm", "coord", "coords", "coordinate", "pos", "position", "value", "axis":
			continue
		}
		if letter != "" {
			return -1
		}
		letter = tok
	}
	switch letter {
	case "x":
		return 0
	case "y":
		return 1
	case "z":
		return 2
	}
	return -1
}

// resolve is called for each line while the columns are unknown. It finds
// the columns from a header naming them (names asked for) or from the first
// line of 2 or 3 leading numbers (no columns asked for), and reports whether
// the line is a data line.
func (d *delimitedReader) resolve(fields []string, no int, t string) (bool, error) {
	if d.names != nil {
		hdr := joinUnits(fields)
		cols := make([]int, 0, len(d.names))
		for _, want := range d.names {
			for i, f := range hdr {
				if name, _ := headerField(f); name == want {
					cols = append(cols, i)
					break
				}
			}
		}
		if len(cols) == len(d.names) {
			d.names = nil
			d.named = true
			d.cols = cols
			d.header, d.headerLine = hdr, no
			d.notes.Add(d.name, no, "column header", t)
			if err := d.headerUnits(); err != nil {
				return false, err
			}
			return false, nil
		}
		if _, num := parseNumber(fields[0], d.decComma); num {
			return false, &geometry.ParseError{File: d.name, Line: no, Err: fmt.Errorf("%w: no header line names column %q", ErrColumnRange, d.names[len(cols)])}
		}
		d.text(fields, no, t)
		return false, nil
	}
	first := 0
	if len(fields) >= 3 && len(fields) <= 4 {
		// A label before the numbers ("P1 12.5 3.25 0"), as probe
		// programs write it: the numbers after it are the coordinates.
		if _, num := parseNumber(fields[0], d.decComma); !num && d.allNumbers(fields[1:]) {
			first = 1
		}
	}
	k := 0
	for first+k < len(fields) && k < 4 { // a fourth tells x, y, z after point numbers
		if _, num := parseNumber(fields[first+k], d.decComma); !num {
			break
		}
		k++
	}
	d.run = k
	k = min(k, 3)
	switch {
	case k >= 2:
		if ok, err := d.headerAxes(fields); ok || err != nil {
			return ok, err
		}
		d.cols = []int{first, first + 1, first + 2}[:k]
		numbers := 0
		for _, f := range fields {
			if _, num := parseNumber(f, d.decComma); num {
				numbers++
			}
		}
		d.guessed = numbers > k
		return true, nil
	case k == 1 && len(fields) == 1:
		if v, _ := parseNumber(fields[0], d.decComma); !d.counted && v == math.Trunc(v) && v >= 0 && v < 1e15 {
			d.counted = true
			d.notes.Add(d.name, no, "point count line", t)
			return false, nil
		}
		return false, &geometry.ParseError{File: d.name, Line: no, Err: fmt.Errorf("%w: 1 coordinate, want 2 or 3", ErrColumnCount)}
	}
	d.text(fields, no, t)
	return false, nil
}

// text records a line that holds no coordinates.
func (d *delimitedReader) text(fields []string, no int, t string) {
	if d.started {
		d.notes.Add(d.name, no, "text line among the data", t)
		return
	}
	if d.title == "" {
		d.title, d.titleLine = geometry.Excerpt(t), no
	}
	d.header, d.headerLine = joinUnits(fields), no
	d.headerNote = len(d.notes.Kept())
	if d.headerNote >= geometry.MaxNotes {
		d.headerNote = -1
	}
	d.notes.Add(d.name, no, "text line before the data", t)
}

// start is called at the first data line: it takes the last text line
// before it as the column header when it has a field for every chosen
// column and no number, and reads units from it.
func (d *delimitedReader) start() error {
	d.started = true
	if d.named {
		return nil // the header was found and read by resolve
	}
	if d.header == nil || len(d.header) <= maxColumn(d.cols) {
		d.header = nil
		return nil
	}
	for _, f := range d.header {
		if _, num := parseNumber(f, d.decComma); num {
			d.header = nil
			return nil
		}
	}
	if d.headerNote >= 0 {
		d.notes.Kept()[d.headerNote].Reason = "column header"
	}
	if d.titleLine == d.headerLine {
		d.title = ""
	}
	return d.headerUnits()
}

// headerUnits reads the unit decorations of the chosen header fields.
func (d *delimitedReader) headerUnits() error {
	for _, col := range d.cols {
		if col >= len(d.header) {
			continue
		}
		if _, u := headerField(d.header[col]); u != "" {
			if err := d.unit.set(d.name, d.headerLine, u); err != nil {
				return err
			}
		}
	}
	return nil
}

// point parses the chosen columns of a line. isData is false for a line
// that holds none of them as numbers (a text line); a line holding some of
// them but not all is an error once the data has started, or when every
// field of the line is a number (the column does not exist).
func (d *delimitedReader) point(fields []string, no int) (p geometry.Vec3, isData bool, err error) {
	var v [3]float64
	got := 0
	bad, missing := -1, -1
	for j, col := range d.cols {
		if col >= len(fields) {
			if missing < 0 {
				missing = j
			}
			continue
		}
		x, num := parseNumber(fields[col], d.decComma)
		if !num {
			if bad < 0 {
				bad = j
			}
			continue
		}
		v[j] = x
		got++
	}
	if got == 0 {
		return p, false, nil
	}
	if got < len(d.cols) {
		if !d.started && !d.allNumbers(fields) {
			return p, false, nil
		}
		switch {
		case bad >= 0:
			return p, false, &geometry.ParseError{File: d.name, Line: no, Err: fmt.Errorf("%w: column %d is %q", ErrNotNumeric, d.cols[bad]+1, geometry.Excerpt(fields[d.cols[bad]]))}
		case d.explicit:
			return p, false, &geometry.ParseError{File: d.name, Line: no, Err: fmt.Errorf("%w: column %d asked for, line has %d field(s)", ErrColumnRange, d.cols[missing]+1, len(fields))}
		default:
			return p, false, &geometry.ParseError{File: d.name, Line: no, Err: fmt.Errorf("%w: %d coordinate(s), want %d", ErrColumnCount, got, len(d.cols))}
		}
	}
	for j := range d.cols {
		if math.IsNaN(v[j]) || math.IsInf(v[j], 0) {
			return p, false, &geometry.ParseError{File: d.name, Line: no, Err: fmt.Errorf("%w: column %d is %q", geometry.ErrNonFinite, d.cols[j]+1, geometry.Excerpt(fields[d.cols[j]]))}
		}
	}
	return geometry.Vec3{X: v[0], Y: v[1], Z: v[2]}, true, nil
}

// allNumbers reports whether every field is a number.
func (d *delimitedReader) allNumbers(fields []string) bool {
	for _, f := range fields {
		if _, num := parseNumber(f, d.decComma); !num {
			return false
		}
	}
	return true
}

// maxColumn returns the largest of the non-empty xs.
func maxColumn(xs []int) int {
	m := xs[0]
	for _, x := range xs[1:] {
		m = max(m, x)
	}
	return m
}

// A dataPart is a stretch of a delimited file's data, whole lines from
// byte start to end, whose first line is line no+1, read on a goroutine of
// its own into the room the file's point slices keep for it: its lines
// start at index at (no point before it takes more than a line) and n
// points were read. ok is false when a line of it is anything other than a
// point or blank (a comment, a text line, an error), which the serial
// reading then meets and handles in the file's order.
type dataPart struct {
	start, end, no int
	at, n          int
	ok             bool
	done           chan struct{}
}

// partBytes is the least length of the data left, in bytes, for which
// dataParts reads it in parts: some 3000 lines of coordinates, a
// millisecond's reading, well above the cost of starting a goroutine.
const partBytes = 64 << 10

// dataParts splits the text of s left after the first data line (lines is
// there) into GOMAXPROCS parts at line ends when it is long enough
// (partBytes), leaves the first part to lines (which it now stops at the
// first part's end) and starts reading every other part on a goroutine
// into c's slices, whose capacity holds a point per line of s. It returns
// the parts, the first one included, or an empty slice (never nil) when
// the text is read in one piece. The caller must wait for the parts
// (waitParts) before it returns.
func (d *delimitedReader) dataParts(c *geometry.Cloud, s string, lines *lineScanner) []*dataPart {
	w := runtime.GOMAXPROCS(0)
	left := len(s) - lines.pos
	if w < 2 || left < partBytes {
		return []*dataPart{}
	}
	var parts []*dataPart
	start, no := lines.pos, lines.no
	for k := range w {
		end := len(s)
		if k < w-1 {
			end = lines.pos + left*(k+1)/w
			if i := strings.IndexByte(s[end:], '\n'); i >= 0 {
				end += i + 1
			} else {
				end = len(s)
			}
		}
		if end <= start {
			continue
		}
		parts = append(parts, &dataPart{start: start, end: end, no: no, at: no})
		no += strings.Count(s[start:end], "\n")
		start = end
		if end == len(s) {
			break
		}
	}
	lines.s = s[:parts[0].end]
	ps, os := c.Points[:cap(c.Points)], c.Origins[:cap(c.Origins)]
	r := *d // read only: the columns are known and stay so
	for _, pt := range parts[1:] {
		pt.done = make(chan struct{})
		go func() {
			defer close(pt.done)
			pt.n, pt.ok = r.points(s[pt.start:pt.end], pt.no, ps[pt.at:], os[pt.at:])
		}()
	}
	return parts
}

// points reads the lines of s, the first of them line no+1, into ps and
// os as the serial reading would when every line is a point or blank; it
// returns the number of points and false at the first other line.
func (d *delimitedReader) points(s string, no int, ps []geometry.Vec3, os []geometry.Origin) (int, bool) {
	var fields []string
	lines := lineScanner{s: s, no: no}
	n := 0
	for {
		line, no, ok := lines.next()
		if !ok {
			return n, true
		}
		t := strings.TrimSpace(line)
		if t == "" {
			continue
		}
		if isComment(t) {
			return n, false
		}
		fields = splitFields(t, d.sep, fields)
		p, isData, err := d.point(fields, no)
		if err != nil || !isData {
			return n, false
		}
		ps[n], os[n] = p, geometry.Origin{File: d.name, Line: no}
		n++
	}
}

// waitParts waits for the parts that dataParts started.
func waitParts(parts []*dataPart) {
	for _, pt := range parts {
		if pt.done != nil {
			<-pt.done
		}
	}
}
