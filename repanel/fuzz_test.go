package repanel

import (
	"errors"
	"math"
	"testing"
)

// FuzzDistribute checks that any panel count, law, clustering strengths and
// curvature weight either give an error wrapping one of the package
// sentinels (for values outside their documented ranges) or exactly n+1
// nodes with the end points kept, the leading edge exact and the arc length
// strictly increasing; and never a panic.
func FuzzDistribute(f *testing.F) {
	f.Add(160, uint8(0), 0.0, 0.0, 0.0, 0.5)
	f.Add(17, uint8(1), 3.0, -3.0, 0.0, 0.3)
	f.Add(2000, uint8(3), -3.0, 3.0, 1.0, 0.02)
	f.Add(16, uint8(2), 2.5, 2.5, 0.7, 0.97)
	f.Add(15, uint8(0), 0.0, 0.0, 0.0, 0.5)
	f.Add(161, uint8(3), 1.0, math.NaN(), 0.5, 0.5)
	p, sle := naca0012()
	f.Fuzz(func(t *testing.T, panels int, law uint8, le, te, w, where float64) {
		if panels > MaxPanels+10 {
			panels = MaxPanels + 10 // keep runs short; larger counts only fail the range check
		}
		o := Options{Panels: panels, Spacing: Laws()[int(law)%len(Laws())], LECluster: le, TECluster: te, CurvatureWeight: w}
		// Move the leading edge along the section to get unequal surfaces.
		s := sle
		if where > 0.05 && where < 0.95 {
			s = where * p.Length()
		}
		ss, k, err := Stations(p, s, o)
		if err != nil {
			if !errors.Is(err, ErrPanelCount) && !errors.Is(err, ErrOptionRange) && !errors.Is(err, ErrPath) {
				t.Fatalf("%+v: unexpected error %v", o, err)
			}
			if panels >= MinPanels && panels <= MaxPanels && inCluster(le) && inCluster(te) && w >= 0 && w <= 1 {
				t.Fatalf("%+v: valid options rejected: %v", o, err)
			}
			return
		}
		n := o.Panels
		if n == 0 {
			n = len(ss) - 1
			if n < AutoMinPanels || n > AutoMaxPanels {
				t.Fatalf("%+v: automatic count %d outside %d..%d", o, n, AutoMinPanels, AutoMaxPanels)
			}
		}
		if len(ss) != n+1 || ss[0] != 0 || ss[n] != p.Length() || ss[k] != s {
			t.Fatalf("%+v: %d stations, ends %v %v, LE node %d at %v; want %d, 0, %v, LE at %v", o, len(ss), ss[0], ss[len(ss)-1], k, ss[k], n+1, p.Length(), s)
		}
		for i := 1; i <= n; i++ {
			if !(ss[i] > ss[i-1]) {
				t.Fatalf("%+v: s[%d] = %v after %v", o, i, ss[i], ss[i-1])
			}
		}
		nodes, err := Distribute(p, s, o)
		if err != nil || len(nodes) != n+1 || nodes[0] != p.At(0) || nodes[n] != p.At(p.Length()) {
			t.Fatalf("%+v: Distribute gave %d nodes, %v", o, len(nodes), err)
		}
	})
}
