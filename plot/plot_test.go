package plot

import (
	"bytes"
	"encoding/xml"
	"errors"
	"flag"
	"fmt"
	"image/color"
	"image/png"
	"io"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/foilwright/foilwright/geometry"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata")

// hex returns the SVG spelling of c, as vgsvg writes it.
func hex(c color.Color) string {
	r, g, b, _ := c.RGBA()
	return fmt.Sprintf("#%02X%02X%02X", r>>8, g>>8, b>>8)
}

// pathStat counts the SVG paths of one colour.
type pathStat struct {
	strokes, fills int
	long           int // stroked paths with more than 8 vertices: data lines
	boxes          []vg.Rectangle
}

// svgPaths walks an SVG document with encoding/xml, failing on malformed
// XML, and returns the paths per stroke or fill colour, with the bounding
// box of each stroked path's vertices (SVG coordinates).
func svgPaths(t *testing.T, svg []byte) map[string]*pathStat {
	t.Helper()
	dec := xml.NewDecoder(bytes.NewReader(svg))
	stats := map[string]*pathStat{}
	get := func(c string) *pathStat {
		if stats[c] == nil {
			stats[c] = &pathStat{}
		}
		return stats[c]
	}
	num := regexp.MustCompile(`[-+]?[0-9]*\.?[0-9]+(?:[eE][-+]?[0-9]+)?`)
	root := ""
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("SVG is not well-formed XML: %v", err)
		}
		se, ok := tok.(xml.StartElement)
		if !ok {
			continue
		}
		if root == "" {
			root = se.Name.Local
		}
		if se.Name.Local != "path" {
			continue
		}
		var d, style string
		for _, a := range se.Attr {
			switch a.Name.Local {
			case "d":
				d = a.Value
			case "style":
				style = a.Value
			}
		}
		props := map[string]string{}
		for kv := range strings.SplitSeq(style, ";") {
			if k, v, ok := strings.Cut(kv, ":"); ok {
				props[k] = v
			}
		}
		vertices := strings.Count(d, "M") + strings.Count(d, "L")
		if c, ok := props["stroke"]; ok && c != "none" {
			s := get(c)
			s.strokes++
			if vertices > 8 && !strings.Contains(d, "A") {
				s.long++
				b := vg.Rectangle{Min: vg.Point{X: math.MaxFloat32, Y: math.MaxFloat32}, Max: vg.Point{X: -math.MaxFloat32, Y: -math.MaxFloat32}}
				ns := num.FindAllString(d, -1)
				for i := 0; i+1 < len(ns); i += 2 {
					x, _ := strconv.ParseFloat(ns[i], 64)
					y, _ := strconv.ParseFloat(ns[i+1], 64)
					b.Min.X, b.Max.X = min(b.Min.X, vg.Length(x)), max(b.Max.X, vg.Length(x))
					b.Min.Y, b.Max.Y = min(b.Min.Y, vg.Length(y)), max(b.Max.Y, vg.Length(y))
				}
				s.boxes = append(s.boxes, b)
			}
		} else if props["fill"] != "none" {
			c := props["fill"]
			if c == "" {
				c = "#000000"
			}
			get(c).fills++
		}
	}
	if root != "svg" {
		t.Fatalf("root element %q, want svg", root)
	}
	return stats
}

// paletteColours are the series colours; the others (ink, greys, band,
// grid, white) are not series.
var paletteColours = []color.Color{colBlue, colOrange, colSky, colPurple, colGold, colRed}

// seriesIn returns the palette colours that have strokes (or fills) in
// stats, sorted.
func seriesIn(stats map[string]*pathStat, fills bool) []string {
	var out []string
	for _, c := range paletteColours {
		s := stats[hex(c)]
		if s != nil && ((!fills && s.strokes > 0) || (fills && s.fills > 0)) {
			out = append(out, hex(c))
		}
	}
	slices.Sort(out)
	return out
}

func hexes(cs ...color.Color) []string {
	out := []string{}
	for _, c := range cs {
		out = append(out, hex(c))
	}
	slices.Sort(out)
	return out
}

