package accuracy

import (
	"math"
	"math/rand/v2"
	"slices"
	"sync/atomic"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/frame"
	"github.com/foilwright/foilwright/internal/par"
)

// Uncertainty holds 95 % bounds on the error of a section against the
// part: chord and leading-edge position in input units, twist in degrees,
// and the surface, the largest distance of the section from the part's
// outline in the normalised frame, in chord units.
type Uncertainty struct {
	Chord    float64 `json:"chord"`
	TwistDeg float64 `json:"twist_deg"`
	LE       float64 `json:"le"`
	Surface  float64 `json:"surface"`
	// Shape is the part of Surface the curve's own shape may be off by
	// between its points: Surface before the terms of a nose the points
	// leave unsampled (the leading edge's place, which moves the outline
	// as a whole) and of the outline turned over (chord units). Package
	// prep reads the section's thicknesses against it. Not written to the
	// section document.
	Shape float64 `json:"-"`
}

// Options controls Estimate. The zero value uses DefaultReplicas replicas
// and seed 1.
type Options struct {
	Replicas int    // replicas of the fit; 0 means DefaultReplicas
	Seed     uint64 // seed of the simulated noise (outputs are reproducible)
	// Edges are the options the section was normalised with; Mirror is
	// replaced by the decision the section made.
	Edges frame.Options
}

// DefaultReplicas is the number of replicas Estimate makes by default.
const DefaultReplicas = 12

// Coverage factors: each figure is the larger RMS change of the replicas
// and of the half fits times its factor, set from the robustness campaign
// so that the bounds cover the true error in at least 95 % of its cases
// with the trailing edge read right (see DEVELOPERS.md, "Running
// campaigns"). A Gaussian figure would need 2; the chord of a noisy scan
// needs more: the corner of a thin trailing edge lies where two nearly
// parallel surfaces meet, so a bias of their last stretch, which the
// replicas (fitted the same way) share, moves it along the chord by that
// bias over the tangent of half the edge angle. For exact data the half
// fits alone speak, for the error at twice the spacing.
var (
	factorsNoisy = deltas{chord: 5.5, twistDeg: 2.75, le: 2.0, surface: 2.9}
	factorsExact = deltas{chord: 3.0, twistDeg: 2.0, le: 1.0, surface: 1.5}
)

// floorLength is the least bound on a length, in chords (and on the twist,
// in radians).
const floorLength = 1e-6

// deltas are the differences of one replica (or half fit) from the
// section.
type deltas struct {
	chord, twistDeg, le, surface float64
	// leFar and twistFar are those of the frame of the curve's own
	// farthest point (frame.Normalized.Farthest).
	leFar, twistFar float64
	ok              bool
}

// Estimate returns the uncertainty of the section nz, normalised from the
// fitted curve cv with fit report rep.
func Estimate(cv *curve.Curve, rep *curve.FitReport, nz *frame.Normalized, opts Options) Uncertainty {
	return newPending(cv, rep, opts).estimate(nz)
}

// A Pending is the uncertainty of a fitted curve under way. Its replicas
// and half fits need only the curve's fit report, not the section
// normalised from the curve: Begin starts them on a goroutine of their
// own, which fits them while the caller normalises the section, then
// (Finish) measures them against the section while the caller repanels
// it, and Wait returns the estimate.
type Pending struct {
	cv       *curve.Curve
	rep      *curve.FitReport
	opts     Options
	replicas int
	jobs     []fitJob // the replicas, then the two half fits
	// nz is the section Finish gave, shape hands it to the goroutine;
	// claimed is set by whichever of the goroutine and Wait makes the
	// estimate, result, and done closed when the goroutine returns.
	nz      *frame.Normalized
	shape   chan *frame.Normalized
	claimed atomic.Bool
	stop    atomic.Bool
	result  Uncertainty
	done    chan struct{}
}

// fitJob is one replica or half fit of a Pending, fitted exactly once by
// whichever goroutine claims it first.
type fitJob struct {
	claimed atomic.Bool
	done    chan struct{}
	c       *curve.Curve
	ok      bool
}

// newPending returns the Pending of cv and rep with no fit begun.
func newPending(cv *curve.Curve, rep *curve.FitReport, opts Options) *Pending {
	if opts.Replicas <= 0 {
		opts.Replicas = DefaultReplicas
	}
	p := &Pending{cv: cv, rep: rep, opts: opts}
	// The fits of every second point show what the spacing leaves
	// unknown between the points (all an interpolating fit does not
	// know), and take a second look at the noise, from the real
	// residuals, where the sampling is irregular or sparse.
	if rep.ReplicaNoise() > 0 {
		p.replicas = opts.Replicas
	}
	p.jobs = make([]fitJob, p.replicas+2)
	for k := range p.jobs {
		p.jobs[k].done = make(chan struct{})
	}
	return p
}

