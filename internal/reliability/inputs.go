package reliability

import (
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"

	"github.com/foilwright/foilwright/geometry"
)

// earlier is the content of every output target a case seeds before it
// runs: a bad input must leave it as it was.
const earlier = "earlier good output\n"

// seed writes the earlier good output to name in the folder of c.
func (b *builder) seed(c *Case, name string) { b.file(c, name, []byte(earlier)) }

// prepCase is a case of "prep FILE -o out.json" on data.
func (b *builder) prepCase(reader, name, what, file string, data []byte, extra ...string) *Case {
	c := b.add(&Case{Name: reader + "-" + name, Group: GroupInput, Reader: reader, What: what,
		Args: append([]string{"prep", file, "-o", "out.json"}, extra...), Names: []string{file}})
	if data != nil {
		b.file(c, file, data)
	}
	b.seed(c, "out.json")
	return c
}

// rows returns the good CSV with row i (0-based data row) replaced by row.
func csvWith(i int, row string) []byte {
	rows := csvRows()
	rows[i] = row
	return []byte("# units: mm\nx,y\n" + strings.Join(rows, "\n") + "\n")
}

func (b *builder) inputs() {
	b.delimited()
	b.listings()
	b.dxf()
	b.stl()
	b.sections()
	b.pipelines()
	b.manifests()
	b.flags()
	b.specialInputs()
}

func (b *builder) delimited() {
	r := rand.New(rand.NewPCG(11, 1))
	garbage := make([]byte, 64<<10)
	for i := range garbage {
		garbage[i] = byte(r.IntN(256))
	}
	rows := csvRows()
	identical := strings.Repeat("12.5,3.25\n", 80)
	var collinear, huge, tiny, ragged3d strings.Builder
	for i := range 80 {
		fmt.Fprintf(&collinear, "%d,0\n", i)
	}
	for _, p := range scaled() {
		fmt.Fprintf(&huge, "%g,%g\n", p.X*1e300, p.Y*1e300)
		fmt.Fprintf(&tiny, "%g,%g\n", p.X*1e-300, p.Y*1e-300)
	}
	for i, p := range scaled() {
		fmt.Fprintf(&ragged3d, "%g,%g,%g\n", p.X, p.Y, 40*math.Sin(float64(i))*p.X)
	}
	long := strings.Repeat("1.5,2.5,", 1<<20) // one 8 MiB line
	cases := []struct {
		name, what string
		data       string
		extra      []string
	}{
		{"empty", "an empty file", "", nil},
		{"blank", "only blank lines", "  \n\n \t\n", nil},
		{"comments", "only comments", "# units: mm\n# nothing else\n", nil},
		{"header-only", "a header and no rows", "# units: mm\nx,y\n", nil},
		{"one-point", "one point", "# units: mm\n1,2\n", nil},
		{"two-points", "two points", "# units: mm\n1,2\n3,4\n", nil},
		{"not-numeric", "a word among the numbers", string(csvWith(30, "12.5,abc")), nil},
		{"nan", "NaN among the numbers", string(csvWith(30, "NaN,3.5")), nil},
		{"inf", "Inf among the numbers", string(csvWith(30, "Inf,3.5")), nil},
		{"overflow", "1e400, beyond float64", string(csvWith(30, "1e400,3.5")), nil},
		{"neg-overflow", "-1e400, beyond float64", string(csvWith(30, "12,-1e400")), nil},
		{"one-column-row", "a row with one number", string(csvWith(30, "12.5")), nil},
		{"exponent", "a number with two exponents", string(csvWith(30, "1e5e5,3.5")), nil},
		{"all-nan", "every coordinate NaN", "# units: mm\n" + strings.Repeat("NaN,NaN\n", 80), nil},
		{"columns-zero", "--columns 0,1", goodCSV(), []string{"--columns", "0,1"}},
		{"identical", "80 copies of one point", "# units: mm\n" + identical, nil},
		{"collinear", "80 points on a line", "# units: mm\n" + collinear.String(), nil},
		{"huge-coordinates", "coordinates near 1e302", "# units: mm\n" + huge.String(), nil},
		{"tiny-coordinates", "coordinates near 1e-298", "# units: mm\n" + tiny.String(), nil},
		{"utf16le", "a word on line 33, in UTF-16 (little-endian, with BOM)", string(utf16(string(csvWith(30, "12.5,abc")), false)), nil},
		{"utf16be", "a word on line 33, in UTF-16 (big-endian, with BOM)", string(utf16(string(csvWith(30, "12.5,abc")), true)), nil},
		{"garbage", "64 KiB of random bytes", string(garbage), nil},
		{"nul", "a NUL byte inside a row", string(csvWith(20, "12.5,\x003.5")), nil},
		{"long-line", "one 8 MiB line of numbers", long, nil},
		{"columns-range", "--columns beyond the file's columns", goodCSV(), []string{"--columns", "5,6"}},
		{"columns-name", "--columns naming no header", goodCSV(), []string{"--columns", "u,v"}},
		{"not-planar", "3D points far from any plane", "# units: mm\nx,y,z\n" + ragged3d.String(), nil},
		{"units-unknown", "a units comment naming no unit", strings.Replace(goodCSV(), "units: mm", "units: furlongs", 1), nil},
		{"no-units", "no units stated anywhere", "x,y\n" + strings.Join(rows, "\n") + "\n", nil},
	}
	for _, tc := range cases {
		c := b.prepCase("delimited", tc.name, tc.what, "probe.csv", []byte(tc.data), tc.extra...)
		switch tc.name {
		case "columns-range", "columns-name", "columns-zero":
			c.Names = append(c.Names, "--columns", `"`+tc.extra[1]+`"`)
		case "utf16le", "utf16be":
			c.Forbid = []string{"facet"}
		case "no-units":
			c.Names = append(c.Names, "--units")
		}
	}
	// Ten million lines (the full campaign), and the same reader limit
	// reached cheaply with a lowered limit (the fast part).
	c := b.add(&Case{Name: "delimited-ten-million-lines", Group: GroupInput, Reader: "delimited", Slow: true,
		What: "a CSV of ten million lines (155 MB)", Args: []string{"prep", "big.csv", "-o", "out.json"}, Names: []string{"big.csv"}})
	if b.opts.Slow {
		b.bigCSV(c, "big.csv", 10_000_000)
	}
	b.seed(c, "out.json")
	c = b.add(&Case{Name: "delimited-lines-limit", Group: GroupInput, Reader: "delimited", FastOnly: true,
		What: "a CSV of 5000 lines against --limit input-lines=1000", Args: []string{"--limit", "input-lines=1000", "prep", "big.csv", "-o", "out.json"}, Names: []string{"big.csv"}})
	if !b.opts.Slow {
		b.bigCSV(c, "big.csv", 5000)
	}
	b.seed(c, "out.json")
}