// TestRender renders every demo figure to SVG and PNG in memory, and checks
// the PNG's size, that the SVG is well-formed, and which series it draws:
// the palette colours of stroked and of filled paths, and the number of
// data lines (stroked paths of more than 8 vertices) of some colours.
func TestRender(t *testing.T) {
	for _, tc := range []struct {
		name           string
		strokes, fills []string
		long           map[color.Color]int // data lines per colour
		minFills       map[color.Color]int // at least this many filled paths
	}{
		// The curve: once in the main panel and the LE window, twice in the
		// TE window (the window cuts it into the upper and lower surface).
		{"prep", hexes(colRed), hexes(colBlue), map[color.Color]int{colInk: 4},
			map[color.Color]int{colBlue: 297 + 1}}, // kept points in the main panel, legend
		{"deviation", hexes(colBlue, colRed), hexes(colBlue, colRed), map[color.Color]int{colBlue: 1}, map[color.Color]int{colBlue: 297}},
		{"nodes", hexes(colBlue, colOrange, colPurple), hexes(colBlue, colOrange), map[color.Color]int{colInk: 1, colBlue: 1, colOrange: 1, colPurple: 1}, map[color.Color]int{colBlue: 161 + 160}},
		{"section", hexes(colBlue, colOrange), hexes(colBlue), map[color.Color]int{colInk: 1, colBlue: 2, colOrange: 2}, nil},
		{"cp", hexes(colBlue, colOrange), nil, map[color.Color]int{colBlue: 1, colOrange: 1}, nil},
		{"cp-sweep", hexes(colBlue, colOrange, colSky), nil, map[color.Color]int{colBlue: 2, colOrange: 2, colSky: 2}, nil},
		{"polar", hexes(colBlue, colOrange), hexes(colBlue, colOrange), nil, map[color.Color]int{colBlue: 2*8 + 1}},
		{"streamlines", hexes(colBlue), nil, nil, nil},
		{"stations", hexes(colBlue, colOrange, colSky, colPurple), hexes(colBlue, colOrange, colSky), nil,
			map[color.Color]int{colBlue: 5, colOrange: 5, colSky: 5}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var d demoFigure
			for _, x := range demoFigures() {
				if x.name == tc.name {
					d = x
				}
			}
			f, err := d.build()
			if err != nil {
				t.Fatal(err)
			}
			var pb bytes.Buffer
			if err := Write(&pb, f, PNG, 0, 0); err != nil {
				t.Fatal(err)
			}
			img, err := png.Decode(&pb)
			if err != nil {
				t.Fatalf("PNG does not decode: %v", err)
			}
			wantW, wantH := int(math.Round(f.Width.Dots(DPI))), int(math.Round(f.Height.Dots(DPI)))
			if b := img.Bounds(); b.Dx() != wantW || b.Dy() != wantH {
				t.Errorf("PNG is %d × %d px, want %d × %d", b.Dx(), b.Dy(), wantW, wantH)
			}
			var sb bytes.Buffer
			if err := Write(&sb, f, SVG, 0, 0); err != nil {
				t.Fatal(err)
			}
			stats := svgPaths(t, sb.Bytes())
			if got := seriesIn(stats, false); !slices.Equal(got, tc.strokes) {
				t.Errorf("stroked series colours %v, want %v", got, tc.strokes)
			}
			if tc.fills != nil {
				if got := seriesIn(stats, true); !slices.Equal(got, tc.fills) {
					t.Errorf("filled series colours %v, want %v", got, tc.fills)
				}
			}
			for c, n := range tc.long {
				if s := stats[hex(c)]; s == nil || s.long != n {
					got := 0
					if s != nil {
						got = s.long
					}
					t.Errorf("%s: %d data line(s), want %d", hex(c), got, n)
				}
			}
			for c, n := range tc.minFills {
				if s := stats[hex(c)]; s == nil || s.fills < n {
					t.Errorf("%s: fewer than %d filled paths", hex(c), n)
				}
			}
		})
	}
}