// Begin returns the uncertainty of the fitted curve cv with fit report
// rep under way: a goroutine of its own makes the fits, in turn, until
// Finish gives it the section (or Stop stops it).
func Begin(cv *curve.Curve, rep *curve.FitReport, opts Options) *Pending {
	p := newPending(cv, rep, opts)
	p.shape = make(chan *frame.Normalized, 1)
	p.done = make(chan struct{})
	go p.work()
	return p
}

// work is the goroutine of Begin.
func (p *Pending) work() {
	defer close(p.done)
	var nz *frame.Normalized
	given := false
fits:
	for k := range p.jobs {
		select {
		case nz = <-p.shape:
			given = true
			break fits
		default:
		}
		if p.stop.Load() {
			return
		}
		p.run(k)
	}
	if !given {
		nz = <-p.shape
	}
	if nz != nil && !p.stop.Load() && p.claimed.CompareAndSwap(false, true) {
		p.result = p.estimate(nz)
	}
}

// Finish gives Begin's goroutine the section nz, normalised from the
// Pending's curve, to estimate the uncertainty of; Wait returns it.
func (p *Pending) Finish(nz *frame.Normalized) {
	p.nz = nz
	p.shape <- nz
}

// Wait returns the uncertainty of the section given to Finish: made by
// Begin's goroutine, or, when that had not begun it (on a machine shared
// with other jobs it may not have had a core), on the caller.
func (p *Pending) Wait() Uncertainty {
	if p.claimed.CompareAndSwap(false, true) {
		return p.estimate(p.nz)
	}
	<-p.done
	return p.result
}

// Stop ends Begin's goroutine early, for a section that will not be
// estimated (Finish not called, or Wait never to be): it begins no more
// fits or measurements and returns. After Wait it changes nothing, so a
// caller may defer it.
func (p *Pending) Stop() {
	p.stop.Store(true)
	select {
	case p.shape <- nil:
	default:
	}
}

// run fits job k unless another goroutine has claimed it, and reports
// whether it did. Replica k has its own seed, so a fit does not depend on
// the goroutine that makes it.
func (p *Pending) run(k int) bool {
	j := &p.jobs[k]
	if !j.claimed.CompareAndSwap(false, true) {
		return false
	}
	var err error
	if k < p.replicas {
		rng := rand.New(rand.NewPCG(p.opts.Seed, uint64(k)+1))
		j.c, err = p.rep.Replica(rng)
	} else {
		j.c, err = p.rep.Half(k - p.replicas)
	}
	j.ok = err == nil
	close(j.done)
	return true
}

// fit returns fit k, made on the caller unless another goroutine has
// claimed it (then once that one has made it), and whether it succeeded.
func (p *Pending) fit(k int) (*curve.Curve, bool) {
	if !p.run(k) {
		<-p.jobs[k].done
	}
	return p.jobs[k].c, p.jobs[k].ok
}

