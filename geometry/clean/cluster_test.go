package clean

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// clusterTestCloud samples the NACA 4-digit section n (NACA Report 824
// equations, via NACA4 and cleanTestSample) with count points evenly by arc
// length, adds Gaussian noise of noise normal to the surface, and moves
// runs of neighbouring samples off the surface together: run k of runs
// starts at the sample nearest the chordwise place at[k] (upper surface for
// a positive place, lower for a negative one, chord fractions), holds
// runs[k] points and stands off by off[k] (chord fractions, outward for a
// positive value) with a 10 % scatter between its points. The set-up is
// this test's own. The points are shuffled when shuffle is set. It returns
// the cloud, whether each point (by line) is planted, and whether each is
// within ends of the chord of the nose or of the trailing edge.
func clusterTestCloud(rng *rand.Rand, n shape.NACA4, count int, noise float64, at []float64, runs []int, off []float64, shuffle bool, ends float64) (*geometry.Cloud, []bool, []bool) {
	loop := cleanTestSample(n, cleanChord, cleanRot, cleanOff, count)
	m := len(loop)
	normal := func(k int) geometry.Point {
		t := loop[(k+1)%m].Sub(loop[(k+m-1)%m])
		// The loop runs counter-clockwise: the outward normal is the
		// tangent turned clockwise.
		return geometry.Point{X: t.Y, Y: -t.X}.Scale(1 / t.Norm())
	}
	// The chordwise place and side of each sample, in the section's own
	// frame.
	inv := func(p geometry.Point) geometry.Point {
		return p.Sub(cleanOff).Rotate(-cleanRot).Scale(1 / cleanChord)
	}
	planted := make([]bool, m)
	pts := make([]geometry.Point, m)
	for k := range loop {
		pts[k] = loop[k].Add(normal(k).Scale(noise * rng.NormFloat64()))
	}
	for r, x := range at {
		best, bd := 0, math.Inf(1)
		for k, p := range loop {
			q := inv(p)
			upper := k < m/2 // the samples start at the upper trailing edge
			if upper != (x > 0) {
				continue
			}
			if d := math.Abs(q.X - math.Abs(x)); d < bd {
				best, bd = k, d
			}
		}
		for j := range runs[r] {
			k := (best + j) % m
			d := off[r] * cleanChord * (1 + 0.1*rng.NormFloat64())
			pts[k] = loop[k].Add(normal(k).Scale(d))
			planted[k] = true
		}
	}
	order := make([]int, m)
	for i := range order {
		order[i] = i
	}
	if shuffle {
		rng.Shuffle(m, func(i, j int) { order[i], order[j] = order[j], order[i] })
	}
	c := &geometry.Cloud{Dim: 2, Ordered: !shuffle}
	isPlanted := make([]bool, m)
	isEnd := make([]bool, m)
	for line, k := range order {
		c.Points = append(c.Points, geometry.Vec3{X: pts[k].X, Y: pts[k].Y})
		c.Origins = append(c.Origins, geometry.Origin{File: "cluster.csv", Line: line + 1})
		isPlanted[line] = planted[k]
		q := inv(loop[k])
		isEnd[line] = !planted[k] && (q.X < ends || q.X > 1-ends)
	}
	return c, isPlanted, isEnd
}

