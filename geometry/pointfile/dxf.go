package pointfile

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/foilwright/foilwright/geometry"
)

// ASCII DXF: a sequence of group-code / value line pairs. The reader takes
// the ENTITIES section: POINT, LINE, LWPOLYLINE, POLYLINE with its VERTEX
// entities up to SEQEND, and SPLINE (its fit points, or its control points
// when it has none). Polylines and splines give ordered runs; LINE entities
// that meet end to end are joined into runs. The HEADER variable $INSUNITS
// gives the unit. Entity types foilwright cannot use (CIRCLE, TEXT, ...) are
// counted in a Note. With a layer named, entities on other layers are
// passed over and counted in a Note.

// dxfPair is one group code and its value; line is the value's line.
type dxfPair struct {
	code  int
	value string
	line  int
}

// looksLikeDXF reports whether s starts like an ASCII DXF file: "0" then
// "SECTION", possibly after a 999 comment pair.
func looksLikeDXF(s string) bool {
	lines := lineScanner{s: s}
	var first [4]string
	n := 0
	for n < 4 {
		line, _, ok := lines.next()
		if !ok {
			break
		}
		t := strings.TrimSpace(line)
		if n == 0 && t == "" {
			continue
		}
		first[n] = t
		n++
	}
	if first[0] == "0" && strings.EqualFold(first[1], "SECTION") {
		return true
	}
	return first[0] == "999" && first[2] == "0" && strings.EqualFold(first[3], "SECTION")
}

// dxfPairs splits s into group-code pairs.
func dxfPairs(s, file string) ([]dxfPair, error) {
	pairs := make([]dxfPair, 0, strings.Count(s, "\n")/2+1)
	lines := lineScanner{s: s}
	for {
		cl, cno, ok := lines.next()
		if !ok {
			break
		}
		ct := strings.TrimSpace(cl)
		if ct == "" && len(pairs) == 0 {
			continue // blank lines before the first pair
		}
		code, err := strconv.Atoi(ct)
		if err != nil {
			if ct == "" && lines.pos >= len(lines.s) {
				break // a final empty line
			}
			return nil, &geometry.ParseError{File: file, Line: cno, Err: fmt.Errorf("%w: group code %q is not an integer", ErrFormat, geometry.Excerpt(ct))}
		}
		vl, vno, ok := lines.next()
		if !ok {
			return nil, &geometry.ParseError{File: file, Line: cno, Err: fmt.Errorf("%w: group code %d has no value", ErrTruncated, code)}
		}
		pairs = append(pairs, dxfPair{code, strings.TrimSpace(vl), vno})
	}
	return pairs, nil
}

// dxfRun is an ordered run of points from one entity or from chained LINEs.
type dxfRun struct {
	pts     []geometry.Vec3
	origins []geometry.Origin
	first   int // entity index of its first entity, for the output order
}

// dxfLine is one LINE entity.
type dxfLine struct {
	a, b   geometry.Vec3
	la, lb int // lines of the start and end x values
	ent    int
}

// dxfReader holds the state of reading one file.
type dxfReader struct {
	file    string
	runs    []dxfRun
	lines   []dxfLine
	loose   []geometry.Vec3   // POINT entities
	looseAt []geometry.Origin // their origins
	ignored map[string]int
	notes   geometry.Notes
	unit    statedUnit
	layer   string         // the layer to read, "" for all
	layers  map[string]int // entities per layer passed over
	matched int            // entities on the layer read
}

