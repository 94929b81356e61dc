package planar

import "github.com/foilwright/foilwright/geometry"

// Mesh is a triangle mesh read from an STL file. Identical vertices are
// welded into one, so facets that share an edge share its vertex indices.
type Mesh struct {
	File     string          // display name of the file
	Name     string          // the solid's name, if the file gives one
	Vertices []geometry.Vec3 // distinct vertices
	Facets   [][3]int        // vertex indices of each facet, in file order
	// Lines[i] is the line of facet i's "facet" keyword in an ASCII file;
	// nil for a binary file.
	Lines []int
	Notes []geometry.Note
}