// bigCSV writes n lines of points on a circle.
func (b *builder) bigCSV(c *Case, name string, n int) {
	f, err := os.Create(filepath.Join(c.Dir, name))
	if err != nil {
		b.err = err
		return
	}
	defer f.Close()
	w := newBufWriter(f)
	w.WriteString("# units: mm\n")
	for i := range n {
		th := 2 * math.Pi * float64(i) / float64(n)
		fmt.Fprintf(w, "%.5f,%.5f\n", 75+75*math.Cos(th), 9*math.Sin(th))
	}
	if err := w.Flush(); err != nil {
		b.err = err
	}
}

func (b *builder) listings() {
	loop := goodLoop()
	lines := strings.Split(loop, "\n")
	with := func(i int, row string) string {
		l := append([]string{}, lines...)
		l[i] = row
		return strings.Join(l, "\n")
	}
	var same strings.Builder
	same.WriteString("NACA 2412 campaign section\n")
	for range 80 {
		same.WriteString("  0.500000  0.500000\n")
	}
	cases := []struct{ name, what, data string }{
		{"name-only", "a name line and nothing else", "NACA 2412 campaign section\n"},
		{"counts-huge", "counts of a billion points", goodSurfaces("1000000000. 1000000000.")},
		{"blank-after-name", "a name line and blank lines", "NACA 2412 campaign section\n\n\n  \n"},
		{"words-only", "a name line and lines of words", "NACA 2412 campaign section\nupper surface\nlower surface\n"},
		{"inf", "Inf in a row", with(20, "  Inf  0.05")},
		{"two-points", "a name and two points", "NACA 2412 campaign section\n 1.0 0.0\n 0.0 0.0\n"},
		{"nan", "NaN in a row", with(20, "  NaN  0.05")},
		{"identical", "80 copies of one point", same.String()},
		{"overflow", "1e400 in a row", with(20, "  1e400  0.05")},
	}
	for _, tc := range cases {
		b.prepCase("listing", tc.name, tc.what, "section.dat", []byte(tc.data), "--units", "chord")
	}
}