// readDXF reads an ASCII DXF file: the entities on layer, or all of them
// when layer is "".
func readDXF(s, file, layer string) (*geometry.Cloud, statedUnit, error) {
	pairs, err := dxfPairs(s, file)
	if err != nil {
		return nil, statedUnit{}, err
	}
	d := &dxfReader{file: file, ignored: map[string]int{}, layer: layer, layers: map[string]int{}}
	section := ""
	ent := 0
	for i := 0; i < len(pairs); {
		p := pairs[i]
		if p.code != 0 {
			if section == "HEADER" && p.code == 9 && p.value == "$INSUNITS" && i+1 < len(pairs) {
				d.insUnits(pairs[i+1])
			}
			i++
			continue
		}
		switch p.value {
		case "SECTION":
			section = ""
			if i+1 < len(pairs) && pairs[i+1].code == 2 {
				section = strings.ToUpper(pairs[i+1].value)
			}
			i++
			continue
		case "ENDSEC":
			section = ""
			i++
			continue
		case "EOF":
			i = len(pairs)
			continue
		}
		j := i + 1
		for j < len(pairs) && pairs[j].code != 0 {
			j++
		}
		if section != "ENTITIES" {
			i = j
			continue
		}
		ent++
		if name, ok := d.otherLayer(pairs[i:j]); ok {
			if p.value == "POLYLINE" {
				j = dxfSkipVertices(pairs, j)
			}
			d.layers[name]++
			i = j
			continue
		}
		switch p.value {
		case "POINT":
			err = d.point(pairs[i:j], ent)
		case "LINE":
			err = d.line(pairs[i:j], ent)
		case "LWPOLYLINE":
			err = d.lwpolyline(pairs[i:j], ent)
		case "SPLINE":
			err = d.spline(pairs[i:j], ent)
		case "POLYLINE":
			j, err = d.polyline(pairs, i, j, ent)
		default:
			d.ignored[p.value]++
		}
		if err != nil {
			return nil, d.unit, err
		}
		i = j
	}
	d.chainLines()
	if d.layer != "" {
		if err := d.layerNote(); err != nil {
			return nil, d.unit, err
		}
	}
	return d.cloud()
}

// otherLayer reports whether the entity at pairs is on a layer other than
// the one to read, and its layer.
func (d *dxfReader) otherLayer(pairs []dxfPair) (string, bool) {
	if d.layer == "" {
		return "", false
	}
	name := "0" // the layer of an entity that names none
	for _, p := range pairs {
		if p.code == 8 {
			name = p.value
			break
		}
	}
	if strings.EqualFold(name, d.layer) {
		d.matched++
		return name, false
	}
	return name, true
}

// layerNote notes the entities passed over on other layers, or returns
// an error when none was on the layer to read.
func (d *dxfReader) layerNote() error {
	names := make([]string, 0, len(d.layers))
	for n := range d.layers {
		names = append(names, n)
	}
	sort.Strings(names)
	if d.matched == 0 {
		return &geometry.ParseError{File: d.file, Err: fmt.Errorf("%w on layer %q (layers with entities: %s)", ErrNoEntities, d.layer, strings.Join(names, ", "))}
	}
	for _, n := range names {
		d.notes.Add(d.file, 0, fmt.Sprintf("%d entit%s on layer %q not read", d.layers[n], map[bool]string{true: "y", false: "ies"}[d.layers[n] == 1], n), "")
	}
	return nil
}

// dxfSkipVertices returns the index after the VERTEX entities and the
// SEQEND that follow a POLYLINE whose header ends at j.
func dxfSkipVertices(pairs []dxfPair, j int) int {
	for j < len(pairs) && pairs[j].code == 0 && pairs[j].value == "VERTEX" {
		for j++; j < len(pairs) && pairs[j].code != 0; j++ {
		}
	}
	if j < len(pairs) && pairs[j].code == 0 && pairs[j].value == "SEQEND" {
		for j++; j < len(pairs) && pairs[j].code != 0; j++ {
		}
	}
	return j
}

// insUnits reads the value pair of $INSUNITS.
func (d *dxfReader) insUnits(p dxfPair) {
	if p.code != 70 {
		return
	}
	n, err := strconv.Atoi(p.value)
	if err != nil {
		d.unit.err = &geometry.ParseError{File: d.file, Line: p.line, Err: fmt.Errorf("%w: $INSUNITS %q", geometry.ErrUnknownUnit, geometry.Excerpt(p.value))}
		return
	}
	// Unit codes of the DXF format's $INSUNITS header variable.
	switch n {
	case 0: // unitless
	case 1:
		_ = d.unit.set(d.file, p.line, "in")
	case 4:
		_ = d.unit.set(d.file, p.line, "mm")
	case 6:
		_ = d.unit.set(d.file, p.line, "m")
	default:
		names := map[int]string{2: "feet", 3: "miles", 5: "centimetres", 7: "kilometres", 8: "microinches",
			9: "mils", 10: "yards", 11: "angstroms", 12: "nanometres", 13: "microns", 14: "decimetres"}
		what := names[n]
		if what == "" {
			what = "an unknown code"
		}
		d.unit.err = &geometry.ParseError{File: d.file, Line: p.line,
			Err: fmt.Errorf("%w: $INSUNITS %d (%s); give the unit as mm, in or m", geometry.ErrUnknownUnit, n, what)}
	}
}

