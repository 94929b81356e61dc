package geometry

import (
	"fmt"
	"strings"
)

// Origin records where a point came from, so that every report can point back
// into the user's file.
type Origin struct {
	File string // display name of the file, as given by the user
	Line int    // 1-based line in the file; 0 when the format has no lines (binary STL)
	// Entity is the 1-based index of the entity the point belongs to: the DXF
	// entity, the STL facet, or 0 when the point stands alone on its line.
	Entity int
}

// String formats o as file:line, or file#entity when there is no line.
func (o Origin) String() string {
	switch {
	case o.Line > 0:
		return fmt.Sprintf("%s:%d", o.File, o.Line)
	case o.Entity > 0:
		return fmt.Sprintf("%s#%d", o.File, o.Entity)
	default:
		return o.File
	}
}

// Unit is a length unit of an input file. It is always recorded, never
// guessed silently.
type Unit string

// The length units foilwright accepts.
const (
	Millimetre Unit = "mm"
	Inch       Unit = "in"
	Metre      Unit = "m"
	ChordUnit  Unit = "chord" // already normalised to unit chord
)

// ParseUnit returns the Unit named by s (mm, in, m or chord, case-insensitive;
// also "millimetre(s)", "inch(es)", "metre(s)"/"meter(s)"). It returns an error
// wrapping ErrUnknownUnit for anything else.
func ParseUnit(s string) (Unit, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "mm", "millimetre", "millimetres", "millimeter", "millimeters":
		return Millimetre, nil
	case "in", "inch", "inches", "\"":
		return Inch, nil
	case "m", "metre", "metres", "meter", "meters":
		return Metre, nil
	case "chord", "c":
		return ChordUnit, nil
	}
	return "", fmt.Errorf("%w %q (want %s)", ErrUnknownUnit, s, unitChoice())
}

// Units returns the length units foilwright accepts, in the order messages,
// help texts, completions and the pipeline file's checks give them.
func Units() []Unit { return []Unit{Millimetre, Inch, Metre, ChordUnit} }

// unitChoice words Units for a message: "mm, in, m or chord".
func unitChoice() string {
	us := Units()
	names := make([]string, len(us))
	for i, u := range us {
		names[i] = string(u)
	}
	return strings.Join(names[:len(names)-1], ", ") + " or " + names[len(names)-1]
}

// A Note records a line of an input file that was not read as a point, and why
// (a header, a comment, a name line), so that the user sees what was skipped.
type Note struct {
	Origin Origin
	Reason string
	Text   string // the line, trimmed and cut to at most 80 bytes
}

// Cloud is a set of points read from one or more files, each with its Origin.
// Points of a 2D file have Z = 0 and Dim = 2.
type Cloud struct {
	Points  []Vec3
	Origins []Origin // Origins[i] is where Points[i] came from
	Dim     int      // 2 or 3: how many coordinates the file gave
	Units   Unit     // "" when neither the user nor the file said
	Format  string   // what the reader took the file for, e.g. "delimited", "dxf"
	Name    string   // a name line or header title, if the file had one
	// Ordered reports that the file's own format orders the points into a
	// single loop (a coordinate listing or a polyline), so the order is
	// meaningful and should be kept.
	Ordered bool
	// Segments holds the start index of each ordered run of points (a DXF
	// polyline, a loop cut from a mesh) when Ordered is set and the file
	// has more than one run; nil means a single run.
	Segments []int
	Notes    []Note // lines skipped, with reasons
	// Columns says which columns of a delimited file were read as the
	// coordinates and why, e.g. "2, 3, 4 (named x, y, z by the header)";
	// "" for other formats.
	Columns string
	// ColumnsGuessed reports that no header named the coordinate columns
	// while the lines hold more numbers than were read, so the first ones
	// were taken: a guess an error message should mention.
	ColumnsGuessed bool
}

// Len returns the number of points in c.
func (c *Cloud) Len() int { return len(c.Points) }

// Contour is a closed loop of points in a plane, each with its Origin. The
// last point joins the first. After orientation the points run in the node
// order of the package conventions: trailing edge, upper surface, leading
// edge, lower surface.
type Contour struct {
	Points  []Point
	Origins []Origin
	Units   Unit
	// Along, when set (one value a point, increasing), is the position of
	// each point along the loop (input units) as the cleaning step measured
	// it on a smooth curve through the points: for a band of points, whose
	// noise is comparable to their spacing, it is a far better parameter for
	// a fit than the distances between neighbours, which zigzag across the
	// band. nil otherwise.
	Along []float64
}

// Len returns the number of points in c.
func (c *Contour) Len() int { return len(c.Points) }