// estimate returns the uncertainty of the section nz, normalised from the
// Pending's curve, making the fits not made yet.
func (p *Pending) estimate(nz *frame.Normalized) Uncertainty {
	cv, rep, opts, replicas := p.cv, p.rep, p.opts, p.replicas
	eo := opts.Edges
	eo.Mirror = frame.MirrorNo
	eo.Support, eo.Noise = nil, 0 // the mirror is the section's: the replicas keep it
	// So is the place of an edge whose surfaces cross ahead of its corner.
	eo.Untangle = frame.UntangleCut
	if nz.Cornered {
		eo.Untangle = frame.UntangleCorner
	}
	if nz.Frame.Mirrored {
		eo.Mirror = frame.MirrorYes
	}
	ref := newReference(nz)
	measure := func(c *curve.Curve) deltas {
		z, err := frame.Normalize(c, eo)
		if err != nil {
			return deltas{}
		}
		return ref.compare(z)
	}
	// The replicas and the fits of every second point, on two goroutines,
	// each taking the next fit (when Begin's goroutine has not made it)
	// and measuring it as it finishes one.
	fits := make([]deltas, replicas+2)
	fitted := make([]bool, replicas+2)
	par.For(replicas+2, 2, func(_, k int) {
		if p.stop.Load() {
			return // no estimate wanted
		}
		c, ok := p.fit(k)
		if !ok {
			return
		}
		fits[k] = measure(c)
		fitted[k] = k >= replicas
	})
	var noise []deltas
	if replicas > 0 {
		noise = fits[:replicas]
	}
	var half []deltas
	for k := replicas; k < replicas+2; k++ {
		if fitted[k] {
			half = append(half, fits[k])
		}
	}
	rn, rh := rms(noise), rms(half)
	f := factorsNoisy
	if len(noise) == 0 {
		f = factorsExact
	}
	u := Uncertainty{
		Chord:    f.chord * math.Max(rn.chord, rh.chord),
		TwistDeg: f.twistDeg * max(rn.twistDeg, rh.twistDeg, rn.twistFar, rh.twistFar),
		LE:       f.le * max(rn.le, rh.le, rn.leFar, rh.leFar),
		Surface:  f.surface * math.Max(rn.surface, rh.surface),
	}
	// The two readings of this fit's own leading edge, the form of the
	// nose's and the curve's farthest point, differ by what the form
	// departs from the nose or the farthest point slides: neither the
	// replicas nor the half fits see it, as each makes the same reading
	// again. The leading edge may be off by that much more; the twist by
	// it seen from the trailing edge, a chord away; and the normalised
	// outline, placed by its leading edge, by it in chords.
	if c := nz.Frame.Chord; c > 0 {
		dLE := math.Hypot(nz.Frame.LE[0]-nz.Farthest.LE[0], nz.Frame.LE[1]-nz.Farthest.LE[1])
		u.LE += dLE
		u.TwistDeg += math.Atan(dLE/c) * 180 / math.Pi
		u.Surface += dLE / c
	}
	// The ends of an open fit pinned where the points end (no base points)
	// are where the trailing edge was found. At a blunt edge they are the
	// last points either side, and the surfaces may run on unseen for up
	// to a spacing h. Last points that stop at the same station along the
	// chord (within twice their offset and the noise) mark the base, as a
	// probe program that ends each pass on the edge leaves them; otherwise
	// the midpoint of the edge may lie anywhere over a spacing. Their
	// stations are the points' own (lastAlong): the fit carries the
	// shorter surface on to the other's station. The surfaces may also
	// meet in a corner beyond them (unseenCorner). Ends the
	// points cannot tell apart at all widen the bound further where the
	// edge is decided (prep). At a sharp edge the corner's place along the
	// chord is what the replicas do not see (cornerAlong); the midpoint
	// moves by the noise at most.
	if h := rep.EndGap(); h > 0 {
		if cv.Start().Dist(cv.End()) > sameEnd*cv.Length() {
			fr := nz.Frame
			d := geometry.Point{X: math.Cos(-fr.TwistDeg * math.Pi / 180), Y: math.Sin(-fr.TwistDeg * math.Pi / 180)}
			if fr.Mirrored {
				d.X = -d.X
			}
			along := lastAlong(rep, cv, d)
			dc, dt := unseenCorner(cv, nz.Frame, h)
			u.Chord += math.Max(0.95*math.Min(h, 2*along+2*rep.NoiseEstimate), dc)
			u.TwistDeg += dt
		} else {
			u.Chord += 0.95*math.Min(h, 2*rep.NoiseEstimate) + cornerAlong(cv, rep)
		}
	}
	// Surfaces of a thin sharp edge that cross ahead of its corner keep
	// the edge at the corner the fit made, or put it where they cross
	// (frame.Normalized.Untangled, Cornered), and so do the replicas that
	// cross: they share the reading and do not see the other, where the
	// part's edge may lie as well. The chord may be longer by the distance between the two; the
	// leading edge, the twist and the outline normalised to that corner
	// off by what untangledShift measures. The outline's term moves it as
	// a whole (a turn and a scale about the leading edge), not its shape:
	// it joins the surface's bound after the shape's is taken.
	var untangledSurface float64
	if nz.Untangled > 0 && nz.Frame.Chord > 0 {
		u.Chord += nz.Untangled
		other := cv.Start()
		if nz.Cornered {
			other = nz.Crossing
		}
		dl, dt, ds := untangledShift(cv, nz.Frame, ref.poly, other)
		u.LE += dl
		u.TwistDeg += dt
		untangledSurface = ds
	}
	// A nose sampled too sparsely (the one Gaps warns of) leaves the
	// leading edge where the curve guesses it between the points round
	// the bend; the true one lies somewhere on the part's nose between
	// the same points, and the replicas and half fits keep the guess's
	// shape, so they do not see how far. A convex nose through the points
	// bounds it (noseRegionFar): the leading edge may be off by up to its
	// distance from the farthest place the part's leading edge may take
	// there; where the points do not bound that place (they turn the
	// other way, or a gap turns half a turn), by up to its distance from
	// the farther of the points ending the stretch. The chord, from the leading
	// edge to the trailing edge, changes by no more than the two ends
	// move (the triangle inequality), so the chord's bound gains that
	// distance; the twist is at least the leading edge's bound seen from
	// the trailing edge, a chord away; and since the normalised outline
	// is placed by its leading edge, the nose of the outline may lie
	// that far (in chords) from the part's.
	u.Shape = u.Surface
	u.Surface += untangledSurface
	if a, b, ok := noseStretch(rep, cv, nz); ok && nz.Frame.Chord > 0 {
		L := cv.Length()
		at := func(t float64) geometry.Point {
			if cv.Closed() {
				t = math.Mod(t, L)
			}
			return cv.At(t)
		}
		le := geometry.Point{X: nz.Frame.LE[0], Y: nz.Frame.LE[1]}
		far := math.Max(le.Dist(at(a)), le.Dist(at(b)))
		if r, ok := noseRegionFar(rep, cv, nz.Frame, le, a, b); ok {
			far = r
		}
		u.LE = math.Max(u.LE, far)
		u.Chord += far
		u.TwistDeg = math.Max(u.TwistDeg, math.Atan(u.LE/nz.Frame.Chord)*180/math.Pi)
		u.Surface = math.Max(u.Surface, far/nz.Frame.Chord)
	}
	// A rounded trailing edge whose tip no point samples (a gap over the
	// tip turns the outline by more than tipTurnDeg) is the fit's guess:
	// the surfaces may as well run on straight to a corner, and the
	// replicas and half fits, which round the end alike, do not see it.
	// The part's trailing edge may lie anywhere from the tip to where the
	// surfaces' straight continuations meet (tipStretch), so the chord's
	// bound gains that distance and the twist's its height over the chord.
	if along, across, ok := tipStretch(rep, cv, nz); ok {
		c := nz.Frame.Chord
		u.Chord += along * c
		u.TwistDeg = math.Max(u.TwistDeg, math.Atan(across)*180/math.Pi)
	}
	// Where the points cannot tell the upper side from the lower (the
	// normalisation says so), the section may be the part turned over:
	// its outline then lies from the part's as far as from its own
	// mirror image about the chord line, give or take its other errors.
	// A mirror image within the bound already stated (a symmetric
	// section, whose image differs from it by its own scatter) is no
	// other reading at that accuracy, and the bound stands.
	if nz.MirrorOpen {
		if d := mirrorDistance(ref.poly); d > u.Surface {
			u.Surface += d
		}
	}
	// The chord line runs from the leading edge to the trailing edge: a
	// leading edge anywhere within its bound turns it by up to that bound
	// seen from the trailing edge, a chord away, which the replicas' own
	// twist need not show where the leading edge's bound holds more than
	// their scatter (the two readings of the nose, the farthest point's
	// slide); as for a sparse nose above.
	if c := nz.Frame.Chord; c > 0 {
		u.TwistDeg = math.Max(u.TwistDeg, math.Atan(u.LE/c)*180/math.Pi)
	}
	// Floors: what the arithmetic of the chain (projections, searches
	// for the farthest point, quadrature) leaves even on exact data.
	c := nz.Frame.Chord
	u.Chord = math.Max(u.Chord, floorLength*c)
	u.LE = math.Max(u.LE, floorLength*c)
	u.TwistDeg = math.Max(u.TwistDeg, floorLength*180/math.Pi)
	u.Surface = math.Max(u.Surface, floorLength)
	u.Shape = math.Max(u.Shape, floorLength)
	return u
}

