package stage

import (
	"encoding/binary"
	"math"
	"slices"
	"sync"
	"unicode/utf8"

	"google.golang.org/grpc/encoding"
	"google.golang.org/grpc/mem"
	"google.golang.org/protobuf/encoding/protowire"
	"google.golang.org/protobuf/proto"

	"github.com/foilwright/foilwright/plugins/gen/stagev1"
)

// A Run reply is read on the host's side straight from its wire bytes into
// a result document: the packed arrays of each case go from the bytes into
// the case's points, with no stagev1.Result in between (whose arrays the
// generic decoder allocates, only for ResultFromProto to copy them into the
// points). That intermediate message was about a third of what a call
// allocated on the host's side, and its decoding and copying most of the
// host's processor time per call outside the round trip itself.
//
// The bytes are the same protobuf message as before (stage.proto); nothing
// changes on the wire or for a stage. The reader takes any valid encoding
// of the fields it knows (packed or one number at a time, in any order,
// unknown fields skipped); a message it does not take in this form (a
// message-typed field given twice, which protobuf merges; a field of
// another wire type; a string that is not UTF-8; broken bytes) is decoded
// by the generic decoder as before, and the result document is then made
// by ResultFromProto. Both ways give the same document and the same error.

// replyCodec is the codec of one Run call on the host's side (a
// grpc.ForceCodecV2 call option): the request is encoded by gRPC's proto
// codec; the reply is read by readRunResponse, and its result document
// kept in the codec for the caller.
type replyCodec struct {
	direct bool       // the reply was read by readRunResponse
	packed bool       // it held a packed result (field 7)
	doc    *ResultDoc // that result, when well formed
	err    error      // else why not (wraps ErrMalformed)
}

// protoCodec is gRPC's codec for protobuf messages.
func protoCodec() encoding.CodecV2 { return encoding.GetCodecV2("proto") }

// Name is empty so that the call's content type stays "application/grpc",
// as without a codec of its own (a named codec would add "+name").
func (*replyCodec) Name() string { return "" }

func (*replyCodec) Marshal(v any) (mem.BufferSlice, error) { return protoCodec().Marshal(v) }

func (c *replyCodec) Unmarshal(data mem.BufferSlice, v any) error {
	out, ok := v.(*stagev1.RunResponse)
	if !ok {
		return protoCodec().Unmarshal(data, v)
	}
	buf := data.MaterializeToBuffer(mem.DefaultBufferPool())
	defer buf.Free()
	return c.read(buf.ReadOnlyData(), out)
}

// read reads the Run reply b into out, as Unmarshal does; nothing of out
// refers to b afterwards.
func (c *replyCodec) read(b []byte, out *stagev1.RunResponse) error {
	if packed, doc, err, ok := readRunResponse(b, out); ok {
		c.direct, c.packed, c.doc, c.err = true, packed, doc, err
		return nil
	}
	proto.Reset(out)
	return proto.Unmarshal(b, out)
}

// readRunResponse reads the RunResponse message b into out, all but its
// result (field 7), which it returns as a checked result document with
// the error ResultFromProto would give for it; packed reports whether the
// message has a result. ok is false when b is not in a form this reader
// takes (see above); out is then partly filled.
func readRunResponse(b []byte, out *stagev1.RunResponse) (packed bool, doc *ResultDoc, err error, ok bool) {
	var result []byte
	for len(b) > 0 {
		num, typ, n := protowire.ConsumeTag(b)
		if n < 0 {
			return false, nil, nil, false
		}
		b = b[n:]
		if num > 7 {
			if n = protowire.ConsumeFieldValue(num, typ, b); n < 0 {
				return false, nil, nil, false
			}
			b = b[n:]
			continue
		}
		if num == 4 {
			if typ != protowire.VarintType {
				return false, nil, nil, false
			}
			v, n := protowire.ConsumeVarint(b)
			if n < 0 {
				return false, nil, nil, false
			}
			out.ErrorCode, b = stagev1.ErrorCode(int32(v)), b[n:]
			continue
		}
		if typ != protowire.BytesType {
			return false, nil, nil, false
		}
		v, n := protowire.ConsumeBytes(b)
		if n < 0 {
			return false, nil, nil, false
		}
		b = b[n:]
		switch num {
		case 1:
			out.ResultJson = append([]byte{}, v...)
		case 2:
			a, ok := readArtifact(v)
			if !ok {
				return false, nil, nil, false
			}
			out.Artifacts = append(out.Artifacts, a)
		case 3:
			if !utf8.Valid(v) {
				return false, nil, nil, false
			}
			out.Warnings = append(out.Warnings, string(v))
		case 5:
			if !utf8.Valid(v) {
				return false, nil, nil, false
			}
			out.ErrorMessage = string(v)
		case 6:
			k, x, ok := readMapEntry(v)
			if !ok {
				return false, nil, nil, false
			}
			if out.TimingsMs == nil {
				out.TimingsMs = map[string]float64{}
			}
			out.TimingsMs[k] = x
		case 7:
			if result != nil {
				return false, nil, nil, false // merged by protobuf: the generic decoder's
			}
			result = v
		default: // num 0 is refused by ConsumeTag
			return false, nil, nil, false
		}
	}
	if result == nil {
		return false, nil, nil, true
	}
	s := scratchPool.Get().(*wireScratch)
	defer scratchPool.Put(s)
	doc, err, ok = s.readResult(result)
	return true, doc, err, ok
}