func (b *builder) dxf() {
	good := goodDXF()
	point := func(_ int, p geometry.Point) string {
		return fmt.Sprintf("  0\nPOINT\n  8\npts\n 10\n%.6f\n 20\n%.6f\n 30\n0.0\n", p.X, p.Y)
	}
	r := rand.New(rand.NewPCG(12, 1))
	cases := []struct{ name, what, data string }{
		{"no-entities", "an empty ENTITIES section", dxfHeader + dxfFooter},
		{"truncated", "cut off in the middle of the polyline", good[:len(good)/2]},
		{"code-not-number", "a group code that is a word", strings.Replace(good, " 10\n", "ten\n", 1)},
		{"point-missing-y", "a POINT without its y (group 20)", dxfPoints(func(i int, p geometry.Point) string {
			if i == 20 {
				return fmt.Sprintf("  0\nPOINT\n  8\npts\n 10\n%.6f\n 30\n0.0\n", p.X)
			}
			return point(i, p)
		})},
		{"point-missing-x", "a POINT without its x (group 10)", dxfPoints(func(i int, p geometry.Point) string {
			if i == 20 {
				return fmt.Sprintf("  0\nPOINT\n  8\npts\n 20\n%.6f\n 30\n0.0\n", p.Y)
			}
			return point(i, p)
		})},
		{"inf", "Inf as a coordinate", strings.Replace(good, " 20\n", " 20\ninf\n 21\n", 1)},
		{"text-only", "only a TEXT entity", dxfHeader + "  0\nTEXT\n  8\ns\n 10\n0\n 20\n0\n 40\n5\n  1\nNACA 2412\n" + dxfFooter},
		{"no-seqend", "a POLYLINE whose vertices never end", dxfHeader + "  0\nPOLYLINE\n  8\ns\n 66\n1\n" + strings.Repeat("  0\nVERTEX\n  8\ns\n 10\n1.0\n 20\n2.0\n", 3) + "  0\nEOF\n"},
		{"spline-no-fit", "a SPLINE with control points and no fit points", dxfHeader + "  0\nSPLINE\n  8\ns\n 70\n8\n 71\n3\n 73\n4\n 10\n0\n 20\n0\n 10\n1\n 20\n1\n 10\n2\n 20\n0\n 10\n3\n 20\n1\n" + dxfFooter},
		{"nan", "NaN as a coordinate", strings.Replace(good, " 20\n", " 20\nnan\n 21\n", 1)},
		{"overflow", "1e400 as a coordinate", dxfPoints(func(i int, p geometry.Point) string {
			if i == 10 {
				return "  0\nPOINT\n  8\npts\n 10\n1e400\n 20\n1.0\n"
			}
			return point(i, p)
		})},
		{"odd-lines", "a group code without its value at the end", strings.TrimSuffix(good, "EOF\n")},
		{"header-only", "a header and no ENTITIES section", "  0\nSECTION\n  2\nHEADER\n  9\n$INSUNITS\n 70\n4\n  0\nENDSEC\n  0\nEOF\n"},
		{"zero-lines", "80 LINE entities of zero length at one point", dxfHeader + strings.Repeat("  0\nLINE\n  8\ns\n 10\n1.0\n 20\n1.0\n 11\n1.0\n 21\n1.0\n", 80) + dxfFooter},
		{"binary", "a binary DXF", "AutoCAD Binary DXF\r\n\x1a\x00" + string(randomBytes(r, 4096))},
		{"arc-only", "only an ARC, which gives no points", dxfHeader + "  0\nARC\n  8\ns\n 10\n0\n 20\n0\n 40\n5\n 50\n0\n 51\n90\n" + dxfFooter},
		{"insunits-bad", "$INSUNITS 99, no unit", strings.Replace(good, " 70\n4\n", " 70\n99\n", 1)},
		{"line-missing-y", "LINE entities without y", dxfHeader + strings.Repeat("  0\nLINE\n  8\ns\n 10\n1.0\n 11\n2.0\n", 40) + dxfFooter},
		{"not-planar", "POINTs far from any plane", dxfPoints(func(i int, p geometry.Point) string {
			return fmt.Sprintf("  0\nPOINT\n  8\npts\n 10\n%.6f\n 20\n%.6f\n 30\n%.6f\n", p.X, p.Y, 50*math.Sin(float64(i)))
		})},
	}
	for _, tc := range cases {
		c := b.prepCase("dxf", tc.name, tc.what, "section.dxf", []byte(tc.data))
		if tc.name == "insunits-bad" {
			c.Names = append(c.Names, "--units")
		}
	}
}

func randomBytes(r *rand.Rand, n int) []byte {
	b := make([]byte, n)
	for i := range b {
		b[i] = byte(r.IntN(256))
	}
	return b
}

