package campaign

import (
	"math"
	"sort"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/scangen"
)

// teUndecidable reports whether the good points of a case cannot tell
// the true kind of its trailing edge from another at their sampling, and
// how many of them lie on the true end piece (a blunt base or a rounded
// end; 0 for a sharp edge). The generator labels an end by how it built
// it, whatever the sampling; these cases are counted apart rather than
// as right or wrong:
//
//   - a rounded end with fewer than three good points on its arc: a
//     circle tangent to both surfaces and a straight base through one or
//     two points fit them alike (an arc whose radius is below the spacing
//     there holds at most two);
//   - a blunt end with no good point on its base whose surfaces, carried
//     on along their end tangents, meet closer to the last point of each
//     surface than the spacing of that surface's last points: a sharp
//     corner there would leave the same points.
//
// A sharp edge is never undecidable: its corner follows from the surfaces
// and needs no point of its own, so a base or an arc is one more thing
// the points do not show.
func teUndecidable(tr *scangen.Truth) (undecidable bool, onEnd int) {
	sec := tr.Section
	if sec == nil || sec.Shape == nil || sec.TEKind == scangen.TESharp || sec.Shape.Pieces() < 3 {
		return false, 0
	}
	sh := sec.Shape
	var upper, lower []float64 // arc lengths from t = 0 (the upper end corner)
	for _, l := range tr.Lines {
		if l.Kind != scangen.LineGood {
			continue
		}
		switch sh.Kind(l.T) {
		case scangen.Upper:
			upper = append(upper, sh.ArcAt(l.T))
		case scangen.Lower:
			lower = append(lower, sh.ArcAt(l.T))
		default:
			onEnd++
		}
	}
	if sec.TEKind == scangen.TERounded {
		return onEnd < 3, onEnd
	}
	if onEnd > 0 || len(upper) < 2 || len(lower) < 2 {
		return false, onEnd
	}
	sort.Float64s(upper)
	sort.Float64s(lower)
	sLo := sh.ArcAt(2) // the lower end corner
	// The last point of each surface, its distance along the outline
	// from the end corner, and the spacing of the last two points.
	du, hu := upper[0], upper[1]-upper[0]
	n := len(lower)
	dl, hl := sLo-lower[n-1], lower[n-1]-lower[n-2]
	cu, cl := sh.At(0), sh.At(2)
	const step = 1e-3 // chord units of arc for the end tangents
	tu := unit(cu.Sub(sh.At(sh.ParamAt(step))))
	tl := unit(cl.Sub(sh.At(sh.ParamAt(sLo - step))))
	// cu + a·tu = cl + b·tl.
	det := tu.X*(-tl.Y) - tu.Y*(-tl.X)
	if math.Abs(det) < 1e-12 {
		return false, onEnd
	}
	d := cl.Sub(cu)
	a := (d.X*(-tl.Y) - d.Y*(-tl.X)) / det
	b := (tu.X*d.Y - tu.Y*d.X) / det
	if !(a >= 0 && b >= 0) {
		return false, onEnd
	}
	return du+a <= hu && dl+b <= hl, onEnd
}

// unit returns p scaled to unit length.
func unit(p geometry.Point) geometry.Point {
	return p.Scale(1 / p.Norm())
}