// rms returns the root mean square of each figure over the deltas that
// were measured; a failed measurement counts as missing.
func rms(ds []deltas) deltas {
	var out deltas
	n := 0
	for _, d := range ds {
		if !d.ok {
			continue
		}
		out.chord += d.chord * d.chord
		out.twistDeg += d.twistDeg * d.twistDeg
		out.le += d.le * d.le
		out.leFar += d.leFar * d.leFar
		out.twistFar += d.twistFar * d.twistFar
		out.surface += d.surface * d.surface
		n++
	}
	if n == 0 {
		return out
	}
	f := 1 / float64(n)
	out.chord = math.Sqrt(out.chord * f)
	out.twistDeg = math.Sqrt(out.twistDeg * f)
	out.le = math.Sqrt(out.le * f)
	out.leFar = math.Sqrt(out.leFar * f)
	out.twistFar = math.Sqrt(out.twistFar * f)
	out.surface = math.Sqrt(out.surface * f)
	out.ok = true
	return out
}

// reference is the section the replicas are compared with: its frame and
// its normalised outline as a dense polyline.
type reference struct {
	fr, far frame.Frame
	poly    []geometry.Point
	reach   segReach // of poly
}

// refSamples is the number of points on each side of the reference
// polyline; a compared outline is sampled refRatio times less densely.
const (
	refSamples = 2000
	refRatio   = 16
)

