package campaign

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/scangen"
)

// perfectDoc returns the section document a perfect chain would write for
// the case: the truth's frame (in the plane of 3D points), the kind of its
// trailing edge and nodes on the true outline; edit changes it before it
// is encoded.
func perfectDoc(t *testing.T, c *Case, panels int, edit func(map[string]any)) []byte {
	t.Helper()
	tr := c.Scan.Truth
	sh := tr.Section.Shape
	nodes := make([][2]float64, panels+1)
	for i := range nodes {
		p := sh.At(float64(sh.Pieces()) * float64(i) / float64(panels))
		nodes[i] = [2]float64{p.X, p.Y}
	}
	frame := map[string]any{"chord": tr.Chord, "twist_deg": tr.TwistDeg, "mirrored": tr.Mirrored}
	le := tr.LE
	if pl := tr.Plane; pl != nil {
		// In-plane coordinates of the leading edge.
		d := [3]float64{le[0] - pl.Origin[0], le[1] - pl.Origin[1], le[2] - pl.Origin[2]}
		dot := func(a [3]float64) float64 { return a[0]*d[0] + a[1]*d[1] + a[2]*d[2] }
		frame["le"] = [2]float64{dot(pl.U), dot(pl.V)}
		frame["plane"] = map[string]any{"origin": pl.Origin, "u": pl.U, "v": pl.V, "normal": pl.Normal}
	} else {
		frame["le"] = [2]float64{le[0], le[1]}
	}
	doc := map[string]any{
		"format": "foilwright.section/1", "units": tr.Units, "frame": frame,
		"trailing_edge": map[string]any{"kind": tr.TEKind},
		"source":        map[string]any{"dropped": []any{}},
		"nodes":         nodes,
	}
	if edit != nil {
		edit(doc)
	}
	data, err := json.Marshal(doc)
	if err != nil {
		t.Fatal(err)
	}
	return data
}

// caseOf returns the first case from seed on whose spec passes keep.
func caseOf(t *testing.T, seed uint64, keep func(scangen.Spec) bool) *Case {
	t.Helper()
	for s := seed; s < seed+5000; s++ {
		if spec := scangen.Draw(s); keep(spec) {
			c, err := NewCase(s)
			if err != nil {
				t.Fatal(err)
			}
			return c
		}
	}
	t.Fatal("no such case")
	return nil
}

func evaluateDoc(t *testing.T, c *Case, doc []byte) Record {
	t.Helper()
	sec, err := decodeSection(doc)
	if err != nil {
		t.Fatal(err)
	}
	var r Record
	evaluate(&r, c.Scan.Truth, sec)
	return r
}

// A section that is the truth has no error, whatever the orientation,
// the plane and the unit; a symmetric section may come back with the
// other mirror flag and the matching twist and still be right.
func TestEvaluatePerfect(t *testing.T) {
	for _, tc := range []struct {
		name string
		keep func(scangen.Spec) bool
	}{
		{"2D", func(s scangen.Spec) bool { return s.Placement.Plane == "" && s.Category != "dense" }},
		{"tilted", func(s scangen.Spec) bool { return s.Placement.Plane == "tilted" && s.Category != "dense" }},
		{"mirrored", func(s scangen.Spec) bool {
			return s.Placement.Orientation == "upside-down" && s.Placement.Plane == "" && s.Category != "dense"
		}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := caseOf(t, 1, tc.keep)
			r := evaluateDoc(t, c, perfectDoc(t, c, 160, nil))
			const tol = 1e-9
			if r.ChordErr > tol || r.TwistErr > 1e-6 || r.LEErr > tol || r.NodeErr > 1e-7 || !r.TERight || r.Wrong != "" {
				t.Errorf("perfect section: chord %g, twist %g°, le %g, node %g, TE right %v, wrong %q",
					r.ChordErr, r.TwistErr, r.LEErr, r.NodeErr, r.TERight, r.Wrong)
			}
		})
	}
	t.Run("symmetric, other mirror flag", func(t *testing.T) {
		c := caseOf(t, 1, func(s scangen.Spec) bool {
			return s.Shape.NACA != nil && s.Shape.NACA.Camber == 0 && s.Shape.RoundRadius == 0 && s.Placement.Plane == "" && s.Category != "dense"
		})
		tr := c.Scan.Truth
		// y ↦ −y of the normalised frame: the other mirror flag at
		// twist −τ − 180°.
		doc := perfectDoc(t, c, 160, func(d map[string]any) {
			f := d["frame"].(map[string]any)
			f["mirrored"] = !tr.Mirrored
			f["twist_deg"] = -tr.TwistDeg - 180
		})
		r := evaluateDoc(t, c, doc)
		if r.TwistErr > 1e-6 || r.NodeErr > 1e-6 || r.Wrong != "" {
			t.Errorf("twist %g°, node %g, wrong %q", r.TwistErr, r.NodeErr, r.Wrong)
		}
	})
}