// number parses a coordinate value.
func (d *dxfReader) number(p dxfPair) (float64, error) {
	v, num := parseNumber(p.value, false)
	if !num {
		return 0, &geometry.ParseError{File: d.file, Line: p.line, Err: fmt.Errorf("%w: group %d is %q", ErrNotNumeric, p.code, geometry.Excerpt(p.value))}
	}
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, &geometry.ParseError{File: d.file, Line: p.line, Err: fmt.Errorf("%w: group %d is %q", geometry.ErrNonFinite, p.code, geometry.Excerpt(p.value))}
	}
	return v, nil
}

// coords collects points whose x group is base (10 or 11): each x value
// starts a point, the y and z groups (base+10, base+20) fill it in. line is
// the line of the x value. A point without its y, or a y or z without an x
// before it, is an error naming the line (a missing y once read as 0); a
// missing z is 0 (a 2D point).
func (d *dxfReader) coords(pairs []dxfPair, base int) (pts []geometry.Vec3, lines []int, err error) {
	hasY := true
	missingY := func(i int) error {
		return &geometry.ParseError{File: d.file, Line: lines[i], Err: fmt.Errorf("%w: group %d (x) without its y (group %d)", ErrFormat, base, base+10)}
	}
	for _, p := range pairs {
		switch p.code {
		case base, base + 10, base + 20:
		default:
			continue
		}
		v, err := d.number(p)
		if err != nil {
			return nil, nil, err
		}
		switch p.code {
		case base:
			if !hasY {
				return nil, nil, missingY(len(pts) - 1)
			}
			pts = append(pts, geometry.Vec3{X: v})
			lines = append(lines, p.line)
			hasY = false
		case base + 10, base + 20:
			if len(pts) == 0 {
				return nil, nil, &geometry.ParseError{File: d.file, Line: p.line, Err: fmt.Errorf("%w: group %d without an x (group %d) before it", ErrFormat, p.code, base)}
			}
			if p.code == base+10 {
				pts[len(pts)-1].Y, hasY = v, true
			} else {
				pts[len(pts)-1].Z = v
			}
		}
	}
	if !hasY {
		return nil, nil, missingY(len(pts) - 1)
	}
	return pts, lines, nil
}

// dxfFlags returns the integer value of group 70, or 0.
func dxfFlags(pairs []dxfPair) int {
	for _, p := range pairs {
		if p.code == 70 {
			n, _ := strconv.Atoi(p.value)
			return n
		}
	}
	return 0
}

// ocs returns the map from the object coordinate system of an entity with
// extrusion direction groups 210/220/230 to world coordinates, by the
// "arbitrary axis" rule of the DXF format: Ax = Wy × N when N is within
// 1/64 of the world z axis in x and y, else Wz × N; Ay = N × Ax.
func (d *dxfReader) ocs(pairs []dxfPair) (func(geometry.Vec3) geometry.Vec3, error) {
	n := geometry.Vec3{X: 0, Y: 0, Z: 1}
	for _, p := range pairs {
		if p.code != 210 && p.code != 220 && p.code != 230 {
			continue
		}
		v, err := d.number(p)
		if err != nil {
			return nil, err
		}
		switch p.code {
		case 210:
			n.X = v
		case 220:
			n.Y = v
		case 230:
			n.Z = v
		}
	}
	n = n.Unit()
	if n == (geometry.Vec3{X: 0, Y: 0, Z: 1}) || n == (geometry.Vec3{}) {
		return func(p geometry.Vec3) geometry.Vec3 { return p }, nil
	}
	var ax geometry.Vec3
	if math.Abs(n.X) < 1.0/64 && math.Abs(n.Y) < 1.0/64 {
		ax = geometry.Vec3{X: 0, Y: 1, Z: 0}.Cross(n).Unit()
	} else {
		ax = geometry.Vec3{X: 0, Y: 0, Z: 1}.Cross(n).Unit()
	}
	ay := n.Cross(ax).Unit()
	return func(p geometry.Vec3) geometry.Vec3 { return ax.Scale(p.X).Add(ay.Scale(p.Y)).Add(n.Scale(p.Z)) }, nil
}