// TestStreamlineContours checks that the streamlines are many contours and
// that the body is filled.
func TestStreamlineContours(t *testing.T) {
	f, err := StreamlinePlot(demoJoukowski.flow(6*math.Pi/180, 211, 121, -0.5, -0.6, 0.01, 0.01))
	if err != nil {
		t.Fatal(err)
	}
	var sb bytes.Buffer
	if err := Write(&sb, f, SVG, 0, 0); err != nil {
		t.Fatal(err)
	}
	stats := svgPaths(t, sb.Bytes())
	// 31 levels, some cut in two by the body: at least one path per level.
	if s := stats[hex(colBlue)]; s == nil || s.strokes < 31 {
		t.Errorf("contour paths: %+v, want at least 31", s)
	}
	if s := stats[hex(colBody)]; s == nil || s.fills != 1 {
		t.Errorf("body fills: %+v, want 1", s)
	}
}

// TestDeterministic renders every figure twice, from two builds, and wants
// the same bytes: the run folder must be reproducible byte for byte. The
// SVG records every drawing call, so equal SVGs mean equal calls; PNG is
// checked for a few figures (rasterising is slow under -race).
func TestDeterministic(t *testing.T) {
	for _, d := range demoFigures() {
		formats := []string{SVG}
		if d.name == "section" || d.name == "streamlines" {
			formats = append(formats, PNG)
		}
		for _, format := range formats {
			var out [2][]byte
			for i := range out {
				f, err := d.build()
				if err != nil {
					t.Fatal(err)
				}
				var b bytes.Buffer
				if err := Write(&b, f, format, 0, 0); err != nil {
					t.Fatal(err)
				}
				out[i] = b.Bytes()
			}
			if !bytes.Equal(out[0], out[1]) {
				t.Errorf("%s.%s: two renderings differ", d.name, format)
			}
			// The same figure again after drawing it at another size.
			f, err := d.build()
			if err != nil {
				t.Fatal(err)
			}
			var other, again bytes.Buffer
			if err := Write(&other, f, format, 700, 260); err != nil {
				t.Fatal(err)
			}
			if err := Write(&again, f, format, 0, 0); err != nil {
				t.Fatal(err)
			}
			if !bytes.Equal(out[0], again.Bytes()) {
				t.Errorf("%s.%s: drawing at another size first changes the picture", d.name, format)
			}
		}
	}
}

// goldenPolar is a small figure for the golden file.
func goldenPolar() (*Figure, error) {
	return PolarPlot([]PolarSeries{
		{Method: "thin-aerofoil", AlphaDeg: []float64{-2, 0, 2, 4}, Cl: []float64{0.0, 0.22, 0.44, 0.66}, Cm: []float64{-0.053, -0.053, -0.053, -0.053}},
	})
}

// TestGolden compares a small SVG with testdata/polar-small.svg.golden,
// parsed: the same elements and text, and numbers within 0.01 pt (floats
// may differ in the last digit between architectures). -update rewrites it.
func TestGolden(t *testing.T) {
	f, err := goldenPolar()
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	if err := Write(&b, f, SVG, 4*vg.Inch, 3*vg.Inch); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join("testdata", "polar-small.svg.golden")
	if *update {
		if err := os.WriteFile(path, b.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run with -update to create it)", err)
	}
	if err := sameSVG(b.Bytes(), want, 0.01); err != nil {
		t.Errorf("SVG differs from %s: %v", path, err)
	}
}

