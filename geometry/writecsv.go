package geometry

import (
	"encoding/csv"
	"fmt"
	"io"
	"strconv"
	"strings"
)

// WriteCSV writes pts as comma-separated text with the header
// "x,y,file,line" and one row per point: the coordinates in the shortest
// form that reads back to the same float64, then the point's origin (file
// and line; both empty when origins is nil). Line ends in a file name are
// written as blanks so that every point stays on one line. The output reads
// back through Read with Columns "x,y" to the same points.
//
// It returns an error for a non-finite point and panics if origins is not
// nil and len(origins) != len(pts).
func WriteCSV(w io.Writer, pts []Point, origins []Origin) error {
	if origins != nil && len(origins) != len(pts) {
		panic("geometry: WriteCSV with len(origins) != len(pts)")
	}
	cw := csv.NewWriter(w)
	if err := cw.Write([]string{"x", "y", "file", "line"}); err != nil {
		return err
	}
	row := make([]string, 4)
	for i, p := range pts {
		if !p.IsFinite() {
			return fmt.Errorf("geometry: write csv: point %d (%g, %g) is not finite", i+1, p.X, p.Y)
		}
		row[0] = strconv.FormatFloat(p.X, 'g', -1, 64)
		row[1] = strconv.FormatFloat(p.Y, 'g', -1, 64)
		row[2], row[3] = "", ""
		if origins != nil {
			row[2] = strings.NewReplacer("\r", " ", "\n", " ").Replace(origins[i].File)
			if origins[i].Line > 0 {
				row[3] = strconv.Itoa(origins[i].Line)
			}
		}
		if err := cw.Write(row); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}
