package prep

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/accuracy"
	"github.com/foilwright/foilwright/geometry/clean"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/frame"
	"github.com/foilwright/foilwright/geometry/planar"
	"github.com/foilwright/foilwright/geometry/pointfile"
	"github.com/foilwright/foilwright/geometry/props"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/internal/digest"
	"github.com/foilwright/foilwright/repanel"
)

// ErrNoUnits means neither the user nor the file said what unit the
// coordinates are in; foilwright never guesses. The edges (a flag, a
// pipeline key) say how to give it.
var ErrNoUnits = errors.New("the file does not say its length unit (mm, in, m or chord)")

// ErrNoiseTooLarge means the expected noise given is not small beside the
// section itself.
var ErrNoiseTooLarge = errors.New("the noise figure is not small beside the section")

// maxNoiseFraction is the largest expected noise accepted, as a fraction of
// the contour's bounding-box diagonal (a noise of 5 % of the part's size
// would smooth the section away).
const maxNoiseFraction = 0.05

// Preparation is everything the geometry chain made of one section: the
// section document and the intermediate results a report or a plot needs.
type Preparation struct {
	Section  *section.Section
	Clouds   []*geometry.Cloud // as read, one per file
	Flatness *planar.Flatness  // set when the points were 3D
	Clean    *clean.Report     // merging, ordering, outliers, loops
	Contour  *geometry.Contour // the kept points, in order, input coordinates (plane coordinates for 3D input)
	Curve    *curve.Curve      // the fitted curve, same coordinates as Contour
	Fit      *curve.FitReport
	Shape    *frame.Normalized // the normalised curve, chord units
	Props    *props.SectionProperties
	Camber   *props.CamberLine
	Quality  repanel.Quality
	// Uncertainty is the section's statement of its own accuracy.
	Uncertainty accuracy.Uncertainty
	// retaken is set when the contour's points were retaken in the order
	// of a fitted outline (Cleaned.retaken): its kink gate reaches up to
	// the trailing edge's own stretch.
	retaken bool
	// strict is set on the last way Prepare tries (strictOutliers): its
	// fit gate leaves out a few points far beyond the fit's tolerance
	// (fitRMS).
	strict bool
}

// Cleaned is what the first half of the geometry chain made of a
// section's files: the clouds read, the flatness of 3D points and their
// plane, and the clean, ordered contour with its report.
type Cleaned struct {
	Clouds   []*geometry.Cloud
	Flatness *planar.Flatness
	Plane    *geometry.Plane // the plane of 3D points; nil for 2D input
	Clean    *clean.Report
	Contour  *geometry.Contour
	Units    geometry.Unit
	Files    []string        // display names
	SHA256   []string        // hex digests of the files' bytes
	Read     int             // points read from all files
	cloud    *geometry.Cloud // the planar cloud cleaned
	alongFit bool            // the contour was retaken in the order of a fitted outline
	strict   bool            // cleaned at strictSigma, the last way Prepare tries
	moved    bool            // the points are ball centres moved toward the part (probe.go)
}

// ReadAndClean runs the first half of the geometry chain on the files of
// one section: read, flatten 3D points onto their plane, merge duplicates,
// order into loops, pick the section loop and drop gross outliers.
func ReadAndClean(files []File, s Settings) (*Cleaned, error) {
	if len(files) == 0 {
		return nil, errors.New("no input files")
	}
	ro, err := readOptions(s)
	if err != nil {
		return nil, err
	}
	out := &Cleaned{}
	var all geometry.Cloud
	for _, f := range files {
		c, err := pointfile.Read(bytes.NewReader(f.Data), f.Path, ro)
		if err != nil {
			return nil, err
		}
		if c.Units == "" {
			return nil, fmt.Errorf("%s: %w", f.Path, ErrNoUnits)
		}
		if all.Units != "" && c.Units != all.Units {
			return nil, fmt.Errorf("%s: units %s differ from %s of %s", f.Path, c.Units, all.Units, out.Files[0])
		}
		out.Clouds = append(out.Clouds, c)
		sum := f.SHA256
		if sum == "" {
			sum = digest.Bytes(f.Data)
		}
		out.Files = append(out.Files, f.Path)
		out.SHA256 = append(out.SHA256, sum)
		mergeCloud(&all, c)
	}
	cloud := &all
	if len(out.Clouds) == 1 {
		cloud = out.Clouds[0]
	}
	out.Read, out.Units = cloud.Len(), cloud.Units
	where := strings.Join(out.Files, ", ")

	if cloud.Dim == 3 {
		fo := planar.FlattenOptions{Plane: ro.Cut}
		if s.Band != nil {
			fo.Band = *s.Band
		}
		if s.FlatTol != nil {
			fo.Tolerance = *s.FlatTol
		}
		flat, fl, err := planar.Flatten(cloud, fo)
		if err != nil {
			return nil, fmt.Errorf("%s: %w%s", where, err, columnsHint(out.Clouds))
		}
		cloud, out.Flatness, out.Plane = flat, &fl, &fl.Plane
	}

	out.cloud = cloud
	if err := out.clean(s, ""); err != nil {
		return nil, err
	}
	return out, nil
}

