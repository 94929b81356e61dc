package pointfile_test

import (
	"fmt"
	"strings"

	"github.com/foilwright/foilwright/geometry/planar"
	"github.com/foilwright/foilwright/geometry/pointfile"
)

// A semicolon-separated export with a decimal comma, a unit comment and a
// header naming the columns.
func ExampleRead() {
	in := "# units: mm\nt;x;y\n0;150,0;0,19\n1;75,2;9,8\n2;0;0\n"
	c, err := pointfile.Read(strings.NewReader(in), "export.csv", pointfile.Options{Columns: "x,y"})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(c.Format, c.Dim, c.Units, c.Len())
	fmt.Println(c.Points[1].X, c.Points[1].Y, c.Origins[1])
	for _, n := range c.Notes {
		fmt.Printf("%s: %s\n", n.Origin, n.Reason)
	}
	// Output:
	// delimited 2 mm 3
	// 75.2 9.8 export.csv:4
	// export.csv:1: comment
	// export.csv:2: column header
}

// Bad input names the file, the line and the reason.
func ExampleRead_error() {
	_, err := pointfile.Read(strings.NewReader("x y\n1.5 2.5\n3.5\n"), "probe.txt", pointfile.Options{})
	fmt.Println(err)
	// Output:
	// probe.txt:3: wrong number of columns: 1 coordinate(s), want 2
}

// Points probed at z = 240 mm map onto the cut plane with the user's own
// x and y kept.
func ExampleFlatten() {
	in := "x,y,z\n150,0.19,240.02\n75.2,9.8,239.99\n0,0,240.01\n75.2,-5.1,239.98\n"
	c, _ := pointfile.Read(strings.NewReader(in), "probe.csv", pointfile.Options{})
	cut, _ := planar.ParseSpec("z=240")
	flat, fl, err := planar.Flatten(c, planar.FlattenOptions{Plane: &cut, Band: 0.1})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("kept %d, max %.2f mm, first point (%g, %g)\n", fl.Kept, fl.Max, flat.Points[0].X, flat.Points[0].Y)
	// Output:
	// kept 4, max 0.02 mm, first point (150, 0.19)
}