func (d *dxfReader) point(pairs []dxfPair, ent int) error {
	pts, lines, err := d.coords(pairs, 10)
	if err != nil {
		return err
	}
	if len(pts) == 0 {
		return &geometry.ParseError{File: d.file, Line: pairs[0].line, Err: fmt.Errorf("%w: POINT entity %d without coordinates (groups 10, 20)", ErrFormat, ent)}
	}
	d.loose = append(d.loose, pts[0])
	d.looseAt = append(d.looseAt, geometry.Origin{File: d.file, Line: lines[0], Entity: ent})
	return nil
}

func (d *dxfReader) line(pairs []dxfPair, ent int) error {
	a, la, err := d.coords(pairs, 10)
	if err != nil {
		return err
	}
	b, lb, err := d.coords(pairs, 11)
	if err != nil {
		return err
	}
	if len(a) == 0 || len(b) == 0 {
		return &geometry.ParseError{File: d.file, Line: pairs[0].line, Err: fmt.Errorf("%w: LINE entity %d without its start (group 10) or end (group 11)", ErrFormat, ent)}
	}
	d.lines = append(d.lines, dxfLine{a: a[0], b: b[0], la: la[0], lb: lb[0], ent: ent})
	return nil
}

// addRun records an ordered run; closed runs are listed without repeating
// their first point.
func (d *dxfReader) addRun(pts []geometry.Vec3, lines []int, ent int, closed bool) {
	if closed && len(pts) > 1 && pts[0] == pts[len(pts)-1] {
		pts, lines = pts[:len(pts)-1], lines[:len(lines)-1]
	}
	if len(pts) == 0 {
		return
	}
	r := dxfRun{pts: pts, origins: make([]geometry.Origin, len(pts)), first: ent}
	for i := range pts {
		r.origins[i] = geometry.Origin{File: d.file, Line: lines[i], Entity: ent}
	}
	d.runs = append(d.runs, r)
}

func (d *dxfReader) lwpolyline(pairs []dxfPair, ent int) error {
	pts, lines, err := d.coords(pairs, 10)
	if err != nil {
		return err
	}
	var elev float64
	bulged := false
	for _, p := range pairs {
		switch p.code {
		case 38:
			if elev, err = d.number(p); err != nil {
				return err
			}
		case 42:
			if v, err := d.number(p); err != nil {
				return err
			} else if v != 0 {
				bulged = true
			}
		}
	}
	toWorld, err := d.ocs(pairs)
	if err != nil {
		return err
	}
	for i := range pts {
		pts[i] = toWorld(geometry.Vec3{X: pts[i].X, Y: pts[i].Y, Z: elev})
	}
	if bulged && len(lines) > 0 {
		d.notes.Add(d.file, lines[0], fmt.Sprintf("LWPOLYLINE entity %d has arc segments (bulges); only its vertices are read", ent), "")
	}
	d.addRun(pts, lines, ent, dxfFlags(pairs)&1 != 0)
	return nil
}

func (d *dxfReader) spline(pairs []dxfPair, ent int) error {
	pts, lines, err := d.coords(pairs, 11)
	if err != nil {
		return err
	}
	if len(pts) == 0 {
		if pts, lines, err = d.coords(pairs, 10); err != nil {
			return err
		}
		if len(pts) > 0 {
			d.notes.Add(d.file, lines[0], fmt.Sprintf("SPLINE entity %d has no fit points; its control points are read, which lie off the curve", ent), "")
		}
	}
	d.addRun(pts, lines, ent, dxfFlags(pairs)&1 != 0)
	return nil
}

