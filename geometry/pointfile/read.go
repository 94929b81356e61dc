package pointfile

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"io"
	"io/fs"
	"strings"
	"unicode/utf16"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/planar"
	"github.com/foilwright/foilwright/internal/enum"
)

// Options control how Read takes a point file apart. The zero value
// detects everything from the content.
type Options struct {
	// Format is "" to detect from the content (never from the file name), or
	// one of Formats().
	Format string
	// Columns chooses the coordinate columns of a delimited file: "" takes
	// the first 2 or 3 numeric columns of the first data line; "2,3,4" gives
	// 1-based indices; "x,y,z" gives names from the header line
	// (case-insensitive; a unit decoration such as "x [mm]" is ignored).
	// Two names or indices read a 2D file, three a 3D file.
	Columns string
	// Units is the length unit of the file. "" takes the unit from the file
	// when it states one ("# units: mm", a header "x [mm]", DXF $INSUNITS)
	// and leaves it "" otherwise. A unit given here wins over the file's.
	Units geometry.Unit
	// Cut is the plane that cuts an STL mesh into section loops; Read
	// refuses an STL file without it. Other formats ignore it (flatten 3D
	// points with planar.Flatten).
	Cut *planar.Spec
	// Layer, when set, reads only the DXF entities on this layer (layer
	// names compare without regard to case); entities on other layers are
	// counted in a Note. Read refuses a file with no entity on it. Other
	// formats ignore it.
	Layer string
}

// The formats Read knows, as named in Options.Format and Cloud.Format.
const (
	FormatDelimited = "delimited"
	FormatLoop      = "loop"
	FormatSurfaces  = "surfaces"
	FormatDXF       = "dxf"
	FormatSTL       = "stl"
)

// A reader reads one format: a text format from text, a binary one from
// data. It returns the cloud and the unit the file states.
type reader func(data []byte, text, name string, opts Options) (*geometry.Cloud, statedUnit, error)

// formats is the one list of the formats Read knows, in the order messages,
// help texts, completions and the pipeline file's checks give them. A new
// format is an entry here (and in detect, if it can be told from its
// content) and a file of its own.
var formats = []struct {
	name   string
	binary bool // read from the bytes, not converted to text
	read   reader
}{
	{FormatDelimited, false, func(_ []byte, text, name string, o Options) (*geometry.Cloud, statedUnit, error) {
		return readDelimited(text, name, o.Columns)
	}},
	{FormatLoop, false, func(_ []byte, text, name string, _ Options) (*geometry.Cloud, statedUnit, error) {
		return readLoop(text, name)
	}},
	{FormatSurfaces, false, func(_ []byte, text, name string, _ Options) (*geometry.Cloud, statedUnit, error) {
		return readSurfaces(text, name)
	}},
	{FormatDXF, false, func(_ []byte, text, name string, o Options) (*geometry.Cloud, statedUnit, error) {
		return readDXF(text, name, o.Layer)
	}},
	{FormatSTL, true, readSTLCut},
}

// Formats returns the names of the formats Read knows, in the order of the
// list (the order messages give them).
func Formats() []string {
	out := make([]string, len(formats))
	for i, f := range formats {
		out[i] = f.name
	}
	return out
}

// formatOf returns the entry of the format called name.
func formatOf(name string) (reader, bool, bool) {
	for _, f := range formats {
		if f.name == name {
			return f.read, f.binary, true
		}
	}
	return nil, false, false
}

// Read reads a point file of any supported format from r into a Cloud. name
// is the display name used in errors and in every point's Origin.
//
// The format is detected from the content unless opts.Format names it:
// binary data is taken for binary STL; text starting with "solid" and
// holding facets for ASCII STL; group-code pairs opening a SECTION for ASCII
// DXF; a name line followed only by coordinate pairs for the "loop" listing
// (a name line, then x y pairs around the section); a name line, a line of
// two point counts and that many pairs for the "surfaces" listing (upper
// then lower surface, each from leading to trailing edge); anything else is
// delimited text. See Options for columns, units and the STL cut.
//
// Malformed input gives a *geometry.ParseError naming the file, the line
// where there is one, and the reason, which wraps geometry.ErrEmpty,
// ErrNonFinite or ErrUnknownUnit, or one of ErrNoNumbers, ErrNotNumeric,
// ErrColumnCount, ErrColumnRange, ErrNotSTL, ErrTruncated, ErrNoEntities or
// ErrFormat.
// Read never checks that the points make a section (how many, whether
// collinear); the cleaning step does.
func Read(r io.Reader, name string, opts Options) (*geometry.Cloud, error) {
	data, err := readAll(r)
	if err != nil {
		return nil, &geometry.ParseError{File: name, Err: err}
	}
	if opts.Units != "" {
		u, err := geometry.ParseUnit(string(opts.Units))
		if err != nil {
			return nil, fmt.Errorf("geometry: units option: %w", err)
		}
		opts.Units = u
	}
	// Text saved as UTF-16 ("Unicode text" in some spreadsheets and
	// editors) starts with its byte-order mark: read it as the text it is,
	// not as a binary mesh (it once read as "header promises 7471216
	// facet(s)").
	if opts.Format != FormatSTL && !stlBinarySizeMatches(data) {
		data = fromUTF16(data)
	}
	if len(bytes.TrimSpace(data)) == 0 {
		return nil, &geometry.ParseError{File: name, Err: geometry.ErrEmpty}
	}
	// Convert to text once, and not at all for a binary mesh.
	format, text := opts.Format, ""
	if format == "" && (isBinary(data[:min(len(data), 1024)]) || stlBinarySizeMatches(data)) {
		format = FormatSTL
	}
	read, binary, known := formatOf(format)
	if !binary {
		text = asText(data)
	}
	if format == "" {
		format = detect(text)
		read, _, known = formatOf(format)
	}
	if !known {
		return nil, fmt.Errorf("geometry: format %q: want %s", opts.Format, enum.Or(Formats()...))
	}
	c, stated, err := read(data, text, name, opts)
	if err != nil {
		return nil, err
	}
	if err := settleUnits(c, name, stated, opts.Units); err != nil {
		return nil, err
	}
	return c, nil
}

