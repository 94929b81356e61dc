package stage

import (
	"errors"
	"fmt"
	"math"
	"reflect"
	"testing"

	"google.golang.org/grpc/mem"
	"google.golang.org/protobuf/encoding/protowire"
	"google.golang.org/protobuf/proto"

	"github.com/foilwright/foilwright/plugins/gen/stagev1"
)

// bigDoc is a reply like the vortex-panel stage's at 17 angles on 160
// panels: the points shared, one check per case, a failed case.
func bigDoc() *ResultDoc {
	d := NewResultDoc(Info{Name: "big", Version: "2.0"})
	d.SetScalar("panels", 160)
	d.SetScalar("condition", 3.5e4)
	at := make([]CpPoint, 161)
	for k := range at {
		t := 2 * math.Pi * float64(k) / 160
		at[k] = CpPoint{X: 0.5 + 0.5*math.Cos(t), Y: 0.06 * math.Sin(t)}
	}
	for i := range 17 {
		a := float64(i - 4)
		c := Case{AlphaDeg: a, CL: 0.11 * a, CMc4: -0.05, Checks: map[string]float64{"kutta": 1e-15 * a}}
		c.Cp = make([]CpPoint, len(at))
		for k, p := range at {
			c.Cp[k] = CpPoint{X: p.X, Y: p.Y, Cp: 1 - 0.01*a*p.X*float64(k%7)}
		}
		d.AddCase(c)
	}
	d.FailCase(30, errors.New("no convergence"))
	d.Warnings = append(d.Warnings, "a warning with ünïcode")
	return d
}

// smallDoc has a load, checks some cases lack, a field and a failed case.
func smallDoc() *ResultDoc {
	d := NewResultDoc(Info{Name: "toy", Version: "1.2"})
	d.SetScalar("panels", 4)
	at := []CpPoint{{X: 1, Y: 0}, {X: 0.5, Y: 0.0625}, {X: 0, Y: 0}, {X: 0.5, Y: -0.0625}, {X: 1, Y: 0}}
	for i, a := range []float64{-2, 0, 4} {
		c := Case{AlphaDeg: a, CL: 0.11 * a, CMc4: -0.05, Checks: map[string]float64{"closure": 1e-16 * float64(i)}}
		if a == 4 {
			c.Checks["x_cp"] = 0.31
		}
		for _, p := range at {
			c.Cp = append(c.Cp, CpPoint{X: p.X, Y: p.Y, Cp: 1 - 0.1*a*p.X})
		}
		for _, x := range []float64{0.25, 0.5, 0.75} {
			c.Load = append(c.Load, LoadPoint{X: x, DCp: 0.1 * a * (1 - x)})
		}
		d.AddCase(c)
	}
	d.FailCase(12, errors.New("the solver gave up"))
	one, two := 0.5, -1.5
	d.Cases[0].Field = &Field{X0: -0.5, Y0: -0.5, DX: 0.5, DY: 1, NX: 3, NY: 2,
		Psi: []*float64{&one, nil, &two, &one, &one, nil}, Cp: []*float64{&two, nil, &one, &two, &two, nil}}
	return d
}

// generic decodes a RunResponse as the client did before replywire.go: the
// generated decoder, then ResultFromProto.
func generic(t *testing.T, b []byte) (*stagev1.RunResponse, *ResultDoc, error) {
	t.Helper()
	var m stagev1.RunResponse
	// Fields it does not know the direct reader skips.
	if err := (proto.UnmarshalOptions{DiscardUnknown: true}).Unmarshal(b, &m); err != nil {
		t.Fatalf("generic decoder: %v", err)
	}
	if m.GetResult() == nil {
		return &m, nil, nil
	}
	d, err := ResultFromProto(m.GetResult())
	m.Result = nil
	return &m, d, err
}

// same checks that the direct reader reads b as the generic decoder does.
func same(t *testing.T, name string, b []byte) {
	t.Helper()
	wantMsg, wantDoc, wantErr := generic(t, b)
	var got stagev1.RunResponse
	packed, doc, err, ok := readRunResponse(b, &got)
	if !ok {
		t.Errorf("%s: the direct reader did not take the message", name)
		return
	}
	if packed != (wantDoc != nil || wantErr != nil) {
		t.Errorf("%s: packed %v", name, packed)
	}
	if fmt.Sprint(err) != fmt.Sprint(wantErr) || !errors.Is(err, ErrMalformed) != (wantErr == nil) {
		t.Errorf("%s: error %v, want %v", name, err, wantErr)
	}
	if !reflect.DeepEqual(doc, wantDoc) {
		t.Errorf("%s: document\n%+v\nwant\n%+v", name, doc, wantDoc)
	}
	if !proto.Equal(&got, wantMsg) {
		t.Errorf("%s: message %v, want %v", name, &got, wantMsg)
	}
}