// polyline reads a POLYLINE entity at pairs[i:j] and the VERTEX entities
// after it up to SEQEND; it returns the index after them.
func (d *dxfReader) polyline(pairs []dxfPair, i, j, ent int) (int, error) {
	head := pairs[i:j]
	flags := dxfFlags(head)
	var pts []geometry.Vec3
	var lines []int
	var elev float64
	for _, p := range head {
		if p.code == 30 {
			v, err := d.number(p)
			if err != nil {
				return j, err
			}
			elev = v
		}
	}
	toWorld := func(p geometry.Vec3) geometry.Vec3 { return p }
	if flags&8 == 0 { // a 2D polyline: vertices in its object coordinate system
		var err error
		if toWorld, err = d.ocs(head); err != nil {
			return j, err
		}
	}
	for j < len(pairs) && pairs[j].code == 0 && pairs[j].value == "VERTEX" {
		k := j + 1
		for k < len(pairs) && pairs[k].code != 0 {
			k++
		}
		vflags := dxfFlags(pairs[j:k])
		if vflags&(16|128) == 0 { // not a spline frame point nor a face record
			vp, vl, err := d.coords(pairs[j:k], 10)
			if err != nil {
				return k, err
			}
			if len(vp) > 0 {
				p := vp[0]
				if flags&8 == 0 {
					p = toWorld(geometry.Vec3{X: p.X, Y: p.Y, Z: elev})
				}
				pts = append(pts, p)
				lines = append(lines, vl[0])
			}
		}
		j = k
	}
	if j < len(pairs) && pairs[j].code == 0 && pairs[j].value == "SEQEND" {
		for j++; j < len(pairs) && pairs[j].code != 0; j++ {
		}
	}
	if flags&(16|64) != 0 {
		d.ignored["POLYLINE mesh"]++
		return j, nil
	}
	d.addRun(pts, lines, ent, flags&1 != 0)
	return j, nil
}

// chainLines joins LINE entities that share end points (within 1e-9 of the
// extent of all LINE end points) into ordered runs: open chains first run
// from an end or a branch point, closed chains from their first LINE.
func (d *dxfReader) chainLines() {
	if len(d.lines) == 0 {
		return
	}
	var w dxfWelder
	ends := make([]geometry.Vec3, 0, 2*len(d.lines))
	for _, l := range d.lines {
		ends = append(ends, l.a, l.b)
	}
	w.init(ends)
	na := make([]int, len(d.lines))
	nb := make([]int, len(d.lines))
	adj := map[int][]int{}
	for k, l := range d.lines {
		na[k], nb[k] = w.id(l.a), w.id(l.b)
		if na[k] == nb[k] {
			d.notes.Add(d.file, l.la, fmt.Sprintf("LINE entity %d has zero length and is not read", l.ent), "")
			continue
		}
		adj[na[k]] = append(adj[na[k]], k)
		adj[nb[k]] = append(adj[nb[k]], k)
	}
	used := make([]bool, len(d.lines))
	// walk follows unused lines from node n through nodes of degree 2.
	walk := func(n, k int) {
		l := d.lines[k]
		var pts []geometry.Vec3
		var origins []geometry.Origin
		if na[k] == n {
			pts, origins = append(pts, l.a), append(origins, geometry.Origin{File: d.file, Line: l.la, Entity: l.ent})
		} else {
			pts, origins = append(pts, l.b), append(origins, geometry.Origin{File: d.file, Line: l.lb, Entity: l.ent})
		}
		start, first := n, l.ent
		for {
			used[k] = true
			l = d.lines[k]
			if na[k] == n {
				n = nb[k]
				pts, origins = append(pts, l.b), append(origins, geometry.Origin{File: d.file, Line: l.lb, Entity: l.ent})
			} else {
				n = na[k]
				pts, origins = append(pts, l.a), append(origins, geometry.Origin{File: d.file, Line: l.la, Entity: l.ent})
			}
			first = min(first, l.ent)
			if len(adj[n]) != 2 || n == start {
				break
			}
			next := adj[n][0]
			if next == k {
				next = adj[n][1]
			}
			if used[next] {
				break
			}
			k = next
		}
		if n == start && len(pts) > 2 {
			pts, origins = pts[:len(pts)-1], origins[:len(origins)-1]
		}
		d.runs = append(d.runs, dxfRun{pts: pts, origins: origins, first: first})
	}
	nodes := make([]int, 0, len(adj))
	for n := range adj {
		nodes = append(nodes, n)
	}
	sort.Ints(nodes)
	for _, n := range nodes {
		if len(adj[n]) == 2 {
			continue
		}
		for _, k := range adj[n] {
			if !used[k] {
				walk(n, k)
			}
		}
	}
	for k := range d.lines {
		if !used[k] && na[k] != nb[k] {
			walk(na[k], k)
		}
	}
}