// Runs of points off the surface together are caught whatever their
// length, and the nose and the trailing edge lose no point. The shapes are
// NACA 4-digit sections of NACA Report 824 (via NACA4); the runs, noise and
// spacing are this test's own: 500 points (0.4 % of the chord apart), 0.01
// mm noise on a 152.4 mm chord, runs of 3 to 14 points standing 0.6 % to 3
// % of the chord off, outward and inward, on both surfaces. Limits are
// issue 10's: planted outliers caught ≥ 98 %, good points dropped ≤ 0.5 %.
func TestCleanCatchesClusters(t *testing.T) {
	for _, tc := range []struct {
		code    string
		sharp   bool
		shuffle bool
		seed    uint64
		at      []float64
		runs    []int
		off     []float64
	}{
		{"2412", true, true, 1, []float64{0.3, -0.5, 0.7}, []int{8, 5, 3}, []float64{0.02, 0.01, -0.006}},
		{"0012", false, false, 2, []float64{-0.25, 0.45, -0.8}, []int{6, 11, 4}, []float64{-0.008, 0.03, 0.015}},
		{"4415", true, true, 3, []float64{0.2, -0.35, 0.6, -0.65}, []int{14, 7, 9, 2}, []float64{0.012, -0.01, 0.025, 0.02}},
	} {
		t.Run(fmt.Sprintf("%s/sharp=%v/shuffled=%v", tc.code, tc.sharp, tc.shuffle), func(t *testing.T) {
			n, err := shape.ParseNACA4(tc.code)
			if err != nil {
				t.Fatal(err)
			}
			n.SharpTE = tc.sharp
			rng := rand.New(rand.NewPCG(tc.seed, 19))
			c, planted, end := clusterTestCloud(rng, n, 500, 0.01, tc.at, tc.runs, tc.off, tc.shuffle, 0.02)
			_, rep, err := Clean(c, Options{})
			if err != nil {
				t.Fatal(err)
			}
			dropped := make(map[int]bool, len(rep.Dropped))
			for _, d := range rep.Dropped {
				dropped[d.Origin.Line] = true
			}
			var nPlanted, caught, good, lost, endLost int
			for line, p := range planted {
				switch {
				case p:
					nPlanted++
					if dropped[line+1] {
						caught++
					}
				default:
					good++
					if dropped[line+1] {
						lost++
						if end[line] {
							endLost++
						}
					}
				}
			}
			t.Logf("planted %d, caught %d; good %d, dropped %d (at the nose or the trailing edge %d); σ %.4g",
				nPlanted, caught, good, lost, endLost, rep.Sigma)
			if share := float64(caught) / float64(nPlanted); share < 0.98 {
				t.Errorf("caught %d of %d planted outliers (%.1f %%), want ≥ 98 %%", caught, nPlanted, 100*share)
			}
			if share := float64(lost) / float64(good); share > 0.005 {
				t.Errorf("dropped %d of %d good points (%.2f %%), want ≤ 0.5 %%", lost, good, 100*share)
			}
			if endLost > 0 {
				t.Errorf("dropped %d good points within 2 %% of the chord of the nose or the trailing edge, want none", endLost)
			}
		})
	}
}

// The cluster test itself leaves exact and noisy samples of whole
// sections alone, reflexed camber included: the NACA 5-digit reflexed
// mean line of NACA Report 824 (via NACA5) turns its curvature over
// near the trailing edge, a real lobe no run of points stands off from.
func TestClusterKeepsRealShape(t *testing.T) {
	for _, tc := range []struct {
		name  string
		loop  []geometry.Point
		noise float64
	}{
		{"naca23112-reflexed-exact", shape.NACA5{L: 2, P: 3, Reflex: true, Thickness: 0.12}.Loop(150), 0},
		{"naca23112-reflexed-exact-sparse", shape.NACA5{L: 2, P: 3, Reflex: true, Thickness: 0.12}.Loop(20), 0},
		{"naca2412-exact-sparse", shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12}.Loop(30), 0},
		{"naca23112-reflexed-noisy", shape.NACA5{L: 2, P: 3, Reflex: true, Thickness: 0.12}.Loop(400), 2e-5},
		{"naca0006-sharp-exact", shape.NACA4{Thickness: 0.06, SharpTE: true}.Loop(200), 0},
		{"naca6409-noisy", shape.NACA4{Camber: 0.06, CamberPos: 0.4, Thickness: 0.09}.Loop(300), 5e-5},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(7, 19))
			loop := tc.loop
			if loop[0].Dist(loop[len(loop)-1]) < 1e-12 {
				loop = loop[:len(loop)-1]
			}
			seq := make([]int32, len(loop))
			pts := make([]geometry.Point, len(loop))
			for i, p := range loop {
				seq[i] = int32(i)
				pts[i] = p.Add(geometry.Point{X: tc.noise * rng.NormFloat64(), Y: tc.noise * rng.NormFloat64()})
			}
			scale, _ := robustScale(pts, seq, residuals(pts, seq, 0))
			ws, wsc := clusterCalibration(pts, seq, DefaultOutlierSigma*scale, nil)
			left, hits := clusterOutliers(pts, seq, DefaultOutlierSigma, scale, false, nil, ws, wsc)
			if len(hits) > 0 || len(left) != len(seq) {
				for _, h := range hits {
					t.Errorf("point %d %v called a cluster point, %.3g off (%.1f σ)", h.idx, pts[h.idx], h.dist, h.sigmas)
				}
			}
		})
	}
}