func newReference(nz *frame.Normalized) reference {
	poly := samples(nz.Path, nz.SLE, refSamples)
	return reference{fr: nz.Frame, far: nz.Farthest, poly: poly, reach: newSegReach(poly)}
}

// samples returns points of the normalised outline p (leading edge at
// arc length sLE): n+1 on each side, from the trailing edge to the
// leading edge and on, by a cosine law that crowds them at both edges.
func samples(p geometry.Path, sLE float64, n int) []geometry.Point {
	L := p.Length()
	out := make([]geometry.Point, 0, 2*n+1)
	for k := 0; k <= n; k++ {
		out = append(out, p.At(sLE*(1-math.Cos(math.Pi*float64(k)/float64(n)))/2))
	}
	for k := 1; k <= n; k++ {
		out = append(out, p.At(sLE+(L-sLE)*(1-math.Cos(math.Pi*float64(k)/float64(n)))/2))
	}
	return out
}

// compare returns the differences of the normalised section z from the
// reference.
func (r reference) compare(z *frame.Normalized) deltas {
	d := deltas{ok: true}
	d.chord = math.Abs(z.Frame.Chord - r.fr.Chord)
	d.le = math.Hypot(z.Frame.LE[0]-r.fr.LE[0], z.Frame.LE[1]-r.fr.LE[1])
	d.twistDeg = math.Abs(math.Remainder(z.Frame.TwistDeg-r.fr.TwistDeg, 360))
	// The leading edge of the curve's own farthest point slides along the
	// nose with the curve's wiggles, which the form of the nose the
	// section's leading edge is read from (frame.Normalize) smooths; the
	// form's own departure from the nose the replicas share and cannot
	// show. The bounds keep the larger spread of the two readings.
	d.leFar = math.Hypot(z.Farthest.LE[0]-r.far.LE[0], z.Farthest.LE[1]-r.far.LE[1])
	d.twistFar = math.Abs(math.Remainder(z.Farthest.TwistDeg-r.far.TwistDeg, 360))
	d.surface = maxDistance(samples(z.Path, z.SLE, refSamples/refRatio), r.poly, refRatio, r.reach)
	return d
}

// maxDistance returns the largest distance from the points qs to the
// polyline poly. Both sample the same outline at the same fractions of arc
// on each side (samples), poly ratio times as densely, so the segment
// nearest to qs[k] lies near poly[ratio·k]; a window of distWindow
// segments either side is searched.
func maxDistance(qs, poly []geometry.Point, ratio int, polyReach segReach) float64 {
	var worst2 float64
	reach := polyReach.with(qs)
	for k, q := range qs {
		c := ratio * k
		lo, hi := max(0, c-distWindow), min(len(poly)-1, c+distWindow)
		worst2 = max(worst2, nearestSeg2(q, poly, lo, hi, c, reach))
	}
	return math.Sqrt(worst2)
}

// nearestSeg2 returns the least segDist2 of q from the segments
// poly[j]–poly[j+1], lo ≤ j < hi (+Inf when there is none), to the bit
// what taking the least of every one gives. It measures segment first
// (within [lo, hi)), then the others, skipping each segment whose start
// lies farther from q than the nearest so far plus the longest segment
// of poly and more than rounding (reach, segReach): the segment cannot
// come nearer than that nearest, and the least of a set of squared
// distances does not depend on the order they are taken in (a NaN, never
// skipped, gives NaN either way).
func nearestSeg2(q geometry.Point, poly []geometry.Point, lo, hi, first int, reach segReach) float64 {
	best := math.Inf(1)
	if lo >= hi {
		return best
	}
	first = min(max(first, lo), hi-1)
	best = segDist2(q, poly[first], poly[first+1])
	r2 := reach.beyond(best)
	for j := lo; j < hi; j++ {
		a := poly[j]
		dx, dy := a.X-q.X, a.Y-q.Y
		if dx*dx+dy*dy > r2 || j == first {
			continue
		}
		if d := segDist2(q, a, poly[j+1]); d < best || d != d { // min(best, d)
			best = d
			r2 = reach.beyond(best)
		}
	}
	return best
}

