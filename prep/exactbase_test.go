package prep

import (
	"bytes"
	"fmt"
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// An exact polyline export of an open-edged section: the NACA 4-digit
// outline (its published thickness law ends 0.021 t thick at x = 1; NACA
// Report 824 equations, geometry/shape) at cosine stations, with one to
// three points on the straight base between the surfaces' last points, or
// an arc of points across a thicker end cut square at x = 0.9 and
// rounded, placed in a part frame and written with three decimals in mm,
// as a CAD or table export writes them. Such points are exact at their
// spacing: prep must take the base's two corners as the points draw them
// (the scatter about parabolas through ten neighbours is the shape's own
// curvature here, not noise, and must not blur the two 90° turns into
// one corner), and give the trailing edge's true kind and angle, the
// chord and the outline within the rounding.
func TestPrepareExactPolylineWithBase(t *testing.T) {
	type variant struct {
		name     string
		code     string
		per      int     // cosine stations per surface
		base     int     // points strictly between the surfaces' last points
		cut      float64 // chord station where the surfaces end
		rounded  bool    // the end is a half circle through the base points
		wantKind string
	}
	var cases []variant
	for _, c := range []struct {
		code string
		per  int
	}{{"0013", 20}, {"2610", 25}, {"2412", 28}, {"4415", 30}} {
		for base := 1; base <= 3; base++ {
			cases = append(cases, variant{name: fmt.Sprintf("%s/%d-per-surface/%d-on-base", c.code, c.per, base), code: c.code, per: c.per, base: base, cut: 1, wantKind: "blunt"})
		}
	}
	// A thicker end, cut square at 90 % chord (0.04 c thick for a NACA
	// 0021), with points on its base, and the same end rounded: a half
	// circle across it with five points.
	cases = append(cases,
		variant{name: "0021/cut-0.9/3-on-base", code: "0021", per: 25, base: 3, cut: 0.9, wantKind: "blunt"},
		variant{name: "0021/cut-0.9/rounded", code: "0021", per: 25, base: 5, cut: 0.9, rounded: true, wantKind: "rounded"},
	)
	// Tolerances: the points carry 0.0005 mm of rounding on a 150 mm
	// chord (3e-6 c); the interpolating spline through 20–30 cosine
	// stations departs from the outline by up to about 2e-4 c between
	// them (measured on these cases, rounded up).
	const (
		chordMM    = 150.0
		chordTol   = 0.002 // relative
		surfTol    = 1e-3  // chord units, nodes from the true outline
		angleTol   = 3.0   // degrees
		twistDeg   = 23.0
		offX, offY = -40.0, 615.0
	)
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			n, err := shape.ParseNACA4(tc.code)
			if err != nil {
				t.Fatal(err)
			}
			outline := exactBaseOutline(n, tc.per, tc.base, tc.cut, tc.rounded)
			s, c := math.Sincos(twistDeg * math.Pi / 180)
			toPart := func(q geometry.Point) geometry.Point {
				return geometry.Point{X: offX + chordMM*(c*q.X+s*q.Y), Y: offY + chordMM*(-s*q.X+c*q.Y)}
			}
			var buf bytes.Buffer
			for _, q := range outline.points {
				p := toPart(q)
				fmt.Fprintf(&buf, "%.3f\t%.3f\n", p.X, p.Y)
			}
			p, err := Prepare("exact", []File{NewFile("exact.txt", buf.Bytes())}, Settings{Units: "mm"})
			if err != nil {
				t.Fatal(err)
			}
			if got := p.Section.TrailingEdge.Kind; got != tc.wantKind {
				t.Errorf("trailing edge %s, want %s", got, tc.wantKind)
			}
			// The chord: from the trailing-edge midpoint to the farthest
			// point of the true outline (the frame's convention, DESIGN.md).
			var far float64
			for _, q := range outline.dense {
				far = math.Max(far, q.Dist(outline.teMid))
			}
			wantChord := chordMM * far
			if d := math.Abs(p.Shape.Frame.Chord-wantChord) / wantChord; d > chordTol {
				t.Errorf("chord %.4f mm, true %.4f mm (%.2g relative)", p.Shape.Frame.Chord, wantChord, d)
			}
			// The nodes, placed back in the part, against the true outline.
			var worst float64
			for _, q := range p.Section.Nodes {
				pp := p.Shape.Frame.ToPart(q)
				worst = math.Max(worst, distToPolyline(pp, outline.dense, toPart)/chordMM)
			}
			if worst > surfTol {
				t.Errorf("nodes up to %.3g c off the true outline, want at most %.3g c", worst, surfTol)
			}
			if !tc.rounded {
				if got := p.Props.TEAngleDeg; math.Abs(got-outline.teAngle) > angleTol {
					t.Errorf("trailing-edge angle %.2f°, true %.2f°", got, outline.teAngle)
				}
			}
		})
	}
}

