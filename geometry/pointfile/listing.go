package pointfile

import (
	"fmt"
	"math"
	"strings"

	"github.com/foilwright/foilwright/geometry"
)

// The two plain coordinate listings of the trade (common practice):
//
//   - loop: a name line, then one "x y" pair per line, going once around the
//     section (usually trailing edge, upper surface, leading edge, lower
//     surface, trailing edge);
//   - surfaces: a name line, a line with the point counts of the upper and
//     lower surface (e.g. "61. 61."), then the upper and then the lower
//     surface, each from the leading to the trailing edge, blank lines
//     allowed between them.
//
// Both read into one ordered loop in the package node order; the surfaces
// listing is turned around: upper surface reversed (trailing edge to leading
// edge), then the lower surface without repeating the shared leading-edge
// point.
//
// Both are by convention normalised to unit chord. A listing whose points
// run in x from 0 to 1 (within ListingChordTol), with a point at the
// origin, is read in chord units (the cloud's Units say so): the node
// listings foilwright writes read back without a unit given. Any other
// listing states no unit.

// listingPair is one coordinate line of a listing.
type listingPair struct {
	p    geometry.Point
	line int
}

// listingScan splits s into its name line (if the first non-blank line does
// not start with a number) and its other non-blank, non-comment lines, split
// into fields at blanks.
type listingScan struct {
	name     string
	nameLine int
	rows     [][]string
	lines    []int
	notes    geometry.Notes
}

// With detect set it gives up (returning nil) as soon as s cannot be a
// listing: no name line, a comment, or a line that is not two fields.
func listingSplit(s, file string, detect bool) *listingScan {
	sc := &listingScan{}
	lines := lineScanner{s: s}
	first := true
	for {
		line, no, ok := lines.next()
		if !ok {
			break
		}
		t := strings.TrimSpace(line)
		if t == "" {
			continue
		}
		if t[0] == '#' {
			if detect {
				return nil // the listings have no comments: delimited text
			}
			sc.notes.Add(file, no, "comment", t)
			continue
		}
		if first {
			first = false
			f := strings.Fields(t)
			if _, num := parseNumber(f[0], false); !num {
				sc.name, sc.nameLine = geometry.Excerpt(t), no
				sc.notes.Add(file, no, "name line", t)
				continue
			}
			if detect {
				return nil
			}
		}
		f := strings.Fields(t)
		if detect && len(f) != 2 {
			return nil
		}
		sc.rows = append(sc.rows, f)
		sc.lines = append(sc.lines, no)
	}
	return sc
}

// pairs parses rows[from:] as x y pairs.
func (sc *listingScan) pairs(file string, from int) ([]listingPair, error) {
	out := make([]listingPair, 0, len(sc.rows)-from)
	for i := from; i < len(sc.rows); i++ {
		p, err := listingPairOf(sc.rows[i], file, sc.lines[i])
		if err != nil {
			return nil, err
		}
		out = append(out, listingPair{p, sc.lines[i]})
	}
	return out, nil
}

// listingPairOf parses one "x y" line.
func listingPairOf(f []string, file string, no int) (geometry.Point, error) {
	if len(f) != 2 {
		return geometry.Point{}, &geometry.ParseError{File: file, Line: no, Err: fmt.Errorf("%w: %d field(s), want x y", ErrColumnCount, len(f))}
	}
	var v [2]float64
	for j := range 2 {
		x, num := parseNumber(f[j], false)
		if !num {
			return geometry.Point{}, &geometry.ParseError{File: file, Line: no, Err: fmt.Errorf("%w: %q", ErrNotNumeric, geometry.Excerpt(f[j]))}
		}
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return geometry.Point{}, &geometry.ParseError{File: file, Line: no, Err: fmt.Errorf("%w: %q", geometry.ErrNonFinite, geometry.Excerpt(f[j]))}
		}
		v[j] = x
	}
	return geometry.Point{X: v[0], Y: v[1]}, nil
}

// listingCounts parses a counts line such as "61. 61.": two whole numbers
// of at least 1.
func listingCounts(f []string) (nu, nl int, ok bool) {
	if len(f) != 2 {
		return 0, 0, false
	}
	var n [2]int
	for j := range 2 {
		x, num := parseNumber(f[j], false)
		if !num || x != math.Trunc(x) || x < 1 || x > 1e9 {
			return 0, 0, false
		}
		n[j] = int(x)
	}
	return n[0], n[1], true
}

// detectListing returns FormatLoop or FormatSurfaces when s is one of the
// listings, or "" otherwise. A listing needs a name line that is not a
// column header and only two-number lines after it; it is a surfaces
// listing when the first of those holds two whole counts adding up to the
// number of lines after it, and a loop when the points, joined in order
// and closed, make a path no longer than 4 times the diagonal of their
// bounding box (an ordered loop around a section is about 2 to 2.5 times;
// points in no order are far longer).
func detectListing(s string) string {
	sc := listingSplit(s, "", true)
	if sc == nil || sc.nameLine == 0 || len(sc.rows) < 3 || listingIsHeader(sc.name) {
		return ""
	}
	for _, r := range sc.rows {
		if len(r) != 2 {
			return ""
		}
		for _, f := range r {
			if _, num := parseNumber(f, false); !num {
				return ""
			}
		}
	}
	if nu, nl, ok := listingCounts(sc.rows[0]); ok && nu+nl == len(sc.rows)-1 {
		return FormatSurfaces
	}
	pts := make([]geometry.Point, 0, len(sc.rows))
	for _, r := range sc.rows {
		x, _ := parseNumber(r[0], false)
		y, _ := parseNumber(r[1], false)
		p := geometry.Point{X: x, Y: y}
		if !p.IsFinite() {
			return FormatLoop // let the reader report it
		}
		pts = append(pts, p)
	}
	lo, hi := pts[0], pts[0]
	var path float64
	for i, p := range pts {
		lo = geometry.Point{X: math.Min(lo.X, p.X), Y: math.Min(lo.Y, p.Y)}
		hi = geometry.Point{X: math.Max(hi.X, p.X), Y: math.Max(hi.Y, p.Y)}
		path += p.Dist(pts[(i+1)%len(pts)])
	}
	if diag := hi.Dist(lo); diag > 0 && path <= 4*diag {
		return FormatLoop
	}
	return ""
}