// A segReach holds what nearestSeg2 skips segments by: the longest
// segment of the polyline and the rounding allowed.
type segReach struct {
	long  float64 // the longest segment, a little over
	mag   float64 // the largest magnitude of a coordinate
	slack float64 // rounding of the distances, absolute
}

// newSegReach returns the segReach of poly. Nothing is skipped (long
// +Inf) when a coordinate is not finite.
func newSegReach(poly []geometry.Point) segReach {
	r := segReach{}.with(poly)
	l2 := 0.0
	for j := 0; j+1 < len(poly); j++ {
		d := poly[j+1].Sub(poly[j])
		l2 = max(l2, d.X*d.X+d.Y*d.Y)
	}
	r.long = math.Sqrt(l2) * (1 + 1e-9)
	if math.IsInf(r.slack, 0) || math.IsInf(l2, 0) {
		r.long = math.Inf(1)
	}
	return r
}

// with returns r for distances from the points qs as well: slack is the
// coordinates' largest magnitude S times 1e-13, where the rounding of
// segDist2's differences and products stays within some 10 S ulp
// (2.2e-15 S); +Inf, which skips nothing, when a coordinate is not finite.
func (r segReach) with(qs []geometry.Point) segReach {
	for _, p := range qs {
		r.mag = max(r.mag, math.Abs(p.X), math.Abs(p.Y))
	}
	r.slack = 1e-13 * r.mag
	if math.IsNaN(r.mag) || math.IsInf(r.mag, 0) {
		r.slack = math.Inf(1)
	}
	return r
}

// beyond returns the squared distance from a point beyond which a
// segment's start lies too far for the segment to come within √best2 of
// it, rounding included: (√best2 + long + slack)², a little over; +Inf
// when best2 is not a finite number.
func (r segReach) beyond(best2 float64) float64 {
	d := math.Sqrt(best2)*(1+1e-9) + r.long + r.slack
	if math.IsNaN(d) {
		return math.Inf(1)
	}
	return d * d * (1 + 1e-9)
}

// segDist2 returns the squared distance of q from the segment ab.
func segDist2(q, a, b geometry.Point) float64 {
	dx, dy := b.X-a.X, b.Y-a.Y
	px, py := q.X-a.X, q.Y-a.Y
	dd := dx*dx + dy*dy
	t := 0.0
	if dd > 0 {
		// The built-in min and max are math.Min and math.Max (NaN, ±0
		// and infinities alike), inline.
		t = max(0, min(1, (px*dx+py*dy)/dd))
	}
	ex, ey := px-t*dx, py-t*dy
	return ex*ex + ey*ey
}

// mirrorStep is the step, in points of the reference polyline, between
// the points of its mirror image whose distance from it mirrorDistance
// measures.
const mirrorStep = 16

// mirrorDistance returns the largest distance of the outline poly (a
// normalised section, chord line along x) from its mirror image about the
// chord line: from every mirrorStep-th point of the image to the nearest
// segment of poly.
func mirrorDistance(poly []geometry.Point) float64 {
	var worst2 float64
	reach := newSegReach(poly) // the image's coordinates are as large
	for k := 0; k < len(poly); k += mirrorStep {
		q := geometry.Point{X: poly[k].X, Y: -poly[k].Y}
		// The image of a point of one side lies near the point as far
		// along the other (samples).
		worst2 = max(worst2, nearestSeg2(q, poly, 0, len(poly)-1, len(poly)-2-k, reach))
	}
	return math.Sqrt(worst2)
}

// distWindow is the half-width, in segments, of maxDistance's search.
const distWindow = 40