func (b *builder) stl() {
	ts := extrusion()
	cut := []string{"--cut", "z=150", "--units", "mm"}
	replaceFacet := func(k int, f func(string) string) string {
		return asciiSTL(ts, func(i int, s string) string {
			if i == k {
				return f(s)
			}
			return s
		})
	}
	bin := binarySTL(ts, -1)
	nanBin := append([]byte{}, bin...)
	for i := 84 + 12; i+4 <= len(nanBin); i += 50 {
		copy(nanBin[i:], []byte{0, 0, 0xc0, 0x7f}) // float32 NaN as every first vertex's x
	}
	var degenerate []triangle
	for range 100 {
		degenerate = append(degenerate, triangle{{1, 1, 100}, {1, 1, 100}, {1, 1, 200}})
	}
	solidBin := append([]byte{}, bin...)
	copy(solidBin, "solid but binary")
	type tc struct {
		name, what string
		data       []byte
		args       []string
	}
	cases := []tc{
		{"solid-only", "a solid with no facets", []byte("solid x\nendsolid x\n"), cut},
		{"two-vertices", "a facet with two vertices", []byte(replaceFacet(10, func(s string) string {
			i := strings.LastIndex(s, "      vertex")
			return s[:i] + "    endloop\n  endfacet\n"
		})), cut},
		{"vertex-nan", "a vertex with NaN", []byte(replaceFacet(10, func(s string) string {
			return strings.Replace(s, "vertex ", "vertex nan ", 1)
		})), cut},
		{"no-endloop", "a facet without endloop", []byte(replaceFacet(10, func(s string) string {
			return strings.Replace(s, "    endloop\n", "", 1)
		})), cut},
		{"vertex-overflow", "a vertex at 1e400", []byte(replaceFacet(10, func(string) string {
			return "  facet normal 0 0 0\n    outer loop\n      vertex 1e400 0 0\n      vertex 1 0 0\n      vertex 1 0 1\n    endloop\n  endfacet\n"
		})), cut},
		{"binary-count-huge", "a binary STL whose header promises a billion facets", binarySTL(ts[:10], 1_000_000_000), cut},
		{"binary-count-zero", "a binary STL with no facets", binarySTL(nil, 0), cut},
		{"binary-truncated", "a binary STL cut in the middle of a facet", bin[:len(bin)-77], cut},
		{"binary-nan", "a binary STL full of NaN", nanBin, cut},
		{"binary-degenerate", "a binary STL of zero-area facets", binarySTL(degenerate, -1), cut},
		{"binary-solid-header", "a binary STL whose header starts with solid, truncated", solidBin[:len(solidBin)-100], cut},
		{"binary-count-mismatch", "a binary STL that promises 10 facets and holds more", binarySTL(ts, 10), cut},
		{"no-crossing", "a mesh the cut plane misses", bin, []string{"--cut", "z=1000", "--units", "mm"}},
		{"no-cut", "a mesh and no --cut", bin, []string{"--units", "mm"}},
		{"cut-syntax", "--cut z=abc", bin, []string{"--cut", "z=abc", "--units", "mm"}},
		{"cut-zero-normal", "--cut with a zero normal", bin, []string{"--cut", "0,0,150:0,0,0", "--units", "mm"}},
		{"one-triangle", "one triangle", []byte(asciiSTL(ts[:1], nil)), cut},
		{"not-stl", "solid, then prose", []byte("solid x\nthis is not an stl file at all\nendsolid x\n"), cut},
	}
	for _, tc := range cases {
		c := b.prepCase("stl", tc.name, tc.what, "part.stl", tc.data, tc.args...)
		switch tc.name {
		case "no-cut", "cut-syntax", "cut-zero-normal":
			c.Names = append(c.Names, "--cut", `"`+tc.args[1]+`"`)
		}
	}
}

// analyzeCase is a case of "analyze FILE --stage STAGE -o res.json".
func (b *builder) analyzeCase(name, what, stageName, doc string) *Case {
	c := b.add(&Case{Name: "section-" + name, Group: GroupInput, Reader: "section", What: what,
		Args: []string{"analyze", "section.json", "--stage", stageName, "-o", "res.json"}, Names: []string{"section.json"}})
	b.file(c, "section.json", []byte(doc))
	b.seed(c, "res.json")
	return c
}

