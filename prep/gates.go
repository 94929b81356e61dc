package prep

import (
	"fmt"
	"math"
	"strings"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/clean"
	"github.com/foilwright/foilwright/geometry/section"
)

// Gates: checks every section passes before prep accepts it. A check that
// fails sends the chain back to try another ordering of the points, then
// the fit without the trailing edge found on the points; when every way
// fails the first failure is reported as a *GateError.
const (
	GateCrossing = "no self-crossing"           // the repanelled outline does not cross itself
	GateExtent   = "chord within the extent"    // the chord is the section's length
	GateMonotone = "surfaces monotone"          // each surface runs one way along the chord
	GateTEAngle  = "trailing-edge angle"        // the surfaces meet at a plausible angle
	GateFit      = "fit within the scatter"     // the curve stays within the points' scatter
	GateEdges    = "leading and trailing edges" // the edges could be located at all
	GateSpan     = "surfaces span the chord"    // both surfaces run from the leading edge to the trailing edge
	GateThinEnd  = "thin end aft"               // the section is thicker near its leading edge than near its trailing edge
	GateKink     = "no kink"                    // the outline turns smoothly away from its trailing edge
	GatePinch    = "no pinch"                   // the thickness nowhere falls to a fraction of the thicknesses fore and aft
)

// Limits of the gates.
const (
	gateExtent  = 0.03 // the chord may differ from the points' largest extent by this share
	gateNoseCap = 0.02 // near the nose (x below this), x may run back by ...
	gateBack    = 2e-3 // ... this much of the chord, and elsewhere by this
	gateTEAngle = 90   // degrees: the largest plausible trailing-edge angle of most sections, ...
	// ... and of a thick one whose surfaces open up from the trailing edge
	// as that angle says (wedgeAft): the thickest sections of the NACA
	// 4-digit-modified equations (Report 824; t up to 0.4, d₁ = 0.7 with
	// the thickness greatest at 60 %) meet at up to 109° (campaign seeds
	// 914, 972, 1983, 5080, 5330 exited 2 at 96–109°), while a trailing
	// edge found on the smooth outline, a nose taken for it or a point off
	// the section beyond it, meets at 128° (seed 6224) to 180°; our choice
	// of limit between them.
	gateTEAngleThick = 120
	// wedgeAft: over the last gateWedgeFrom to gateWedgeTo of the chord
	// the thickness grows by at least gateWedgeShare of what straight
	// surfaces meeting at the trailing-edge angle would give: the
	// 4-digit-modified sections above open by 0.77 to 0.81 of it (their
	// equations give 0.76); a section whose end was read at a wider angle
	// than its own (an outlier kept at the tail, a rounded end read as a
	// corner: seeds 1310, 1835, 2588, of 5 %, 7 % and 30 % thickness with
	// true angles of 7° to 70°, read at 91–117° with a node 0.02 c off)
	// by −0.02 to 0.36 (our choice between them).
	gateWedgeFrom  = 0.9
	gateWedgeTo    = 0.99
	gateWedgeShare = 0.6
	gateFitRMS     = 10   // the fit's RMS residual may exceed the points' scatter this many times
	gateFitBeyond  = 0.01 // on the last way, the share of points beyond the fit's tolerance its gate may leave out ...
	gateFitRest    = 2    // ... when the rest depart by at most this many times their scatter (our choices)
	// The thicknesses compared by the thin-end gate, at gateThinFore and
	// gateThinAft of the chord: every section of the campaign's families
	// (NACA 4- and 5-digit and 4-digit-modified, Report 824 and Abbott and
	// von Doenhoff; flat-bottomed; Kármán–Trefftz; rounded ends up to 1 %
	// of the chord) is at least twice as thick at 5 % as at 95 %, by
	// their equations; a section whose edges were swapped is the reverse.
	gateThinFore = 0.05
	gateThinAft  = 0.95
	// A nose, whatever its radius, widens from its tip as a parabola
	// does, h² ≈ 2·r·d at a distance d behind it (common practice; the
	// NACA sections' 0.2969·√x term, Report 824): the square of the
	// section's thickness at gateNoseFar from its leading edge is about
	// four times that at gateNoseNear. A rounded or blunt trailing edge
	// widens far less ahead of its own radius (1.1 to 2 times). Where the
	// thicknesses at gateThinFore and gateThinAft differ by less than
	// gateThinRatio, they cannot tell the ends apart (a thin section
	// whose rounded trailing edge is blunter than its nose: campaign
	// seeds 661, 1271, 505, 458, thin 4-digit and 4-digit-modified
	// sections with the edge rounded to 0.4–1 % of the chord, exited 0
	// turned end for end); then a leading edge that widens by less than
	// gateNoseGrowth, and less than the trailing edge does, is a rounded
	// trailing edge taken for the nose. No section of the campaign's
	// families whose ends were found right widens by less than 2.48
	// there (seeds 1 to 1500; 1.35 to 1.78 when swapped).
	//
	// The other way round, a leading end that widens by more than
	// gateWedgeGrowth while the trailing end widens as a nose does
	// (between gateNoseGrowth and gateWedgeGrowth, and less than the
	// leading end) is a blunt base or a wedge taken for the nose: the
	// square of the thickness behind a base or a corner grows as much as
	// 16 times (h ∝ d). Seed 5839 (scan seeds from 5001: a 4-digit-modified
	// section of 18 % with its thickness greatest at 60 % and a nose of
	// radius 0.005 c read as a rounded trailing edge) grows 7.5 times
	// behind its leading edge; no section whose ends were found right in
	// that zone grows by more than 4.9 (seeds 1 to 1304).
	gateNoseNear    = 0.005
	gateNoseFar     = 0.02
	gateNoseGrowth  = 2.2
	gateWedgeGrowth = 6.5
	gateThinRatio   = 2
	// A fitted curve is smooth (its spline has continuous curvature), so
	// neighbouring panels of the repanelled section turn by a few degrees
	// at most; a turn beyond gateKinkDeg between gateKinkFrom and
	// gateKinkTo of the chord is a fold of points taken in the wrong
	// order (our choice of limits: the trailing edge may hold a corner,
	// and a sparse rounded end turns by some 50° between panels at 95 %
	// of the chord: campaign seed 60199). Points retaken in the order of
	// a fitted outline (Cleaned.retaken) may keep a spike of points off
	// the section that the first fit looped round and the retaken one
	// follows (seed 2469: 0.045 c high at x = 0.906): their gate reaches
	// up to the trailing edge's own stretch, the last gateKinkTail of the
	// chord or gateKinkEdges times the edge's thickness (a rounded end's
	// diameter, a base's height) when that is longer.
	gateKinkDeg   = 45
	gateKinkFrom  = 0.01
	gateKinkTo    = 0.9
	gateKinkTail  = 0.02
	gateKinkEdges = 4
	// The thickness of a section rises from its nose to its greatest
	// and falls to its trailing edge (every family of the campaign, by
	// its equations), so at every station it is at least the lesser of
	// the greatest thicknesses fore and aft of it. A station where it is
	// less than gatePinch of that, between gatePinchFrom and gatePinchTo
	// of the chord (gatePinchStations even stations), is a surface
	// drawn across to the other and back, a finger of the other
	// surface's points taken into its order, which neither crosses the
	// other nor runs back along the chord (campaign seeds 1116, 1396,
	// 5209: exited 0 with a node 0.03–0.06 c off, the thickness there
	// under 2 % of its neighbours'; no section made right falls below
	// 0.99).
	gatePinch         = 0.5
	gatePinchFrom     = 0.02
	gatePinchTo       = 0.98
	gatePinchStations = 200
)