// cloud assembles the cloud: runs in the order of their first entity, then
// the POINT entities.
func (d *dxfReader) cloud() (*geometry.Cloud, statedUnit, error) {
	if len(d.runs) == 0 && len(d.loose) == 0 {
		return nil, d.unit, &geometry.ParseError{File: d.file, Err: ErrNoEntities}
	}
	sort.SliceStable(d.runs, func(a, b int) bool { return d.runs[a].first < d.runs[b].first })
	c := &geometry.Cloud{Format: FormatDXF, Dim: 2}
	for _, r := range d.runs {
		if len(d.runs) > 1 {
			c.Segments = append(c.Segments, len(c.Points))
		}
		c.Points = append(c.Points, r.pts...)
		c.Origins = append(c.Origins, r.origins...)
	}
	c.Ordered = len(d.runs) > 0 && len(d.loose) == 0
	if len(d.runs) > 0 && len(d.loose) > 0 {
		c.Segments = nil
		d.notes.Add(d.file, 0, fmt.Sprintf("%d POINT entities alongside %d polyline run(s): the order of the runs is not kept", len(d.loose), len(d.runs)), "")
	}
	c.Points = append(c.Points, d.loose...)
	c.Origins = append(c.Origins, d.looseAt...)
	for _, p := range c.Points {
		if p.Z != 0 {
			c.Dim = 3
			break
		}
	}
	types := make([]string, 0, len(d.ignored))
	for t := range d.ignored {
		types = append(types, t)
	}
	sort.Strings(types)
	for _, t := range types {
		d.notes.Add(d.file, 0, fmt.Sprintf("%d %s entit%s not read", d.ignored[t], t, map[bool]string{true: "y", false: "ies"}[d.ignored[t] == 1]), "")
	}
	c.Notes = d.notes.List(d.file)
	return c, d.unit, nil
}

// dxfWelder gives the same id to points within tol of each other, using a
// grid of cells of side tol (points closer than tol lie in neighbouring
// cells).
type dxfWelder struct {
	tol  float64
	lo   geometry.Vec3
	pts  []geometry.Vec3
	grid map[[3]int64][]int
}

// init sets the tolerance to 1e-9 of the extent of pts.
func (w *dxfWelder) init(pts []geometry.Vec3) {
	lo, hi := pts[0], pts[0]
	for _, p := range pts {
		lo = geometry.Vec3{X: math.Min(lo.X, p.X), Y: math.Min(lo.Y, p.Y), Z: math.Min(lo.Z, p.Z)}
		hi = geometry.Vec3{X: math.Max(hi.X, p.X), Y: math.Max(hi.Y, p.Y), Z: math.Max(hi.Z, p.Z)}
	}
	w.lo = lo
	w.tol = 1e-9 * hi.Sub(lo).Norm()
	w.grid = map[[3]int64][]int{}
}

func (w *dxfWelder) cell(p geometry.Vec3) [3]int64 {
	if w.tol == 0 {
		return [3]int64{}
	}
	f := func(x float64) int64 { return int64(math.Floor(x / w.tol)) }
	q := p.Sub(w.lo) // within the extent, so q/tol is at most about 1e9
	return [3]int64{f(q.X), f(q.Y), f(q.Z)}
}

// id returns the id of the point within tol of p, adding p if there is none.
func (w *dxfWelder) id(p geometry.Vec3) int {
	c := w.cell(p)
	for dx := int64(-1); dx <= 1; dx++ {
		for dy := int64(-1); dy <= 1; dy++ {
			for dz := int64(-1); dz <= 1; dz++ {
				for _, k := range w.grid[[3]int64{c[0] + dx, c[1] + dy, c[2] + dz}] {
					if w.pts[k].Sub(p).Norm() <= w.tol {
						return k
					}
				}
			}
		}
	}
	w.pts = append(w.pts, p)
	w.grid[c] = append(w.grid[c], len(w.pts)-1)
	return len(w.pts) - 1
}
