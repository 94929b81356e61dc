package pointfile

import (
	"bytes"
	"fmt"
	"math"
	"reflect"
	"runtime"
	"strconv"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// longFile writes n data lines of a ring (x,y with 6 decimals, sep between
// the fields, eol at the end of each line), with the line edit(i) returns
// (when not "") written before data line i.
func longFile(n int, sep, eol string, edit func(i int) string) []byte {
	var b bytes.Buffer
	b.WriteString("# units: mm" + eol + "x" + sep + "y" + eol)
	for i := range n {
		if l := edit(i); l != "" {
			b.WriteString(l + eol)
		}
		a := 2 * math.Pi * float64(i) / float64(n)
		b.WriteString(strconv.FormatFloat(75+75*math.Cos(a), 'f', 6, 64) + sep + strconv.FormatFloat(9*math.Sin(a), 'f', 6, 64) + eol)
	}
	return b.Bytes()
}

// TestReadInParts checks that a long delimited file read in parts on
// several goroutines (dataParts) gives the cloud, notes and error of the
// same file read line by line on one (GOMAXPROCS 1), whatever lines the
// later parts hold: comments, text, blank lines, a bad number, CRLF ends,
// a last line without its end.
func TestReadInParts(t *testing.T) {
	const n = 20000 // some 400 kB, well over partBytes
	at := func(k int, line string) func(int) string {
		return func(i int) string {
			if i == k {
				return line
			}
			return ""
		}
	}
	cases := []struct {
		name string
		data []byte
		fail bool
	}{
		{"plain", longFile(n, ",", "\n", at(-1, "")), false},
		{"blanks", longFile(n, " ", "\n", func(i int) string {
			if i%997 == 0 {
				return "   "
			}
			return ""
		}), false},
		{"crlf", longFile(n, "\t", "\r\n", at(-1, "")), false},
		{"no last end", bytes.TrimSuffix(longFile(n, ",", "\n", at(-1, "")), []byte("\n")), false},
		{"comment late", longFile(n, ",", "\n", at(3*n/4, "# probe re-seated")), false},
		{"unit comment late", longFile(n, ",", "\n", at(n-10, "# units: mm")), false},
		{"text late", longFile(n, ",", "\n", at(2*n/3, "second pass")), false},
		{"text late in every part", longFile(n, ",", "\n", func(i int) string {
			if i%(n/8) == n/16 {
				return fmt.Sprintf("pass %d", i)
			}
			return ""
		}), false},
		{"bad number late", longFile(n, ",", "\n", at(3*n/4, "12.5,3.x5")), true},
		{"short line late", longFile(n, ",", "\n", at(n-5, "12.5")), true},
		{"non-finite late", longFile(n, ",", "\n", at(n/2+7, "12.5,NaN")), true},
	}
	read := func(data []byte, procs int) (*geometry.Cloud, error) {
		defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(procs))
		return Read(bytes.NewReader(data), "long.csv", Options{})
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			if len(tc.data) < 2*partBytes {
				t.Fatalf("%d bytes: too short to be read in parts", len(tc.data))
			}
			one, err1 := read(tc.data, 1)
			if (err1 != nil) != tc.fail {
				t.Fatalf("read on one goroutine: error %v, want failure %v", err1, tc.fail)
			}
			for _, procs := range []int{2, 3, 8} {
				got, err := read(tc.data, procs)
				if fmt.Sprint(err) != fmt.Sprint(err1) {
					t.Errorf("GOMAXPROCS %d: error %v, want %v", procs, err, err1)
				}
				if !reflect.DeepEqual(got, one) {
					t.Errorf("GOMAXPROCS %d: the cloud differs from the one read line by line", procs)
				}
			}
			if tc.fail {
				return
			}
			if one.Len() != n {
				t.Errorf("%d points, want %d", one.Len(), n)
			}
			// The notes of the unit comment and the header, and one for
			// each line among the data.
			if late := strings.Contains(tc.name, "late"); late && len(one.Notes) < 3 || !late && len(one.Notes) != 2 {
				t.Errorf("notes %v", one.Notes)
			}
		})
	}
}
