package scangen

import (
	"fmt"
	"math"
	"math/rand/v2"
	"sort"

	"github.com/foilwright/foilwright/geometry"
)

// The kinds of line in a generated file.
const (
	LineGood      = "good"      // a point of the outline with its noise
	LineOutlier   = "outlier"   // a point moved well off the surface
	LineDuplicate = "duplicate" // a copy of another line (exact or by a hair)
	// LineRepeat is a second measurement of a stretch another pass
	// measured too: a point of the outline with its own noise, moved with
	// its pass (Truth.Shift).
	LineRepeat = "repeat"
)

// Line is the truth about one point line of a generated file.
type Line struct {
	No   int     `json:"line"` // 1-based line of the point (of its x value in DXF)
	Kind string  `json:"kind"`
	T    float64 `json:"t"` // loop parameter of the outline point it was drawn at
	// Of is the line a duplicate copies.
	Of int `json:"of,omitempty"`
	// Offset is the signed distance of an outlier from the surface, chord
	// units (positive outward).
	Offset float64 `json:"offset,omitempty"`
}

// Truth is what a generated file really holds.
type Truth struct {
	// Section is the true section (outline in the normalised frame).
	Section *Section `json:"-"`
	Units   string   `json:"units"`
	// Chord, TwistDeg, Mirrored, LE and TE are the frame of the tool's
	// convention, in file units: the part is LE + Chord·M·R(−twist)·q for a
	// normalised point q (M mirrors x when Mirrored), carried into the
	// plane of 3D points. LE and TE are 3D; Z is 0 for 2D files.
	Chord    float64    `json:"chord"`
	TwistDeg float64    `json:"twist_deg"`
	Mirrored bool       `json:"mirrored"`
	LE       [3]float64 `json:"le"`
	TE       [3]float64 `json:"te"`
	TEKind   string     `json:"te_kind"`
	// TEThickness is the base of a blunt edge or the diameter of a rounded
	// end, chord units.
	TEThickness float64 `json:"te_thickness"`
	Symmetric   bool    `json:"symmetric"`
	// Noise is the standard deviation of the scatter normal to the
	// surface, chord units; Resolution is the step of the written numbers,
	// chord units.
	Noise      float64 `json:"noise"`
	Resolution float64 `json:"resolution"`
	// NoiseMax is the largest standard deviation along the outline (the
	// scatter varies where a scanner grazes); Offset is the probe-radius
	// compensation error every point carries along its normal, and Shift
	// the largest rigid move of a second pass or repeated stretch against
	// the first, chord units.
	NoiseMax float64 `json:"noise_max"`
	Offset   float64 `json:"offset,omitempty"`
	Shift    float64 `json:"shift,omitempty"`
	Dim      int     `json:"dim"`
	// Plane is the plane of 3D points: in-plane coordinates (a, b) are at
	// Origin + a·U + b·V; nil for 2D files.
	Plane *PlaneTruth `json:"plane,omitempty"`
	// GoodPoints counts the good lines; MaxGap is the longest arc between
	// neighbouring good points along the outline and NoseGap the longest
	// within 0.05 chord of arc from the leading edge, chord units.
	GoodPoints int     `json:"good_points"`
	MaxGap     float64 `json:"max_gap"`
	NoseGap    float64 `json:"nose_gap"`
	Lines      []Line  `json:"lines"`
}

// PlaneTruth is the plane of 3D points, in file units.
type PlaneTruth struct {
	Origin, U, V, Normal [3]float64
}

// Scan is a generated point file and its truth.
type Scan struct {
	Name  string // file name: case-<seed>.<ext>
	Data  []byte
	Truth *Truth
}

// point is a line before writing: its position in the normalised frame,
// the out-of-plane offset (3D) and its truth.
type point struct {
	q    geometry.Point
	z    float64
	line Line
	id   int     // index before shuffling
	src  int     // id of the original, for duplicates; -1 for the others
	pass bool    // the first point of a probe program's second pass
	ext  bool    // a point of the first pass's overlap over the second
	csd  float64 // σ of its correlated noise, chord units
}