func marshal(t *testing.T, m proto.Message) []byte {
	t.Helper()
	b, err := proto.Marshal(m)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// TestReplyWireAsGeneric: replies as the Go SDK encodes them are read
// straight into the same result document, message fields and errors as
// through the generated decoder and ResultFromProto.
func TestReplyWireAsGeneric(t *testing.T) {
	own := NewResultDoc(Info{Name: "toy", Version: "1"})
	own.AddCase(Case{AlphaDeg: 0, Cp: []CpPoint{{X: 0, Y: 0, Cp: 1}, {X: 1, Y: 0, Cp: 0.5}}, Load: []LoadPoint{{X: 0.5, DCp: 1}}})
	own.AddCase(Case{AlphaDeg: 2, Cp: []CpPoint{{X: 0, Y: 0, Cp: 1}}, Load: []LoadPoint{{X: 0.4, DCp: 2}}})
	for name, d := range map[string]*ResultDoc{"sample": smallDoc(), "big": bigDoc(), "own points": own,
		"empty": NewResultDoc(Info{Name: "none", Version: "0"})} {
		resp := &stagev1.RunResponse{
			Result:    ResultToProto(d),
			Warnings:  []string{"from the reply"},
			TimingsMs: map[string]float64{"solve": 1.25, "build": 0.5},
			Artifacts: []*stagev1.Artifact{{Name: "a.svg", MediaType: "image/svg+xml", Data: []byte("<svg/>")}, {Name: "empty"}},
		}
		same(t, name, marshal(t, resp))
		// The document comes back as it went.
		var got stagev1.RunResponse
		if _, doc, err, _ := readRunResponse(marshal(t, resp), &got); err != nil || !reflect.DeepEqual(doc, d) {
			t.Errorf("%s: came back %+v (%v)", name, doc, err)
		}
	}
	// No result, or an error code, or JSON text.
	same(t, "json", marshal(t, &stagev1.RunResponse{ResultJson: []byte(`{"format":"foilwright.result/2"}`)}))
	same(t, "error", marshal(t, &stagev1.RunResponse{ErrorCode: stagev1.ErrorCode(CodeDiverged), ErrorMessage: "diverged"}))
	same(t, "nothing", nil)
}

// TestReplyWireMalformed: a packed result that is not well formed gives the
// error ResultFromProto gives, word for word.
func TestReplyWireMalformed(t *testing.T) {
	for name, spoil := range map[string]func(m *stagev1.Result){
		"no stage":       func(m *stagev1.Result) { m.Stage = "" },
		"NaN scalar":     func(m *stagev1.Result) { m.Scalars["panels"] = math.NaN() },
		"check twice":    func(m *stagev1.Result) { m.CheckNames = append(m.CheckNames, m.CheckNames[0]) },
		"cp_y short":     func(m *stagev1.Result) { m.CpY = m.CpY[1:] },
		"infinite cl":    func(m *stagev1.Result) { m.Cases[2].Cl = math.Inf(1) },
		"NaN cp":         func(m *stagev1.Result) { m.Cases[3].Cp[7] = math.NaN() },
		"checks short":   func(m *stagev1.Result) { m.Cases[1].Checks = nil; m.Cases[4].Checks = m.Cases[4].Checks[:0:0] },
		"extra check":    func(m *stagev1.Result) { m.Cases[5].Checks = append(m.Cases[5].Checks, 1) },
		"points nowhere": func(m *stagev1.Result) { m.CpX, m.CpY = nil, nil },
		"field short": func(m *stagev1.Result) {
			m.Cases[0].Field = &stagev1.Field{Nx: 2, Ny: 2, Psi: []float64{1, 2, 3}, Cp: []float64{1, 2, 3}}
		},
		"field infinite": func(m *stagev1.Result) {
			m.Cases[0].Field = &stagev1.Field{Nx: 1, Ny: 1, Psi: []float64{math.Inf(-1)}, Cp: []float64{1}}
		},
		"failed case ignored": func(m *stagev1.Result) { m.Cases[6] = &stagev1.Case{Failed: true, Cl: math.NaN()} },
	} {
		m := ResultToProto(bigDoc())
		spoil(m)
		same(t, name, marshal(t, &stagev1.RunResponse{Result: m}))
	}
}

// TestReplyWireOtherEncodings: the reader takes what other protobuf
// encoders may write: numbers one at a time instead of packed, a packed
// field in two pieces, fields in another order, fields it does not know,
// a value given twice (the last counts).
func TestReplyWireOtherEncodings(t *testing.T) {
	tag := protowire.AppendTag
	doubles := func(b []byte, num protowire.Number, packed bool, vs ...float64) []byte {
		if !packed {
			for _, v := range vs {
				b = tag(b, num, protowire.Fixed64Type)
				b = protowire.AppendFixed64(b, math.Float64bits(v))
			}
			return b
		}
		var p []byte
		for _, v := range vs {
			p = protowire.AppendFixed64(p, math.Float64bits(v))
		}
		return protowire.AppendBytes(tag(b, num, protowire.BytesType), p)
	}
	str := func(b []byte, num protowire.Number, s string) []byte {
		return protowire.AppendString(tag(b, num, protowire.BytesType), s)
	}
	msg := func(b []byte, num protowire.Number, m []byte) []byte {
		return protowire.AppendBytes(tag(b, num, protowire.BytesType), m)
	}
	unknown := func(b []byte) []byte {
		b = protowire.AppendVarint(tag(b, 99, protowire.VarintType), 7)
		b = str(b, 100, "later versions may add fields")
		return protowire.AppendFixed32(tag(b, 101, protowire.Fixed32Type), 3)
	}
	var c1, c2, c3 []byte
	c1 = doubles(c1, 6, false, 0.5, -0.25, 1) // cp one at a time, before alpha
	c1 = doubles(c1, 2, false, 3)
	c1 = unknown(c1)
	c1 = doubles(c1, 3, false, 0.1, 0.3) // cl twice: 0.3 counts
	c1 = doubles(c1, 5, true, 1e-9)
	c2 = doubles(c2, 6, true, 0.4)
	c2 = doubles(c2, 6, true, 0.2, 0.1) // packed in two pieces
	c2 = doubles(c2, 10, true, 0.25)
	c2 = doubles(c2, 9, false, 2)
	c2 = doubles(c2, 5, false, math.NaN())
	c3 = protowire.AppendVarint(tag(c3, 1, protowire.VarintType), 2) // failed, as 2
	c3 = doubles(c3, 3, false, 7)                                    // ignored
	var field []byte
	field = doubles(field, 1, false, -1)
	field = doubles(field, 3, false, 0.5)
	field = protowire.AppendVarint(tag(field, 5, protowire.VarintType), 2)
	field = protowire.AppendVarint(tag(field, 6, protowire.VarintType), 1)
	field = doubles(field, 7, false, 1, math.NaN())
	field = doubles(field, 8, true, 0, 2)
	c2 = msg(c2, 11, field)

	var r []byte
	r = msg(r, 4, c1) // the cases before the points they use
	r = doubles(r, 6, false, 0, 0.5, 1)
	r = msg(r, 4, c2)
	r = msg(r, 4, c3)
	r = unknown(r)
	r = doubles(r, 7, true, 0, 0.1, 0)
	r = str(r, 9, "closure")
	r = doubles(r, 8, false, 0.5)
	var entry []byte
	entry = doubles(entry, 2, false, 4) // value before key
	entry = str(entry, 1, "panels")
	r = msg(r, 3, entry)
	r = msg(r, 3, str(nil, 1, "zero")) // no value: 0
	r = str(r, 2, "0.9")
	r = str(r, 1, "first")
	r = str(r, 1, "other") // the last counts
	r = str(r, 5, "warned")

	var b []byte
	b = str(b, 3, "w1")
	b = unknown(b)
	b = msg(b, 7, r)
	b = msg(b, 6, doubles(str(nil, 1, "total"), 2, false, 9))
	b = msg(b, 2, str(str(nil, 2, "text/plain"), 1, "note.txt"))
	b = str(b, 3, "w2")
	same(t, "hand-made", b)

	var got stagev1.RunResponse
	_, doc, err, ok := readRunResponse(b, &got)
	if !ok || err != nil || doc.Stage != "other" || doc.Cases[0].CL != 0.3 || len(doc.Cases[1].Cp) != 3 || doc.Cases[2] != nil ||
		doc.Scalars["panels"] != 4 || doc.Cases[1].Field == nil || doc.Cases[1].Field.Psi[1] != nil {
		t.Errorf("read %+v (%v, %v)", doc, err, ok)
	}
}

// TestReplyWireLeavesToGeneric: what protobuf merges (a message given
// twice) and what is not well formed goes to the generated decoder.
func TestReplyWireLeavesToGeneric(t *testing.T) {
	whole := marshal(t, &stagev1.RunResponse{Result: ResultToProto(smallDoc())})
	half := marshal(t, &stagev1.RunResponse{Result: &stagev1.Result{Stage: "toy", Version: "1"}})
	withField := marshal(t, &stagev1.Case{AlphaDeg: 1, Field: &stagev1.Field{Nx: 1, Ny: 1, Psi: []float64{1}, Cp: []float64{1}}})
	twoFields := append(withField, withField[len(marshal(t, &stagev1.Case{AlphaDeg: 1})):]...)
	for name, b := range map[string][]byte{
		"result twice": append(append([]byte{}, whole...), half...),
		"field twice": protowire.AppendBytes(protowire.AppendTag(nil, 7, protowire.BytesType),
			protowire.AppendBytes(protowire.AppendTag([]byte{10, 1, 't', 18, 1, '1'}, 4, protowire.BytesType), twoFields)),
		"not UTF-8":    protowire.AppendString(protowire.AppendTag(nil, 3, protowire.BytesType), "\xff\xfe"),
		"wrong type":   protowire.AppendVarint(protowire.AppendTag(nil, 7, protowire.VarintType), 1),
		"cut short":    whole[:len(whole)-3],
		"odd doubles":  protowire.AppendBytes(protowire.AppendTag(nil, 7, protowire.BytesType), protowire.AppendBytes(protowire.AppendTag(nil, 6, protowire.BytesType), []byte{1, 2, 3})),
		"bad map type": protowire.AppendBytes(protowire.AppendTag(nil, 6, protowire.BytesType), protowire.AppendVarint(protowire.AppendTag(nil, 2, protowire.VarintType), 1)),
	} {
		var got stagev1.RunResponse
		if _, _, _, ok := readRunResponse(b, &got); ok {
			t.Errorf("%s: taken by the direct reader", name)
		}
	}
	// A merged result through the codec: the generic decoder's document.
	b := append(append([]byte{}, half...), whole...)
	var want stagev1.RunResponse
	if err := proto.Unmarshal(b, &want); err != nil {
		t.Fatal(err)
	}
	var got stagev1.RunResponse
	c := &replyCodec{}
	if err := c.Unmarshal(memSlice(b), &got); err != nil || c.direct || !proto.Equal(&got, &want) {
		t.Errorf("merged: %v, direct %v, message %v", err, c.direct, &got)
	}
}

func memSlice(b []byte) mem.BufferSlice { return mem.BufferSlice{mem.SliceBuffer(b)} }

// FuzzReplyWire: whatever bytes the direct reader takes, the generated
// decoder takes too, and both give the same.
func FuzzReplyWire(f *testing.F) {
	add := func(m proto.Message) {
		b, err := proto.Marshal(m)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
	add(&stagev1.RunResponse{Result: ResultToProto(smallDoc()), TimingsMs: map[string]float64{"solve": 1}})
	add(&stagev1.RunResponse{Result: ResultToProto(bigDoc())})
	add(&stagev1.RunResponse{ResultJson: []byte("{}"), Artifacts: []*stagev1.Artifact{{Name: "a", MediaType: "b", Data: []byte{1}}}})
	f.Fuzz(func(t *testing.T, b []byte) {
		var m stagev1.RunResponse
		if _, _, _, ok := readRunResponse(b, &m); !ok {
			return
		}
		if err := proto.Unmarshal(b, &stagev1.RunResponse{}); err != nil {
			t.Fatalf("taken by the direct reader, refused by the generated decoder: %v", err)
		}
		same(t, "fuzzed", b)
	})
}

// BenchmarkReplyDecode reads a reply like the vortex-panel stage's at 17
// angles on 160 panels into a result document, through the generated
// decoder and ResultFromProto (generic) and straight from the wire
// (direct).
func BenchmarkReplyDecode(b *testing.B) {
	wire, err := proto.Marshal(&stagev1.RunResponse{Result: ResultToProto(bigDoc()), TimingsMs: map[string]float64{"solve": 1}})
	if err != nil {
		b.Fatal(err)
	}
	b.Run("generic", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			var m stagev1.RunResponse
			if err := proto.Unmarshal(wire, &m); err != nil {
				b.Fatal(err)
			}
			if _, err := ResultFromProto(m.GetResult()); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("direct", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			var m stagev1.RunResponse
			if _, _, err, ok := readRunResponse(wire, &m); err != nil || !ok {
				b.Fatal(err, ok)
			}
		}
	})
}
