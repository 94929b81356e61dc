package pointfile

import (
	"bytes"
	"math"
	"strconv"
	"testing"
)

// BenchmarkReadDelimited reads n lines of "x,y,z" probe points generated in
// memory (a 3D ring, 6 decimals, as a measuring machine writes them).
func BenchmarkReadDelimited(b *testing.B) {
	for _, size := range []struct {
		name string
		n    int
	}{{"n=1e4", 1e4}, {"n=1e5", 1e5}, {"n=1e6", 1e6}} {
		n := size.n
		var buf bytes.Buffer
		buf.WriteString("# units: mm\nx [mm],y [mm],z [mm]\n")
		var line []byte
		for i := range n {
			a := 2 * math.Pi * float64(i) / float64(n)
			line = strconv.AppendFloat(line[:0], 75+75*math.Cos(a), 'f', 6, 64)
			line = append(line, ',')
			line = strconv.AppendFloat(line, 9*math.Sin(a), 'f', 6, 64)
			line = append(line, ",240.000000\n"...)
			buf.Write(line)
		}
		data := buf.Bytes()
		b.Run(size.name, func(b *testing.B) {
			b.SetBytes(int64(len(data)))
			for b.Loop() {
				c, err := Read(bytes.NewReader(data), "bench.csv", Options{})
				if err != nil || c.Len() != n {
					b.Fatalf("%v, %d points", err, c.Len())
				}
			}
		})
	}
}