// exactOutline is an exact polyline of a section with its truth
// (normalised NACA frame).
type exactOutline struct {
	points  []geometry.Point // upper end, upper surface, LE, lower surface, the base's points
	dense   []geometry.Point // the true closed outline, finely sampled
	teMid   geometry.Point   // the trailing-edge point: the midpoint of a base, the tip of an arc
	teAngle float64          // degrees between the surfaces' tangents at their ends
}

// exactBaseOutline returns the outline of n at per cosine stations a
// surface on [0, cut], then base points evenly spaced strictly between
// the lower and the upper surface's last points (on the straight base, or
// on the half circle across it when rounded).
func exactBaseOutline(n shape.NACA4, per, base int, cut float64, rounded bool) exactOutline {
	var o exactOutline
	st := func(i int) float64 { return cut * shape.CosineStation(i, per) }
	for i := per; i >= 1; i-- {
		o.points = append(o.points, n.Upper(st(i)))
	}
	o.points = append(o.points, geometry.Point{})
	for i := 1; i <= per; i++ {
		o.points = append(o.points, n.Lower(st(i)))
	}
	lo, up := n.Lower(cut), n.Upper(cut)
	o.teMid = lo.Add(up).Scale(0.5)
	d := up.Sub(lo)
	r := d.Norm() / 2
	// The outward normal of the base (the loop runs counter-clockwise).
	out := geometry.Point{X: d.Y, Y: -d.X}.Scale(1 / d.Norm())
	mid := o.teMid
	endAt := func(f float64) geometry.Point { // f in [0, 1] from lower to upper
		if !rounded {
			return lo.Add(d.Scale(f))
		}
		a := math.Pi * f
		return mid.Add(d.Scale(-math.Cos(a) / 2)).Add(out.Scale(r * math.Sin(a)))
	}
	if rounded {
		// A rounded end's trailing-edge point is the tip of its arc.
		o.teMid = o.teMid.Add(out.Scale(r))
	}
	for j := 1; j <= base; j++ {
		o.points = append(o.points, endAt(float64(j)/float64(base+1)))
	}
	const fine = 4000
	for i := fine; i >= 0; i-- {
		o.dense = append(o.dense, n.Upper(cut*shape.CosineStation(i, fine)))
	}
	for i := 1; i <= fine; i++ {
		o.dense = append(o.dense, n.Lower(cut*shape.CosineStation(i, fine)))
	}
	for j := 1; j < 200; j++ {
		o.dense = append(o.dense, endAt(float64(j)/200))
	}
	// The surfaces' tangents at the end, pointing aft.
	const h = 1e-6
	tu := n.Upper(cut).Sub(n.Upper(cut - h))
	tl := n.Lower(cut).Sub(n.Lower(cut - h))
	o.teAngle = math.Acos(tu.Dot(tl)/(tu.Norm()*tl.Norm())) * 180 / math.Pi
	return o
}

// distToPolyline returns the distance from p to the closed polyline pts
// mapped by f.
func distToPolyline(p geometry.Point, pts []geometry.Point, f func(geometry.Point) geometry.Point) float64 {
	best := math.Inf(1)
	prev := f(pts[len(pts)-1])
	for _, q := range pts {
		cur := f(q)
		best = math.Min(best, p.Dist(geometry.SegmentFoot(p, prev, cur)))
		prev = cur
	}
	return best
}
