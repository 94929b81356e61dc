package campaign

import "testing"

// TestTailSidesCases runs cases whose section order put a thin tail's
// points on the wrong surface (internal/scangen: invented scans of NACA
// Report 824 sections, invented noise, spacing and outliers), each wrong
// beyond its stated uncertainty at the start of stop 25. The coarse
// camber line's last bins were drawn outside the body by a few points
// apart from both surfaces (a burst of slips beyond a tail thinner than
// their distance from it: the bin's largest gap lay between them and both
// surfaces), and the tail's points were sided on one surface; which bins
// did so turned on the count of points (5463 went wrong when one nose
// point more was kept). 5463: two planted points 0.009 c below a
// 0.0015 c tail kept and two good points dropped, twist 0.79° against
// 0.52°; 1228: 22 good upper-surface points ahead of the tail dropped,
// twist 0.30° against 0.069°; 2736: twist 0.91° against 0.29°. In each a
// bin near the tail held about an eighth of its outline on one side of
// its largest gap. Each must be within its bounds, 5463 with every
// planted outlier caught and no good point dropped.
func TestTailSidesCases(t *testing.T) {
	for _, seed := range []uint64{5463, 1228, 2736} {
		r, _, ok := runStated(t, seed)
		if !ok {
			continue
		}
		if r.Wrong != "" {
			t.Errorf("case %d: wrong beyond its stated uncertainty (%s): chord off %.4f, twist %.3f°, node %.4f c; stated chord %.4g, twist %.3g°, surface %.4f c", seed, r.Wrong, r.ChordErr, r.TwistErr, r.NodeErr, r.Stated.Chord, r.Stated.TwistDeg, r.Stated.Surface)
		}
		if seed == 5463 && (r.Caught != r.Planted || r.GoodDropped > 0) {
			t.Errorf("case 5463: %d of %d planted outliers caught, %d good points dropped", r.Caught, r.Planted, r.GoodDropped)
		}
	}
}

// TestLinkedLoopKeepsMore runs cases where the section order passed its
// gates with good points dropped and outliers kept, while linking closed
// one loop that kept more of the points (internal/scangen: invented
// scans, noise, spacing and outliers), each wrong beyond its stated
// uncertainty at the start of stop 25. 876: a burst of three slips
// beside a nose sampled 0.011 c apart was taken for the surface and the
// five good points after it dropped (twist 0.55° against 0.49°); 6542:
// six good points of a two-pass probe near the nose dropped (nodes
// 0.0083 c against 0.0056 c). Each must be within its bounds with no
// more than two good points dropped.
func TestLinkedLoopKeepsMore(t *testing.T) {
	for _, seed := range []uint64{876, 6542} {
		r, _, ok := runStated(t, seed)
		if !ok {
			continue
		}
		if r.Wrong != "" {
			t.Errorf("case %d: wrong beyond its stated uncertainty (%s): chord off %.4f, twist %.3f°, node %.4f c; stated chord %.4g, twist %.3g°, surface %.4f c", seed, r.Wrong, r.ChordErr, r.TwistErr, r.NodeErr, r.Stated.Chord, r.Stated.TwistDeg, r.Stated.Surface)
		}
		if r.GoodDropped > 2 {
			t.Errorf("case %d: %d good points dropped", seed, r.GoodDropped)
		}
	}
}

// TestSparseSideCases runs cases that the camber bins' side share
// (geometry/clean sideShare) sent wrong at the end of stop 25 and that
// were within their bounds before it (internal/scangen: invented scans,
// noise, spacing and outliers). In each, bins where one surface was
// probed more sparsely than the other, its points still spread across the
// bin, held under a quarter of the bin's points and were set aside, and
// the camber line lost the middle over that stretch. 6795 (passes): a
// rounded edge read blunt, nodes 0.0081 c against 0.0073 c stated; 6479
// (scan): chord 0.018 % against a bound of 0.00055, four planted
// outliers fewer caught. Each must be within its bounds and its edge read
// as generated.
func TestSparseSideCases(t *testing.T) {
	for _, seed := range []uint64{6795, 6479} {
		r, _, ok := runStated(t, seed)
		if !ok {
			continue
		}
		if r.Wrong != "" {
			t.Errorf("case %d: wrong beyond its stated uncertainty (%s): chord off %.4f, twist %.3f°, node %.4f c; stated chord %.4g, twist %.3g°, surface %.4f c", seed, r.Wrong, r.ChordErr, r.TwistErr, r.NodeErr, r.Stated.Chord, r.Stated.TwistDeg, r.Stated.Surface)
		}
		if !r.TERight && !r.TEUndecidable {
			t.Errorf("case %d: trailing edge read %s", seed, r.TEGot)
		}
	}
}

// TestSteepTailCase runs case 2800 (internal/scangen: an invented scan of
// a NACA 6604 with its open trailing edge, NACA Report 824 equations,
// shuffled, invented noise and bursts of slips), wrong beyond its stated
// uncertainty at the end of stop 25: the coarse camber line's last
// counted bin lay at 0.898 c, the tail's bins aft of it holding both
// surfaces overlapped in y (the line falls across a bin by more than the
// tail is thick), and the line was held level 0.013 c above the middle
// over the tail; the trailing edge came out 0.016 c short, twist 0.29°
// against 0.175° stated. It must be within its bounds with every planted
// outlier caught.
func TestSteepTailCase(t *testing.T) {
	r, _, ok := runStated(t, 2800)
	if !ok {
		return
	}
	if r.Wrong != "" {
		t.Errorf("wrong beyond its stated uncertainty (%s): chord off %.4f, twist %.3f°, node %.4f c; stated chord %.4g, twist %.3g°, surface %.4f c", r.Wrong, r.ChordErr, r.TwistErr, r.NodeErr, r.Stated.Chord, r.Stated.TwistDeg, r.Stated.Surface)
	}
	if r.Caught != r.Planted {
		t.Errorf("%d of %d planted outliers caught", r.Caught, r.Planted)
	}
}