// sameSVG compares two SVG documents token by token; numbers in attribute
// values and text may differ by tol.
func sameSVG(got, want []byte, tol float64) error {
	tokens := func(b []byte) ([]string, error) {
		dec := xml.NewDecoder(bytes.NewReader(b))
		var out []string
		for {
			tok, err := dec.Token()
			if err == io.EOF {
				return out, nil
			}
			if err != nil {
				return nil, err
			}
			switch v := tok.(type) {
			case xml.StartElement:
				out = append(out, "<"+v.Name.Local)
				for _, a := range v.Attr {
					out = append(out, a.Name.Local+"="+a.Value)
				}
			case xml.EndElement:
				out = append(out, "</"+v.Name.Local)
			case xml.CharData:
				if s := strings.TrimSpace(string(v)); s != "" {
					out = append(out, s)
				}
			}
		}
	}
	g, err := tokens(got)
	if err != nil {
		return fmt.Errorf("got: %v", err)
	}
	w, err := tokens(want)
	if err != nil {
		return fmt.Errorf("want: %v", err)
	}
	if len(g) != len(w) {
		return fmt.Errorf("%d tokens, want %d", len(g), len(w))
	}
	num := regexp.MustCompile(`[-+]?[0-9]*\.?[0-9]+(?:[eE][-+]?[0-9]+)?`)
	for i := range g {
		if g[i] == w[i] {
			continue
		}
		gn, wn := num.FindAllString(g[i], -1), num.FindAllString(w[i], -1)
		if len(gn) != len(wn) || num.ReplaceAllString(g[i], "#") != num.ReplaceAllString(w[i], "#") {
			return fmt.Errorf("token %d: %.80q, want %.80q", i, g[i], w[i])
		}
		for k := range gn {
			a, _ := strconv.ParseFloat(gn[k], 64)
			b, _ := strconv.ParseFloat(wn[k], 64)
			if math.Abs(a-b) > tol {
				return fmt.Errorf("token %d: number %s, want %s", i, gn[k], wn[k])
			}
		}
	}
	return nil
}

// TestSectionEqualScale lays out figures with equal-scale panels at their
// natural size and at sizes of very different aspect, and measures the
// data-to-canvas scale of each such panel in x and y: they must agree, and
// the wanted data must stay in view.
func TestSectionEqualScale(t *testing.T) {
	const tol = 1e-3 // relative; the fit repeats until tick labels settle
	builds := []demoFigure{}
	for _, d := range demoFigures() {
		switch d.name {
		case "section", "prep", "nodes", "streamlines":
			builds = append(builds, d)
		}
	}
	for _, d := range builds {
		f, err := d.build()
		if err != nil {
			t.Fatal(err)
		}
		for _, size := range [][2]vg.Length{{f.Width, f.Height}, {900, 300}, {300, 700}, {500, 500}} {
			c := draw.Canvas{Rectangle: vg.Rectangle{Max: vg.Point{X: size[0], Y: size[1]}}}
			canvases, _ := f.layout(c)
			for i, r := range f.rows {
				for j, pn := range r.panels {
					if !pn.equal {
						continue
					}
					p := pn.plot
					title := p.Title.Text
					p.Title.Text = "" // the figure draws titles itself
					dc := p.DataCanvas(canvases[i][j])
					p.Title.Text = title
					x, y := p.Transforms(&dc)
					sx, sy := float64(x(1)-x(0)), float64(y(1)-y(0))
					if math.Abs(sx-sy) > tol*sx {
						t.Errorf("%s %v panel %d,%d: %.6g pt per unit in x, %.6g in y", d.name, size, i, j, sx, sy)
					}
					w := pn.want
					if p.X.Min > w.x0+1e-9 || p.X.Max < w.x1-1e-9 || p.Y.Min > w.y0+1e-9 || p.Y.Max < w.y1-1e-9 {
						t.Errorf("%s %v panel %d,%d: shows [%g, %g] × [%g, %g], want [%g, %g] × [%g, %g] in view",
							d.name, size, i, j, p.X.Min, p.X.Max, p.Y.Min, p.Y.Max, w.x0, w.x1, w.y0, w.y1)
					}
				}
			}
		}
	}
}

// TestLECircleRound draws the section at a wide and at a tall size and
// measures, in the SVG itself, the leading-edge circle (the only long blue
// stroke in the upper panel): its width and height on the page must agree.
func TestLECircleRound(t *testing.T) {
	d := demoSection()
	d.Thickness = nil // leave the circle the only long blue stroke
	f, err := SectionPlot(d)
	if err != nil {
		t.Fatal(err)
	}
	for _, size := range [][2]vg.Length{{0, 0}, {1000, 260}, {360, 720}} {
		var b bytes.Buffer
		if err := Write(&b, f, SVG, size[0], size[1]); err != nil {
			t.Fatal(err)
		}
		s := svgPaths(t, b.Bytes())[hex(colBlue)]
		if s == nil || len(s.boxes) != 1 {
			t.Fatalf("%v: want one long blue stroke, got %+v", size, s)
		}
		bx := s.boxes[0]
		w, h := float64(bx.Max.X-bx.Min.X), float64(bx.Max.Y-bx.Min.Y)
		// 96-gon: width and height agree to cos(π/96) or better; SVG
		// numbers carry 5 significant digits.
		if math.Abs(w-h) > 0.02*w || w < 1 {
			t.Errorf("%v: LE circle is %.4g × %.4g pt", size, w, h)
		}
	}
}