// GateError reports a section that failed a gate under every way of
// making it that prep tried: which gate, what was seen, where (a file and
// line near the place when there is one), what the user can do, and the
// ways tried.
type GateError struct {
	Gate   string
	Seen   string
	Where  geometry.Origin // zero when no point is named
	Advice string
	Tried  []string
}

func (e *GateError) Error() string {
	var b strings.Builder
	fmt.Fprintf(&b, "the section fails the check %q: %s", e.Gate, e.Seen)
	if e.Where.File != "" {
		fmt.Fprintf(&b, " (near %s)", e.Where)
	}
	if len(e.Tried) > 0 {
		fmt.Fprintf(&b, "; tried %s", strings.Join(e.Tried, ", "))
	}
	if e.Advice != "" {
		b.WriteString("; ")
		b.WriteString(e.Advice)
	}
	return b.String()
}

// nearestOrigin returns the origin of the contour point nearest to p
// (input coordinates).
func nearestOrigin(c *geometry.Contour, p geometry.Point) geometry.Origin {
	best, bd := -1, math.Inf(1)
	for i, q := range c.Points {
		if d := q.Dist(p); d < bd {
			best, bd = i, d
		}
	}
	if best < 0 || best >= len(c.Origins) {
		return geometry.Origin{}
	}
	return c.Origins[best]
}

