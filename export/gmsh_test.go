package export

import (
	"bufio"
	"bytes"
	"context"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/foilwright/foilwright/geometry"
)

// TestGmshMeshes runs Gmsh, the open-source mesher from the OS packages
// (Debian: gmsh), on the .geo of a blunt and of a sharp section when it is
// installed, and checks the mesh it makes: triangles fill the ring between
// the far field and the section, their areas adding up to the circle's
// less the section's (shoelace areas of the boundary nodes Gmsh placed,
// and of our nodes), and every mesh node on the section lies within 1e-4
// chord of the outline through our nodes.
func TestGmshMeshes(t *testing.T) {
	gmsh, err := exec.LookPath("gmsh")
	if err != nil {
		t.Skip("gmsh is not installed (Debian: apt-get install gmsh)")
	}
	if testing.Short() {
		t.Skip("runs gmsh")
	}
	for _, sharp := range []bool{false, true} {
		p := place(t, testSection(sharp, false), PlaceOptions{})
		dir := t.TempDir()
		geo, msh := filepath.Join(dir, "s.geo"), filepath.Join(dir, "s.msh")
		var b bytes.Buffer
		if err := Geo(&b, p, GeoOptions{Farfield: 10}); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(geo, b.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
		ctx, cancel := context.WithTimeout(context.Background(), 2*time.Minute)
		out, err := exec.CommandContext(ctx, gmsh, geo, "-2", "-format", "msh2", "-v", "2", "-nt", "1", "-o", msh).CombinedOutput()
		cancel()
		if err != nil {
			t.Fatalf("sharp %v: gmsh: %v\n%s", sharp, err, out)
		}
		m := readMsh2(t, msh)
		var area float64
		for _, tri := range m.triangles {
			a, b2, c := m.nodes[tri[0]], m.nodes[tri[1]], m.nodes[tri[2]]
			area += math.Abs(b2.Sub(a).Cross(c.Sub(a))) / 2
		}
		farArea := loopArea(m.nodes, m.lines[2])
		sectionArea := math.Abs(geometry.SignedArea(p.outline()))
		want := farArea - sectionArea
		if len(m.triangles) == 0 || math.Abs(area-want) > 1e-3*sectionArea {
			t.Errorf("sharp %v: %d triangles of area %.6g, want %.6g (far field %.6g less section %.6g)", sharp, len(m.triangles), area, want, farArea, sectionArea)
		}
		worst := 0.0
		out2 := p.outline()
		for _, seg := range m.lines[1] {
			for _, id := range seg {
				q := m.nodes[id]
				best := math.Inf(1)
				for i := range out2 {
					best = math.Min(best, geometry.SegmentDist(q, out2[i], out2[(i+1)%len(out2)]))
				}
				worst = math.Max(worst, best)
			}
		}
		if worst/p.Chord > 1e-4 || len(m.lines[1]) < len(out2)/2 {
			t.Errorf("sharp %v: %d section edges, a mesh node %.3g chord off the outline", sharp, len(m.lines[1]), worst/p.Chord)
		}
		t.Logf("sharp %v: %d nodes, %d triangles, %d section edges, section nodes within %.2g chord of the outline", sharp, len(m.nodes), len(m.triangles), len(m.lines[1]), worst/p.Chord)
	}
}

// loopArea returns the area enclosed by the line elements segs, chained.
func loopArea(nodes map[int]geometry.Point, segs [][2]int) float64 {
	var a float64
	for _, s := range segs {
		p, q := nodes[s[0]], nodes[s[1]]
		a += p.Cross(q) / 2
	}
	return math.Abs(a)
}

// msh2 is what the test reads of a Gmsh mesh file, format 2.2: nodes by
// id, triangles, and line elements by physical tag.
type msh2 struct {
	nodes     map[int]geometry.Point
	triangles [][3]int
	lines     map[int][][2]int
}

func readMsh2(t *testing.T, path string) msh2 {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	m := msh2{nodes: map[int]geometry.Point{}, lines: map[int][][2]int{}}
	sc := bufio.NewScanner(f)
	section := ""
	ints := func(fs []string) []int {
		out := make([]int, len(fs))
		for i, s := range fs {
			out[i], _ = strconv.Atoi(s)
		}
		return out
	}
	for sc.Scan() {
		line := strings.TrimSpace(sc.Text())
		if strings.HasPrefix(line, "$End") {
			section = ""
			continue
		}
		if strings.HasPrefix(line, "$") {
			section = line
			sc.Scan() // the count, or the format line
			continue
		}
		fs := strings.Fields(line)
		switch section {
		case "$Nodes":
			if len(fs) < 3 {
				t.Fatalf("node line %q", line)
			}
			id, _ := strconv.Atoi(fs[0])
			x, _ := strconv.ParseFloat(fs[1], 64)
			y, _ := strconv.ParseFloat(fs[2], 64)
			m.nodes[id] = geometry.Point{X: x, Y: y}
		case "$Elements":
			v := ints(fs)
			typ, ntags := v[1], v[2]
			ns := v[3+ntags:]
			switch typ {
			case 1:
				m.lines[v[3]] = append(m.lines[v[3]], [2]int{ns[0], ns[1]})
			case 2:
				m.triangles = append(m.triangles, [3]int{ns[0], ns[1], ns[2]})
			}
		}
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	return m
}