// clean cleans the (planar) cloud read into the contour, by the ordering
// named (clean.Options.Order; "" tries them in turn).
func (c *Cleaned) clean(s Settings, order string) error {
	co := clean.Options{Order: order}
	if s.MergeTol != nil {
		co.MergeTol = *s.MergeTol
	}
	if s.OutlierSigma != nil {
		co.OutlierSigma = *s.OutlierSigma
	}
	if s.KeepOutliers != nil {
		co.KeepOutliers = *s.KeepOutliers
	}
	if s.Loop != nil {
		co.Loop = *s.Loop
	}
	if r, err := probeRadius(s, c.Units); err == nil && r > 0 && !c.moved {
		// ball centres: the path rounds the end and a base's corners
		// at the radius or more (probe.go)
		// ball centres, and the points moved from them: the path rounds
		// the end and a base's corners at the radius or more (probe.go)
		co.EndSpare = probeEndSpare * r
	}
	contour, rep, err := clean.Clean(c.cloud, co)
	if err != nil {
		return fmt.Errorf("%s: %w%s", strings.Join(c.Files, ", "), err, columnsHint(c.Clouds))
	}
	c.Contour, c.Clean = contour, rep
	return nil
}

// Prepare runs the whole geometry chain on the files of one section:
// ReadAndClean, then fit, locate the edges and normalise, repanel, and
// compute the properties. Every error comes from the data or the settings
// and names the file where there is one.
//
// Gates. The section must pass every gate of checkGates (no
// self-crossing, chord within the points' extent, surfaces monotone along
// the chord, a plausible trailing-edge angle, a fit within the points'
// scatter). When it fails one, or the edges cannot be located, the chain
// tries again with the other orderings of the points (orderings), then
// with the fit finding the trailing edge on its own, then with the points
// retaken along a fitted outline (retaken), and last with the points
// cleaned at a stricter outlier threshold (strictOutliers); the first way
// that passes wins, and its record says which (the clean report's
// Strategy, and a warning).
// When none does, Prepare returns the first failure as a *GateError.
//
// With a probe radius set, the points are ball centres: a closed curve is
// fitted to the path the ball took, and the chain runs on the points moved
// the radius toward the part (probe.go).
func Prepare(name string, files []File, s Settings) (*Preparation, error) {
	if _, err := probeRadius(s, geometry.Millimetre); err != nil {
		return nil, err // before the reading: a setting wrong for any input
	}
	cl, err := ReadAndClean(files, s)
	if err != nil {
		return nil, err
	}
	r, err := probeRadius(s, cl.Units)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", strings.Join(cl.Files, ", "), err)
	}
	if r > 0 {
		return compensate(name, cl, s, r)
	}
	return prepareCleaned(name, cl, s)
}

// prepareCleaned runs the chain on from a cleaned contour, through every
// way of ordering and of finding the trailing edge until one passes the
// gates (Prepare).
func prepareCleaned(name string, cl *Cleaned, s Settings) (*Preparation, error) {
	p, first := finishChain(name, cl, s, true)
	if first == nil {
		return p, nil
	}
	var ge *GateError
	if !errors.As(first, &ge) {
		return nil, first
	}
	tried := []string{cl.Clean.Strategy + " order"}
	for _, order := range orderings(cl.Clean.Strategy) {
		alt := *cl
		if alt.clean(s, order) != nil {
			continue
		}
		tried = append(tried, order+" order")
		if p, err := finishChain(name, &alt, s, true); err == nil {
			p.Section.Warnings = append(p.Section.Warnings, fmt.Sprintf("the %s order of the points failed the check %q (%s); the %s order passed", cl.Clean.Strategy, ge.Gate, ge.Seen, order))
			return p, nil
		}
	}
	if cl.Clean.Edge != nil {
		tried = append(tried, "the fit's own trailing edge")
		if p, err := finishChain(name, cl, s, false); err == nil {
			p.Section.Warnings = append(p.Section.Warnings, fmt.Sprintf("the trailing edge found on the points failed the check %q (%s); the fit's own passed", ge.Gate, ge.Seen))
			return p, nil
		}
	}
	// retakenWay finishes the chain on points retaken in the order of the
	// outline fitted to them (alt, nil when there is none), the way named
	// by what; nil when it fails a check or leaves runs beyond the fit.
	retakenWay := func(alt *Cleaned, what string) *Preparation {
		if alt == nil {
			return nil
		}
		tried = append(tried, what)
		p, err := finishChain(name, alt, s, true)
		if err != nil || beyondInRuns(p.Fit) {
			return nil
		}
		p.Section.Warnings = append(p.Section.Warnings, fmt.Sprintf("the %s order of the points failed the check %q (%s); the points retaken in the order of the outline fitted to them, its folds cut out, passed", cl.Clean.Strategy, ge.Gate, ge.Seen))
		return p
	}
	if p := retakenWay(cl.retaken(s), "the points retaken along the fitted outline"); p != nil {
		return p, nil
	}
	if p := cl.strictOutliers(name, s, ge, &tried); p != nil {
		return p, nil
	}
	if p := retakenWay(cl.retakenPointwise(s), "the points retaken one by one along the fitted outline"); p != nil {
		return p, nil
	}
	ge.Tried = tried
	return nil, fmt.Errorf("%s: %w", strings.Join(cl.Files, ", "), ge)
}