// checkGates checks the preparation p (normalised, repanelled: nodes with
// the leading edge at node le) against the gates, in order, and returns
// the first failure, nil when all pass.
func (p *Preparation) checkGates(nodes []geometry.Point, le int) *GateError {
	fr := p.Shape.Frame
	toPart := func(q geometry.Point) geometry.Point { return geometry.Point(fr.ToPart(q)) }
	if _, err := section.CheckNodes(nodes); err != nil {
		g := &GateError{Gate: GateCrossing, Seen: fmt.Sprintf("the repanelled section is not usable: %v", err),
			Advice: "the points may be out of order there, or two parts of the outline overlap: look at the points near that place (points --plot), give the measurement noise with --noise to smooth more, or pick another loop with --loop"}
		if i, _, ok := geometry.LoopCrossing(nodes); ok && i < len(nodes) {
			g.Where = nearestOrigin(p.Contour, toPart(nodes[i]))
		}
		return g
	}
	// The chord against the largest extent of the points: a leading or
	// trailing edge found in the wrong place makes the chord short.
	if ext := extent(p.Contour.Points); ext > 0 && math.Abs(fr.Chord-ext) > gateExtent*ext {
		return &GateError{Gate: GateExtent, Seen: fmt.Sprintf("the chord %.5g is %.1f %% off the points' largest extent %.5g", fr.Chord, 100*(fr.Chord-ext)/ext, ext),
			Where:  nearestOrigin(p.Contour, toPart(geometry.Point{X: 1})),
			Advice: "the trailing or leading edge was found in the wrong place: set the leading edge with --le-at X,Y, or check for points beyond the part"}
	}
	// Each surface runs one way: x falls from the trailing edge to the
	// leading edge over the upper surface and rises back over the lower.
	// A surface runs back by how far it returns behind the farthest it
	// had come, over as many panels as it takes: a fold drawn by many
	// short panels turns and runs back a little at each (campaign seed
	// 667: the lower surface runs 0.005 c back over 16 panels at x = 0.54,
	// up to the upper surface and down again, a finger of points of the
	// upper surface taken into the lower one's order).
	reach := nodes[0].X
	for k := 1; k < len(nodes); k++ {
		a, b := nodes[k-1], nodes[k]
		if k == le+1 {
			reach = a.X
		}
		back := b.X - reach // upper: must not rise
		if k > le {
			back = reach - b.X // lower: must not fall
		}
		if k <= le {
			reach = min(reach, b.X)
		} else {
			reach = max(reach, b.X)
		}
		lim := gateBack
		if min(a.X, b.X) < gateNoseCap {
			lim = gateNoseCap // round the nose the surface turns
		}
		if back > lim {
			side := "upper"
			if k > le {
				side = "lower"
			}
			return &GateError{Gate: GateMonotone, Seen: fmt.Sprintf("the %s surface runs back by %.3g chord at x = %.3f", side, back, b.X),
				Where:  nearestOrigin(p.Contour, toPart(b)),
				Advice: "the outline folds there: the points may be out of order, or points of another part lie among them"}
		}
	}
	if a := p.Props.TEAngleDeg; math.IsNaN(a) || a > gateTEAngle && !(a <= gateTEAngleThick && wedgeAft(nodes, le, a)) {
		return &GateError{Gate: GateTEAngle, Seen: fmt.Sprintf("the surfaces meet at %.1f° at the trailing edge", a),
			Where:  nearestOrigin(p.Contour, toPart(geometry.Point{X: 1})),
			Advice: "the trailing edge was probably found in the wrong place: set the leading edge with --le-at X,Y"}
	}
	// No kink away from the trailing edge: a smooth curve repanelled turns
	// little from panel to panel.
	kinkTo := gateKinkTo
	if p.retaken {
		kinkTo = 1 - max(gateKinkTail, gateKinkEdges*p.Shape.TE.Thickness)
	}
	if k, turn, ok := kink(nodes, kinkTo); ok {
		return &GateError{Gate: GateKink, Seen: fmt.Sprintf("the outline turns %.0f° between neighbouring panels at x = %.3f", turn, nodes[k].X),
			Where:  nearestOrigin(p.Contour, toPart(nodes[k])),
			Advice: "the outline folds there: the points may be out of order (surfaces close together at a thin edge, passes that overlap), or points of another part lie among them; look at them (points --plot)"}
	}
	if x, ratio, ok := pinch(nodes, le); ok {
		return &GateError{Gate: GatePinch, Seen: fmt.Sprintf("the section is %.2g %% as thick at x = %.3f as the lesser of its greatest thicknesses fore and aft of there", 100*ratio, x),
			Where:  nearestOrigin(p.Contour, toPart(geometry.Point{X: x})),
			Advice: "one surface is drawn across to the other and back: points of one surface were taken in the order of the other; look at them (points --plot), or give the measurement noise with --noise"}
	}
	// The thin end is aft: a section whose leading and trailing edges were
	// swapped (a sharp corner taken for the nose) is thicker aft.
	if fore, aft := thicknessAt(nodes, le, gateThinFore), thicknessAt(nodes, le, gateThinAft); fore > 0 && aft > fore && !noseFore(nodes, le, fore, aft) {
		return &GateError{Gate: GateThinEnd, Seen: fmt.Sprintf("the section is %.3g chord thick at %.0f %% of the chord and %.3g at %.0f %%: thicker aft than at the nose", fore, 100*gateThinFore, aft, 100*gateThinAft),
			Where:  nearestOrigin(p.Contour, toPart(geometry.Point{X: 1})),
			Advice: "the leading and trailing edges were probably swapped: set the leading edge with --le-at X,Y"}
	}
	if g := noseAft(nodes, le); g != nil {
		g.Where = nearestOrigin(p.Contour, toPart(geometry.Point{X: 1}))
		return g
	}
	if scat := max(p.Clean.Sigma, p.Fit.Scatter, p.Fit.NoiseEstimate); scat > 0 && p.fitDeparts(scat) {
		return &GateError{Gate: GateFit, Seen: fmt.Sprintf("the fitted curve departs from the points by %.3g RMS, %.0f times their scatter %.3g", p.Fit.RMS, p.Fit.RMS/scat, scat),
			Where:  p.Fit.MaxAt,
			Advice: "the points may not lie on one smooth outline in the order found: look at them (points --plot)"}
	}
	return nil
}

