package stage

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"reflect"
	"testing"

	"google.golang.org/grpc/encoding"
	"google.golang.org/protobuf/encoding/protowire"
	"google.golang.org/protobuf/proto"

	"github.com/foilwright/foilwright/plugins/gen/stagev1"
)

// wireDocs are result documents of every shape resultField writes: points
// shared or each case's own, loads shared or not, checks some cases lack,
// fields with nulls, failed cases, zeros and negative zeros (proto3 leaves
// +0 out and keeps -0), a negative grid size, empty strings and no cases.
func wireDocs() map[string]*ResultDoc {
	own := NewResultDoc(Info{Name: "toy", Version: "1"})
	own.AddCase(Case{AlphaDeg: 0, Cp: []CpPoint{{X: 0, Y: 0, Cp: 1}, {X: 1, Y: 0, Cp: 0.5}}, Load: []LoadPoint{{X: 0.5, DCp: 1}}})
	own.AddCase(Case{AlphaDeg: 2, Cp: []CpPoint{{X: 0, Y: 0, Cp: 1}}, Load: []LoadPoint{{X: 0.4, DCp: 2}}})
	zeros := NewResultDoc(Info{Name: "zeros", Version: "0"})
	zeros.SetScalar("", 0)
	zeros.SetScalar("negative zero", math.Copysign(0, -1))
	zeros.AddCase(Case{AlphaDeg: math.Copysign(0, -1), CL: 0, CMc4: math.Copysign(0, -1),
		Checks: map[string]float64{"": 0}, Cp: []CpPoint{{X: math.Copysign(0, -1)}}})
	zeros.Cases = append(zeros.Cases, &Case{Field: &Field{NX: -1, NY: 0}})
	zeros.Warnings = append(zeros.Warnings, "", "second")
	failed := NewResultDoc(Info{Name: "failed", Version: "3"})
	failed.FailCase(0, errors.New("no"))
	failed.FailCase(1, errors.New("no again"))
	large := bigDoc()
	for k := range 200 { // a scalar map beyond 127 bytes a message
		large.SetScalar(string(rune('a'+k%26))+string(rune('A'+k/26)), float64(k)*1.5)
	}
	return map[string]*ResultDoc{
		"small": smallDoc(), "big": bigDoc(), "own points": own, "zeros": zeros, "failed": failed,
		"large scalars": large, "empty": NewResultDoc(Info{Name: "none", Version: "0"}),
		"zero value": {},
	}
}

// TestResultFieldAsProtobuf: the bytes resultField writes are, byte for
// byte, those protobuf (the reference implementation of the wire format,
// google.golang.org/protobuf) writes for field 7 holding ResultToProto's
// message, its maps in key order.
func TestResultFieldAsProtobuf(t *testing.T) {
	for name, d := range wireDocs() {
		got, ok := resultField(d)
		if !ok {
			t.Errorf("%s: not written", name)
			continue
		}
		want, err := proto.MarshalOptions{Deterministic: true}.Marshal(&stagev1.RunResponse{Result: ResultToProto(d)})
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if !bytes.Equal(got, want) {
			t.Errorf("%s: %d bytes differ from protobuf's %d\n got % x\nwant % x", name, len(got), len(want), got[:min(len(got), 64)], want[:min(len(want), 64)])
		}
	}
}

// TestRunResponseWritten: a reply as a stage's gRPC server writes it (the
// gRPC proto codec, other fields set) is read by the host's direct reader
// and by the generated decoder into the document (or the error) that
// ResultToProto's message gives, with the reply's other fields.
func TestRunResponseWritten(t *testing.T) {
	codec := encoding.GetCodecV2("proto")
	for name, d := range wireDocs() {
		if d.Stage == "" {
			continue // refused by the reader, as before
		}
		res := Result{Doc: d, Warnings: []string{"from the reply"},
			Artifacts: []Artifact{{Name: "a.svg", MediaType: "image/svg+xml", Data: []byte("<svg/>")}}}
		out := resultToResponse(res)
		if out.Result != nil {
			t.Fatalf("%s: the result went through ResultToProto", name)
		}
		buf, err := codec.Marshal(out)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		wire := buf.Materialize()
		buf.Free()
		same(t, name, wire)
		var got stagev1.RunResponse
		_, doc, err, ok := readRunResponse(wire, &got)
		want, werr := ResultFromProto(ResultToProto(d))
		if !ok || fmt.Sprint(err) != fmt.Sprint(werr) || !reflect.DeepEqual(doc, want) {
			t.Errorf("%s: read back %+v (%v), want %+v (%v)", name, doc, err, want, werr)
		}
		if len(got.Warnings) != 1 || len(got.Artifacts) != 1 || got.Artifacts[0].Name != "a.svg" {
			t.Errorf("%s: reply fields %v", name, &got)
		}
	}
}

// TestResultFieldRefusesBadUTF8: a document with a string that is not
// UTF-8 goes through ResultToProto, whose message protobuf refuses to
// write, as before.
func TestResultFieldRefusesBadUTF8(t *testing.T) {
	bad := "\xff"
	for name, edit := range map[string]func(*ResultDoc){
		"stage":   func(d *ResultDoc) { d.Stage = bad },
		"version": func(d *ResultDoc) { d.Version = bad },
		"scalar":  func(d *ResultDoc) { d.Scalars[bad] = 1 },
		"warning": func(d *ResultDoc) { d.Warnings = append(d.Warnings, bad) },
		"check":   func(d *ResultDoc) { d.Cases[0].Checks[bad] = 1 },
	} {
		d := smallDoc()
		edit(d)
		if _, ok := resultField(d); ok {
			t.Errorf("%s: written", name)
		}
		out := resultToResponse(Result{Doc: d})
		if out.Result == nil {
			t.Errorf("%s: no message for protobuf to refuse", name)
			continue
		}
		if _, err := proto.Marshal(out); err == nil {
			t.Errorf("%s: protobuf wrote it", name)
		}
	}
}

// TestResultFieldIsLastField: field 7 is the last field of RunResponse, so
// a reply with the result as unknown bytes is in field order.
func TestResultFieldIsLastField(t *testing.T) {
	fields := (&stagev1.RunResponse{}).ProtoReflect().Descriptor().Fields()
	for i := range fields.Len() {
		if n := fields.Get(i).Number(); n > 7 {
			t.Errorf("RunResponse has field %d after the result", n)
		}
	}
	if f := fields.ByNumber(7); f == nil || f.Message() == nil || f.Message().FullName() != (&stagev1.Result{}).ProtoReflect().Descriptor().FullName() {
		t.Errorf("field 7 of RunResponse is %v, want the Result", f)
	}
	if protowire.SizeTag(7) != 1 {
		t.Error("tag 7 is not one byte")
	}
}

// BenchmarkReplyEncode writes a reply like the vortex-panel stage's at 17
// angles on 160 panels as the stage's gRPC server does: through
// ResultToProto and protobuf (generic) and straight from the document
// (direct).
func BenchmarkReplyEncode(b *testing.B) {
	d := bigDoc()
	codec := encoding.GetCodecV2("proto")
	timings := map[string]float64{"solve": 1}
	b.Run("generic", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			buf, err := codec.Marshal(&stagev1.RunResponse{Result: ResultToProto(d), TimingsMs: timings})
			if err != nil {
				b.Fatal(err)
			}
			buf.Free()
		}
	})
	b.Run("direct", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			out := resultToResponse(Result{Doc: d})
			out.TimingsMs = timings
			buf, err := codec.Marshal(out)
			if err != nil {
				b.Fatal(err)
			}
			buf.Free()
		}
	})
}
