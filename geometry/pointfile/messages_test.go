package pointfile

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf16"

	"github.com/foilwright/foilwright/geometry"
)

// encodeUTF16 encodes s as UTF-16 with a byte-order mark.
func encodeUTF16(s string, bigEndian bool) []byte {
	var b bytes.Buffer
	for _, u := range append([]uint16{0xfeff}, utf16.Encode([]rune(s))...) {
		if bigEndian {
			b.Write([]byte{byte(u >> 8), byte(u)})
		} else {
			b.Write([]byte{byte(u), byte(u >> 8)})
		}
	}
	return b.Bytes()
}

// TestReadUTF16 is the reader part of defect 14 of issue 11: a UTF-16 CSV
// (as spreadsheets save "Unicode text") read as a binary mesh, "header
// promises 7471216 facet(s)". It reads as the text it is: the same points
// as in UTF-8, and an error in it names the right line.
func TestReadUTF16(t *testing.T) {
	text, err := os.ReadFile(filepath.Join("testdata", "naca2412-semicolon.csv"))
	if err != nil {
		t.Fatal(err)
	}
	want, err := Read(bytes.NewReader(text), "a.csv", Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, be := range []bool{false, true} {
		got, err := Read(bytes.NewReader(encodeUTF16(string(text), be)), "a.csv", Options{})
		if err != nil {
			t.Fatalf("big-endian %v: %v", be, err)
		}
		if got.Len() != want.Len() || got.Points[7] != want.Points[7] || got.Units != want.Units {
			t.Errorf("big-endian %v: %d points, units %s; want %d, %s", be, got.Len(), got.Units, want.Len(), want.Units)
		}
	}
	lines := strings.Split(string(text), "\n")
	lines[9] = "12,5;abc"
	_, err = Read(bytes.NewReader(encodeUTF16(strings.Join(lines, "\n"), false)), "a.csv", Options{})
	var pe *geometry.ParseError
	if !errors.As(err, &pe) || pe.Line != 10 || strings.Contains(err.Error(), "facet") {
		t.Errorf("a bad line in UTF-16: %v, want a.csv:10", err)
	}
}

// TestDXFMissingCoordinate is the DXF part of defect 14 of issue 11: a
// POINT missing its y group silently got y = 0. A missing coordinate is an
// error naming the line.
func TestDXFMissingCoordinate(t *testing.T) {
	head := "  0\nSECTION\n  2\nENTITIES\n"
	tail := "  0\nENDSEC\n  0\nEOF\n"
	good := "  0\nPOINT\n  8\np\n 10\n1.0\n 20\n2.0\n"
	for _, tc := range []struct {
		name, entity string
		line         int
		msg          string
	}{
		{"point without y", "  0\nPOINT\n  8\np\n 10\n3.0\n 30\n0.0\n", 34, "group 10 (x) without its y (group 20)"},
		{"point without x", "  0\nPOINT\n  8\np\n 20\n3.0\n", 34, "group 20 without an x (group 10) before it"},
		{"point without coordinates", "  0\nPOINT\n  8\np\n", 30, "POINT entity 4 without coordinates"},
		{"line without its end", "  0\nLINE\n  8\np\n 10\n1.0\n 20\n2.0\n", 30, "LINE entity 4 without its start (group 10) or end (group 11)"},
		{"lwpolyline vertex without y", "  0\nLWPOLYLINE\n  8\np\n 90\n2\n 10\n1.0\n 10\n2.0\n 20\n3.0\n", 36, "group 10 (x) without its y"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			data := head + good + good + good + tc.entity + tail
			_, err := Read(strings.NewReader(data), "s.dxf", Options{Units: geometry.Millimetre})
			var pe *geometry.ParseError
			if !errors.As(err, &pe) || !strings.Contains(err.Error(), tc.msg) {
				t.Fatalf("got %v, want %q", err, tc.msg)
			}
			// The entity starts at line 29, after the section's four lines
			// and three good POINTs of eight.
			if pe.Line != tc.line {
				t.Errorf("line %d, want %d", pe.Line, tc.line)
			}
		})
	}
}
