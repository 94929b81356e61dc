package pointfile

import (
	"bufio"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/foilwright/foilwright/geometry"
)

// WriteNodes writes the plain node listing of a section (nodes.dat): a
// name line, then one "x y" line per node, in the order given. An empty
// name becomes "section", and line ends in the name become blanks, so that
// it stays one line. Each number is written in the shortest decimal form
// that reads back to the same float64, without an exponent, and zero (also
// −0) as "0", so that any program that reads plain decimals reads the
// file. It returns an error for a non-finite node before writing anything.
func WriteNodes(w io.Writer, name string, nodes []geometry.Point) error {
	for i, p := range nodes {
		if !p.IsFinite() {
			return fmt.Errorf("geometry: write nodes: node %d is not finite", i)
		}
	}
	if name == "" {
		name = "section"
	}
	bw := bufio.NewWriter(w)
	bw.WriteString(strings.NewReplacer("\r", " ", "\n", " ").Replace(name))
	bw.WriteByte('\n')
	buf := make([]byte, 0, 64)
	for _, p := range nodes {
		buf = appendCoord(buf[:0], p.X)
		buf = append(buf, ' ')
		buf = appendCoord(buf, p.Y)
		buf = append(buf, '\n')
		bw.Write(buf)
	}
	return bw.Flush()
}

// appendCoord appends x in the shortest decimal form that reads back to
// the same float64, without an exponent; zero (also −0) is "0".
func appendCoord(b []byte, x float64) []byte {
	if x == 0 {
		return append(b, '0')
	}
	return strconv.AppendFloat(b, x, 'f', -1, 64)
}