// strictSigma is the outlier threshold, in robust sigmas of the local
// fit, of the last way Prepare tries: our choice, between the default
// (clean.DefaultOutlierSigma, 6) and 3, which on the robustness
// campaign's failures mended more sections but made some wrong (seeds
// 121 and 1206 of 1–3000).
const strictSigma = 4

// strictOutliers runs the chain again on the points cleaned with the
// stricter outlier threshold strictSigma, when the user set neither the
// threshold nor --keep-outliers: in the order the cleaning picks, with
// the fit placing the trailing edge on its own, then in the other
// orderings, as Prepare does at the default threshold. It returns the
// first preparation that passes every gate, warned of as the way that
// passed, or nil; it adds the ways to tried.
//
// A burst of outliers beside a surface probed several times more coarsely
// than the rest can outnumber that surface's own points in a local fit:
// at the default threshold some of the burst stays in, the fitted outline
// bends out to it and fails a gate (self-crossing, a fold, a thick end
// where the section is thin). The stricter threshold drops them; it may
// drop a few good points as well, which the gates, the fit's report and
// the stated bounds then judge as for any other section. A burst that
// stays in even so, as a tight cluster its own local fits follow, but
// lies far off the curve fitted to the rest, is listed by the fit as
// beyond its tolerance and left out of its gate (fitRMS).
func (cl *Cleaned) strictOutliers(name string, s Settings, ge *GateError, tried *[]string) *Preparation {
	if s.OutlierSigma != nil || (s.KeepOutliers != nil && *s.KeepOutliers) {
		return nil
	}
	if ge.Gate == GateFit {
		// The first way failed only the fit gate: its points again, with
		// the burst the fit lists left out of that gate.
		first := *cl
		first.strict = true
		*tried = append(*tried, "the points beyond the fit's tolerance left out of its check")
		if p, err := finishChain(name, &first, s, true); err == nil {
			p.Section.Warnings = append(p.Section.Warnings, fmt.Sprintf("the %s order of the points failed the check %q (%s) by %d point(s) far off the fitted curve (listed above); without them it passes", cl.Clean.Strategy, ge.Gate, ge.Seen, len(p.Fit.Beyond)))
			return p
		}
	}
	st := s
	sigma := float64(strictSigma)
	st.OutlierSigma = &sigma
	alt := *cl
	alt.strict = true
	if alt.clean(st, "") != nil {
		return nil
	}
	way := fmt.Sprintf("outliers dropped beyond %g robust sigmas", sigma)
	*tried = append(*tried, way)
	passed := func(p *Preparation, how string) *Preparation {
		p.Section.Warnings = append(p.Section.Warnings, fmt.Sprintf("the %s order of the points failed the check %q (%s); with outliers dropped beyond %g robust sigmas of the local fit rather than %g, %s passed: look at the points dropped (points --plot), or set --outlier-sigma", cl.Clean.Strategy, ge.Gate, ge.Seen, sigma, float64(clean.DefaultOutlierSigma), how))
		return p
	}
	if p, err := finishChain(name, &alt, st, true); err == nil {
		return passed(p, "the "+alt.Clean.Strategy+" order")
	}
	if alt.Clean.Edge != nil {
		if p, err := finishChain(name, &alt, st, false); err == nil {
			return passed(p, "the "+alt.Clean.Strategy+" order with the fit's own trailing edge")
		}
	}
	for _, order := range orderings(alt.Clean.Strategy) {
		o := alt
		if o.clean(st, order) != nil {
			continue
		}
		if p, err := finishChain(name, &o, st, true); err == nil {
			return passed(p, "the "+order+" order")
		}
	}
	return nil
}