// readArtifact reads an Artifact message.
func readArtifact(b []byte) (*stagev1.Artifact, bool) {
	a := &stagev1.Artifact{}
	for len(b) > 0 {
		num, typ, n := protowire.ConsumeTag(b)
		if n < 0 {
			return nil, false
		}
		b = b[n:]
		if num > 3 {
			if n = protowire.ConsumeFieldValue(num, typ, b); n < 0 {
				return nil, false
			}
			b = b[n:]
			continue
		}
		if typ != protowire.BytesType {
			return nil, false
		}
		v, n := protowire.ConsumeBytes(b)
		if n < 0 {
			return nil, false
		}
		b = b[n:]
		switch {
		case num == 3:
			a.Data = append([]byte{}, v...)
		case !utf8.Valid(v):
			return nil, false
		case num == 1:
			a.Name = string(v)
		default:
			a.MediaType = string(v)
		}
	}
	return a, true
}

// readMapEntry reads an entry of a map<string, double>: a missing key is
// "", a missing value 0, as protobuf has them.
func readMapEntry(b []byte) (key string, value float64, ok bool) {
	for len(b) > 0 {
		num, typ, n := protowire.ConsumeTag(b)
		if n < 0 {
			return "", 0, false
		}
		b = b[n:]
		switch {
		case num == 1 && typ == protowire.BytesType:
			v, n := protowire.ConsumeBytes(b)
			if n < 0 || !utf8.Valid(v) {
				return "", 0, false
			}
			key, b = string(v), b[n:]
		case num == 2 && typ == protowire.Fixed64Type:
			v, n := protowire.ConsumeFixed64(b)
			if n < 0 {
				return "", 0, false
			}
			value, b = math.Float64frombits(v), b[n:]
		case num == 1 || num == 2:
			return "", 0, false
		default:
			if n = protowire.ConsumeFieldValue(num, typ, b); n < 0 {
				return "", 0, false
			}
			b = b[n:]
		}
	}
	return key, value, true
}

// appendDoubles appends the numbers of a repeated double field to dst: b
// is what follows the tag, typ its wire type (bytes when packed, fixed64
// for one number). It returns the bytes read, or -1.
func appendDoubles(dst []float64, typ protowire.Type, b []byte) ([]float64, int) {
	switch typ {
	case protowire.BytesType:
		v, n := protowire.ConsumeBytes(b)
		if n < 0 || len(v)%8 != 0 {
			return dst, -1
		}
		o, k := len(dst), len(v)/8
		dst = slices.Grow(dst, k)[:o+k]
		for i, d := 0, dst[o:]; i < len(d); i++ {
			d[i] = math.Float64frombits(binary.LittleEndian.Uint64(v[8*i : 8*i+8]))
		}
		return dst, n
	case protowire.Fixed64Type:
		v, n := protowire.ConsumeFixed64(b)
		if n < 0 {
			return dst, -1
		}
		return append(dst, math.Float64frombits(v)), n
	}
	return dst, -1
}

// skipDoubles checks the numbers of a repeated double field as
// appendDoubles reads them, and returns the bytes they take, or -1.
func skipDoubles(typ protowire.Type, b []byte) int {
	switch typ {
	case protowire.BytesType:
		v, n := protowire.ConsumeBytes(b)
		if n < 0 || len(v)%8 != 0 {
			return -1
		}
		return n
	case protowire.Fixed64Type:
		_, n := protowire.ConsumeFixed64(b)
		return n
	}
	return -1
}

// wireScratch holds what readResult reuses from one reply to the next:
// the columns of the case being read (copied into the case's own points
// by caseColumns.result) and the places of the cases in the bytes.
type wireScratch struct {
	cases              [][]byte
	cpX, cpY, loadX    []float64
	checks, cp, caseX  []float64
	caseY, dcp, caseLX []float64
	scalars            map[string]float64
	warnings, names    []string
}

var scratchPool = sync.Pool{New: func() any { return &wireScratch{scalars: map[string]float64{}} }}