// listingIsHeader reports whether a first line is a column header ("x y",
// "X [mm], Y [mm]") rather than a name.
func listingIsHeader(t string) bool {
	f := joinUnits(strings.FieldsFunc(t, func(r rune) bool { return r == ' ' || r == '\t' || r == ',' || r == ';' }))
	if len(f) < 2 {
		return false
	}
	for _, x := range f {
		switch name, _ := headerField(x); name {
		case "x", "y", "z", "u", "v", "n", "i", "no", "id", "point":
		default:
			return false
		}
	}
	return true
}

// listingCloud builds the cloud of a listing from its pairs.
func listingCloud(sc *listingScan, file, format string, pairs []listingPair) *geometry.Cloud {
	c := &geometry.Cloud{Format: format, Dim: 2, Name: sc.name, Ordered: true,
		Points: make([]geometry.Vec3, len(pairs)), Origins: make([]geometry.Origin, len(pairs)), Notes: sc.notes.List(file)}
	for i, q := range pairs {
		c.Points[i] = geometry.Vec3{X: q.p.X, Y: q.p.Y, Z: 0}
		c.Origins[i] = geometry.Origin{File: file, Line: q.line}
	}
	return c
}

// readLoop reads a loop listing.
func readLoop(s, file string) (*geometry.Cloud, statedUnit, error) {
	sc := listingSplit(s, file, false)
	if len(sc.rows) == 0 {
		return nil, statedUnit{}, &geometry.ParseError{File: file, Err: ErrNoNumbers}
	}
	pairs, err := sc.pairs(file, 0)
	if err != nil {
		return nil, statedUnit{}, err
	}
	c := listingCloud(sc, file, FormatLoop, pairs)
	return c, listingUnit(c), nil
}

// ListingChordTol is how near 0 and 1 the smallest and largest x of a
// coordinate listing, and how near the origin its nearest point, must lie
// for the listing to be read in chord units.
const ListingChordTol = 1e-6

// listingUnit returns chord units for a listing normalised to unit chord
// (see the top of this file); no unit otherwise.
func listingUnit(c *geometry.Cloud) statedUnit {
	lo, hi, origin := math.Inf(1), math.Inf(-1), math.Inf(1)
	for _, p := range c.Points {
		lo, hi = math.Min(lo, p.X), math.Max(hi, p.X)
		origin = math.Min(origin, math.Hypot(p.X, p.Y))
	}
	if math.Abs(lo) > ListingChordTol || math.Abs(hi-1) > ListingChordTol || origin > ListingChordTol {
		return statedUnit{}
	}
	return statedUnit{unit: geometry.ChordUnit}
}

// readSurfaces reads a surfaces listing and turns it into one loop.
func readSurfaces(s, file string) (*geometry.Cloud, statedUnit, error) {
	sc := listingSplit(s, file, false)
	if len(sc.rows) == 0 {
		return nil, statedUnit{}, &geometry.ParseError{File: file, Err: ErrNoNumbers}
	}
	nu, nl, ok := listingCounts(sc.rows[0])
	if !ok {
		return nil, statedUnit{}, &geometry.ParseError{File: file, Line: sc.lines[0],
			Err: fmt.Errorf("%w: want the point counts of the upper and lower surface, e.g. \"61. 61.\"", ErrFormat)}
	}
	pairs, err := sc.pairs(file, 1)
	if err != nil {
		return nil, statedUnit{}, err
	}
	switch {
	case len(pairs) < nu+nl:
		return nil, statedUnit{}, &geometry.ParseError{File: file, Line: sc.lines[len(sc.lines)-1],
			Err: fmt.Errorf("%w: %d point(s) after the counts line, which promises %d + %d", ErrTruncated, len(pairs), nu, nl)}
	case len(pairs) > nu+nl:
		return nil, statedUnit{}, &geometry.ParseError{File: file, Line: pairs[nu+nl].line,
			Err: fmt.Errorf("%w: more points than the counts line (line %d) promises (%d + %d)", ErrFormat, sc.lines[0], nu, nl)}
	}
	sc.notes.Add(file, sc.lines[0], "point counts line", strings.Join(sc.rows[0], " "))
	upper, lower := pairs[:nu], pairs[nu:]
	loop := make([]listingPair, 0, nu+nl)
	for i := nu - 1; i >= 0; i-- {
		loop = append(loop, upper[i])
	}
	if upper[0].p == lower[0].p {
		lower = lower[1:]
	}
	loop = append(loop, lower...)
	c := listingCloud(sc, file, FormatSurfaces, loop)
	return c, listingUnit(c), nil
}
