package geometry

import (
	"bufio"
	"fmt"
	"io"
	"strconv"
)

// WriteNodes writes the plain node listing of a section: a name line, then
// one "x y" line per node, in the order given. Numbers are written with the
// fewest digits that read back exactly.
func WriteNodes(w io.Writer, name string, nodes []Point) error {
	bw := bufio.NewWriter(w)
	if name == "" {
		name = "section"
	}
	fmt.Fprintln(bw, name)
	buf := make([]byte, 0, 64)
	for i, p := range nodes {
		if !p.IsFinite() {
			return fmt.Errorf("geometry: write nodes: node %d is not finite", i)
		}
		buf = strconv.AppendFloat(buf[:0], p.X, 'g', -1, 64)
		buf = append(buf, ' ')
		buf = strconv.AppendFloat(buf, p.Y, 'g', -1, 64)
		buf = append(buf, '\n')
		bw.Write(buf)
	}
	return bw.Flush()
}