// readResult reads a Result message into a checked result document, or
// the error ResultFromProto gives for it. ok is false when b is not in a
// form the reader takes.
func (s *wireScratch) readResult(b []byte) (_ *ResultDoc, _ error, ok bool) {
	s.cases, s.cpX, s.cpY, s.loadX = s.cases[:0], s.cpX[:0], s.cpY[:0], s.loadX[:0]
	s.warnings, s.names = s.warnings[:0], s.names[:0]
	clear(s.scalars)
	defer func() { clear(s.cases); clear(s.warnings); clear(s.names); clear(s.scalars) }()
	var stageName, version string
	for len(b) > 0 {
		num, typ, n := protowire.ConsumeTag(b)
		if n < 0 {
			return nil, nil, false
		}
		b = b[n:]
		switch num {
		case 6:
			s.cpX, n = appendDoubles(s.cpX, typ, b)
		case 7:
			s.cpY, n = appendDoubles(s.cpY, typ, b)
		case 8:
			s.loadX, n = appendDoubles(s.loadX, typ, b)
		case 1, 2, 3, 4, 5, 9:
			if typ != protowire.BytesType {
				return nil, nil, false
			}
			var v []byte
			if v, n = protowire.ConsumeBytes(b); n < 0 {
				return nil, nil, false
			}
			switch num {
			case 3:
				k, x, ok := readMapEntry(v)
				if !ok {
					return nil, nil, false
				}
				s.scalars[k] = x
			case 4:
				s.cases = append(s.cases, v)
			default:
				if !utf8.Valid(v) {
					return nil, nil, false
				}
				switch num {
				case 1:
					stageName = string(v)
				case 2:
					version = string(v)
				case 5:
					s.warnings = append(s.warnings, string(v))
				case 9:
					s.names = append(s.names, string(v))
				}
			}
		default:
			n = protowire.ConsumeFieldValue(num, typ, b)
		}
		if n < 0 {
			return nil, nil, false
		}
		b = b[n:]
	}
	// Every case is looked through before any is read, so that broken
	// bytes anywhere go to the generic decoder, whose error that is.
	fields := make([]*stagev1.Field, len(s.cases))
	for i, c := range s.cases {
		field, ok := s.readCase(c, nil, false)
		if !ok {
			return nil, nil, false
		}
		if field != nil {
			fields[i] = &stagev1.Field{}
			if err := proto.Unmarshal(field, fields[i]); err != nil {
				return nil, nil, false
			}
		}
	}
	d, err := packedHead(stageName, version, s.scalars, s.warnings, s.names, s.cpX, s.cpY, len(s.cases))
	if err != nil {
		return nil, err, true
	}
	shared := sharedColumns{cpX: s.cpX, cpY: s.cpY, loadX: s.loadX, checkNames: s.names}
	var cols caseColumns
	for i, c := range s.cases {
		cols = caseColumns{field: fields[i]}
		if _, ok := s.readCase(c, &cols, true); !ok {
			return nil, nil, false // not reached: the same bytes were looked through
		}
		if cols.failed {
			continue
		}
		if d.Cases[i], err = cols.result(i, &shared); err != nil {
			return nil, err, true
		}
	}
	return d, nil, true
}

// readCase reads the Case message b. Looking through (read false), it
// checks the bytes and returns those of the case's field, if any; reading,
// it sets the coefficients and columns of c, the columns in s's slices.
// ok is false when b is not in a form the reader takes, as when the field
// is given twice.
func (s *wireScratch) readCase(b []byte, c *caseColumns, read bool) (field []byte, ok bool) {
	if read {
		s.checks, s.cp, s.caseX, s.caseY, s.dcp, s.caseLX = s.checks[:0], s.cp[:0], s.caseX[:0], s.caseY[:0], s.dcp[:0], s.caseLX[:0]
	}
	for len(b) > 0 {
		num, typ, n := protowire.ConsumeTag(b)
		if n < 0 {
			return nil, false
		}
		b = b[n:]
		var x uint64
		switch num {
		case 1:
			if typ != protowire.VarintType {
				return nil, false
			}
			x, n = protowire.ConsumeVarint(b)
			if read {
				c.failed = x != 0
			}
		case 2, 3, 4:
			if typ != protowire.Fixed64Type {
				return nil, false
			}
			x, n = protowire.ConsumeFixed64(b)
			if read {
				switch v := math.Float64frombits(x); num {
				case 2:
					c.alpha = v
				case 3:
					c.cl = v
				default:
					c.cm = v
				}
			}
		case 5, 6, 7, 8, 9, 10:
			if !read {
				n = skipDoubles(typ, b)
				break
			}
			dst := [...]*[]float64{&s.checks, &s.cp, &s.caseX, &s.caseY, &s.dcp, &s.caseLX}[num-5]
			*dst, n = appendDoubles(*dst, typ, b)
		case 11:
			if typ != protowire.BytesType || field != nil {
				return nil, false // a field given twice is merged by protobuf
			}
			field, n = protowire.ConsumeBytes(b)
			if field == nil && n >= 0 {
				field = []byte{}
			}
		default:
			n = protowire.ConsumeFieldValue(num, typ, b)
		}
		if n < 0 {
			return nil, false
		}
		b = b[n:]
	}
	if read {
		c.checks, c.cp, c.cpX, c.cpY, c.loadDcp, c.loadX = s.checks, s.cp, s.caseX, s.caseY, s.dcp, s.caseLX
	}
	return field, true
}
