package prep

import (
	"fmt"
	"os"
	"testing"
	"time"

	"github.com/foilwright/foilwright/geometry/pointfile"
	"bytes"
)

func TestZZPhases(t *testing.T) {
	path := os.Getenv("ZZ_FILE")
	if path == "" {
		t.Skip()
	}
	data, _ := os.ReadFile(path)
	t0 := time.Now()
	ro, _ := readOptions(Settings{})
	c, err := pointfile.Read(bytes.NewReader(data), path, ro)
	if err != nil {
		t.Fatal(err)
	}
	t1 := time.Now()
	cl, err := ReadAndClean([]File{NewFile(path, data)}, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	t2 := time.Now()
	p := &Preparation{Clouds: cl.Clouds, Flatness: cl.Flatness, Clean: cl.Clean, Contour: cl.Contour}
	if err := p.fit(cl, Settings{}, true); err != nil {
		t.Fatal(err)
	}
	t3 := time.Now()
	_, err = finishChain("x", cl, Settings{}, true)
	t4 := time.Now()
	fmt.Println(c.Len(), "read", t1.Sub(t0), "read+clean", t2.Sub(t1), "fit", t3.Sub(t2), "fit+rest", t4.Sub(t3), err)
}