// Errors beyond the thresholds count as wrong unless the stated
// uncertainty covers them.
func TestEvaluateWrong(t *testing.T) {
	c := caseOf(t, 1, func(s scangen.Spec) bool { return s.Placement.Plane == "" && s.Category == "general" })
	tr := c.Scan.Truth
	off := func(d map[string]any) {
		f := d["frame"].(map[string]any)
		f["chord"] = tr.Chord * 1.01
		f["twist_deg"] = tr.TwistDeg + 0.5
	}
	r := evaluateDoc(t, c, perfectDoc(t, c, 160, off))
	if r.Wrong != "chord+twist" || math.Abs(r.ChordErr-0.01) > 1e-12 || math.Abs(r.TwistErr-0.5) > 1e-9 {
		t.Errorf("wrong %q, chord %g, twist %g", r.Wrong, r.ChordErr, r.TwistErr)
	}
	if r.NodeErr > 1e-7 {
		t.Errorf("node error %g from a frame error", r.NodeErr)
	}
	covered := perfectDoc(t, c, 160, func(d map[string]any) {
		off(d)
		d["uncertainty"] = map[string]any{"chord": 0.02 * tr.Chord, "twist_deg": 0.6, "le": []float64{0.001, 0.001}, "surface": 0.001}
	})
	r = evaluateDoc(t, c, covered)
	if r.Wrong != "" || r.Stated == nil || r.Covered != [4]bool{true, true, true, true} {
		t.Errorf("covered: wrong %q, stated %v, covered %v", r.Wrong, r.Stated, r.Covered)
	}
	// Chord and twist turn about the leading edge, which stays put; the
	// trailing edge moves by 1.01 chords turned 0.5° less one chord
	// (calculated by hand).
	if r.LEErr > 1e-12 || math.Abs(r.LEAlong) > 1e-12 || math.Abs(r.LEAcross) > 1e-12 {
		t.Errorf("leading edge error %g (along %g, across %g)", r.LEErr, r.LEAlong, r.LEAcross)
	}
	wantAlong, wantAcross := 1.01*math.Cos(0.5*math.Pi/180)-1, 1.01*math.Sin(0.5*math.Pi/180)
	if math.Abs(r.TEAlong-wantAlong) > 1e-9 || math.Abs(math.Abs(r.TEAcross)-wantAcross) > 1e-9 {
		t.Errorf("trailing edge off %g along, %g across the chord line; want %g, ±%g", r.TEAlong, r.TEAcross, wantAlong, wantAcross)
	}
	// The whole section moved across its chord line by 0.001 chord: both
	// ends move alike, the chord line does not turn.
	u := geometry.Point{X: tr.TE[0] - tr.LE[0], Y: tr.TE[1] - tr.LE[1]}.Scale(1 / tr.Chord)
	shift := geometry.Point{X: -u.Y, Y: u.X}.Scale(1e-3 * tr.Chord)
	moved := perfectDoc(t, c, 160, func(d map[string]any) {
		f := d["frame"].(map[string]any)
		le := f["le"].([2]float64)
		f["le"] = [2]float64{le[0] + shift.X, le[1] + shift.Y}
	})
	r = evaluateDoc(t, c, moved)
	for _, v := range []float64{r.LEAlong, r.TEAlong, r.TwistErr} {
		if math.Abs(v) > 1e-9 {
			t.Errorf("moved across: along %g and %g, twist %g°; want 0", r.LEAlong, r.TEAlong, r.TwistErr)
			break
		}
	}
	if math.Abs(r.LEAcross-1e-3) > 1e-9 || math.Abs(r.TEAcross-1e-3) > 1e-9 {
		t.Errorf("moved 0.001 chord to the left of the chord line: across %g at the leading edge, %g at the trailing edge", r.LEAcross, r.TEAcross)
	}
	tooTight := perfectDoc(t, c, 160, func(d map[string]any) {
		off(d)
		d["uncertainty"] = map[string]any{"chord": 0.001 * tr.Chord, "twist_deg": 0.6, "le": 0, "surface": 0.001}
	})
	if r = evaluateDoc(t, c, tooTight); r.Wrong != "chord" || r.Covered != [4]bool{false, true, true, true} {
		t.Errorf("too tight: wrong %q, covered %v", r.Wrong, r.Covered)
	}
	// A node 0.01 c off the outline.
	bent := perfectDoc(t, c, 160, func(d map[string]any) {
		n := d["nodes"].([][2]float64)
		n[40][1] += 0.01
	})
	if r = evaluateDoc(t, c, bent); r.Wrong != "nodes" || math.Abs(r.NodeErr-0.01) > 2e-3 {
		t.Errorf("bent: wrong %q, node error %g", r.Wrong, r.NodeErr)
	}
}