func (b *builder) sections() {
	good := goodSection()
	cases := []struct{ name, what, doc string }{
		{"empty", "an empty file", ""},
		{"not-json", "text that is not JSON", "nodes: 1 2\n"},
		{"array", "a JSON array", "[[1, 0], [0, 0], [1, 0]]\n"},
		{"no-format", "no format key", strings.Replace(good, `"format"`, `"fmt"`, 1)},
		{"wrong-format", "another format", strings.Replace(good, "foilwright.section/1", "foilwright.section/9", 1)},
		{"no-nodes", "no nodes", `{"format": "foilwright.section/1", "name": "x"}` + "\n"},
		{"two-nodes", "two nodes", sectionNodes("[[1, 0], [0, 0]]")},
		{"node-null", "a null node", sectionNodes("[[1, 0], null, [0, 0.1], [0, -0.1], [1, 0]]")},
		{"node-string", "a node of strings", sectionNodes(`[[1, 0], ["0.5", "0.1"], [0, 0], [0.5, -0.1], [1, 0]]`)},
		{"node-overflow", "a coordinate of 1e400", sectionNodes("[[1, 0], [0.5, 1e400], [0, 0], [0.5, -0.1], [1, 0]]")},
		{"deep", "nodes nested 100000 deep", sectionNodes(nested(100000))},
		{"nodes-deep-short", "nodes nested three deep", sectionNodes("[[[1, 0]], [[0, 0]], [[1, 0]]]")},
		{"identical", "100 copies of one node", sectionNodes("[" + strings.TrimSuffix(strings.Repeat("[0.5, 0], ", 100), ", ") + "]")},
		{"nodes-object", "nodes as an object", sectionNodes(`{"x": [1, 0], "y": [0, 0]}`)},
	}
	for _, tc := range cases {
		b.analyzeCase(tc.name, tc.what, "vortex-panel", tc.doc)
	}
	big := sectionNodes(manyNodes(100000))
	b.analyzeCase("thin-100k-nodes", "100000 nodes to thin-aerofoil", "thin-aerofoil", big)
	b.analyzeCase("vortex-20k-nodes", "20000 nodes to vortex-panel", "vortex-panel", sectionNodes(manyNodes(20000))).Slow = true
	b.analyzeCase("source-20k-nodes", "20000 nodes to source-panel", "source-panel", sectionNodes(manyNodes(20000))).Slow = true
	c := b.add(&Case{Name: "section-inspect-deep", Group: GroupInput, Reader: "section", What: "inspect a section nested 100000 deep",
		Args: []string{"inspect", "section.json"}, Names: []string{"section.json"}})
	b.file(c, "section.json", []byte(sectionNodes(nested(100000))))
}

// pipelineText is a good pipeline of one section (probe.csv) through the
// built-in thin-aerofoil stage into the folder "run".
const pipelineText = `{
  "foilwright": 1,
  "name": "campaign",
  "inputs": [{"name": "mid", "files": ["probe.csv"]}],
  "prepare": {"panels": 120},
  "stages": [
    {"id": "thin", "stage": "thin-aerofoil", "params": {"alpha_deg": [0, 4]}}
  ],
  "outputs": {"folder": "run"}
}
`

// pipelineCase is a case of "run pipeline.json" with probe.csv beside it.
func (b *builder) pipelineCase(name, what, text string) *Case {
	c := b.add(&Case{Name: "pipeline-" + name, Group: GroupInput, Reader: "pipeline", What: what,
		Args: []string{"run", "pipeline.json"}, Names: []string{"pipeline.json"}})
	b.file(c, "pipeline.json", []byte(text))
	b.file(c, "probe.csv", []byte(goodCSV()))
	return c
}

// swap replaces old with new in the good pipeline.
func swap(old, new string) string {
	if !strings.Contains(pipelineText, old) {
		panic("reliability: pipeline text lacks " + old)
	}
	return strings.Replace(pipelineText, old, new, 1)
}