// Generate makes the scan of spec with the random draws of seed. The same
// spec and seed always give the same bytes. It returns an error for a spec
// that describes no section or no file.
func Generate(spec Spec, seed uint64) (*Scan, error) {
	sec, err := spec.Shape.Build()
	if err != nil {
		return nil, err
	}
	if spec.Placement.ChordMM <= 0 {
		return nil, fmt.Errorf("scangen: chord %g mm, want > 0", spec.Placement.ChordMM)
	}
	rng := rand.New(rand.NewPCG(seed, 0x5ca9))
	sh := sec.Shape
	g := &gen{sh: sh, rng: rng, noise: spec.Noise.Chord + spec.Noise.MM/spec.Placement.ChordMM, spec: spec}
	g.offset = spec.Noise.OffsetMM / spec.Placement.ChordMM
	sb, cb := math.Sincos(spec.Noise.BeamDeg * math.Pi / 180)
	g.beam = geometry.Point{X: cb, Y: sb}
	g.corr = newField(spec.Noise.Correlated, sh.Length(), max(spec.Sampling.Points, 2*spec.Sampling.PerSurface), spec.Placement.ChordMM, seed)
	smp := &sampler{sh: sh, sm: spec.Sampling, rng: rng}
	switch spec.Order.Start {
	case "nose":
		smp.fixStart, smp.start = true, sh.LE()
	case "te":
		smp.fixStart, smp.start = true, sh.TE()
	}
	var ts []float64
	if spec.Sampling.CAD != "" {
		ts = smp.cadParams(spec.Shape.Family)
	} else {
		if spec.Sampling.Points < 3 {
			return nil, fmt.Errorf("scangen: %d point(s), want at least 3", spec.Sampling.Points)
		}
		ts = smp.params()
	}
	var offs, sds []float64 // a mesh's noise, by point
	if g.corr != nil && g.corr.c.Form == CorrelatedMesh {
		ts, offs, sds = g.corr.meshCut(sh, ts)
	}
	pts := make([]point, len(ts))
	for i, t := range ts {
		pts[i] = g.measure(t, LineGood)
		if offs != nil {
			pts[i].q = pts[i].q.Add(sh.Normal(t).Scale(offs[i]))
			pts[i].csd = sds[i]
		}
	}
	plantOutliers(pts, sh, spec.Defects, g.noise, rng)
	// The first pass's overlap over the second and a repeated stretch,
	// measured again with noise of their own.
	L := sh.Length()
	var ext, rep []point
	if spec.Order.Mode == "two-pass" && spec.Order.Overlap > 0 {
		a := sh.ArcAt(sh.LE()) // past the nose onto the lower surface
		if spec.Order.Meet == "te" {
			a = sh.ArcAt(sh.TE()) - spec.Order.Overlap*L // round the tail from the lower surface
		}
		ext = g.remeasure(pts, a, spec.Order.Overlap*L)
		for i := range ext {
			ext[i].ext = true
		}
	}
	if spec.Defects.Repeat > 0 {
		rep = g.remeasure(pts, L*rng.Float64(), spec.Defects.Repeat*L)
		g.shift(rep, spec.Defects.RepeatShiftMM/spec.Placement.ChordMM)
	}
	pts = g.order(append(pts, ext...), spec.Order)
	pts = append(pts, rep...)
	if f := spec.Defects.Fixture; f != nil {
		pts = append(pts, fixturePoints(f, sh, g.noise, rand.New(rand.NewPCG(seed, 0xf1c6)))...)
	}
	pts = duplicate(pts, spec.Defects, rng)
	for i := range pts {
		pts[i].id = i
	}
	if spec.Defects.CloseLoop && len(pts) > 0 {
		pts = append(pts, point{q: pts[0].q, z: pts[0].z, line: Line{Kind: LineDuplicate, T: pts[0].line.T}, src: 0})
	}
	if spec.Order.Mode == "shuffled" {
		rng.Shuffle(len(pts), func(i, j int) { pts[i], pts[j] = pts[j], pts[i] })
	}
	tr := &Truth{Section: sec, TEKind: sec.TEKind, TEThickness: sec.TEThickness, Symmetric: sec.Symmetric, Offset: g.offset, Shift: g.shifted}
	tr.Noise, tr.NoiseMax = g.noiseStats(pts)
	pl, err := newPlacement(spec.Placement, spec.File.Units)
	if err != nil {
		return nil, err
	}
	pl.frame(tr)
	data, err := write(pts, pl, spec, seed, tr)
	if err != nil {
		return nil, err
	}
	gapStats(tr, sh)
	return &Scan{Name: fmt.Sprintf("case-%d.%s", seed, extension(spec.File.Format)), Data: data, Truth: tr}, nil
}

// gen holds what the measurement of one case needs.
type gen struct {
	sh      *Shape
	rng     *rand.Rand
	spec    Spec
	noise   float64        // σ, chord units
	offset  float64        // probe-radius compensation error, chord units
	beam    geometry.Point // a scanner's beam, for the grazing noise
	shifted float64        // largest shift of a pass, chord units
	corr    *field         // correlated noise, nil for none
}