// finishChain runs the rest of the chain on a cleaned contour: fit (with
// the trailing edge found on the points when useEdge), normalise, repanel,
// the gates, the properties and the document. A failure to locate the
// edges or to pass a gate is a *GateError.
func finishChain(name string, cl *Cleaned, s Settings, useEdge bool) (*Preparation, error) {
	p := &Preparation{Clouds: cl.Clouds, Flatness: cl.Flatness, Clean: cl.Clean, Contour: cl.Contour, retaken: cl.alongFit, strict: cl.strict}
	where := strings.Join(cl.Files, ", ")
	if err := p.fit(cl, s, useEdge); err != nil {
		return nil, err
	}
	eo, err := edgeOptions(s, cl.Units)
	if err != nil {
		return nil, err
	}
	// The ends of a base the points show are a blunt edge's, whichever
	// way the base leans.
	eo.Base = useEdge && cl.Clean.Edge != nil && cl.Clean.Edge.Kind == clean.EdgeBlunt
	// The section's uncertainty (its replicas refitted and normalised)
	// needs only the curve and the fit for its fits, which a second core
	// begins while this one normalises the section; the shape for the
	// rest. Whatever way the chain leaves, the estimate's goroutine stops
	// (after Wait it has ended already).
	acc := accuracy.Begin(p.Curve, p.Fit, accuracy.Options{Edges: eo})
	defer acc.Stop()
	no := eo
	no.Support = p.Fit.S // the mirror decision reads only the measured nose
	no.Noise = p.Fit.NoiseEstimate
	if p.Shape, err = frame.Normalize(p.Curve, no); err != nil {
		if errors.Is(err, frame.ErrNoLeadingEdge) {
			return nil, &GateError{Gate: GateEdges, Seen: strings.TrimPrefix(err.Error(), "geometry: ")}
		}
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	// The estimate is finished on the second core while this one
	// repanels and checks the gates, and given up when they fail.
	acc.Finish(p.Shape)
	rp := panelOptions(s)
	nodes, le, dev, err := p.shaped(rp, s, where)
	if err != nil {
		if errors.Is(err, repanel.ErrPath) {
			// A surface the repanelling cannot place its nodes on: the
			// loop was cut open in the wrong place. A gate, so that the
			// other ways are tried.
			return nil, endGate(p)
		}
		return nil, err
	}
	p.Uncertainty = acc.Wait()
	if useEdge {
		widenForEdge(&p.Uncertainty, cl.Clean.Edge)
	} else {
		widenForRejectedEdge(&p.Uncertainty, cl.Clean.Edge, p.Shape.Frame)
	}
	widenForPasses(&p.Uncertainty, cl.Clean.Passes, p.Shape.Frame.Chord)
	widenForReseat(&p.Uncertainty, cl.Clean.Reseat)
	if s.LEAt == nil {
		// Which end is the nose, read against the section's own bound.
		if g := endsUnsupported(nodes, le, p.Uncertainty.Shape); g != nil {
			g.Where = nearestOrigin(p.Contour, geometry.Point(p.Shape.Frame.ToPart(geometry.Point{X: 1})))
			return nil, g
		}
	}
	var edgeWarning string
	if c := p.Shape.Frame.Chord; p.Uncertainty.Chord > wideChord*c {
		// The replicas' share of the chord's bound is the noise's, a few
		// hundredths of it; a bound this wide comes from the ends the
		// points leave open at the trailing edge, and the user should
		// know what would close them.
		edgeWarning = fmt.Sprintf("the chord is known to ± %s (%.2g %% of it): the points leave open where the section ends aft (surfaces that may run on unseen beyond the last points to a base or a corner, or ends the points fit alike); points measured at and on the trailing edge narrow it", LengthText(p.Uncertainty.Chord, cl.Units), 100*p.Uncertainty.Chord/c)
	}
	p.Section = p.document(name, cl, nodes, le, rp.Spacing)
	if edgeWarning != "" {
		p.Section.Warnings = append(p.Section.Warnings, edgeWarning)
	}
	if useEdge {
		if w := edgeKindWarning(cl.Clean.Edge, p.Section.TrailingEdge.Kind); w != "" {
			p.Section.Warnings = append(p.Section.Warnings, w)
		}
	}
	p.Section.Warnings = append(p.Section.Warnings, passWarnings(cl.Clean.Passes, cl.Units)...)
	if w := reseatWarning(cl.Clean.Reseat, cl.Units); w != "" {
		p.Section.Warnings = append(p.Section.Warnings, w)
	}
	p.Section.Warnings = append(p.Section.Warnings, accuracy.Gaps(p.Contour, p.Fit, p.Curve, p.Shape)...)
	p.Section.Panels.Deviation = dev
	if rp.Panels == 0 {
		p.Section.Panels.Target = rp.Tolerance
		if p.Section.Panels.Target == 0 {
			p.Section.Panels.Target = repanel.DefaultTolerance
		}
		if dev > p.Section.Panels.Target {
			p.Section.Warnings = append(p.Section.Warnings, fmt.Sprintf("%d panels, the most an automatic count takes, deviate from the curve by %.3g c, more than the %.3g c asked for", len(nodes)-1, dev, p.Section.Panels.Target))
		}
	}
	return p, nil
}

// retaken returns a copy of cl whose contour holds the same points in
// the order of their feet on the outline fitted to them, with every loop
// of that outline cut out (reorder.go), nil when no outline could be
// fitted and repanelled to order them by, or when the points were not
// ordered as a band (their positions along the loop measured on a
// curve, Contour.Along): those pointwise retakenPointwise takes.
func (cl *Cleaned) retaken(s Settings) *Cleaned {
	if cl.Contour.Along == nil {
		// Points taken one by one in the wrong order are no band whose
		// positions along the loop were measured on a curve that folded:
		// what makes their fit fold is more often points off the
		// section, which a retaken order keeps as a bulge.
		return nil
	}
	return cl.retake(s)
}

// retakenPointwise is retaken for points ordered one by one (no
// Contour.Along), nil for a band. Where the noise is as large as the
// spacing (a scan crowded at a thin nose), the order linked point to
// point zigzags along the surface and the fit follows the zigzag into
// folds; the outline fitted to the points, its folds cut out, orders
// them by their feet. Prepare tries it last, after the stricter outlier
// threshold, so that points off the section are dropped first where
// they can be, and, as for a band, a fit that then leaves a run of points
// beyond its tolerance (beyondInRuns, a bulge the retaken order kept)
// does not pass.
func (cl *Cleaned) retakenPointwise(s Settings) *Cleaned {
	if cl.Contour.Along != nil {
		return nil
	}
	return cl.retake(s)
}

// retake returns a copy of cl retaken in the order of the outline fitted
// to its points (retaken), nil when none could be fitted and repanelled.
func (cl *Cleaned) retake(s Settings) *Cleaned {
	p := &Preparation{Clouds: cl.Clouds, Flatness: cl.Flatness, Clean: cl.Clean, Contour: cl.Contour}
	if p.fit(cl, s, true) != nil {
		return nil
	}
	eo, err := edgeOptions(s, cl.Units)
	if err != nil {
		return nil
	}
	if p.Shape, err = frame.Normalize(p.Curve, eo); err != nil {
		return nil
	}
	nodes, _, _, err := p.repanel(panelOptions(s))
	if err != nil {
		return nil
	}
	fr := p.Shape.Frame
	for i, q := range nodes {
		nodes[i] = geometry.Point(fr.ToPart(q))
	}
	ring := untangled(nodes)
	if ring == nil {
		return nil
	}
	c := alongOutline(cl.Contour, ring, p.Curve.Start())
	if c == nil {
		return nil
	}
	alt := *cl
	alt.Contour, alt.alongFit = c, true
	return &alt
}

// shaped repanels the normalised section, computes its properties and
// checks the gates, and sets the repanelled nodes' quality: it returns
// the nodes, the index of the leading-edge node and the panels' deviation
// from the curve.
func (p *Preparation) shaped(rp repanel.Options, s Settings, where string) ([]geometry.Point, int, float64, error) {
	nodes, le, dev, err := p.repanel(rp)
	if err != nil {
		return nil, 0, 0, err
	}
	// The noise of the points widens the arc of the leading-edge circle so
	// that noise left in the curve does not upset the radius (0 for exact
	// points, which are interpolated).
	po := props.Options{Thickness: s.ThicknessMode, Camber: s.CamberMode, Noise: p.Fit.NoiseEstimate / p.Shape.Frame.Chord}
	if _, err := section.CheckNodes(nodes); err == nil {
		if p.Props, p.Camber, err = props.Compute(p.Shape.Path, p.Shape.SLE, po); err != nil {
			if errors.Is(err, props.ErrNotNormalized) {
				// The section found does not span the chord from its
				// leading edge to both ends: a gate, so that the other
				// ways are tried.
				return nil, 0, 0, spanGate(p, err)
			}
			return nil, 0, 0, fmt.Errorf("%s: %w", where, err)
		}
	}
	if g := p.checkGates(nodes, le); g != nil {
		return nil, 0, 0, g
	}
	p.Quality = repanel.Measure(nodes)
	return nodes, le, dev, nil
}

// beyondInRuns reports whether two or more neighbouring points (in
// contour order) lie farther from the fitted curve than its tolerance: a
// cluster the curve neither follows nor leaves out, as a spike of points
// off the section is after a retaken order made the fit bulge towards it
// (campaign seed 60175: 0.034 c at mid-chord) instead of looping round
// it. Lone points beyond the tolerance are outliers the fit lists.
func beyondInRuns(rep *curve.FitReport) bool {
	if rep == nil || !(rep.Tolerance > 0) {
		return false
	}
	run := 0
	for _, r := range rep.Residual {
		if math.Abs(r) > rep.Tolerance {
			if run++; run >= 2 {
				return true
			}
		} else {
			run = 0
		}
	}
	return false
}

// fit fits the smoothing spline to the cleaned contour, with the noise and
// tolerance the settings give.
func (p *Preparation) fit(cl *Cleaned, s Settings, useEdge bool) error {
	fo, err := fitOptions(cl, s)
	if err != nil {
		return err
	}
	if useEdge {
		fo.Edge = fitEdge(cl.Clean.Edge)
	}
	cv, rep, err := curve.Fit(cl.Contour, fo)
	return p.finishFit(cl, s, cv, rep, err)
}

// fitOptions returns the fit's options of the settings: the noise given
// (or a band's, or exact points), and the tolerance for listing points.
func fitOptions(cl *Cleaned, s Settings) (curve.FitOptions, error) {
	var fo curve.FitOptions
	switch {
	case s.Noise == nil:
		if cl.Clean.Band && cl.Clean.Sigma > 0 {
			// A band: its points scatter about the curve by the robust
			// scale the cleaning measured across it, a noise known well
			// enough to set the smoothing by; cross-validation on a band
			// leaves the curve looping through it.
			fo.Noise = cl.Clean.Sigma
		}
	case *s.Noise == 0:
		fo.Exact = true
	default:
		if diag := contourDiagonal(cl.Contour); *s.Noise > maxNoiseFraction*diag {
			return fo, fmt.Errorf("noise %g %s: %w (the points span %.4g %s)", *s.Noise, cl.Units, ErrNoiseTooLarge, diag, cl.Units)
		}
		fo.Noise = *s.Noise
	}
	if s.FitTol != nil {
		fo.Tolerance = *s.FitTol
	}
	return fo, nil
}

// finishFit checks the fit's outcome and keeps the curve.
func (p *Preparation) finishFit(cl *Cleaned, s Settings, cv *curve.Curve, rep *curve.FitReport, err error) error {
	if err != nil {
		if !errors.Is(err, geometry.ErrTooFewPoints) && !errors.Is(err, geometry.ErrNonFinite) && !errors.Is(err, geometry.ErrCollinear) {
			// The points passed the fit's checks but its equations could
			// not be solved in this order (points that double back on
			// themselves, as a stair-stepped scan's can): a gate, so that
			// the other ways are tried.
			return &GateError{Gate: GateFit, Seen: "the smoothing fit could not be solved (" + strings.TrimPrefix(err.Error(), "geometry: ") + ")",
				Advice: "the points may double back along the outline (stair-stepped or rounded coordinates, two passes apart): give the measurement noise with --noise, or look at them (points --plot)"}
		}
		return fmt.Errorf("%s: %w", strings.Join(cl.Files, ", "), err)
	}
	if s.Noise != nil && *s.Noise > 0 && rep.BinNoise > 0 {
		// The user's figure was per point; the bins it was divided down
		// for scatter more than that (curve.FitReport.BinNoise), and the
		// fit smoothed for what they show. Say so rather than let the
		// setting pass as used.
		rep.Warnings = append(rep.Warnings, fmt.Sprintf("the noise given (%s a point) was not used as is: the %d points were fitted in bins of neighbours, which scatter by %s, more than that noise averaged over a bin; the fit smoothed for the bins' own scatter",
			LengthText(*s.Noise, cl.Units), cl.Contour.Len(), LengthText(rep.BinNoise, cl.Units)))
	}
	p.Curve, p.Fit = cv, rep
	return nil
}

// wideChord is the share of the chord beyond which the chord's bound is
// warned of: our choice, five times the chord error the robustness
// campaign holds well-sampled scans to (0.1 %).
const wideChord = 0.005

// widenForEdge widens the chord's bound to the spread of the trailing
// edges that the points cannot tell apart (clean.Edge.Spread): the end of
// a section may be an unsampled sharp corner or a base through the last
// points, and the chord is one or the other; the bound says so rather
// than resting on the one chosen. Those ends' trailing-edge points also
// lie at different heights across the chord (the tip of an arc and the
// midpoint of a base through the same last points, on a cambered end),
// and the chord line turns with the one chosen: the twist's bound is at
// least that height over the chord (clean.Edge.SpreadAcross), and the
// surface's at least how far their outlines lie apart
// (clean.Edge.SpreadSurface).
//
// Where another kind of end fits the points nearly as well
// (clean.Edge.Rivals), the section may be that one: its chord runs from
// the leading edge to the rival's end, so the chord's bound reaches that
// end (the spread, which takes in how far the rival's own end may lie)
// and the leading edge's bound besides. The chord's bound of the stated
// end is not added: it already holds the end's unsampled stretch
// (geometry/accuracy), which the spread covers again. The surface's
// bound reaches the rival's outline (SpreadSurface) and no more: it is
// the largest error anywhere round the section, mostly the nose's.
func widenForEdge(u *accuracy.Uncertainty, e *clean.Edge) {
	if e == nil {
		return
	}
	le := u.LE
	if e.Spread > u.Chord && !math.IsInf(e.Spread, 0) {
		u.Chord = e.Spread
	}
	if a := e.SpreadAcross; a > 0 && e.Chord > 0 && !math.IsInf(a, 0) {
		u.TwistDeg = math.Max(u.TwistDeg, math.Atan(a/e.Chord)*180/math.Pi)
	}
	if s := e.SpreadSurface; s > u.Surface && !math.IsInf(s, 0) {
		u.Surface = s
	}
	if len(e.Rivals) == 0 {
		return
	}
	if d := e.Spread + le; d > u.Chord && !math.IsInf(d, 0) && !math.IsNaN(d) {
		u.Chord = d
	}
}

// edgeKindWarning returns the warning that the points leave the kind of
// the trailing edge open, "" when they decide it: the kinds other than
// the one stated that the end analysis found as likely (clean.Edge.Rivals,
// within a likelihood ratio of 20), whose ends the bounds take in
// (widenForEdge).
func edgeKindWarning(e *clean.Edge, stated string) string {
	if e == nil {
		return ""
	}
	var others []string
	for _, k := range e.Rivals {
		if k != stated {
			others = append(others, k)
		}
	}
	if len(others) == 0 {
		return ""
	}
	return fmt.Sprintf("the points do not decide the trailing edge's kind: it is stated %s, but a %s end fits them nearly as well (within a likelihood ratio of 20); the bounds take in both; points measured on the end itself decide it", stated, strings.Join(others, " or "))
}

// widenForRejectedEdge widens the bounds of a section whose fit found
// its own trailing edge after the one found on the points failed a gate:
// the points still say the section may end there (the surfaces' corner
// beyond the last points, say), so the chord's bound reaches that edge's
// tip and its spread, and the twist's the tip's height over the chord.
func widenForRejectedEdge(u *accuracy.Uncertainty, e *clean.Edge, fr frame.Frame) {
	if e == nil || e.Kind == clean.EdgeRounded || !(fr.Chord > 0) {
		return
	}
	tip := fr.ToChord(e.Upper.Add(e.Lower).Scale(0.5))
	along, across := math.Abs(tip.X-1)*fr.Chord, math.Abs(tip.Y)*fr.Chord
	if d := along + e.Spread; d > u.Chord && !math.IsInf(d, 0) && !math.IsNaN(d) {
		u.Chord = d
	}
	if a := across + e.SpreadAcross; a > 0 && !math.IsInf(a, 0) && !math.IsNaN(a) {
		u.TwistDeg = math.Max(u.TwistDeg, math.Atan(a/fr.Chord)*180/math.Pi)
	}
}

// fitEdge returns the trailing edge the cleaning step found on the
// points as the fit takes it, nil when it found none.
func fitEdge(e *clean.Edge) *curve.Edge {
	if e == nil {
		return nil
	}
	return &curve.Edge{Closed: e.Kind == clean.EdgeRounded, Base: e.Base, Upper: e.Upper, Lower: e.Lower}
}

// edgeOptions returns the edge and normalisation options of the settings
// for an input in units: trailing-edge lengths in part units are
// converted to the input's units. It returns an error for a length that
// cannot be read or converted.
func edgeOptions(s Settings, units geometry.Unit) (frame.Options, error) {
	eo := frame.Options{TE: s.TE, Mirror: s.Mirror}
	if s.TEBlend != nil {
		eo.Blend = *s.TEBlend
	}
	length := func(name, v string) (geometry.Length, error) {
		l, err := geometry.ParseLength(v)
		if err == nil {
			l, err = l.For(units)
		}
		if err != nil {
			return l, fmt.Errorf("%s: %w", name, err)
		}
		return l, nil
	}
	if s.TEThickness != "" {
		l, err := length("trailing-edge thickness", s.TEThickness)
		if err != nil {
			return eo, err
		}
		eo.Thickness = &l
	}
	if s.TEBlendLength != "" {
		l, err := length("trailing-edge blend length", s.TEBlendLength)
		if err != nil {
			return eo, err
		}
		eo.BlendLength = l
	}
	if s.LEAt != nil {
		at := geometry.Point{X: s.LEAt[0], Y: s.LEAt[1]}
		eo.LEAt = &at
	}
	return eo, nil
}

// panelOptions returns the repanelling options of the settings.
func panelOptions(s Settings) repanel.Options {
	rp := repanel.Options{Spacing: s.Spacing}
	if s.Panels != nil {
		rp.Panels = *s.Panels
	}
	if s.PanelTol != nil {
		rp.Tolerance = *s.PanelTol
	}
	if s.LECluster != nil {
		rp.LECluster = *s.LECluster
	}
	if s.TECluster != nil {
		rp.TECluster = *s.TECluster
	}
	if s.CurvatureWeight != nil {
		rp.CurvatureWeight = *s.CurvatureWeight
	}
	return rp
}

// repanel places the nodes along the normalised section and returns them
// with the index of the leading-edge node, which is exactly (0, 0), and
// the largest distance between the panels and the curve (chord units).
func (p *Preparation) repanel(rp repanel.Options) ([]geometry.Point, int, float64, error) {
	ss, le, err := repanel.Stations(p.Shape.Path, p.Shape.SLE, rp)
	if err != nil {
		return nil, 0, 0, err
	}
	nodes := make([]geometry.Point, len(ss))
	for i, sv := range ss {
		nodes[i] = p.Shape.Path.At(sv)
	}
	nodes[le] = geometry.Point{}
	dev, _ := repanel.Deviation(p.Shape.Path, ss)
	return nodes, le, dev, nil
}

// document returns the section document of the preparation: the nodes
// and the record of how they were made, with every warning of the chain.
func (p *Preparation) document(name string, cl *Cleaned, nodes []geometry.Point, le int, spacing string) *section.Section {
	fit, shape := p.Fit, p.Shape
	fr := section.Frame(shape.Frame)
	fr.Plane = cl.Plane
	te := section.TrailingEdge(shape.TE)
	docProps := section.Properties(p.Props.Properties)
	if spacing == "" {
		spacing = repanel.LawCosine
	}
	sec := &section.Section{
		Format: section.Format,
		Name:   name,
		Units:  cl.Units,
		Source: &section.SourceInfo{
			Files: cl.Files, SHA256: cl.SHA256,
			PointsRead: cl.Read, PointsUsed: cl.Contour.Len(),
			Dropped: append(strayDropped(cl.Flatness, cl.Units), DroppedOf(cl.Clean, cl.Units)...),
		},
		Frame:        &fr,
		Fit:          p.fitSummary(),
		TrailingEdge: &te,
		LEIndex:      &le,
		Panels: &section.PanelSummary{
			Count: len(nodes) - 1, Spacing: spacing,
			MaxRatio: p.Quality.MaxRatio, MaxTurnDeg: p.Quality.MaxTurnDeg,
		},
		Properties:  &docProps,
		Uncertainty: &section.Uncertainty{Chord: p.Uncertainty.Chord, TwistDeg: p.Uncertainty.TwistDeg, LE: p.Uncertainty.LE, Surface: p.Uncertainty.Surface},
		Nodes:       nodes,
	}
	for _, c := range p.Clouds {
		for _, n := range c.Notes {
			if strings.HasPrefix(n.Reason, "warning") {
				sec.Warnings = append(sec.Warnings, n.Origin.String()+": "+n.Reason)
			}
		}
	}
	sec.Warnings = append(sec.Warnings, fit.Warnings...)
	if len(fit.Beyond) > 0 {
		list := make([]string, 0, len(fit.Beyond))
		for _, o := range fit.Beyond {
			list = append(list, o.String())
		}
		sec.Warnings = append(sec.Warnings, fmt.Sprintf("listed, not moved: %s", strings.Join(list, ", ")))
	}
	sec.Warnings = append(sec.Warnings, shape.Warnings...)
	sec.Warnings = append(sec.Warnings, p.Quality.Warnings...)
	return sec
}

// fitSummary returns the fit block of the section document: the method,
// the residuals, the noise estimate, why the curve interpolates when it
// does, and its fairness, the roughness in chord units.
func (p *Preparation) fitSummary() *section.FitSummary {
	fit := p.Fit
	c := p.Shape.Frame.Chord
	return &section.FitSummary{
		Method: fit.Method, RMS: fit.RMS, Max: fit.Max, MaxAt: fit.MaxAt.String(),
		NoiseEstimate: fit.NoiseEstimate, Interpolates: fit.Interpolates, Parameter: fit.Parameter,
		Fairness: &section.Fairness{
			Inflections: fit.Fairness.Inflections, Wiggles: fit.Fairness.Wiggles, Ripples: fit.Fairness.Ripples,
			Roughness: fit.Fairness.Roughness * c * c,
		},
	}
}

// readOptions turns the reading settings into pointfile.Options.
func readOptions(s Settings) (pointfile.Options, error) {
	ro := pointfile.Options{Format: s.Format, Columns: s.Columns, Layer: s.Layer}
	if s.Units != "" {
		u, err := geometry.ParseUnit(s.Units)
		if err != nil {
			return ro, err
		}
		ro.Units = u
	}
	if s.Cut != "" {
		pl, err := planar.ParseSpec(s.Cut)
		if err != nil {
			return ro, err
		}
		ro.Cut = &pl
	}
	return ro, nil
}

// columnsHint returns, for an error message, what to do when the
// coordinate columns of a file were a guess (no header named them and the
// lines hold more numbers than were read), "" otherwise.
func columnsHint(clouds []*geometry.Cloud) string {
	for _, c := range clouds {
		if c.ColumnsGuessed && len(c.Origins) > 0 {
			return fmt.Sprintf("; the coordinates of %s were read from columns %s: if those are not x, y (z), name the columns in a header (x, y, z) or give them with --columns (e.g. --columns 2,3,4)",
				c.Origins[0].File, c.Columns)
		}
	}
	return ""
}

// mergeCloud appends the points of c to all. The result is unordered when
// it holds more than one file.
func mergeCloud(all, c *geometry.Cloud) {
	if all.Len() == 0 {
		*all = *c
		all.Points = append([]geometry.Vec3(nil), c.Points...)
		all.Origins = append([]geometry.Origin(nil), c.Origins...)
		all.Notes = append([]geometry.Note(nil), c.Notes...)
		all.Segments = nil
		return
	}
	all.Points = append(all.Points, c.Points...)
	all.Origins = append(all.Origins, c.Origins...)
	all.Notes = append(all.Notes, c.Notes...)
	all.Ordered = false
	if c.Dim > all.Dim {
		all.Dim = c.Dim
	}
}

// contourDiagonal returns the diagonal of the bounding box of c.
func contourDiagonal(c *geometry.Contour) float64 {
	lo := geometry.Point{X: math.Inf(1), Y: math.Inf(1)}
	hi := geometry.Point{X: math.Inf(-1), Y: math.Inf(-1)}
	for _, p := range c.Points {
		lo.X, lo.Y = math.Min(lo.X, p.X), math.Min(lo.Y, p.Y)
		hi.X, hi.Y = math.Max(hi.X, p.X), math.Max(hi.Y, p.Y)
	}
	return hi.Dist(lo)
}

// strayDropped lists the points of a 3D file dropped as strays off its
// plane (planar.Flatness.Strays); none for a 2D file.
func strayDropped(f *planar.Flatness, units geometry.Unit) []section.Dropped {
	if f == nil {
		return nil
	}
	out := make([]section.Dropped, 0, len(f.Strays))
	for _, st := range f.Strays {
		out = append(out, section.Dropped{File: st.Origin.File, Line: st.Origin.Line, Entity: st.Origin.Entity,
			Reason: fmt.Sprintf("off the plane: %s from it, alone (its neighbours lie within half the flatness tolerance)", LengthText(math.Abs(st.Distance), units))})
	}
	return out
}

// DroppedOf lists every input point that is not in the contour: merged
// duplicates, outliers and stray points, with distances in units.
func DroppedOf(rep *clean.Report, units geometry.Unit) []section.Dropped {
	out := []section.Dropped{}
	for _, m := range rep.Merged {
		out = append(out, section.Dropped{File: m.Dropped.File, Line: m.Dropped.Line, Entity: m.Dropped.Entity,
			Reason: fmt.Sprintf("duplicate of %s (%s apart)", m.Kept, LengthText(m.Distance, units))})
	}
	for _, d := range rep.Dropped {
		if d.Kept {
			continue
		}
		reason := d.Reason
		if d.Sigmas > 0 {
			reason = fmt.Sprintf("%s: %s off the local fit (%.1f robust sigmas)", d.Reason, LengthText(d.Distance, units), d.Sigmas)
		}
		out = append(out, section.Dropped{File: d.Origin.File, Line: d.Origin.Line, Entity: d.Origin.Entity, Reason: reason})
	}
	return out
}