// meshSliceCloud cuts a prismatic strip of triangles whose two rows of
// vertices both lie on the NACA 4-digit section n (NACA Report 824
// equations, via NACA4 and cleanTestSample: count vertices a row, evenly
// by arc length), each vertex moved along the normal by its own Gaussian
// noise of sd, as a plane cuts it at height cut between the rows: a point
// on each edge aᵢbᵢ and each diagonal aᵢbᵢ₊₁, the linear interpolation of
// their ends, so that neighbouring points share the noise of a vertex
// and, with a cut near a row, come in near pairs. Runs are planted as for
// clusterTestCloud (at, runs, off), on the cut points. The set-up is this
// test's own. It returns the cloud (in loop order) and whether each point
// (by line) is planted, and whether it lies within 2 % of the chord of
// the trailing edge.
func meshSliceCloud(rng *rand.Rand, n shape.NACA4, count int, sd, cut float64, at []float64, runs []int, off []float64) (*geometry.Cloud, []bool, []bool) {
	vs := cleanTestSample(n, cleanChord, cleanRot, cleanOff, count)
	m := len(vs)
	normal := func(k int) geometry.Point {
		t := vs[(k+1)%m].Sub(vs[(k+m-1)%m])
		return geometry.Point{X: t.Y, Y: -t.X}.Scale(1 / t.Norm())
	}
	as, bs := make([]geometry.Point, m), make([]geometry.Point, m)
	for k := range vs {
		as[k] = vs[k].Add(normal(k).Scale(sd * rng.NormFloat64()))
		bs[k] = vs[k].Add(normal(k).Scale(sd * rng.NormFloat64()))
	}
	var pts, truth []geometry.Point // cut points, and their noise-free places
	var nrm []geometry.Point
	mix := func(p, q geometry.Point) geometry.Point { return p.Scale(1 - cut).Add(q.Scale(cut)) }
	for k := range m {
		j := (k + 1) % m
		pts = append(pts, mix(as[k], bs[k]), mix(as[k], bs[j]))
		truth = append(truth, vs[k], mix(vs[k], vs[j]))
		nrm = append(nrm, normal(k), normal(k))
	}
	inv := func(p geometry.Point) geometry.Point {
		return p.Sub(cleanOff).Rotate(-cleanRot).Scale(1 / cleanChord)
	}
	planted := make([]bool, len(pts))
	for r, x := range at {
		best, bd := 0, math.Inf(1)
		for k, p := range truth {
			if (k < len(truth)/2) != (x > 0) {
				continue
			}
			if d := math.Abs(inv(p).X - math.Abs(x)); d < bd {
				best, bd = k, d
			}
		}
		for j := range runs[r] {
			k := (best + j) % len(pts)
			pts[k] = truth[k].Add(nrm[k].Scale(off[r] * cleanChord * (1 + 0.1*rng.NormFloat64())))
			planted[k] = true
		}
	}
	c := &geometry.Cloud{Dim: 2, Ordered: true}
	tail := make([]bool, len(pts))
	for k, p := range pts {
		c.Points = append(c.Points, geometry.Vec3{X: p.X, Y: p.Y})
		c.Origins = append(c.Origins, geometry.Origin{File: "mesh.csv", Line: k + 1})
		tail[k] = inv(truth[k]).X > 0.98
	}
	return c, planted, tail
}

// A slice of a noisy mesh loses no good point, and the runs planted on it
// are still caught: its points share the noise of the vertices they are
// cut between, so the loop wanders by the vertices' noise while
// neighbouring points, in near pairs where the cut passes near a row of
// vertices, hardly differ. The noise (0.04 mm a vertex on a 152.4 mm
// chord, 200 vertices a row) is that of the rotor demo's scan; the runs
// stand 0.6 % to 3 % of the chord off. Limits are issue 10's: good points
// dropped ≤ 0.5 %, planted outliers caught ≥ 98 %. The points within 2 %
// of the chord of the sharp trailing edge are not counted: the edge's end
// models judge them (edge.go), not the tests of residuals.
func TestCleanMeshSlice(t *testing.T) {
	n := shape.NACA4{Camber: 0.04, CamberPos: 0.4, Thickness: 0.14, SharpTE: true}
	for _, tc := range []struct {
		cut  float64
		seed uint64
		at   []float64
		runs []int
		off  []float64
	}{
		{0.01, 1, nil, nil, nil},
		{0.3, 2, nil, nil, nil},
		{0.02, 3, []float64{0.3, -0.5, 0.7}, []int{8, 5, 3}, []float64{0.02, 0.01, -0.006}},
		{0.5, 4, []float64{-0.25, 0.45, -0.8}, []int{6, 11, 4}, []float64{-0.008, 0.03, 0.015}},
	} {
		t.Run(fmt.Sprintf("cut=%g/runs=%d", tc.cut, len(tc.runs)), func(t *testing.T) {
			rng := rand.New(rand.NewPCG(tc.seed, 23))
			c, planted, tail := meshSliceCloud(rng, n, 200, 0.04, tc.cut, tc.at, tc.runs, tc.off)
			_, rep, err := Clean(c, Options{})
			if err != nil {
				t.Fatal(err)
			}
			out := make(map[int]bool, len(rep.Dropped))
			for _, d := range rep.Dropped {
				out[d.Origin.Line] = true
			}
			var nPlanted, caught, good, lost int
			for line, p := range planted {
				switch {
				case p:
					nPlanted++
					if out[line+1] {
						caught++
					}
				case !tail[line]:
					good++
					if out[line+1] {
						lost++
					}
				}
			}
			t.Logf("planted %d, caught %d; good %d, dropped %d; σ %.4g", nPlanted, caught, good, lost, rep.Sigma)
			if nPlanted > 0 && float64(caught) < 0.98*float64(nPlanted) {
				t.Errorf("caught %d of %d planted outliers, want ≥ 98 %%", caught, nPlanted)
			}
			if float64(lost) > 0.005*float64(good) {
				t.Errorf("dropped %d of %d good points (%.2f %%), want ≤ 0.5 %%", lost, good, 100*float64(lost)/float64(good))
			}
		})
	}
}

