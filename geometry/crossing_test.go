package geometry

import "testing"

func TestFirstCrossing(t *testing.T) {
	for _, tc := range []struct {
		name    string
		pts     []Point
		crossed bool
		i, j    int
	}{
		{"square", []Point{{0, 0}, {1, 0}, {1, 1}, {0, 1}, {0, 0}}, false, 0, 0},
		{"bow tie", []Point{{0, 0}, {1, 1}, {1, 0}, {0, 1}, {0, 0}}, true, 0, 2},
		{"touching", []Point{{0, 0}, {2, 0}, {2, 2}, {1, 0}, {0, 2}}, true, 0, -1}, // a node on segment 0 touches it twice (segments 2 and 3)
		{"open polyline", []Point{{0, 0}, {1, 0}, {1, 1}, {0, 1}}, false, 0, 0},
		{"NACA 0012", NACA4{Thickness: 0.12, SharpTE: true}.Nodes(160), false, 0, 0},
	} {
		t.Run(tc.name, func(t *testing.T) {
			i, j, crossed := FirstCrossing(tc.pts)
			if crossed != tc.crossed || (crossed && (i != tc.i || (tc.j >= 0 && j != tc.j))) {
				t.Errorf("got (%d, %d, %v), want (%d, %d, %v)", i, j, crossed, tc.i, tc.j, tc.crossed)
			}
		})
	}
	// A NACA section whose upper surface dips through the lower one.
	pts := NACA4{Thickness: 0.12, SharpTE: true}.Nodes(40)
	pts[10].Y = -0.2
	if _, _, crossed := FirstCrossing(pts); !crossed {
		t.Error("pulled node not found crossing")
	}
}
