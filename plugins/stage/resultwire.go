package stage

import (
	"encoding/binary"
	"math"
	"slices"
	"unicode/utf8"

	"google.golang.org/protobuf/encoding/protowire"
)

// A stage's Run reply is written on the stage's side straight from its
// result document into the wire bytes of the packed Result (field 7 of
// RunResponse): each case's points go from the document into the packed
// arrays of the bytes, with no stagev1.Result in between (whose arrays
// ResultToProto allocated, only for protobuf to copy them again into the
// message). The bytes are those protobuf writes for ResultToProto's
// message with its maps in key order (proto.MarshalOptions.Deterministic),
// so nothing changes on the wire for a host: fields in number order, zero
// scalars left out, -0 kept, a failed case as {failed: true}, a check a
// case lacks and a null field value as NaN.
//
// The bytes ride in the RunResponse as its unknown fields, which protobuf
// writes as they are after the known ones (field 7 is the last field of
// the message); a document with a string that is not UTF-8, which
// protobuf refuses to write, goes the generic way and fails there as
// before.

// resultField returns the wire bytes of field 7 of a RunResponse (tag,
// length and the Result message) holding d, and false if a string of d
// is not valid UTF-8.
func resultField(d *ResultDoc) ([]byte, bool) {
	if !validStrings(d) {
		return nil, false
	}
	w := resultWriter{d: d, names: checkNames(d.Cases)}
	w.sharedCp, w.cpShared = sharedCp(d.Cases)
	w.sharedLoad, w.loadShared = sharedLoad(d.Cases)
	n := w.size()
	b := make([]byte, 0, protowire.SizeTag(7)+protowire.SizeVarint(uint64(n))+n)
	b = protowire.AppendTag(b, 7, protowire.BytesType)
	b = protowire.AppendVarint(b, uint64(n))
	return w.append(b), true
}

// validStrings reports whether every string of d is valid UTF-8.
func validStrings(d *ResultDoc) bool {
	if !utf8.ValidString(d.Stage) || !utf8.ValidString(d.Version) {
		return false
	}
	for k := range d.Scalars {
		if !utf8.ValidString(k) {
			return false
		}
	}
	for _, w := range d.Warnings {
		if !utf8.ValidString(w) {
			return false
		}
	}
	for _, c := range d.Cases {
		if c == nil {
			continue
		}
		for k := range c.Checks {
			if !utf8.ValidString(k) {
				return false
			}
		}
	}
	return true
}

// resultWriter writes the Result message of d.
type resultWriter struct {
	d          *ResultDoc
	names      []string // check names, sorted
	sharedCp   []CpPoint
	cpShared   bool
	sharedLoad []LoadPoint
	loadShared bool
}

// Sizes of the parts of the messages: a tag of a field numbered below 16
// is one byte.
const (
	tagSize    = 1
	doubleSize = tagSize + 8
)

// stringSize is the size of a string (or message) field of n bytes.
func stringSize(n int) int { return tagSize + protowire.SizeVarint(uint64(n)) + n }

// packedSize is the size of a packed double field of n values (none when
// n is 0).
func packedSize(n int) int {
	if n == 0 {
		return 0
	}
	return stringSize(8 * n)
}

// scalarSize is the size of a double field of value v (none when v is
// +0, which proto3 leaves out).
func scalarSize(v float64) int {
	if math.Float64bits(v) == 0 {
		return 0
	}
	return doubleSize
}

func (w *resultWriter) size() int {
	d := w.d
	n := 0
	if d.Stage != "" {
		n += stringSize(len(d.Stage))
	}
	if d.Version != "" {
		n += stringSize(len(d.Version))
	}
	for k := range d.Scalars {
		n += stringSize(stringSize(len(k)) + doubleSize)
	}
	for _, c := range d.Cases {
		n += stringSize(w.caseSize(c))
	}
	for _, s := range d.Warnings {
		n += stringSize(len(s))
	}
	if w.cpShared {
		n += 2 * packedSize(len(w.sharedCp))
	}
	if w.loadShared {
		n += packedSize(len(w.sharedLoad))
	}
	for _, s := range w.names {
		n += stringSize(len(s))
	}
	return n
}