func (b *builder) pipelines() {
	params := func(p string) string { return swap(`"params": {"alpha_deg": [0, 4]}`, `"params": `+p) }
	stageLine := func(s string) string {
		return swap(`{"id": "thin", "stage": "thin-aerofoil", "params": {"alpha_deg": [0, 4]}}`, s)
	}
	var manyKeys strings.Builder
	for i := range 1000 {
		fmt.Fprintf(&manyKeys, `"key%d": 1, `, i)
	}
	cases := []struct{ name, what, text string }{
		{"empty", "an empty file", ""},
		{"blank", "only blanks", " \n\t\n"},
		{"trailing-comma", "a trailing comma", swap(`"folder": "run"}`, `"folder": "run",}`)},
		{"bom-bad-version", "a byte-order mark, then format version 2", "\ufeff" + swap(`"foilwright": 1`, `"foilwright": 2`)},
		{"array", "a JSON array", "[1, 2]\n"},
		{"no-version", "no format version", swap(`"foilwright": 1,`, "")},
		{"version-2", "format version 2", swap(`"foilwright": 1`, `"foilwright": 2`)},
		{"version-string", `format version "1"`, swap(`"foilwright": 1`, `"foilwright": "1"`)},
		{"unknown-key", "a misspelt top-level key", swap(`"stages"`, `"stagez"`)},
		{"duplicate-key", "a key given twice", swap(`"name": "campaign",`, `"name": "campaign", "name": "other",`)},
		{"inputs-empty", "no inputs", swap(`[{"name": "mid", "files": ["probe.csv"]}]`, "[]")},
		{"file-missing", "an input file that does not exist", swap(`"probe.csv"`, `"missing.csv"`)},
		{"glob-nomatch", "a pattern that matches nothing", swap(`"probe.csv"`, `"*.nothing"`)},
		{"input-folder", "a folder as input", swap(`"probe.csv"`, `"."`)},
		{"stage-unknown", "an unknown stage", swap(`"thin-aerofoil"`, `"thin-airfoil-x"`)},
		{"stage-missing", "a stage executable that does not exist", swap(`"thin-aerofoil"`, `"./nope"`)},
		{"stage-not-executable", "a stage file without execute permission", swap(`"thin-aerofoil"`, `"./probe.csv"`)},
		{"sha256-bad", "a pin that is not a sha256", stageLine(`{"id": "thin", "stage": "thin-aerofoil", "sha256": "xyz"}`)},
		{"param-unknown", "a misspelt stage parameter", params(`{"alpah_deg": [0, 4]}`)},
		{"param-overflow", "an angle of 1e400", params(`{"alpha_deg": [1e400]}`)},
		{"param-type", "angles as a string", params(`{"alpha_deg": "0,4"}`)},
		{"param-range", "an angle of 1000 degrees", params(`{"alpha_deg": [1000]}`)},
		{"param-many", "a million angles", params(`{"alpha_deg": [` + strings.TrimSuffix(strings.Repeat("1,", 1_000_000), ",") + `]}`)},
		{"after-unknown", "after an unknown stage", params(`{"alpha_deg": [0]}, "after": ["nothing"]`)},
		{"after-self", "a stage after itself", params(`{"alpha_deg": [0]}, "after": ["thin"]`)},
		{"on-error-bad", "an unknown on_error", params(`{"alpha_deg": [0]}, "on_error": "retry"`)},
		{"timeout-negative", "a negative timeout", params(`{"alpha_deg": [0]}, "timeout_s": -1`)},
		{"timeout-overflow", "a timeout of 1e400 s", params(`{"alpha_deg": [0]}, "timeout_s": 1e400`)},
		{"panels", "8 panels", swap(`"panels": 120`, `"panels": 8`)},
		{"le-cluster", "le_cluster 4", swap(`"panels": 120`, `"le_cluster": 4`)},
		{"documents", "an unknown document kind", swap(`"folder": "run"`, `"folder": "run", "documents": ["sections"]`)},
		{"params-deep-10001", "an angle list nested 10001 deep, on_error continue", params(`{"alpha_deg": ` + nested(10001) + `}, "on_error": "continue"`)},
		{"params-deep-200k", "parameters nested 100000 deep (200 KB)", params(`{"alpha_deg": [0], "x": ` + nestedObjects(40000) + `}`)},
		{"nul", "a NUL byte in a string", swap(`"campaign"`, "\"camp\x00aign\"")},
		{"stage-id-path", "a stage id that is a path", swap(`"id": "thin"`, `"id": "../thin"`)},
		{"section-collision", "two inputs making one section", swap(`[{"name": "mid", "files": ["probe.csv"]}]`, `[{"name": "mid", "files": ["probe.csv"]}, {"name": "mid", "files": ["probe.csv"]}]`)},
		{"many-errors", "a thousand unknown keys", swap(`"name": "campaign",`, `"name": "campaign", `+manyKeys.String())},
		{"long-name", "a name of 8 MiB", swap(`"campaign"`, `"`+strings.Repeat("n", 8<<20)+`"`)},
		{"panels-huge", "1e30 panels", swap(`"panels": 120`, `"panels": 1e30`)},
		{"station-string", "a station given as a string", swap(`"name": "mid",`, `"name": "mid", "station": "300",`)},
		{"files-string", "files as a string", swap(`["probe.csv"]`, `"probe.csv"`)},
		{"cycle", "two stages after each other", stageLine(`{"id": "a", "stage": "thin-aerofoil", "after": ["b"]}, {"id": "b", "stage": "thin-aerofoil", "after": ["a"]}`)},
	}
	for _, tc := range cases {
		c := b.pipelineCase(tc.name, tc.what, tc.text)
		switch tc.name {
		case "bom-bad-version":
			c.Forbid = []string{"ï", "invalid character"}
		case "stage-not-executable":
			os.Chmod(filepath.Join(c.Dir, "probe.csv"), 0o644)
		case "params-deep-10001", "params-deep-200k":
			c.Forbid = []string{"exceeded max depth"}
		}
	}
	c := b.pipelineCase("sha256-mismatch", "a pin the stage executable does not have",
		stageLine(`{"id": "thin", "stage": "./stage.sh", "sha256": "`+strings.Repeat("ab", 32)+`"}`))
	b.wrapper(c, "stage.sh", "ok", true)
	c = b.pipelineCase("folder-is-file", "outputs.folder names a regular file", swap(`"folder": "run"`, `"folder": "probe.csv"`))
	c = b.pipelineCase("params-deep-2m", "parameters nested 400000 deep (2 MB)", params(`{"alpha_deg": [0], "x": `+nestedObjects(400000)+`}`))
	c.Slow = true
	c = b.pipelineCase("huge", "100 MB of blanks inside a good pipeline", "")
	c.Slow = true
	if b.opts.Slow {
		b.file(c, "pipeline.json", []byte(strings.Replace(pipelineText, `"name": "campaign",`, `"name": "campaign",`+strings.Repeat(" ", 100<<20), 1)))
	}
}