// wedgeAft reports whether the normalised section nodes (leading edge at
// node le) grow in thickness from gateWedgeTo to gateWedgeFrom of the
// chord by at least gateWedgeShare of what straight surfaces meeting at
// the trailing-edge angle (degrees) would: a thick section whose wide
// trailing-edge angle is its own.
func wedgeAft(nodes []geometry.Point, le int, angle float64) bool {
	grow := thicknessAt(nodes, le, gateWedgeFrom) - thicknessAt(nodes, le, gateWedgeTo)
	straight := 2 * math.Tan(angle*math.Pi/360) * (gateWedgeTo - gateWedgeFrom)
	return grow >= gateWedgeShare*straight
}

// fitDeparts reports whether the fitted curve departs from the points by
// more than gateFitRMS times their scatter scat (RMS). On the last way
// Prepare tries (Preparation.strict), when the points beyond the fit's
// tolerance are at most gateFitBeyond of them, it judges the rest alone,
// and more strictly: within gateFitRest times their scatter. That is a
// burst of outliers the cleaning kept which the curve does not follow
// and the fit lists (campaign seed 2258: 6 points of 1022, 0.018 c off,
// the rest within 0.90 of their scatter; seed 2575, 0.88); a curve
// drawn out towards a burst departs from the points round it (seed 6915:
// the rest at 4.1 times their scatter, a node 0.02 c off).
func (p *Preparation) fitDeparts(scat float64) bool {
	rep := p.Fit
	if rep.RMS <= gateFitRMS*scat {
		return false
	}
	if !p.strict || !(rep.Tolerance > 0) || len(rep.Beyond) == 0 || float64(len(rep.Beyond)) > gateFitBeyond*float64(len(rep.Residual)) {
		return true
	}
	var ss float64
	var n int
	for _, r := range rep.Residual {
		if math.Abs(r) <= rep.Tolerance {
			ss += r * r
			n++
		}
	}
	return n == 0 || math.Sqrt(ss/float64(n)) > gateFitRest*scat
}