// fromUTF16 returns data decoded from UTF-16 to UTF-8 when it starts with a
// UTF-16 byte-order mark (little- or big-endian), else data as it is.
func fromUTF16(data []byte) []byte {
	var order binary.ByteOrder
	switch {
	case len(data) >= 2 && data[0] == 0xff && data[1] == 0xfe:
		order = binary.LittleEndian
	case len(data) >= 2 && data[0] == 0xfe && data[1] == 0xff:
		order = binary.BigEndian
	default:
		return data
	}
	units := make([]uint16, (len(data)-2)/2)
	for i := range units {
		units[i] = order.Uint16(data[2+2*i:])
	}
	return []byte(string(utf16.Decode(units)))
}

// readAll reads r to the end, in one allocation when r can tell its size
// (a bytes or strings reader, a file).
func readAll(r io.Reader) ([]byte, error) {
	size := -1
	switch v := r.(type) {
	case interface{ Len() int }:
		size = v.Len()
	case interface{ Stat() (fs.FileInfo, error) }:
		if fi, err := v.Stat(); err == nil && fi.Mode().IsRegular() && fi.Size() < 1<<40 {
			size = int(fi.Size())
		}
	}
	if size < 0 {
		return io.ReadAll(r)
	}
	var b bytes.Buffer
	b.Grow(size + 512)
	_, err := b.ReadFrom(r)
	return b.Bytes(), err
}

// detect guesses the format of the text s (binary data has been taken
// for STL already).
func detect(s string) string {
	head := s[:min(len(s), 64<<10)]
	if t := strings.TrimLeft(head, " \t\r\n"); len(t) >= 5 && strings.EqualFold(t[:5], "solid") {
		if strings.Contains(head, "facet") || strings.Contains(head, "endsolid") {
			return FormatSTL
		}
	}
	if looksLikeDXF(head) {
		return FormatDXF
	}
	if f := detectListing(s); f != "" {
		return f
	}
	return FormatDelimited
}

// isBinary reports whether b holds control bytes that never occur in a
// text file (NUL and the C0 controls other than tab, newline, vertical tab,
// form feed, carriage return and the DOS end-of-file mark).
func isBinary(b []byte) bool {
	for _, c := range b {
		if c < 0x20 && c != '\t' && c != '\n' && c != '\v' && c != '\f' && c != '\r' && c != 0x1a {
			return true
		}
	}
	return false
}

// asText returns data as a string without a UTF-8 byte-order mark and
// with old-style lone carriage returns turned into newlines.
func asText(data []byte) string {
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	if bytes.IndexByte(data, '\n') < 0 && bytes.IndexByte(data, '\r') >= 0 {
		data = bytes.ReplaceAll(data, []byte("\r"), []byte("\n"))
	}
	return string(data)
}

// lineScanner walks the lines of a text, numbering them from 1 and dropping
// the line ends (\n or \r\n).
type lineScanner struct {
	s   string
	pos int
	no  int
}

// next returns the next line and its number; ok is false at the end.
func (l *lineScanner) next() (line string, no int, ok bool) {
	if l.pos >= len(l.s) {
		return "", l.no, false
	}
	rest := l.s[l.pos:]
	i := strings.IndexByte(rest, '\n')
	if i < 0 {
		line = rest
		l.pos = len(l.s)
	} else {
		line = rest[:i]
		l.pos += i + 1
	}
	if n := len(line); n > 0 && line[n-1] == '\r' {
		line = line[:n-1]
	}
	l.no++
	return line, l.no, true
}

// statedUnit records the unit a file states and where it said so.
type statedUnit struct {
	unit geometry.Unit
	line int
	err  error // a *ParseError for a unit the file names but foilwright does not know
}

// set records that line no names unit text. A second, different unit is an
// error; an unknown one is kept as an error for settleUnits to report
// unless the caller gave the unit.
func (u *statedUnit) set(file string, no int, text string) error {
	unit, err := geometry.ParseUnit(text)
	if err != nil {
		if u.err == nil {
			u.err = &geometry.ParseError{File: file, Line: no, Err: err}
		}
		return nil
	}
	if u.unit != "" && u.unit != unit {
		return &geometry.ParseError{File: file, Line: no, Err: fmt.Errorf("%w: unit %s here but %s at line %d", ErrFormat, unit, u.unit, u.line)}
	}
	if u.unit == "" {
		u.unit, u.line = unit, no
	}
	return nil
}

// settleUnits sets c.Units from the caller's choice, else from the unit
// the file stated. A unit the file names but foilwright does not know is an
// error only when the caller gave none.
func settleUnits(c *geometry.Cloud, file string, stated statedUnit, given geometry.Unit) error {
	switch {
	case given != "":
		if stated.unit != "" && stated.unit != given {
			c.Notes = append(c.Notes, geometry.Note{Origin: geometry.Origin{File: file, Line: stated.line},
				Reason: fmt.Sprintf("the file says %s; using %s as asked", stated.unit, given)})
		}
		c.Units = given
	case stated.err != nil:
		return stated.err
	default:
		c.Units = stated.unit
	}
	return nil
}