func (w *resultWriter) caseSize(c *Case) int {
	if c == nil {
		return tagSize + 1 // failed: true
	}
	n := scalarSize(c.AlphaDeg) + scalarSize(c.CL) + scalarSize(c.CMc4)
	if len(c.Checks) > 0 {
		n += packedSize(len(w.names))
	}
	n += packedSize(len(c.Cp))
	if !w.cpShared {
		n += 2 * packedSize(len(c.Cp))
	}
	n += packedSize(len(c.Load))
	if !w.loadShared {
		n += packedSize(len(c.Load))
	}
	if f := c.Field; f != nil {
		n += stringSize(fieldSize(f))
	}
	return n
}

func fieldSize(f *Field) int {
	n := scalarSize(f.X0) + scalarSize(f.Y0) + scalarSize(f.DX) + scalarSize(f.DY)
	if v := int32(f.NX); v != 0 {
		n += tagSize + protowire.SizeVarint(uint64(int64(v)))
	}
	if v := int32(f.NY); v != 0 {
		n += tagSize + protowire.SizeVarint(uint64(int64(v)))
	}
	return n + packedSize(len(f.Psi)) + packedSize(len(f.Cp))
}

func (w *resultWriter) append(b []byte) []byte {
	d := w.d
	b = appendStringField(b, 1, d.Stage)
	b = appendStringField(b, 2, d.Version)
	keys := make([]string, 0, len(d.Scalars))
	for k := range d.Scalars {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	for _, k := range keys {
		// A map entry has its key and value whatever they are.
		b = protowire.AppendTag(b, 3, protowire.BytesType)
		b = protowire.AppendVarint(b, uint64(stringSize(len(k))+doubleSize))
		b = protowire.AppendTag(b, 1, protowire.BytesType)
		b = protowire.AppendString(b, k)
		b = protowire.AppendTag(b, 2, protowire.Fixed64Type)
		b = protowire.AppendFixed64(b, math.Float64bits(d.Scalars[k]))
	}
	for _, c := range d.Cases {
		b = protowire.AppendTag(b, 4, protowire.BytesType)
		b = protowire.AppendVarint(b, uint64(w.caseSize(c)))
		b = w.appendCase(b, c)
	}
	for _, s := range d.Warnings {
		b = protowire.AppendTag(b, 5, protowire.BytesType)
		b = protowire.AppendString(b, s)
	}
	if w.cpShared {
		b = appendCpColumn(b, 6, w.sharedCp, cpX)
		b = appendCpColumn(b, 7, w.sharedCp, cpY)
	}
	if w.loadShared {
		b = appendLoadColumn(b, 8, w.sharedLoad, loadX)
	}
	for _, s := range w.names {
		b = protowire.AppendTag(b, 9, protowire.BytesType)
		b = protowire.AppendString(b, s)
	}
	return b
}

func (w *resultWriter) appendCase(b []byte, c *Case) []byte {
	if c == nil {
		b = protowire.AppendTag(b, 1, protowire.VarintType)
		return protowire.AppendVarint(b, 1)
	}
	b = appendDouble(b, 2, c.AlphaDeg)
	b = appendDouble(b, 3, c.CL)
	b = appendDouble(b, 4, c.CMc4)
	if len(c.Checks) > 0 {
		b = appendPacked(b, 5, len(w.names), func(k int) float64 {
			if v, ok := c.Checks[w.names[k]]; ok {
				return v
			}
			return math.NaN()
		})
	}
	b = appendCpColumn(b, 6, c.Cp, cpValue)
	if !w.cpShared {
		b = appendCpColumn(b, 7, c.Cp, cpX)
		b = appendCpColumn(b, 8, c.Cp, cpY)
	}
	b = appendLoadColumn(b, 9, c.Load, loadDCp)
	if !w.loadShared {
		b = appendLoadColumn(b, 10, c.Load, loadX)
	}
	if f := c.Field; f != nil {
		b = protowire.AppendTag(b, 11, protowire.BytesType)
		b = protowire.AppendVarint(b, uint64(fieldSize(f)))
		b = appendDouble(b, 1, f.X0)
		b = appendDouble(b, 2, f.Y0)
		b = appendDouble(b, 3, f.DX)
		b = appendDouble(b, 4, f.DY)
		b = appendInt32(b, 5, int32(f.NX))
		b = appendInt32(b, 6, int32(f.NY))
		b = appendPacked(b, 7, len(f.Psi), func(k int) float64 { return orNaN(f.Psi[k]) })
		b = appendPacked(b, 8, len(f.Cp), func(k int) float64 { return orNaN(f.Cp[k]) })
	}
	return b
}

// appendStringField appends string field num unless s is empty.
func appendStringField(b []byte, num protowire.Number, s string) []byte {
	if s == "" {
		return b
	}
	b = protowire.AppendTag(b, num, protowire.BytesType)
	return protowire.AppendString(b, s)
}

// appendDouble appends double field num unless v is +0.
func appendDouble(b []byte, num protowire.Number, v float64) []byte {
	if math.Float64bits(v) == 0 {
		return b
	}
	b = protowire.AppendTag(b, num, protowire.Fixed64Type)
	return protowire.AppendFixed64(b, math.Float64bits(v))
}

// appendInt32 appends int32 field num unless v is 0.
func appendInt32(b []byte, num protowire.Number, v int32) []byte {
	if v == 0 {
		return b
	}
	b = protowire.AppendTag(b, num, protowire.VarintType)
	return protowire.AppendVarint(b, uint64(int64(v)))
}

// appendPacked appends packed double field num of the n values at(0), …,
// at(n−1), nothing when n is 0.
func appendPacked(b []byte, num protowire.Number, n int, at func(k int) float64) []byte {
	if n == 0 {
		return b
	}
	b, dst := growPacked(b, num, n)
	for k := range n {
		binary.LittleEndian.PutUint64(dst[8*k:8*k+8], math.Float64bits(at(k)))
	}
	return b
}

// The columns of points appendCpColumn and appendLoadColumn write.
const (
	cpX = iota
	cpY
	cpValue
	loadX   = 0
	loadDCp = 1
)

// appendCpColumn appends packed double field num holding one column of
// pts (cpX, cpY or cpValue), nothing when pts is empty. It is
// appendPacked with a loop of its own per column: the points of the
// pressure distributions are most of a reply's numbers.
func appendCpColumn(b []byte, num protowire.Number, pts []CpPoint, column int) []byte {
	if len(pts) == 0 {
		return b
	}
	b, dst := growPacked(b, num, len(pts))
	switch column {
	case cpX:
		for k := range pts {
			binary.LittleEndian.PutUint64(dst[8*k:8*k+8], math.Float64bits(pts[k].X))
		}
	case cpY:
		for k := range pts {
			binary.LittleEndian.PutUint64(dst[8*k:8*k+8], math.Float64bits(pts[k].Y))
		}
	default:
		for k := range pts {
			binary.LittleEndian.PutUint64(dst[8*k:8*k+8], math.Float64bits(pts[k].Cp))
		}
	}
	return b
}

// appendLoadColumn is appendCpColumn for load stations (loadX or
// loadDCp).
func appendLoadColumn(b []byte, num protowire.Number, pts []LoadPoint, column int) []byte {
	if len(pts) == 0 {
		return b
	}
	b, dst := growPacked(b, num, len(pts))
	for k := range pts {
		v := pts[k].DCp
		if column == loadX {
			v = pts[k].X
		}
		binary.LittleEndian.PutUint64(dst[8*k:8*k+8], math.Float64bits(v))
	}
	return b
}

// growPacked appends the tag and length of packed double field num of n
// values, and room for the values, which it returns as dst.
func growPacked(b []byte, num protowire.Number, n int) (_, dst []byte) {
	b = protowire.AppendTag(b, num, protowire.BytesType)
	b = protowire.AppendVarint(b, uint64(8*n))
	o := len(b)
	b = slices.Grow(b, 8*n)[:o+8*n]
	return b, b[o:]
}

// orNaN returns *v, or NaN for nil.
func orNaN(v *float64) float64 {
	if v == nil {
		return math.NaN()
	}
	return *v
}
