package campaign

import (
	"math"
	"strings"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/scangen"
)

// Thresholds of a wrong answer (issue 10): a section that exits 0 with
// its chord off by more than WrongChord (relative), its twist by more than
// WrongTwistDeg or a node farther than WrongNode (chord units) from the true
// shape, beyond what it states as its own uncertainty.
const (
	WrongChord    = 0.005
	WrongTwistDeg = 0.2
	WrongNode     = 0.005
)

// Record is what one case gave.
type Record struct {
	Seed     uint64
	Spec     scangen.Spec
	Truth    *scangen.Truth // without its lines
	File     string
	OK       bool   // the chain returned a section
	Err      string // the first line of its error otherwise
	Seconds  float64
	Well     bool // well sampled: ≥ 300 good points, σ ≤ 0.5, no missing stretch, no sparse zone
	ChordErr float64
	TwistErr float64 // degrees
	LEErr    float64 // chord units
	// LEAlong and LEAcross are the leading edge's error along the true
	// chord line (towards the trailing edge) and across it (to the left
	// of that direction seen from the side the plane's normal points to,
	// or from +z for 2D points), signed, chord units; TEAlong and
	// TEAcross are those of the trailing-edge point. The twist error is
	// about |TEAcross − LEAcross| radians: they tell which end turned
	// the chord line.
	LEAlong, LEAcross float64
	TEAlong, TEAcross float64
	NodeErr           float64 // largest distance of a node from the true shape, chord units
	// NodeErrAt is where that node is, in the section's normalised frame.
	NodeErrAt geometry.Point
	TEGot     string
	TERight   bool
	// TEUndecidable is true when the good points cannot tell the true
	// trailing-edge kind from another at their sampling (teUndecidable)
	// or at their noise (teIndistinct); TEEndPoints counts the good points
	// on the true base or rounded end.
	TEUndecidable bool
	TEEndPoints   int
	// TESeparation is teIndistinct's λ, the noise-free points' squared
	// distance in scatters from the nearest outline of a rival kind of
	// end; −1 when it weighs none.
	TESeparation float64
	// TEUndecidable26 is the stop 26 judgement (teJudge: one
	// likelihood-ratio test, positions and the gap round the end, of the
	// truth against the best rival of every other kind); TEUndecidable
	// stays the stop 23 one, so a reader sees what changed. TERival26 is
	// the best rival kind and TELambda26 its λ (−1 when none is weighed;
	// then the stop 23 judgement stands).
	// TEWhy26 says why an undecided case is undecided (teVerdict.Why);
	// TEMiss26 is the probability that an end piece as long as the true
	// one, at the spacing of the points there, holds no point (−1 unless
	// no point lies on it).
	TEUndecidable26 bool
	TERival26       string  `json:",omitempty"`
	TELambda26      float64 `json:",omitempty"`
	TEWhy26         string  `json:",omitempty"`
	TEMiss26        float64 `json:",omitempty"`
	// Good counts good lines that are not part of a duplicate pair;
	// GoodDropped those the section lists as dropped for a reason other
	// than being a duplicate. Planted counts planted outliers, Caught those
	// the section lists as dropped.
	Good, GoodDropped int
	Planted, Caught   int
	// Fixture counts the points of a fixture's face (scangen.LineFixture),
	// FixtureCaught those the section lists as dropped.
	Fixture       int `json:",omitempty"`
	FixtureCaught int `json:",omitempty"`
	// Stated is the section's uncertainty, nil when it states none.
	Stated *uncertainty
	// Covered says, per figure (chord, twist, le, surface), whether the
	// stated uncertainty covers the true error.
	Covered [4]bool
	Wrong   string // why the answer is wrong beyond its uncertainty, "" if it is not
	Lift    *Lift  // the lift check of a lift case
}

// evaluate compares a section document with the truth.
func evaluate(r *Record, tr *scangen.Truth, sec *section) {
	sh := tr.Section.Shape
	r.OK = true
	// Frame: chord, the chord line's direction and the leading edge, all
	// compared in the file's coordinates (in space for 3D points), so the
	// mirror flag and the in-plane basis the tool chose do not matter.
	le, te := sec.toPart(geometry.Point{}), sec.toPart(geometry.Point{X: 1})
	tle := geometry.Vec3{X: tr.LE[0], Y: tr.LE[1], Z: tr.LE[2]}
	tte := geometry.Vec3{X: tr.TE[0], Y: tr.TE[1], Z: tr.TE[2]}
	chordAbs := math.Abs(sec.Frame.Chord - tr.Chord)
	r.ChordErr = chordAbs / tr.Chord
	a, b := te.Sub(le), tte.Sub(tle)
	r.TwistErr = math.Atan2(a.Cross(b).Norm(), a.Dot(b)) * 180 / math.Pi
	leAbs := le.Sub(tle).Norm()
	r.LEErr = leAbs / tr.Chord
	along := b.Scale(1 / b.Norm())
	normal := geometry.Vec3{Z: 1}
	if pl := tr.Plane; pl != nil {
		normal = geometry.Vec3{X: pl.Normal[0], Y: pl.Normal[1], Z: pl.Normal[2]}
	}
	across := normal.Cross(along)
	dl, dt := le.Sub(tle).Scale(1/tr.Chord), te.Sub(tte).Scale(1/tr.Chord)
	r.LEAlong, r.LEAcross = dl.Dot(along), dl.Dot(across)
	r.TEAlong, r.TEAcross = dt.Dot(along), dt.Dot(across)
	for _, n := range sec.Nodes {
		if d, _ := sh.Nearest(n); d > r.NodeErr {
			r.NodeErr, r.NodeErrAt = d, n
		}
	}
	r.TEGot = sec.TrailingEdge.Kind
	r.TERight = teRight(tr, r.TEGot)
	judgeTE(r, tr)
	countDropped(r, tr, sec)

	u := sec.Uncertainty
	if u != nil {
		r.Stated = u
		r.Covered = [4]bool{chordAbs <= u.Chord, r.TwistErr <= u.TwistDeg, leAbs <= u.LE, r.NodeErr <= u.Surface}
	} else {
		u = &uncertainty{}
	}
	var why []string
	if r.ChordErr > WrongChord && chordAbs > u.Chord {
		why = append(why, "chord")
	}
	if r.TwistErr > WrongTwistDeg && r.TwistErr > u.TwistDeg {
		why = append(why, "twist")
	}
	if r.NodeErr > WrongNode && r.NodeErr > u.Surface {
		why = append(why, "nodes")
	}
	r.Wrong = strings.Join(why, "+")
}