func (b *builder) manifests() {
	cases := []struct{ name, what, data string }{
		{"not-json", "a manifest that is not JSON", "manifest\n"},
		{"wrong-format", "a JSON document of another format", `{"format": "foilwright.section/1", "nodes": []}` + "\n"},
		{"deep", "a manifest nested 100000 deep", `{"format": "foilwright.manifest/1", "x": ` + nested(100000) + "}\n"},
		{"empty", "an empty manifest", ""},
	}
	for _, tc := range cases {
		c := b.add(&Case{Name: "manifest-" + tc.name, Group: GroupInput, Reader: "manifest", What: tc.what,
			Args: []string{"run", "--verify", "manifest.json"}, Names: []string{"manifest.json"}})
		b.file(c, "manifest.json", []byte(tc.data))
	}
	c := b.add(&Case{Name: "manifest-missing", Group: GroupInput, Reader: "manifest", What: "a manifest that does not exist",
		Args: []string{"run", "--verify", "manifest.json"}, Names: []string{"manifest.json"}})
	_ = c
	// A recorded run whose pipeline file or input changed since.
	for _, changed := range []string{"pipeline.json", "probe.csv"} {
		c := b.pipelineCase("verify-changed-"+strings.TrimSuffix(changed, filepath.Ext(changed)), "verify after "+changed+" changed", pipelineText)
		c.Reader = "manifest"
		c.Args = []string{"run", "--verify", "run/manifest.json"}
		c.Names = []string{changed}
		file := changed
		c.Before = func(r *Runner) error {
			if err := r.setup(c, "run", "pipeline.json"); err != nil {
				return err
			}
			f, err := os.OpenFile(filepath.Join(c.Dir, file), os.O_APPEND|os.O_WRONLY, 0)
			if err != nil {
				return err
			}
			defer f.Close()
			_, err = io.WriteString(f, "\n")
			return err
		}
	}
}

func (b *builder) flags() {
	type tc struct {
		name, what string
		args       []string
		flag       string
	}
	cases := []tc{
		{"panels", "--panels 8", []string{"prep", "probe.csv", "-o", "out.json", "--panels", "8"}, "--panels"},
		{"te", "--te bogus", []string{"prep", "probe.csv", "-o", "out.json", "--te", "bogus"}, "--te|\"bogus\""},
		{"noise", "--noise x", []string{"prep", "probe.csv", "-o", "out.json", "--noise", "x"}, "--noise"},
		{"spacing", "--spacing bogus", []string{"prep", "probe.csv", "-o", "out.json", "--spacing", "bogus"}, "--spacing|\"bogus\""},
		{"units", "--units furlongs", []string{"prep", "probe.csv", "-o", "out.json", "--units", "furlongs"}, "--units"},
		{"loop", "--loop -1", []string{"points", "probe.csv", "--loop", "-1"}, "--loop"},
		{"alpha-step-zero", "--alpha 1:2:0", []string{"analyze", "section.json", "--alpha", "1:2:0", "-o", "out.json"}, "--alpha"},
		{"alpha-billion", "--alpha with a billion angles", []string{"analyze", "section.json", "--alpha", "0:1e9:1", "-o", "out.json"}, "--alpha"},
		{"params-syntax", "--params {", []string{"analyze", "section.json", "--params", "{", "-o", "out.json"}, "--params"},
		{"params-deep", "--params nested 50000 deep", []string{"analyze", "section.json", "--params", `{"x": ` + nested(50000) + "}", "-o", "out.json"}, "--params"},
		{"jobs", "--jobs 0", []string{"run", "pipeline.json", "--jobs", "0"}, "--jobs"},
		{"naca", "naca4 99999", []string{"shape", "naca4", "99999", "-o", "out.json"}, "99999"},
		{"stage-missing", "--stage ./nope", []string{"analyze", "section.json", "--stage", "./nope", "-o", "out.json"}, "nope"},
		{"sha256", "--sha256 xyz", []string{"analyze", "section.json", "--stage", "./probe.csv", "--sha256", "xyz", "-o", "out.json"}, "--sha256|probe.csv"},
		{"no-args", "prep without files", []string{"prep", "-o", "out.json"}, "prep"},
		{"timeout", "--stage-timeout -1s", []string{"analyze", "section.json", "--stage-timeout", "-1s", "-o", "out.json"}, "--stage-timeout"},
	}
	for _, t := range cases {
		c := b.add(&Case{Name: "flags-" + t.name, Group: GroupInput, Reader: "flags", What: t.what, Args: t.args, Names: strings.Split(t.flag, "|")})
		b.file(c, "probe.csv", []byte(goodCSV()))
		b.file(c, "section.json", []byte(goodSection()))
		b.file(c, "pipeline.json", []byte(pipelineText))
		b.seed(c, "out.json")
	}
}