// pinch returns the chord station x of the normalised section nodes
// (leading edge at node le) where the thickness is the least share of
// the lesser of the greatest thicknesses fore and aft of x, and that
// share, when it is less than gatePinch; ok is false when there is none.
func pinch(nodes []geometry.Point, le int) (x, ratio float64, ok bool) {
	xs := make([]float64, gatePinchStations+1)
	ts := make([]float64, gatePinchStations+1)
	for k := range xs {
		xs[k] = gatePinchFrom + (gatePinchTo-gatePinchFrom)*float64(k)/gatePinchStations
		ts[k] = thicknessAt(nodes, le, xs[k])
	}
	aft := make([]float64, len(ts)) // the greatest thickness aft of each station
	for k := len(ts) - 2; k >= 0; k-- {
		aft[k] = max(aft[k+1], ts[k+1])
	}
	fore := 0.0
	ratio = gatePinch
	for k, t := range ts {
		if m := min(fore, aft[k]); t > 0 && m > 0 && t < ratio*m {
			x, ratio, ok = xs[k], t/m, true
		}
		fore = max(fore, t)
	}
	return x, ratio, ok
}

// noseAft returns the failure of the thin-end gate for a section whose
// leading end widens as a rounded or blunt trailing edge, a base or a
// corner does while its trailing end widens as a nose does, where the
// thicknesses near both ends cannot tell them apart (see gateNoseGrowth
// and gateWedgeGrowth); nil otherwise.
func noseAft(nodes []geometry.Point, le int) *GateError {
	fore, aft := thicknessAt(nodes, le, gateThinFore), thicknessAt(nodes, le, gateThinAft)
	if !(aft > 0) || fore >= gateThinRatio*aft {
		return nil
	}
	gLE, gTE := endGrowths(nodes, le)
	if gLE > gateWedgeGrowth && gTE >= gateNoseGrowth && gTE <= gateWedgeGrowth {
		return &GateError{Gate: GateThinEnd,
			Seen:   fmt.Sprintf("the section is %.3g chord thick at %.0f %% of the chord and %.3g at %.0f %%, and from %.1f %% to %.0f %% of the chord behind its leading edge the square of its thickness grows %.2g times, as behind a blunt base or a corner (behind a nose about 4 times), but %.2g times over as much ahead of its trailing edge, as behind a nose", fore, 100*gateThinFore, aft, 100*gateThinAft, 100*gateNoseNear, 100*gateNoseFar, gLE, gTE),
			Advice: "the leading and trailing edges were probably swapped (a small-radius nose taken for a rounded trailing edge): set the leading edge with --le-at X,Y"}
	}
	if !(gLE < gateNoseGrowth) || !(gTE > gLE) {
		return nil
	}
	return &GateError{Gate: GateThinEnd,
		Seen:   fmt.Sprintf("the section is %.3g chord thick at %.0f %% of the chord and %.3g at %.0f %%, and from %.1f %% to %.0f %% of the chord behind its leading edge the square of its thickness grows %.2g times, as ahead of a rounded or blunt trailing edge (behind a nose about 4 times), but %.2g times over as much ahead of its trailing edge", fore, 100*gateThinFore, aft, 100*gateThinAft, 100*gateNoseNear, 100*gateNoseFar, gLE, gTE),
		Advice: "the leading and trailing edges were probably swapped (a rounded trailing edge blunter than the nose): set the leading edge with --le-at X,Y"}
}

