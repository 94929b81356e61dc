package pointfile

import (
	"bufio"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/foilwright/foilwright/geometry"
)

// WriteCSV writes pts as comma-separated text with the header
// "x,y,file,line" and one row per point: the coordinates in the shortest
// form that reads back to the same float64, then the point's origin: the
// file name in double quotes (a quote doubled, line ends written as blanks,
// so that every point stays on one line) and the line (empty when there is
// none). Both are empty when origins is nil. The output reads back through
// Read with Columns "x,y" to the same points.
//
// It returns an error for a non-finite point or a failing writer, and
// panics if origins is not nil and len(origins) != len(pts).
func WriteCSV(w io.Writer, pts []geometry.Point, origins []geometry.Origin) error {
	if origins != nil && len(origins) != len(pts) {
		panic("geometry: WriteCSV with len(origins) != len(pts)")
	}
	bw := bufio.NewWriter(w)
	bw.WriteString("x,y,file,line\n")
	quote := strings.NewReplacer(`"`, `""`, "\r", " ", "\n", " ")
	var buf []byte
	for i, p := range pts {
		if !p.IsFinite() {
			return fmt.Errorf("geometry: write csv: point %d (%g, %g) is not finite", i+1, p.X, p.Y)
		}
		buf = strconv.AppendFloat(buf[:0], p.X, 'g', -1, 64)
		buf = append(buf, ',')
		buf = strconv.AppendFloat(buf, p.Y, 'g', -1, 64)
		buf = append(buf, ',')
		if origins != nil {
			buf = append(buf, '"')
			buf = append(buf, quote.Replace(origins[i].File)...)
			buf = append(buf, '"', ',')
			if origins[i].Line > 0 {
				buf = strconv.AppendInt(buf, int64(origins[i].Line), 10)
			}
		} else {
			buf = append(buf, ',')
		}
		buf = append(buf, '\n')
		if _, err := bw.Write(buf); err != nil {
			return err
		}
	}
	return bw.Flush()
}
