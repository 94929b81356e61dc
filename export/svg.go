package export

import (
	"bufio"
	"errors"
	"fmt"
	"html"
	"io"
	"math"
	"strings"

	"github.com/foilwright/foilwright/geometry"
)

// ErrNoScale means an SVG template of a section in chord units, which has
// no true size to draw it at.
var ErrNoScale = errors.New("export: a 1:1 template needs the section in a part unit (mm, in or m)")

// svgUnit returns the SVG length unit a drawing in u is sized in, and the
// factor from u to it: 1:1 means one unit of the drawing is one unit of
// the part.
func svgUnit(u geometry.Unit) (string, float64, bool) {
	switch u {
	case geometry.Millimetre:
		return "mm", 1, true
	case geometry.Inch:
		return "in", 1, true
	case geometry.Metre:
		return "cm", 100, true
	}
	return "", 0, false
}

// scaleBar returns a round length for the scale bar of a drawing width w
// wide: the largest of 1, 2 or 5 times a power of ten that is at most 40 %
// of w.
func scaleBar(w float64) float64 {
	target := 0.4 * w
	p := math.Pow(10, math.Floor(math.Log10(target)))
	for _, f := range []float64{5, 2, 1} {
		if f*p <= target {
			return f * p
		}
	}
	return p
}

// SVG writes p as an SVG drawing at 1:1 (width and height in the section's
// unit) for a cutting or checking template: the outline through the nodes
// (path id "section"), the chord line (id "chord"), crosses at the leading
// edge, trailing edge and quarter chord, a scale bar with its length (id
// "scale-bar"), and a title block. y of the part points up the page. It
// returns an error wrapping ErrNoScale for a section in chord units, and
// the first error of w.
func SVG(w io.Writer, p *Placed) error {
	unit, factor, ok := svgUnit(p.Units)
	if !ok {
		return fmt.Errorf("%w; %q is in %s: give it a chord length", ErrNoScale, p.Name, p.Units)
	}
	mm := 1.0 // one millimetre in the drawing's unit
	switch p.Units {
	case geometry.Inch:
		mm = 1 / 25.4
	case geometry.Metre:
		mm = 1e-3
	}
	lo, hi := p.bounds()
	margin := 10 * mm
	text := 3 * mm
	x0, x1 := lo.X-margin, hi.X+margin
	y0, y1 := -hi.Y-margin, -lo.Y+margin+9*text // room below for the scale bar and title
	width, height := x1-x0, y1-y0
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, `<?xml version="1.0" encoding="UTF-8"?>
<svg xmlns="http://www.w3.org/2000/svg" width="%s%s" height="%s%s" viewBox="%s %s %s %s">
`, num(width*factor), unit, num(height*factor), unit, num(x0), num(y0), num(width), num(height))
	name := p.Name
	if name == "" {
		name = "section"
	}
	fmt.Fprintf(bw, "<title>%s, drawn 1:1 by foilwright</title>\n", html.EscapeString(name))
	fmt.Fprintf(bw, `<g fill="none" stroke="black" stroke-width="%s" stroke-linejoin="round">`+"\n", num(0.25*mm))
	// The outline.
	var d strings.Builder
	for i, q := range p.outline() {
		if i == 0 {
			d.WriteString("M ")
		} else {
			d.WriteString(" L ")
		}
		fmt.Fprintf(&d, "%s,%s", num(q.X), num(-q.Y))
	}
	d.WriteString(" Z")
	fmt.Fprintf(bw, `<path id="section" d="%s"/>`+"\n", d.String())
	// The chord line, dashed.
	fmt.Fprintf(bw, `<line id="chord" x1="%s" y1="%s" x2="%s" y2="%s" stroke-width="%s" stroke-dasharray="%s %s"/>`+"\n",
		num(p.LE.X), num(-p.LE.Y), num(p.TE.X), num(-p.TE.Y), num(0.18*mm), num(3*mm), num(1.5*mm))
	// Datum crosses.
	dir := p.TE.Sub(p.LE).Scale(1 / p.TE.Dist(p.LE))
	nrm := geometry.Point{X: -dir.Y, Y: dir.X}
	s := 2.5 * mm
	for _, m := range []struct {
		at    geometry.Point
		label string
	}{{p.LE, "LE"}, {p.TE, "TE"}, {p.QuarterChord, "c/4"}} {
		a, b := m.at.Sub(dir.Scale(s)), m.at.Add(dir.Scale(s))
		c, e := m.at.Sub(nrm.Scale(s)), m.at.Add(nrm.Scale(s))
		fmt.Fprintf(bw, `<path class="datum" d="M %s,%s L %s,%s M %s,%s L %s,%s" stroke="red" stroke-width="%s"/>`+"\n",
			num(a.X), num(-a.Y), num(b.X), num(-b.Y), num(c.X), num(-c.Y), num(e.X), num(-e.Y), num(0.18*mm))
		at := m.at.Add(nrm.Scale(1.4 * s))
		fmt.Fprintf(bw, `<text x="%s" y="%s" font-size="%s" font-family="sans-serif" fill="red" stroke="none" text-anchor="middle">%s</text>`+"\n",
			num(at.X), num(-at.Y), num(text), m.label)
	}
	// The scale bar: a bar of a round length with ticks at each fifth.
	bar := scaleBar(hi.X - lo.X)
	bx, by := lo.X, -lo.Y+margin/2+2*text
	fmt.Fprintf(bw, `<g id="scale-bar" stroke-width="%s">`+"\n", num(0.25*mm))
	fmt.Fprintf(bw, `<line x1="%s" y1="%s" x2="%s" y2="%s"/>`+"\n", num(bx), num(by), num(bx+bar), num(by))
	for k := 0; k <= 5; k++ {
		x := bx + bar*float64(k)/5
		tick := text / 2
		if k == 0 || k == 5 {
			tick = text
		}
		fmt.Fprintf(bw, `<line x1="%s" y1="%s" x2="%s" y2="%s"/>`+"\n", num(x), num(by), num(x), num(by-tick))
	}
	fmt.Fprintf(bw, `<text x="%s" y="%s" font-size="%s" font-family="sans-serif" fill="black" stroke="none">%s %s: print at 100 %% and check this bar</text>`+"\n",
		num(bx), num(by+1.3*text), num(text), num(bar), unitWord(p.Units))
	bw.WriteString("</g>\n")
	// The title block.
	lines := []string{name}
	if p.Frame == FramePart {
		lines = append(lines, fmt.Sprintf("chord %s %s, twist %s° nose-up, leading edge at (%s, %s) %s%s",
			num(round(p.Chord, 6)), unitWord(p.Units), num(round(p.TwistDeg, 4)), num(round(p.LE.X, 6)), num(round(p.LE.Y, 6)), unitWord(p.Units),
			map[bool]string{true: ", mirrored", false: ""}[p.Mirrored]))
	}
	lines = append(lines, "drawn 1:1 by foilwright; dashed: chord line; red: datum marks")
	for i, l := range lines {
		fmt.Fprintf(bw, `<text x="%s" y="%s" font-size="%s" font-family="sans-serif" fill="black" stroke="none">%s</text>`+"\n",
			num(bx), num(by+(2.8+1.3*float64(i))*text), num(text), html.EscapeString(l))
	}
	bw.WriteString("</g>\n</svg>\n")
	return bw.Flush()
}
