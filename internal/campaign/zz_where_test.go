package campaign

import (
	"fmt"
	"os"
	"strconv"
	"testing"
)

func TestZZWhere(t *testing.T) {
	seed, _ := strconv.Atoi(os.Getenv("ZZC"))
	c, err := NewCase(uint64(seed))
	if err != nil {
		t.Fatal(err)
	}
	doc, err := prepare(c.Scan.Name, c.Scan.Data, 0)
	if err != nil {
		t.Fatal(err)
	}
	sec, _ := decodeSection(doc)
	sh := c.Scan.Truth.Section.Shape
	type e struct {
		i    int
		x, y float64
		d    float64
	}
	var es []e
	for i, n := range sec.Nodes {
		d, _ := sh.Nearest(n)
		es = append(es, e{i, n.X, n.Y, d})
	}
	best := 0
	for i := range es {
		if es[i].d > es[best].d {
			best = i
		}
	}
	for i := max(0, best-6); i < min(len(es), best+7); i++ {
		fmt.Printf("node %d (%.5f, %.5f) err %.5f\n", es[i].i, es[i].x, es[i].y, es[i].d)
	}
	fmt.Println("nodes", len(es))
}