// noseFore reports whether a section thicker aft than near its nose
// (thicknesses fore at gateThinFore and aft at gateThinAft) has its
// nose where it was found all the same: where the two differ by less
// than gateThinRatio they cannot tell the ends apart (a thin section
// whose rounded or blunt trailing edge is thicker than the section at
// 5 % of its chord: campaign seeds 505, 609, thin 4-digit and
// 4-digit-modified sections rounded to 0.4–1 % of the chord), and the
// ends' own forms decide, as in noseAft: the leading end widens as a
// nose does (by at least gateNoseGrowth, at most gateWedgeGrowth, in
// the square of its thickness) and more than the trailing end, which
// widens as a rounded or blunt end does (by less than gateNoseGrowth).
func noseFore(nodes []geometry.Point, le int, fore, aft float64) bool {
	gLE, gTE := endGrowths(nodes, le)
	if !(fore > 0) || aft >= gateThinRatio*fore {
		return false
	}
	return gLE >= gateNoseGrowth && gLE <= gateWedgeGrowth && gTE < gateNoseGrowth && gLE > gTE
}

// endsUnsupported returns the failure of the thin-end gate for a section
// whose ends its own accuracy cannot tell apart, where the thin-end gate
// passed it on its ends' forms alone (noseFore, noseAft):
//
//   - thicker aft than at the nose, it passed because its leading end
//     widens as a nose does (noseFore); but where the thickness
//     gateNoseNear behind the leading edge, on which that growth rests,
//     is itself within twice shape (chord units: the bound on the curve's
//     own shape, accuracy.Uncertainty.Shape, which each surface may be off
//     by) of nothing, the growth says nothing, and the thicknesses, which
//     say the ends are swapped, differ by no more than that error either;
//   - less than 2·gateThinRatio times as thick at the nose as aft, its
//     leading end widens less than a nose does and less than its trailing
//     end (noseAft's rule, which reads the forms only under gateThinRatio):
//     a rounded trailing edge blunter than the nose taken for it, with a
//     nose so fine it reads as a corner.
//
// Either section could as well be the true one turned end for end, its
// twist off by 180° (campaign seeds 2282 and 458: 5 % and 3 % sections
// with a rounded trailing edge, noise of 0.2 % of the chord or a nose of
// radius 0.0005 c, exited 0 turned round with twist bounds of about 1°).
// nil otherwise.
func endsUnsupported(nodes []geometry.Point, le int, shape float64) *GateError {
	fore, aft := thicknessAt(nodes, le, gateThinFore), thicknessAt(nodes, le, gateThinAft)
	if !(fore > 0) || !(aft > 0) {
		return nil
	}
	advice := "set the leading edge with --le-at X,Y; points measured closer together, or with less noise, round both ends decide it"
	err := 2 * shape
	if near := thicknessAt(nodes, le, gateNoseNear); aft > fore && shape > 0 && aft-fore <= err && !(near > err) {
		return &GateError{Gate: GateThinEnd,
			Seen:   fmt.Sprintf("the section is %.3g chord thick at %.0f %% of the chord and %.3g at %.0f %%, thicker aft, and %.3g at %.1f %%, on which the nose's form rests: each within the %.3g chord its own accuracy leaves a thickness, so the points do not say which end is the nose", fore, 100*gateThinFore, aft, 100*gateThinAft, near, 100*gateNoseNear, err),
			Advice: advice}
	}
	if fore >= aft && fore < 2*gateThinRatio*aft {
		if gLE, gTE := endGrowths(nodes, le); gLE < gateNoseGrowth && gTE > gLE {
			return &GateError{Gate: GateThinEnd,
				Seen:   fmt.Sprintf("the section is %.3g chord thick at %.0f %% of the chord and %.3g at %.0f %%, and from %.1f %% to %.0f %% of the chord behind its leading edge the square of its thickness grows %.2g times, as ahead of a rounded or blunt trailing edge (behind a nose about 4 times), but %.2g times over as much ahead of its trailing edge", fore, 100*gateThinFore, aft, 100*gateThinAft, 100*gateNoseNear, 100*gateNoseFar, gLE, gTE),
				Advice: "the leading and trailing edges were probably swapped (a rounded trailing edge blunter than a fine nose): " + advice}
		}
	}
	return nil
}