// TestErrors feeds bad input to every function.
func TestErrors(t *testing.T) {
	nan := math.NaN()
	good := demoPrep()
	badS := good
	badS.S = badS.S[:10]
	badM := good
	badM.Measured = append(slices.Clone(good.Measured), geometry.Point{X: nan})
	for _, tc := range []struct {
		name   string
		call   func() (*Figure, error)
		noData bool
		substr string
	}{
		{"prep empty", func() (*Figure, error) { return PrepPlot(PrepData{}) }, true, ""},
		{"prep nan", func() (*Figure, error) { return PrepPlot(badM) }, false, "Measured[297]"},
		{"deviation no residuals", func() (*Figure, error) { return DeviationPlot(PrepData{Curve: good.Curve}) }, true, ""},
		{"deviation lengths", func() (*Figure, error) { return DeviationPlot(badS) }, false, "Residual"},
		{"nodes few", func() (*Figure, error) { return NodesPlot(naca2412.Loop(2)[:2]) }, true, ""},
		{"nodes nan", func() (*Figure, error) {
			return NodesPlot([]geometry.Point{{X: 1}, {X: nan}, {X: 0}, {X: 1}})
		}, false, "nodes[1]"},
		{"section few", func() (*Figure, error) { return SectionPlot(SectionData{}) }, true, ""},
		{"section radius", func() (*Figure, error) {
			d := demoSection()
			d.LERadius = -1
			return SectionPlot(d)
		}, false, "negative"},
		{"cp none", func() (*Figure, error) { return CpPlot(nil, CpOptions{}) }, true, ""},
		{"cp lengths", func() (*Figure, error) {
			c := demoCp(2)
			c[0].Cp = c[0].Cp[1:]
			return CpPlot(c, CpOptions{})
		}, false, "cases[0].Cp"},
		{"cp inf", func() (*Figure, error) {
			c := demoCp(2)
			c[0].Cp[5] = math.Inf(1)
			return CpPlot(c, CpOptions{})
		}, false, "cases[0].Cp[5]"},
		{"polar none", func() (*Figure, error) { return PolarPlot(nil) }, true, ""},
		{"polar empty series", func() (*Figure, error) { return PolarPlot([]PolarSeries{{Method: "x"}}) }, true, ""},
		{"polar cm lengths", func() (*Figure, error) {
			return PolarPlot([]PolarSeries{{AlphaDeg: []float64{0, 1}, Cl: []float64{0, 0.1}, Cm: []float64{0}}})
		}, false, "series[0].Cm"},
		{"flow small", func() (*Figure, error) { return StreamlinePlot(FlowField{Nx: 1, Ny: 5}) }, true, ""},
		{"flow psi length", func() (*Figure, error) {
			return StreamlinePlot(FlowField{Nx: 2, Ny: 2, DX: 1, DY: 1, Psi: []float64{1, 2, 3}, Body: naca2412.Loop(4)})
		}, false, "Psi"},
		{"flow spacing", func() (*Figure, error) {
			return StreamlinePlot(FlowField{Nx: 2, Ny: 2, DX: 0, DY: 1, Psi: []float64{1, 2, 3, 4}, Body: naca2412.Loop(4)})
		}, false, "spacing"},
		{"flow body", func() (*Figure, error) {
			return StreamlinePlot(FlowField{Nx: 2, Ny: 2, DX: 1, DY: 1, Psi: []float64{1, 2, 3, 4}})
		}, false, "body"},
		{"stations none", func() (*Figure, error) { return StationsPlot("mm", nil) }, true, ""},
		{"stations nan", func() (*Figure, error) { return StationsPlot("mm", []Station{{Chord: nan}}) }, false, "stations[0]"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			f, err := tc.call()
			if err == nil {
				t.Fatalf("no error, figure %v", f)
			}
			if f != nil {
				t.Errorf("figure with error %v", err)
			}
			if tc.noData != errors.Is(err, ErrNoData) {
				t.Errorf("errors.Is(%v, ErrNoData) = %v, want %v", err, !tc.noData, tc.noData)
			}
			if !strings.Contains(err.Error(), tc.substr) || !strings.HasPrefix(err.Error(), "plot: ") {
				t.Errorf("error %q, want prefix \"plot: \" and %q", err, tc.substr)
			}
		})
	}
}