// sigma returns the standard deviation of the scatter at loop parameter
// t: the case's σ, larger where a scanner's beam grazes the surface.
func (g *gen) sigma(t float64) float64 {
	if g.spec.Noise.Grazing == 0 {
		return g.noise
	}
	c := math.Abs(g.sh.Normal(t).Dot(g.beam))
	return g.noise * (1 + g.spec.Noise.Grazing*(1-c))
}

// measure returns the point measured at loop parameter t: the outline
// point moved along its normal by the compensation error and the
// scatter, and out of a 3D plane by the scatter.
func (g *gen) measure(t float64, kind string) point {
	sd := g.sigma(t)
	off := g.offset + sd*g.rng.NormFloat64()
	var csd float64
	if g.corr != nil && g.corr.c.Form == CorrelatedWander {
		off += g.corr.wander(g.sh.ArcAt(t))
		csd = g.corr.sd
	}
	p := point{q: g.sh.At(t).Add(g.sh.Normal(t).Scale(off)), line: Line{Kind: kind, T: t}, src: -1, csd: csd}
	if g.spec.Placement.Plane != "" {
		p.z = sd * g.rng.NormFloat64()
	}
	return p
}

// remeasure measures the stretch [a, a+length) of arc length (round the
// loop) again: a point between each pair of neighbouring good points
// there (at a random fraction of their gap), or, where fewer than two
// fall in it, about as many as the mean spacing gives, evenly.
func (g *gen) remeasure(pts []point, a, length float64) []point {
	sh := g.sh
	L := sh.Length()
	var in []float64 // offsets from a
	var good int
	for _, p := range pts {
		if p.line.Kind != LineGood {
			continue
		}
		good++
		if d := math.Mod(sh.ArcAt(p.line.T)-a+2*L, L); d < length {
			in = append(in, d)
		}
	}
	sort.Float64s(in)
	var out []point
	if len(in) < 2 {
		n := max(3, int(length/L*float64(max(good, 1))))
		for i := range n {
			d := length * (float64(i) + 0.5) / float64(n)
			out = append(out, g.measure(sh.ParamAt(math.Mod(a+d+2*L, L)), LineRepeat))
		}
		return out
	}
	for i := 0; i+1 < len(in); i++ {
		d := in[i] + (0.2+0.6*g.rng.Float64())*(in[i+1]-in[i])
		out = append(out, g.measure(sh.ParamAt(math.Mod(a+d+2*L, L)), LineRepeat))
	}
	return out
}

// shift moves the points by d (chord units) in a random direction.
func (g *gen) shift(pts []point, d float64) {
	if d == 0 || len(pts) == 0 {
		return
	}
	s, c := math.Sincos(2 * math.Pi * g.rng.Float64())
	v := geometry.Point{X: c, Y: s}.Scale(d)
	for i := range pts {
		pts[i].q = pts[i].q.Add(v)
	}
	g.shifted = math.Max(g.shifted, math.Abs(d))
}

// noiseStats returns the RMS and the largest standard deviation of the
// scatter over the good points, the correlated scatter included.
func (g *gen) noiseStats(pts []point) (rms, top float64) {
	var s2 float64
	var n int
	for _, p := range pts {
		if p.line.Kind != LineGood {
			continue
		}
		sd := g.sigma(p.line.T)
		sd = math.Hypot(sd, p.csd)
		s2 += sd * sd
		top = math.Max(top, sd)
		n++
	}
	if n == 0 {
		sd := g.noise
		if g.corr != nil {
			sd = math.Hypot(sd, g.corr.sd)
		}
		return sd, sd
	}
	return math.Sqrt(s2 / float64(n)), top
}

// plantOutliers moves a share of the points off the surface by 0.5–5 % of
// the chord, at least ten times the noise, outward or inward; an inward
// move that lands near another stretch of the outline (across a thin
// trailing edge) goes outward instead. With bursts, the moved points come
// in runs of 2–4 neighbours (pts is in loop order here) off by about the
// same distance.
func plantOutliers(pts []point, sh *Shape, df Defects, noise float64, rng *rand.Rand) {
	k := int(math.Round(df.Outliers * float64(len(pts))))
	if k == 0 {
		return
	}
	var moved int
	for _, i := range rng.Perm(len(pts)) {
		if moved >= k {
			break
		}
		run := 1
		if df.Bursts {
			top := df.BurstMax
			if top < 2 {
				top = 4
			}
			run = min(2+rng.IntN(top-1), k-moved)
		}
		d := math.Max(0.005+0.045*rng.Float64(), 10*noise)
		if rng.IntN(2) == 0 {
			d = -d
		}
		for j := range run {
			p := &pts[(i+j)%len(pts)]
			if p.line.Kind == LineOutlier {
				continue
			}
			dj := d * (1 + 0.1*rng.NormFloat64())
			t := p.line.T
			base, n := sh.At(t), sh.Normal(t)
			q := base.Add(n.Scale(dj))
			if dist, _ := sh.Nearest(q); dist < 0.5*math.Abs(dj) || dist < 0.004 {
				dj = math.Max(math.Abs(dj), 0.005)
				q = base.Add(n.Scale(dj))
			}
			p.q = q
			p.line.Kind, p.line.Offset = LineOutlier, dj
			moved++
		}
	}
}