// endGrowths returns how many times the square of the section's
// thickness grows from gateNoseNear to gateNoseFar of the chord behind
// its leading edge (gLE) and ahead of its trailing edge (gTE); NaN where
// a thickness is not positive.
func endGrowths(nodes []geometry.Point, le int) (gLE, gTE float64) {
	growth := func(near, far float64) float64 {
		a, b := thicknessAt(nodes, le, near), thicknessAt(nodes, le, far)
		if !(a > 0) || !(b > 0) {
			return math.NaN()
		}
		return (b / a) * (b / a)
	}
	return growth(gateNoseNear, gateNoseFar), growth(1-gateNoseNear, 1-gateNoseFar)
}

// kink returns the first node k of the normalised section nodes where
// the outline turns by more than gateKinkDeg degrees between neighbouring
// panels (the turn is returned), between gateKinkFrom and kinkTo of the
// chord; ok is false when there is none.
func kink(nodes []geometry.Point, kinkTo float64) (k int, turn float64, ok bool) {
	for k := 1; k+1 < len(nodes); k++ {
		a, b, c := nodes[k-1], nodes[k], nodes[k+1]
		if b.X <= gateKinkFrom || b.X >= kinkTo {
			continue
		}
		u, v := b.Sub(a), c.Sub(b)
		turn := math.Abs(math.Atan2(u.X*v.Y-u.Y*v.X, u.X*v.X+u.Y*v.Y)) * 180 / math.Pi
		if turn > gateKinkDeg {
			return k, turn, true
		}
	}
	return 0, 0, false
}

// thicknessAt returns the distance across the section at chord station
// x, perpendicular to the chord line: the upper surface (nodes 0..le) less
// the lower (le..end), each interpolated linearly at x; 0 when either
// surface does not reach x.
func thicknessAt(nodes []geometry.Point, le int, x float64) float64 {
	at := func(ps []geometry.Point) (float64, bool) {
		for k := 1; k < len(ps); k++ {
			a, b := ps[k-1], ps[k]
			if (a.X-x)*(b.X-x) <= 0 && a.X != b.X {
				return a.Y + (b.Y-a.Y)*(x-a.X)/(b.X-a.X), true
			}
		}
		return 0, false
	}
	if le <= 0 || le >= len(nodes)-1 {
		return 0
	}
	yu, okU := at(nodes[:le+1])
	yl, okL := at(nodes[le:])
	if !okU || !okL {
		return 0
	}
	return yu - yl
}