// TestSave writes files by extension and refuses other extensions without
// leaving anything behind.
func TestSave(t *testing.T) {
	f, err := goldenPolar()
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	for _, name := range []string{"a.svg", "b.PNG"} {
		path := filepath.Join(dir, name)
		if err := Save(f, path, 300, 200); err != nil {
			t.Fatal(err)
		}
		b, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		if strings.HasSuffix(name, "PNG") {
			cfg, err := png.DecodeConfig(bytes.NewReader(b))
			if err != nil || cfg.Width != 400 || cfg.Height != 267 {
				t.Errorf("%s: %+v, %v, want 400 × 267 PNG", name, cfg, err)
			}
		} else {
			svgPaths(t, b)
		}
	}
	err = Save(f, filepath.Join(dir, "c.pdf"), 0, 0)
	if !errors.Is(err, ErrFormat) {
		t.Errorf("Save .pdf: %v, want ErrFormat", err)
	}
	if err := Write(io.Discard, f, "gif", 0, 0); !errors.Is(err, ErrFormat) {
		t.Errorf("Write gif: %v, want ErrFormat", err)
	}
	if err := Write(io.Discard, &Figure{}, SVG, 0, 0); err == nil {
		t.Error("Write of a figure with no size: no error")
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) != 2 {
		t.Errorf("folder holds %d entries, want 2", len(entries))
	}
}

// TestTicks checks the axis ticks over ranges of many sizes and signs.
func TestTicks(t *testing.T) {
	for _, r := range [][2]float64{{0, 1}, {-1.93, 1.05}, {-0.0664, 0.0133}, {-4.3, 10.3}, {33, 51}, {0, 312}, {1e-6, 3e-6}, {-250, -20}, {0.9999, 1.0001}} {
		for _, n := range []int{4, 6} {
			var labels []string
			var last = math.Inf(-1)
			for _, tk := range (niceTicks{n}).Ticks(r[0], r[1]) {
				if tk.Value < r[0]-1e-12 || tk.Value > r[1]+1e-12 {
					t.Errorf("%v n=%d: tick %g outside the range", r, n, tk.Value)
				}
				if tk.Label == "" {
					continue
				}
				if tk.Value <= last {
					t.Errorf("%v n=%d: labelled ticks not increasing at %g", r, n, tk.Value)
				}
				last = tk.Value
				if v, err := strconv.ParseFloat(strings.Replace(tk.Label, "\u2212", "-", 1), 64); err != nil || math.Abs(v-tk.Value) > 1e-9*math.Max(1, math.Abs(tk.Value))+math.Abs(r[1]-r[0])*1e-3 {
					t.Errorf("%v n=%d: label %q for %g", r, n, tk.Label, tk.Value)
				}
				if strings.HasPrefix(tk.Label, "\u22120") && strings.Trim(tk.Label, "\u22120.") == "" {
					t.Errorf("%v n=%d: negative zero label %q", r, n, tk.Label)
				}
				labels = append(labels, tk.Label)
			}
			if len(labels) < n/2 || len(labels) > 2*n+1 {
				t.Errorf("%v n=%d: %d labels %v", r, n, len(labels), labels)
			}
			if len(slices.Compact(slices.Clone(labels))) != len(labels) {
				t.Errorf("%v n=%d: repeated labels %v", r, n, labels)
			}
		}
	}
}

// BenchmarkPrepPNG draws the preparation figure to PNG.
func BenchmarkPrepPNG(b *testing.B) {
	f, err := PrepPlot(demoPrep())
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if err := Write(io.Discard, f, PNG, 0, 0); err != nil {
			b.Fatal(err)
		}
	}
}