// order puts the points in the file's order: along the loop from a
// random start (either way), in two probe passes, or (shuffled later)
// as they are.
//
// The points of the first pass's overlap (ext) belong to the first pass,
// which then starts on the lower surface past the nose, or ends on it past
// the trailing edge; the second pass is moved by Order.PassShiftMM.
func (g *gen) order(pts []point, o Order) []point {
	sh := g.sh
	switch o.Mode {
	case "two-pass":
		L := sh.Length()
		te, le := sh.ArcAt(sh.TE()), sh.ArcAt(sh.LE())
		rel := func(p point) float64 {
			r := math.Mod(sh.ArcAt(p.line.T)-te+2*L, L)
			if p.ext && r > L/2 && o.Meet == "te" {
				r -= L // past the trailing edge: after the end of the first pass
			}
			return r
		}
		leRel := math.Mod(le-te+2*L, L)
		var upper, lower []point
		for _, p := range pts {
			if p.ext || rel(p) <= leRel {
				upper = append(upper, p)
			} else {
				lower = append(lower, p)
			}
		}
		sort.SliceStable(upper, func(i, j int) bool { return rel(upper[i]) > rel(upper[j]) })
		sort.SliceStable(lower, func(i, j int) bool { return rel(lower[i]) < rel(lower[j]) })
		g.shift(lower, o.PassShiftMM/g.spec.Placement.ChordMM)
		out := append(upper, lower...)
		if len(upper) > 0 && len(lower) > 0 {
			out[len(upper)].pass = true
		}
		return out
	case "loop":
		if o.Reverse && len(pts) > 1 {
			// The other way round from the same first point.
			rest := pts[1:]
			for i, j := 0, len(rest)-1; i < j; i, j = i+1, j-1 {
				rest[i], rest[j] = rest[j], rest[i]
			}
		}
	}
	return pts
}

// duplicate writes a share of the points twice, the copy right after its
// original; a share of the copies differ by a hair.
func duplicate(pts []point, d Defects, rng *rand.Rand) []point {
	k := int(math.Round(d.Duplicates * float64(len(pts))))
	if k == 0 {
		return pts
	}
	pick := make(map[int]bool, k)
	for _, i := range rng.Perm(len(pts))[:min(k, len(pts))] {
		pick[i] = true
	}
	out := make([]point, 0, len(pts)+k)
	for i, p := range pts {
		out = append(out, p)
		if !pick[i] {
			continue
		}
		c := p
		c.line = Line{Kind: LineDuplicate, T: p.line.T}
		c.src, c.pass = len(out)-1, false
		if rng.Float64() < d.NearShare {
			a := 2 * math.Pi * rng.Float64()
			r := math.Pow(10, -7+2.5*rng.Float64())
			c.q = c.q.Add(geometry.Point{X: math.Cos(a), Y: math.Sin(a)}.Scale(r))
		}
		out = append(out, c)
	}
	return out
}

// gapStats fills the gap figures of the truth from its good lines.
func gapStats(tr *Truth, sh *Shape) {
	L := sh.Length()
	var ss []float64
	for _, l := range tr.Lines {
		if l.Kind == LineGood {
			ss = append(ss, sh.ArcAt(l.T))
		}
	}
	tr.GoodPoints = len(ss)
	if len(ss) < 2 {
		tr.MaxGap, tr.NoseGap = L, L
		return
	}
	sort.Float64s(ss)
	le := sh.ArcAt(sh.LE())
	for i := range ss {
		a, b := ss[i], ss[(i+1)%len(ss)]
		g := b - a
		if i == len(ss)-1 {
			g += L
		}
		tr.MaxGap = math.Max(tr.MaxGap, g)
		// A gap counts at the nose when it overlaps 0.05 chord of arc
		// either side of the leading edge.
		if arcOverlaps(a, g, le-0.05, 0.1, L) {
			tr.NoseGap = math.Max(tr.NoseGap, g)
		}
	}
}

// arcOverlaps reports whether the arcs [a, a+la) and [b, b+lb) of a loop of
// length L overlap.
func arcOverlaps(a, la, b, lb, L float64) bool {
	d := math.Mod(b-a+2*L, L)
	if d < la {
		return true
	}
	e := math.Mod(a-b+2*L, L)
	return e < lb
}