// specialInputs are inputs that are not plain files: devices, folders,
// symbolic links, a FIFO, standard input.
func (b *builder) specialInputs() {
	c := b.prepCase("special", "dev-zero", "/dev/zero as input (endless NUL bytes)", "/dev/zero", nil)
	c.Names = []string{"/dev/zero"}
	c = b.prepCase("special", "dev-urandom", "/dev/urandom as input (endless random bytes)", "/dev/urandom", nil)
	c.Names = []string{"/dev/urandom"}
	c.Slow = true
	c = b.prepCase("special", "dev-null", "/dev/null as input (empty)", "/dev/null", nil)
	c.Names = []string{"/dev/null"}
	c = b.prepCase("special", "folder", "a folder as input", "sub", nil)
	os.MkdirAll(filepath.Join(c.Dir, "sub"), 0o755)
	c = b.prepCase("special", "dangling-link", "a symbolic link to nothing", "probe.csv", nil)
	os.Symlink("nowhere.csv", filepath.Join(c.Dir, "probe.csv"))
	c = b.prepCase("special", "link-loop", "symbolic links in a loop", "probe.csv", nil)
	os.Symlink("other.csv", filepath.Join(c.Dir, "probe.csv"))
	os.Symlink("probe.csv", filepath.Join(c.Dir, "other.csv"))
	c = b.prepCase("special", "link-to-bad", "a symbolic link to a bad file", "probe.csv", nil)
	b.file(c, "bad.csv", []byte("# units: mm\n1,2\nx,y\n"))
	os.Symlink("bad.csv", filepath.Join(c.Dir, "probe.csv"))
	c.Names = []string{"probe.csv", "bad.csv"}
	c = b.prepCase("special", "fifo", "a FIFO fed 64 KiB of random text", "feed.csv", nil)
	mkfifo(filepath.Join(c.Dir, "feed.csv"))
	c.Feed = "feed.csv"
	c = b.prepCase("special", "stdin-empty", "empty standard input", "-", nil)
	c.Names = []string{"stdin"}
	c.Stdin = func(io.Writer) error { return nil }
	c = b.prepCase("special", "stdin-garbage", "8 MiB of random bytes on standard input", "-", nil)
	c.Names = []string{"stdin"}
	c.Stdin = func(w io.Writer) error {
		r := rand.New(rand.NewPCG(13, 1))
		_, err := w.Write(randomBytes(r, 8<<20))
		return err
	}
	c = b.prepCase("special", "stdin-2gb", "2 GB of text on standard input", "-", nil)
	c.Names = []string{"stdin"}
	c.Slow = true
	c.Stdin = func(w io.Writer) error { return endless(w, "1.5,2.5\n", 2<<30) }
	c = b.prepCase("special", "stdin-limit", "16 MiB on standard input against --limit input-bytes=1MiB", "-", nil)
	c.Args = append([]string{"--limit", "input-bytes=1MiB"}, c.Args...)
	c.Names = []string{"stdin"}
	c.FastOnly = true
	c.Stdin = func(w io.Writer) error { return endless(w, "1.5,2.5\n", 16<<20) }
}

// endless writes line to w until n bytes are written or w fails.
func endless(w io.Writer, line string, n int64) error {
	chunk := []byte(strings.Repeat(line, (64<<10)/len(line)))
	for done := int64(0); done < n; done += int64(len(chunk)) {
		if _, err := w.Write(chunk); err != nil {
			return err
		}
	}
	return nil
}