// The spread of the left-out residuals sees the noise neighbours share
// that the point-to-point scale misses: on a mesh slice cut near a row of
// vertices (meshSliceCloud, 0.04 mm a vertex) the narrowest window's
// spread stands far above the point-to-point scale and near the vertices'
// noise; on independent noise (clusterTestCloud, 0.01 mm) it stays about
// indepRatio times it (1.97 here). Bounds measured, then widened.
func TestClusterScalesSeeSharedNoise(t *testing.T) {
	n := shape.NACA4{Camber: 0.04, CamberPos: 0.4, Thickness: 0.14, SharpTE: true}
	for _, tc := range []struct {
		name     string
		mesh     bool
		ratio    [2]float64 // bounds of the spread over the point-to-point scale (raw)
		noise    float64    // the noise, mm
		spreadHi float64    // the largest spread, in units of the noise
	}{
		{"mesh", true, [2]float64{10, math.Inf(1)}, 0.04, 2},
		{"independent", false, [2]float64{0.8, 2.5}, 0.01, 2},
	} {
		rng := rand.New(rand.NewPCG(5, 29))
		var c *geometry.Cloud
		if tc.mesh {
			c, _, _ = meshSliceCloud(rng, n, 200, tc.noise, 0.01, nil, nil, nil)
		} else {
			c, _, _ = clusterTestCloud(rng, n, 400, tc.noise, nil, nil, nil, false, 0)
		}
		pts := make([]geometry.Point, len(c.Points))
		seq := make([]int32, len(pts))
		for i, p := range c.Points {
			pts[i], seq[i] = geometry.Point{X: p.X, Y: p.Y}, int32(i)
		}
		scale, raw := robustScale(pts, seq, residuals(pts, seq, 0))
		_, wsc := clusterCalibration(pts, seq, DefaultOutlierSigma*scale, nil)
		r := wsc.at(0) / raw
		t.Logf("%s: point-to-point scale %.3g mm, narrowest window's spread %.3g mm (%.2f times)", tc.name, raw, wsc.at(0), r)
		if r < tc.ratio[0] || r > tc.ratio[1] || wsc.at(0) > tc.spreadHi*tc.noise {
			t.Errorf("%s: spread %.3g mm, %.2f times the point-to-point scale %.3g mm; want %v times, at most %g mm", tc.name, wsc.at(0), r, raw, tc.ratio, tc.spreadHi*tc.noise)
		}
	}
}

// TestTooTurned checks the cluster test's turn limit, read from the
// tangent of the difference, against the arc tangents it stands for
// (exact in real numbers: tan(a − b) = (tan a − tan b)/(1 + tan a tan b))
// on random slopes and on pairs placed at the limit itself.
func TestTooTurned(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	byAtan := func(p, m float64) bool { return math.Abs(math.Atan(p)-math.Atan(m)) > clusterTurn }
	check := func(p, m float64) {
		if got, want := tooTurned(p, m), byAtan(p, m); got != want {
			t.Errorf("tooTurned(%g, %g) = %v, arc tangents say %v", p, m, got, want)
		}
	}
	for range 100000 {
		p, m := rng.NormFloat64()*3, rng.NormFloat64()*3
		check(p, m)
		// At the limit: m turned from p by clusterTurn, give or take a
		// few ulps to 1e-8.
		a := math.Atan(p)
		for _, d := range []float64{0, 1e-16, -1e-16, 1e-12, -1e-12, 1e-8, -1e-8} {
			for _, sgn := range []float64{1, -1} {
				if b := a + sgn*(clusterTurn+d); math.Abs(b) < math.Pi/2 {
					check(p, math.Tan(b))
				}
			}
		}
	}
	for _, pm := range [][2]float64{{math.Inf(1), 0}, {0, math.Inf(-1)}, {math.Inf(1), math.Inf(1)}, {math.NaN(), 0}, {1e300, -1e300}, {1e-300, 0}} {
		check(pm[0], pm[1])
	}
}