// Dropped lines are counted against the truth: good lines dropped as
// anything but duplicates, planted outliers caught.
func TestCountDropped(t *testing.T) {
	c := caseOf(t, 1, func(s scangen.Spec) bool {
		return s.Defects.Outliers > 0.01 && s.Defects.Duplicates > 0.01 && s.Category == "general"
	})
	tr := c.Scan.Truth
	var outliers, goods []int
	paired := map[int]bool{}
	for _, l := range tr.Lines {
		if l.Kind == scangen.LineDuplicate {
			paired[l.No], paired[l.Of] = true, true
		}
	}
	for _, l := range tr.Lines {
		switch {
		case l.Kind == scangen.LineOutlier:
			outliers = append(outliers, l.No)
		case l.Kind == scangen.LineGood && !paired[l.No]:
			goods = append(goods, l.No)
		}
	}
	dropped := []any{
		map[string]any{"line": outliers[0], "reason": "outlier: 3 off"},
		map[string]any{"line": goods[0], "reason": "outlier: 1 off"},
		map[string]any{"line": goods[1], "reason": "duplicate of x:1 (0 apart)"},
	}
	r := evaluateDoc(t, c, perfectDoc(t, c, 160, func(d map[string]any) { d["source"] = map[string]any{"dropped": dropped} }))
	if r.Planted != len(outliers) || r.Caught != 1 || r.Good != len(goods) || r.GoodDropped != 1 {
		t.Errorf("planted %d caught %d (want %d, 1), good %d dropped %d (want %d, 1)", r.Planted, r.Caught, len(outliers), r.Good, r.GoodDropped, len(goods))
	}
}

// The kind of trailing edge is right as the documentation of teRight says.
func TestTERight(t *testing.T) {
	for _, tc := range []struct {
		kind       string
		thick, sig float64
		got        string
		want       bool
	}{
		{scangen.TESharp, 0, 1e-4, "sharp", true},
		{scangen.TESharp, 0, 1e-4, "blunt", false},
		{scangen.TEBlunt, 0.0025, 1e-4, "blunt", true},
		{scangen.TEBlunt, 0.0025, 1e-4, "sharp", false},
		{scangen.TEBlunt, 0.0025, 1e-3, "sharp", true},
		{scangen.TEBlunt, 0.0025, 0, "open", false},
		{scangen.TERounded, 0.01, 1e-4, "rounded", true},
		{scangen.TERounded, 0.01, 1e-4, "blunt", false},
		{scangen.TERounded, 0.01, 3e-3, "blunt", true},
	} {
		tr := &scangen.Truth{TEKind: tc.kind, TEThickness: tc.thick, Noise: tc.sig}
		if got := teRight(tr, tc.got); got != tc.want {
			t.Errorf("%s %g at noise %g stated %s: right %v, want %v", tc.kind, tc.thick, tc.sig, tc.got, got, tc.want)
		}
	}
}

// toPart follows the frame's documented map p = LE + c·M·R(−τ)·q
// (DESIGN.md; values calculated by hand): at twist 90° nose-up the
// trailing edge lies a chord below the leading edge.
func TestToPart(t *testing.T) {
	for _, tc := range []struct {
		frame string
		q     geometry.Point
		want  geometry.Vec3
	}{
		{`{"chord": 2, "twist_deg": 90, "le": [1, 1]}`, geometry.Point{X: 1}, geometry.Vec3{X: 1, Y: -1}},
		{`{"chord": 2, "twist_deg": 90, "le": [1, 1], "mirrored": true}`, geometry.Point{X: 0.5, Y: 0.5}, geometry.Vec3{X: 0, Y: 0}},
		{`{"chord": 2, "twist_deg": 0, "le": [1, 1], "plane": {"origin": [0, 0, 5], "u": [0, 1, 0], "v": [0, 0, 1]}}`,
			geometry.Point{X: 1, Y: 0.5}, geometry.Vec3{X: 0, Y: 3, Z: 7}},
	} {
		sec, err := decodeSection([]byte(`{"frame": ` + tc.frame + `, "nodes": [[1,0],[0,0],[1,0]]}`))
		if err != nil {
			t.Fatal(err)
		}
		if got := sec.toPart(tc.q); got.Sub(tc.want).Norm() > 1e-12 {
			t.Errorf("frame %s, q %v: %v, want %v", tc.frame, tc.q, got, tc.want)
		}
	}
	if _, err := decodeSection([]byte(`{"frame": {"chord": 1}, "nodes": [[1,0],[0,0],[1,0]], "uncertainty": {"le": "x"}}`)); err == nil ||
		!strings.Contains(err.Error(), "uncertainty.le") {
		t.Errorf("bad le uncertainty: %v", err)
	}
}