// judgeTE sets the record's judgements of whether the good points decide
// the kind of the trailing edge, both the stop 23 one (teUndecidable,
// teIndistinct) and the stop 26 one (teJudge). They read the truth and
// the points as drawn, never the section: whether a case can be judged
// does not depend on the answer.
//
// A sharp truth is decided by both whatever its points (see teUndecidable
// and teJudge); judgeTE reads only its kind, so Rejudge need not generate
// its case again.
func judgeTE(r *Record, tr *scangen.Truth) {
	if tr.TEKind == scangen.TESharp {
		r.TEUndecidable, r.TEEndPoints, r.TESeparation = false, 0, -1
		r.TEUndecidable26, r.TERival26, r.TELambda26, r.TEWhy26, r.TEMiss26 = false, "", -1, "", -1
		return
	}
	r.TEUndecidable, r.TEEndPoints = teUndecidable(tr)
	indistinct, lambda := teIndistinct(tr)
	r.TEUndecidable = r.TEUndecidable || indistinct
	r.TESeparation = -1
	if !math.IsInf(lambda, 1) {
		r.TESeparation = lambda
	}
	r.TEUndecidable26, r.TERival26, r.TELambda26, r.TEWhy26, r.TEMiss26 = r.TEUndecidable, "", -1, "", -1
	if v := teJudge(tr); v.OK {
		r.TEUndecidable26, r.TERival26, r.TEWhy26, r.TEMiss26 = !v.Decided, v.Rival, v.Why(), v.Miss
		if !math.IsInf(v.Lambda, 0) {
			r.TELambda26 = v.Lambda
		}
	} else if r.TEUndecidable {
		r.TEWhy26 = "stop 23 judgement (noise-free points or no end to weigh)"
	}
}

// teRight reports whether the trailing-edge kind the section states is
// right. A blunt base or a rounded end smaller than four times the
// scatter of the points (noise and the rounding of the written numbers)
// cannot be told from a sharp edge, so "sharp" is right for it too, and
// "blunt" for a rounded end that small. "open" is never right: every
// generated part is a closed body.
func teRight(tr *scangen.Truth, got string) bool {
	scatter := math.Sqrt(tr.Noise*tr.Noise + tr.Resolution*tr.Resolution/12)
	small := tr.TEThickness < 4*scatter
	switch tr.TEKind {
	case scangen.TEBlunt:
		return got == "blunt" || (small && got == "sharp")
	case scangen.TERounded:
		return got == "rounded" || (small && (got == "sharp" || got == "blunt"))
	}
	return got == "sharp"
}

// countDropped counts the good lines the section dropped and the planted
// outliers it caught. Lines of duplicate pairs (the original and its
// copies) are left out: either may be the one kept.
func countDropped(r *Record, tr *scangen.Truth, sec *section) {
	dropped := make(map[int]string, len(sec.Source.Dropped))
	for _, d := range sec.Source.Dropped {
		dropped[d.Line] = d.Reason
	}
	paired := map[int]bool{}
	for _, l := range tr.Lines {
		if l.Kind == scangen.LineDuplicate {
			paired[l.No], paired[l.Of] = true, true
		}
	}
	for _, l := range tr.Lines {
		reason, gone := dropped[l.No]
		switch {
		case l.Kind == scangen.LineOutlier:
			r.Planted++
			if gone {
				r.Caught++
			}
		case l.Kind == scangen.LineFixture:
			r.Fixture++
			if gone {
				r.FixtureCaught++
			}
		case l.Kind == scangen.LineGood && !paired[l.No]:
			r.Good++
			if gone && !strings.HasPrefix(reason, "duplicate") {
				r.GoodDropped++
			}
		}
	}
}

// wellSampled reports whether a case is well sampled: at least 300 good
// points, gap σ ≤ 0.5 (issue 10's definition), and, since the generator
// also makes them, no missing stretch and no sparse zone.
func wellSampled(spec scangen.Spec, tr *scangen.Truth) bool {
	sm := spec.Sampling
	return tr.GoodPoints >= 300 && sm.CAD == "" && sm.Sigma <= 0.5 && sm.Missing == 0 && sm.Zone != "sparse"
}