// lastAlong returns how far apart along the chord direction d (a unit
// vector in input coordinates) the outermost points of an open fit lie:
// the feet on cv of the points first and last along it (arc lengths
// rep.S), not the curve's ends, which the fit may carry on beyond them.
func lastAlong(rep *curve.FitReport, cv *curve.Curve, d geometry.Point) float64 {
	if len(rep.S) == 0 {
		return 0
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, s := range rep.S {
		lo, hi = math.Min(lo, s), math.Max(hi, s)
	}
	return math.Abs(cv.At(hi).Sub(cv.At(lo)).Dot(d))
}

// cornerReach is how many end spacings the surfaces of an edge read as
// blunt may run on unseen: gaps of irregular sampling differ by that much
// from their median (log-normal gaps of σ 0.8 exceed 3 medians one time
// in ten, and the edge has two sides).
const cornerReach = 3

// unseenCorner returns what an edge read as blunt from the last points
// either side (no points on a base) leaves unknown: the two surfaces,
// run on straight along their last stretch, may meet in a sharp corner
// beyond the points. When they meet within cornerReach end spacings h of
// both ends, the points cannot tell that corner from a blunt edge, and the
// chord may be longer by the corner's distance beyond the edge's midpoint
// (input units) and the twist off by the angle the corner's offset from
// the midpoint makes at the leading edge (degrees). Otherwise (surfaces
// that part or meet far beyond the points) it returns zeros.
func unseenCorner(cv *curve.Curve, fr frame.Frame, h float64) (chord, twistDeg float64) {
	L := cv.Length()
	if !(h > 0) || !(L > 2*h) || !(fr.Chord > 0) {
		return 0, 0
	}
	a, b := fr.ToChord(cv.Start()), fr.ToChord(cv.End())
	da := a.Sub(fr.ToChord(cv.At(h)))
	db := b.Sub(fr.ToChord(cv.At(L - h)))
	la, lb := math.Hypot(da.X, da.Y), math.Hypot(db.X, db.Y)
	if !(la > 0) || !(lb > 0) {
		return 0, 0
	}
	da, db = da.Scale(1/la), db.Scale(1/lb)
	// a + s·da = b + t·db.
	det := da.Cross(db)
	if math.Abs(det) < 1e-9 {
		return 0, 0
	}
	w := b.Sub(a)
	s := w.Cross(db) / det
	t := w.Cross(da) / det
	reach := cornerReach * h / fr.Chord
	if !(s > 0) || !(t > 0) || s > reach || t > reach {
		return 0, 0
	}
	corner := a.Add(da.Scale(s))
	mid := a.Add(b).Scale(0.5)
	chord = math.Max(0, corner.X-mid.X) * fr.Chord
	if corner.X > 0 && mid.X > 0 {
		twistDeg = math.Abs(math.Atan2(corner.Y, corner.X)-math.Atan2(mid.Y, mid.X)) * 180 / math.Pi
	}
	return chord, twistDeg
}

// untangledSamples is the number of samples of the fitted curve that
// untangledShift searches and compares the outline with.
const untangledSamples = 4000

// untangledWindow is the half-width, in segments of the image, of
// untangledShift's search round the last nearest segment.
const untangledWindow = 300

// untangledShift returns what a sharp trailing edge put at one end of the
// stretch its surfaces cross over (frame.Normalized.Untangled: the
// crossing ahead of the fit's corner, or the corner) leaves open when the
// part's edge is the other end, corner (cv.Start() or the crossing),
// instead: how far the leading edge (input units) and the twist (degrees)
// of that edge's frame lie from those of fr, and the largest distance
// (chord units) of the outline poly, normalised by fr, from the whole
// fitted curve cv normalised by the other edge's frame. Its leading edge
// is fr's moved as the curve point farthest from the trailing edge moves
// from fr's edge to the other (the convention's leading edge).
func untangledShift(cv *curve.Curve, fr frame.Frame, poly []geometry.Point, corner geometry.Point) (le, twistDeg, surface float64) {
	te := fr.ToPart(geometry.Point{X: 1})
	L := cv.Length()
	if !(L > 0) || len(poly) == 0 {
		return 0, 0, 0
	}
	lep := geometry.Point{X: fr.LE[0], Y: fr.LE[1]}.Add(farthestOn(cv, corner).Sub(farthestOn(cv, te)))
	v := corner.Sub(lep)
	if fr.Mirrored {
		v.X = -v.X
	}
	c := math.Hypot(v.X, v.Y)
	if !(c > 0) {
		return 0, 0, 0
	}
	cf := frame.Frame{Chord: c, TwistDeg: -math.Atan2(v.Y, v.X) * 180 / math.Pi, LE: [2]float64{lep.X, lep.Y}, Mirrored: fr.Mirrored}
	le = lep.Dist(geometry.Point{X: fr.LE[0], Y: fr.LE[1]})
	twistDeg = math.Abs(math.Remainder(cf.TwistDeg-fr.TwistDeg, 360))
	img := make([]geometry.Point, untangledSamples+1)
	for k := range img {
		// Cosine spacing crowds the samples at the corner (both ends).
		img[k] = cf.ToChord(cv.At(L * (1 - math.Cos(math.Pi*float64(k)/untangledSamples)) / 2))
	}
	// Both run from the trailing edge round the nose and back, the image
	// the other way round when the point a quarter along poly (mid upper
	// surface) lies nearest to its second half; each point's nearest
	// segment is sought within untangledWindow of the last one's (the
	// image runs on beyond the crossing by fewer samples).
	mid, far := poly[len(poly)/4], 0
	best := math.Inf(1)
	for j := 0; j+1 < len(img); j++ {
		if d := segDist2(mid, img[j], img[j+1]); d < best {
			best, far = d, j
		}
	}
	if far > len(img)/2 {
		slices.Reverse(img)
	}
	var worst2 float64
	at := 0
	for _, q := range poly {
		lo, hi := max(0, at-untangledWindow), min(len(img)-1, at+untangledWindow)
		best := math.Inf(1)
		for j := lo; j < hi; j++ {
			if d := segDist2(q, img[j], img[j+1]); d < best {
				best, at = d, j
			}
		}
		worst2 = max(worst2, best)
	}
	return le, twistDeg, math.Sqrt(worst2)
}

// farthestOn returns the point of cv farthest from p: the best of
// untangledSamples even samples, refined over the steps either side.
func farthestOn(cv *curve.Curve, p geometry.Point) geometry.Point {
	L := cv.Length()
	step := L / untangledSamples
	best, bd := cv.Start(), -1.0
	var bs float64
	for k := 0; k <= untangledSamples; k++ {
		if q := cv.At(float64(k) * step); q.Dist(p) > bd {
			best, bd, bs = q, q.Dist(p), float64(k)*step
		}
	}
	const fine = 200
	for k := -fine; k <= fine; k++ {
		s := bs + step*float64(k)/fine
		if s < 0 || s > L {
			continue
		}
		if q := cv.At(s); q.Dist(p) > bd {
			best, bd = q, q.Dist(p)
		}
	}
	return best
}

// cornerFactor is the coverage factor of cornerAlong, set from the
// campaign as the other factors are.
var cornerFactor = 3.0

// cornerGap is the share of the longer unsampled stretch to the corner
// by which the corner may lie off along the chord beyond what cornerFactor
// covers: the surfaces carried over the stretch follow a model of their
// shape, not the part (set from the campaign).
var cornerGap = 0.1

// cornerAlong returns the 95 % bound on how far along the edge's bisector
// the corner of a sharp edge that the fit was given (the surfaces' fits
// carried to where they meet, or the aftmost point) may lie from the true
// one (input units): the replicas move the ends across the curve, never
// along it. A surface whose position near the corner is uncertain by δ
// moves the corner along the bisector by δ/(2 sin(θ/2)), θ the edge angle;
// two surfaces, independently, by δ/(√2 sin(θ/2)). δ is the noise a replica
// simulates and, for the stretch a surface runs on unsampled to the
// corner (a step a), the miss κa²/2 of a straight extrapolation over it
// at the curvature κ there. It returns 0 unless the curve's ends meet.
func cornerAlong(cv *curve.Curve, rep *curve.FitReport) float64 {
	L := cv.Length()
	if cv.Closed() || !(L > 0) || cv.Start().Dist(cv.End()) > sameEnd*L {
		return 0
	}
	a, b := rep.EndSteps()
	if !(a > 0) || !(b > 0) || a+b >= L/2 {
		return 0
	}
	c := cv.Start()
	da := c.Sub(cv.At(a))
	db := c.Sub(cv.At(L - b))
	la, lb := math.Hypot(da.X, da.Y), math.Hypot(db.X, db.Y)
	if !(la > 0) || !(lb > 0) {
		return 0
	}
	half := da.Scale(1 / la).Sub(db.Scale(1 / lb))
	sinHalf := math.Max(math.Hypot(half.X, half.Y)/2, minSinHalf)
	sigma := rep.ReplicaNoise()
	ka := math.Abs(cv.Curvature(a)) * a * a / 2
	kb := math.Abs(cv.Curvature(L-b)) * b * b / 2
	delta := math.Sqrt(2*sigma*sigma + ka*ka + kb*kb)
	return cornerFactor*delta/(2*sinHalf) + cornerGap*math.Max(a, b)
}

// sameEnd is how near (a share of the curve's length) the ends of an open
// curve lie when they are one corner, pinned there by the fit.
const sameEnd = 1e-6

// minSinHalf bounds the sine of half the edge angle from below: a cusp
// (surfaces that meet tangentially) is not a corner whose place the
// crossing fixes, and the bound is not pushed to infinity there.
const minSinHalf = 0.02