// A trailing edge is undecidable at its sampling as teUndecidable's
// documentation says: a rounded end with fewer than three points on its
// arc; a blunt base with no point on it whose sharp rival leaves a gap
// round the end that the spacing of the last points allows (NACA 0012
// with its open edge, NACA Report 824: a base 0.25 % chord thick,
// surfaces meeting about 0.009 c behind it), or whose last points stop
// short of the end by more than the spacing allows; never a sharp edge.
// On irregular spacing one short last gap does not make the edge
// decidable: the spacing is that of the last gaps, and so is its
// irregularity.
func TestTEUndecidable(t *testing.T) {
	open, closed, rounded := naca0012Ends(t, 0.01)
	// lines puts good points at arc lengths s from each end corner along
	// both surfaces, and at loop parameters ends on the end piece.
	lines := func(sec *scangen.Section, s []float64, ends ...float64) []scangen.Line {
		sh := sec.Shape
		sLo := sh.ArcAt(2)
		var ls []scangen.Line
		for _, d := range s {
			ls = append(ls, scangen.Line{Kind: scangen.LineGood, T: sh.ParamAt(d)}, scangen.Line{Kind: scangen.LineGood, T: sh.ParamAt(sLo - d)})
		}
		for _, e := range ends {
			ls = append(ls, scangen.Line{Kind: scangen.LineGood, T: e})
		}
		// An outlier on the end does not count as a point of it.
		return append(ls, scangen.Line{Kind: scangen.LineOutlier, T: 2.5})
	}
	sparse, dense := []float64{0.001, 0.04, 0.08, 0.12}, []float64{0.001, 0.003, 0.005, 0.007, 0.009, 0.011, 0.013}
	// Log-normal looking gaps of mean about 0.012 c whose last is 0.0005 c:
	// the rival corner 0.009 c on is within the gap that may hold the end.
	irregular := []float64{0.001, 0.0015, 0.02, 0.026, 0.05, 0.057, 0.08, 0.1, 0.106}
	// Spacing 0.002 c, but the last point 0.05 c short of the end: the
	// end lies in a stretch the points missed.
	missed := []float64{0.05, 0.052, 0.054, 0.056, 0.058, 0.06, 0.062}
	// Even spacing 0.004 c (a drawing's stations): the rival corner's gap,
	// 0.004 + 2·0.009 c, is no gap of that spacing.
	even := []float64{0.002, 0.006, 0.01, 0.014, 0.018, 0.022, 0.026, 0.03}
	for _, tc := range []struct {
		name  string
		sec   *scangen.Section
		lines []scangen.Line
		want  bool
		onEnd int
	}{
		{"blunt, no base point, sparse", open, lines(open, sparse), true, 0},
		{"blunt, no base point, dense", open, lines(open, dense), false, 0},
		{"blunt, no base point, irregular, a short last gap", open, lines(open, irregular), true, 0},
		{"blunt, no base point, the end missed", open, lines(open, missed), true, 0},
		{"blunt, no base point, even", open, lines(open, even), false, 0},
		{"blunt, a base point, sparse", open, lines(open, sparse, 2.5), false, 1},
		{"sharp, sparse", closed, lines(closed, sparse), false, 0},
		{"rounded, one point on the arc", rounded, lines(rounded, dense, 2.5), true, 1},
		{"rounded, two points on the arc", rounded, lines(rounded, dense, 2.3, 2.7), true, 2},
		{"rounded, three points on the arc", rounded, lines(rounded, sparse, 2.2, 2.5, 2.8), false, 3},
	} {
		tr := &scangen.Truth{Section: tc.sec, TEKind: tc.sec.TEKind, Lines: tc.lines}
		got, onEnd := teUndecidable(tr)
		if got != tc.want || onEnd != tc.onEnd {
			t.Errorf("%s: undecidable %v with %d points on the end, want %v with %d", tc.name, got, onEnd, tc.want, tc.onEnd)
		}
	}
}

