package plot

import (
	"cmp"
	"fmt"
	"image/color"
	"math"
	"slices"

	gplot "gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/foilwright/foilwright/geometry"
)

// FlowField is the stream function ψ sampled on a regular grid around a
// section, in chord units of the normalised frame: Psi[j*Nx+i] is ψ at
// (X0 + i·DX, Y0 + j·DY). Values inside the body are hidden under it but
// must be finite.
type FlowField struct {
	AlphaDeg float64 // angle of attack, degrees, for the title
	Method   string  // the stage or method that computed it; may be empty
	Nx, Ny   int
	X0, Y0   float64
	DX, DY   float64
	Psi      []float64
	Body     []geometry.Point // the section outline, node order
	// Levels are the values of ψ drawn; nil draws 31 levels evenly spaced
	// between the least and greatest ψ on the grid's edges (the flow
	// outside the body).
	Levels []float64
}

// psiGrid adapts a FlowField to gonum's GridXYZ.
type psiGrid struct{ f *FlowField }

func (g psiGrid) Dims() (c, r int)   { return g.f.Nx, g.f.Ny }
func (g psiGrid) Z(c, r int) float64 { return g.f.Psi[r*g.f.Nx+c] }
func (g psiGrid) X(c int) float64    { return g.f.X0 + float64(c)*g.f.DX }
func (g psiGrid) Y(r int) float64    { return g.f.Y0 + float64(r)*g.f.DY }

// onePalette gives every contour the same colour.
type onePalette struct{ c color.Color }

func (p onePalette) Colors() []color.Color { return []color.Color{p.c} }

// StreamlinePlot draws streamlines around a section, as contours of the
// stream function, with the body filled, at equal axis scales over the
// grid. It returns an error wrapping ErrNoData for a grid smaller than 2 × 2,
// and an error for a Psi of the wrong length, a non-positive spacing,
// non-finite values, or a body of fewer than 3 points.
func StreamlinePlot(f FlowField) (*Figure, error) {
	if f.Nx < 2 || f.Ny < 2 {
		return nil, fmt.Errorf("%w: grid %d × %d, want at least 2 × 2", ErrNoData, f.Nx, f.Ny)
	}
	if err := firstErr(
		checkLen("Psi", len(f.Psi), "Nx·Ny", f.Nx*f.Ny),
		checkValues("Psi", f.Psi),
		checkValues("X0, Y0, DX, DY", []float64{f.X0, f.Y0, f.DX, f.DY}),
		checkValues("Levels", f.Levels),
		checkPoints("Body", f.Body),
	); err != nil {
		return nil, err
	}
	if !(f.DX > 0 && f.DY > 0) {
		return nil, fmt.Errorf("plot: grid spacing %g × %g is not positive", f.DX, f.DY)
	}
	if len(f.Body) < 3 {
		return nil, fmt.Errorf("plot: body has %d point(s), want at least 3", len(f.Body))
	}
	g := psiGrid{&f}
	levels := slices.Clone(f.Levels)
	if levels == nil {
		lo, hi := math.Inf(1), math.Inf(-1)
		for i := range f.Nx {
			for _, j := range []int{0, f.Ny - 1} {
				lo, hi = math.Min(lo, g.Z(i, j)), math.Max(hi, g.Z(i, j))
			}
		}
		for j := range f.Ny {
			for _, i := range []int{0, f.Nx - 1} {
				lo, hi = math.Min(lo, g.Z(i, j)), math.Max(hi, g.Z(i, j))
			}
		}
		const n = 31
		if hi > lo {
			for k := range n {
				levels = append(levels, lo+(hi-lo)*(float64(k)+0.5)/n)
			}
		}
	}
	slices.Sort(levels)
	title := fmt.Sprintf("Streamlines, α = %g°", f.AlphaDeg)
	if f.Method != "" {
		title += " (" + f.Method + ")"
	}
	p := newPlot(title, "x/c", "y/c")
	if len(levels) > 0 {
		ct := plotter.NewContour(g, levels, onePalette{colBlue})
		ct.LineStyles = []draw.LineStyle{lineStyle(colBlue, 0.8, nil)}
		ct.Min, ct.Max = levels[0], levels[len(levels)-1]
		p.Add(sortedContour{ct})
	}
	body := xys(f.Body)
	p.Add(newPolygon(body, colBody, lineStyle(colInk, 1, nil)))
	want := box{f.X0, g.X(f.Nx - 1), f.Y0, g.Y(f.Ny - 1)}

	fig := &Figure{Width: 8 * vg.Inch}
	pn := equalPanel(p, want)
	h := pn.equalHeight(fig.Width - 2*figMargin)
	fig.addRow(1, pn)
	fig.Height = h + 2*figMargin
	return fig, nil
}

// sortedContour draws a gonum Contour with its paths in a fixed order.
// gonum collects the paths of a level in a map, so their order, and with it
// the SVG, changes from run to run; the run folder must be reproducible.
type sortedContour struct{ *plotter.Contour }

// Plot implements gonum's plot.Plotter.
func (sc sortedContour) Plot(c draw.Canvas, plt *gplot.Plot) {
	rec := &strokeRecorder{Canvas: c.Canvas}
	sc.Contour.Plot(draw.Canvas{Canvas: rec, Rectangle: c.Rectangle}, plt)
	slices.SortStableFunc(rec.strokes, func(a, b recordedStroke) int { return comparePaths(a.path, b.path) })
	for _, s := range rec.strokes {
		c.SetLineStyle(s.style)
		c.Stroke(s.path)
	}
}

// GlyphBoxes implements gonum's plot.GlyphBoxer: contour lines need no
// padding (gonum's Contour asks for a box at every grid point, which makes
// each layout slow).
func (sortedContour) GlyphBoxes(*gplot.Plot) []gplot.GlyphBox { return nil }

// recordedStroke is one Stroke call and the line style it was made with.
type recordedStroke struct {
	path  vg.Path
	style draw.LineStyle
}

// strokeRecorder passes everything to Canvas but keeps Stroke calls.
type strokeRecorder struct {
	vg.Canvas
	style   draw.LineStyle
	strokes []recordedStroke
}

func (r *strokeRecorder) SetLineWidth(w vg.Length) { r.style.Width = w }
func (r *strokeRecorder) SetLineDash(d []vg.Length, off vg.Length) {
	r.style.Dashes, r.style.DashOffs = slices.Clone(d), off
}
func (r *strokeRecorder) SetColor(c color.Color) { r.style.Color = c }
func (r *strokeRecorder) Stroke(p vg.Path) {
	r.strokes = append(r.strokes, recordedStroke{slices.Clone(p), r.style})
}

// comparePaths orders paths by their components.
func comparePaths(a, b vg.Path) int {
	for i := range min(len(a), len(b)) {
		p, q := a[i], b[i]
		if c := cmp.Compare(p.Type, q.Type); c != 0 {
			return c
		}
		if c := cmp.Compare(p.Pos.X, q.Pos.X); c != 0 {
			return c
		}
		if c := cmp.Compare(p.Pos.Y, q.Pos.Y); c != 0 {
			return c
		}
	}
	return cmp.Compare(len(a), len(b))
}