// spanGate is the failure of a section whose surfaces do not both run
// from the leading edge to the trailing edge (props.ErrNotNormalized):
// the loop was cut open in the wrong place, so one surface ends short.
// It names the point nearest to the end that falls short.
func spanGate(p *Preparation, err error) *GateError {
	g := &GateError{Gate: GateSpan, Seen: "the outline found does not run from the trailing edge round the nose and back (" + strings.TrimPrefix(err.Error(), "geometry: ") + ")",
		Advice: spanAdvice}
	if path := p.Shape.Path; path != nil && path.Length() > 0 {
		fr := p.Shape.Frame
		a, b := path.At(0), path.At(path.Length())
		end := a
		if b.X < a.X {
			end = b
		}
		g.Where = nearestOrigin(p.Contour, geometry.Point(fr.ToPart(end)))
	}
	return g
}

// spanAdvice is what the user can do about a section that fails the gate
// "surfaces span the chord".
const spanAdvice = "the loop was cut open in the wrong place, often where one surface is sampled far more densely than the other or two passes meet: set the leading edge with --le-at X,Y, or look at the points (points --plot)"

// endGate is the failure of a section whose leading edge, as found, lies
// at or next to an end of the outline, so that one surface is missing or
// too short to hold its panels (the repanelling's repanel.ErrPath): the
// loop was cut open in the wrong place, and what is left is no section.
// It is the gate "surfaces span the chord", saying how long each surface
// is and naming the point nearest to the short surface's end, so that the
// other ways of making the section are tried and, when all fail, the user
// reads what was seen rather than the repanelling's arc lengths.
func endGate(p *Preparation) *GateError {
	g := &GateError{Gate: GateSpan, Advice: spanAdvice}
	path := p.Shape.Path
	L, sLE := path.Length(), p.Shape.SLE
	if !(L > 0) || math.IsInf(L, 0) {
		g.Seen = "the outline found has no length to panel"
		return g
	}
	up := 100 * min(max(sLE/L, 0), 1)
	g.Seen = fmt.Sprintf("the outline found does not run from the trailing edge round the nose and back (its leading edge lies at or next to an end: the upper surface is %.3g %% of its length, the lower %.3g %%, too short a surface to panel)", up, 100-up)
	end := path.At(0)
	if up > 50 {
		end = path.At(L)
	}
	g.Where = nearestOrigin(p.Contour, geometry.Point(p.Shape.Frame.ToPart(end)))
	return g
}

// extent returns the largest distance between two points of pts, found by
// farthest-point sweeps (exact for the ends of an elongated body).
func extent(pts []geometry.Point) float64 {
	if len(pts) < 2 {
		return 0
	}
	var c geometry.Point
	for _, p := range pts {
		c = c.Add(p)
	}
	c = c.Scale(1 / float64(len(pts)))
	far := func(from geometry.Point) (geometry.Point, float64) {
		best, bd := pts[0], -1.0
		for _, p := range pts {
			if d := p.Dist(from); d > bd {
				best, bd = p, d
			}
		}
		return best, bd
	}
	a, _ := far(c)
	b, d := far(a)
	for range 4 {
		a2, d2 := far(b)
		if d2 <= d {
			break
		}
		a, b, d = b, a2, d2
	}
	_ = a
	return d
}

// orderings returns the orderings of the points to try after the one
// clean chose (strategy), in turn.
func orderings(strategy string) []string {
	switch strategy {
	case clean.OrderSection:
		return []string{clean.OrderLinked, clean.OrderBand, clean.OrderFile}
	case clean.OrderLinked:
		return []string{clean.OrderSection, clean.OrderFile}
	case clean.OrderFile:
		return []string{clean.OrderSection}
	case clean.OrderBand:
		return []string{clean.OrderSection, clean.OrderLinked, clean.OrderFile}
	}
	return nil
}