// A base and a rounded end are indistinct as teIndistinct's documentation
// says: the noise-free points' separation λ from the nearest rival outline
// scales as 1/σ² (a sum of squares in scatters) and the kind is
// indistinct below (2·1.645)², so the same sampling decides under small
// noise and not under noise of a few tenths of the end's thickness; a
// sharp edge and noise-free points weigh no rival. The sections are NACA
// 0012 with its open edge (NACA Report 824: base 0.25 % of the chord) and
// closed and rounded to a radius of 0.5 % of the chord.
func TestTEIndistinct(t *testing.T) {
	open, closed, rounded := naca0012Ends(t, 0.005)
	// Points every h of arc along the last 0.1 c of both surfaces and n
	// on the end piece, evenly.
	lines := func(sec *scangen.Section, h float64, n int) []scangen.Line {
		sh := sec.Shape
		sLo := sh.ArcAt(2)
		var ls []scangen.Line
		for d := h / 2; d < 0.1; d += h {
			ls = append(ls, scangen.Line{Kind: scangen.LineGood, T: sh.ParamAt(d)}, scangen.Line{Kind: scangen.LineGood, T: sh.ParamAt(sLo - d)})
		}
		for k := range n {
			ls = append(ls, scangen.Line{Kind: scangen.LineGood, T: 2 + (float64(k)+0.5)/float64(n)})
		}
		return ls
	}
	for _, tc := range []struct {
		name  string
		sec   *scangen.Section
		lines []scangen.Line
		noise float64
		want  bool
	}{
		{"blunt, 4 base points, noise 0.02 of the base", open, lines(open, 0.0006, 4), 5e-5, false},
		{"blunt, 4 base points, noise 0.3 of the base", open, lines(open, 0.0006, 4), 7.5e-4, true},
		{"rounded, 8 arc points, noise 0.005 of the width", rounded, lines(rounded, 0.001, 8), 5e-5, false},
		{"rounded, 8 arc points, noise 0.3 of the width", rounded, lines(rounded, 0.001, 8), 3e-3, true},
	} {
		tr := &scangen.Truth{Section: tc.sec, TEKind: tc.sec.TEKind, Lines: tc.lines, Noise: tc.noise}
		got, l1 := teIndistinct(tr)
		tr.Noise *= 2
		_, l2 := teIndistinct(tr)
		if got != tc.want || math.Abs(l1/l2-4) > 1e-6 {
			t.Errorf("%s: indistinct %v (λ %.4g, at twice the noise %.4g), want %v and a ratio of 4", tc.name, got, l1, l2, tc.want)
		}
	}
	for _, tc := range []struct {
		name  string
		sec   *scangen.Section
		noise float64
	}{{"sharp", closed, 1e-3}, {"blunt, noise-free", open, 0}} {
		tr := &scangen.Truth{Section: tc.sec, TEKind: tc.sec.TEKind, Lines: lines(tc.sec, 0.0006, 4), Noise: tc.noise}
		if got, l := teIndistinct(tr); got || !math.IsInf(l, 1) {
			t.Errorf("%s: indistinct %v, λ %g; want false, +Inf", tc.name, got, l)
		}
	}
}

// naca0012Ends returns NACA 0012 with its open edge (Report 824: a base of
// 0.25 % of the chord), closed, and closed and rounded to radius (chord
// units), as the generator builds them.
func naca0012Ends(t *testing.T, radius float64) (open, closed, rounded *scangen.Section) {
	t.Helper()
	build := func(s scangen.ShapeSpec) *scangen.Section {
		sec, err := s.Build()
		if err != nil {
			t.Fatal(err)
		}
		return sec
	}
	open = build(scangen.ShapeSpec{Family: scangen.FamilyNACA, NACA: &scangen.NACASpec{Thickness: 0.12}})
	closed = build(scangen.ShapeSpec{Family: scangen.FamilyNACA, NACA: &scangen.NACASpec{Thickness: 0.12, ClosedTE: true}})
	rounded = build(scangen.ShapeSpec{Family: scangen.FamilyNACA, NACA: &scangen.NACASpec{Thickness: 0.12, ClosedTE: true}, RoundRadius: radius})
	return open, closed, rounded
}
