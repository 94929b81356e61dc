package compare

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"sort"

	"github.com/foilwright/foilwright/geometry/section"
)

// A StageFunc runs the built-in analysis stage called name on a section
// document with the given parameters (a JSON object) in a stage process,
// and returns its result document (foilwright.result/1).
type StageFunc func(ctx context.Context, name string, section, params []byte) ([]byte, error)

// The stages the aerodynamic comparison runs, each on the design and on
// the measured section.
const (
	StageVortexPanel  = "vortex-panel"
	StageThinAerofoil = "thin-aerofoil"
)

// AeroStages returns the stages Aero runs, in order.
func AeroStages() []string { return []string{StageVortexPanel, StageThinAerofoil} }

// AeroConvention says how the measured section's coefficients are set
// against the design's.
const AeroConvention = "measured section at the design's angle of attack: its stages run at alpha + twist_deg (the " +
	"measured chord line against the design's in the alignment); its Cl and Cm are referred to the design's chord " +
	"(Cl times chord_ratio, Cm times chord_ratio squared), Cm about each section's own quarter-chord point; " +
	"alpha_l0 in the design's angle"

// AeroReport is the aerodynamic consequence of the deviations: the design
// and the measured section through the same stages, and the differences.
type AeroReport struct {
	Caution    string       `json:"caution"`
	Convention string       `json:"convention"`
	TwistDeg   float64      `json:"twist_deg"`
	ChordRatio float64      `json:"chord_ratio"`
	Methods    []AeroMethod `json:"methods"`
}

// AeroMethod is one stage's answer for the design and for the measured
// section, at the design's angles of attack (degrees).
type AeroMethod struct {
	Stage      string     `json:"stage"`
	Version    string     `json:"version"`
	AlphaDeg   []float64  `json:"alpha_deg"`
	ClDesign   []float64  `json:"cl_design"`
	ClMeasured []float64  `json:"cl_measured"`
	DeltaCl    []float64  `json:"delta_cl"`
	CmDesign   []float64  `json:"cm_design"`
	CmMeasured []float64  `json:"cm_measured"`
	DeltaCm    []float64  `json:"delta_cm"`
	AlphaL0Deg Difference `json:"alpha_l0_deg"`
	// AlphaL0From says where the zero-lift angles come from: "stage" (the
	// stage's own scalar) or "line" (a straight line through Cl(α)).
	AlphaL0From string   `json:"alpha_l0_from"`
	DeltaCp     *DeltaCp `json:"delta_cp,omitempty"`
	Warnings    []string `json:"warnings,omitempty"`
}

// DeltaCp is Cp of the measured section less Cp of the design along the
// chord (x/c of the design) on each surface, at one angle of attack.
type DeltaCp struct {
	AlphaDeg float64      `json:"alpha_deg"`
	Upper    [][2]float64 `json:"upper"`
	Lower    [][2]float64 `json:"lower"`
}

// CpPair is the pressure distribution of the design and of the measured
// section at one angle of attack (the design's), for the ΔCp picture.
type CpPair struct {
	AlphaDeg         float64
	Stage            string
	Design, Measured []CpPoint
	Delta            *DeltaCp
}

// CpPoint is Cp at a surface point (chord units, each section's own
// frame), in node order, as a result document gives it.
type CpPoint struct {
	X  float64 `json:"x"`
	Y  float64 `json:"y"`
	Cp float64 `json:"cp"`
}

// resultDoc is the part of a result document (foilwright.result/1) the
// comparison reads.
type resultDoc struct {
	Stage    string             `json:"stage"`
	Version  string             `json:"version"`
	Scalars  map[string]float64 `json:"scalars"`
	Cases    []*resultCase      `json:"cases"`
	Warnings []string           `json:"warnings"`
}

type resultCase struct {
	AlphaDeg float64   `json:"alpha_deg"`
	CL       float64   `json:"cl"`
	CM       float64   `json:"cm_c4"`
	Cp       []CpPoint `json:"cp"`
}

// AeroOptions say which angles the aerodynamic comparison covers.
type AeroOptions struct {
	// AlphaDeg are the design's angles of attack, degrees.
	AlphaDeg []float64
	// CpAlphaDeg chooses the angle of the ΔCp distribution: the angle of
	// AlphaDeg nearest to it.
	CpAlphaDeg float64
}

// Aero runs the design and the measured section through the vortex-panel
// and thin-aerofoil stages (through run, which starts them as child
// processes) and records the differences in c.Report.Aero and c.Cp. The
// measured section runs at the design's angles plus its twist against the
// design in the alignment (see AeroConvention).
func (c *Comparison) Aero(ctx context.Context, run StageFunc, opts AeroOptions) error {
	if len(opts.AlphaDeg) == 0 {
		return fmt.Errorf("%w: no angles of attack", ErrOptions)
	}
	design, err := section.Encode(c.Design.Section)
	if err != nil {
		return err
	}
	measured, err := section.Encode(c.Measurement.Section)
	if err != nil {
		return err
	}
	d := c.Report.Derived
	rep := &AeroReport{
		Caution: Caution, Convention: AeroConvention,
		TwistDeg:   d.TwistDeg.Difference,
		ChordRatio: d.Chord.Measured / d.Chord.Design,
	}
	shifted := make([]float64, len(opts.AlphaDeg))
	for i, a := range opts.AlphaDeg {
		shifted[i] = a + rep.TwistDeg
	}
	for _, name := range AeroStages() {
		extra := map[string]any{}
		if name == StageThinAerofoil {
			extra["load"] = false
		}
		dr, err := runStage(ctx, run, name, design, opts.AlphaDeg, extra)
		if err != nil {
			return fmt.Errorf("%s on the design: %w", name, err)
		}
		mr, err := runStage(ctx, run, name, measured, shifted, extra)
		if err != nil {
			return fmt.Errorf("%s on the measured section: %w", name, err)
		}
		method := aeroMethod(name, dr, mr, opts.AlphaDeg, rep.TwistDeg, rep.ChordRatio)
		if name == StageVortexPanel {
			c.Cp = cpPair(name, dr, mr, opts)
			if c.Cp != nil {
				method.DeltaCp = c.Cp.Delta
			}
		}
		rep.Methods = append(rep.Methods, method)
	}
	c.Report.Aero = rep
	return nil
}

// runStage runs one stage on one section at the angles alphas.
func runStage(ctx context.Context, run StageFunc, name string, sec []byte, alphas []float64, extra map[string]any) (*resultDoc, error) {
	params := map[string]any{"alpha_deg": alphas}
	for k, v := range extra {
		params[k] = v
	}
	pb, err := json.Marshal(params)
	if err != nil {
		return nil, err
	}
	out, err := run(ctx, name, sec, pb)
	if err != nil {
		return nil, err
	}
	var doc resultDoc
	if err := json.NewDecoder(bytes.NewReader(out)).Decode(&doc); err != nil {
		return nil, fmt.Errorf("the stage's result document: %v", err)
	}
	if len(doc.Cases) != len(alphas) {
		return nil, fmt.Errorf("the stage answered %d case(s) for %d angle(s)", len(doc.Cases), len(alphas))
	}
	return &doc, nil
}

// aeroMethod sets the measured results (at the design's angles plus
// twist) against the design's.
func aeroMethod(name string, dr, mr *resultDoc, alphas []float64, twist, ratio float64) AeroMethod {
	m := AeroMethod{Stage: name, Version: dr.Version}
	for _, w := range dr.Warnings {
		m.Warnings = append(m.Warnings, "design: "+w)
	}
	for _, w := range mr.Warnings {
		m.Warnings = append(m.Warnings, "measured: "+w)
	}
	for i, a := range alphas {
		dc, mc := dr.Cases[i], mr.Cases[i]
		if dc == nil || mc == nil {
			continue // the stage said why in its warnings
		}
		clm, cmm := mc.CL*ratio, mc.CM*ratio*ratio
		m.AlphaDeg = append(m.AlphaDeg, a)
		m.ClDesign, m.ClMeasured = append(m.ClDesign, dc.CL), append(m.ClMeasured, clm)
		m.CmDesign, m.CmMeasured = append(m.CmDesign, dc.CM), append(m.CmMeasured, cmm)
		m.DeltaCl, m.DeltaCm = append(m.DeltaCl, clm-dc.CL), append(m.DeltaCm, cmm-dc.CM)
	}
	da, okd := dr.Scalars["alpha_l0_deg"]
	ma, okm := mr.Scalars["alpha_l0_deg"]
	if okd && okm {
		m.AlphaL0From = "stage"
		m.AlphaL0Deg = diff(ma-twist, da)
	} else {
		m.AlphaL0From = "line"
		m.AlphaL0Deg = diff(zeroLift(m.AlphaDeg, m.ClMeasured), zeroLift(m.AlphaDeg, m.ClDesign))
	}
	if m.AlphaDeg == nil {
		m.Warnings = append(m.Warnings, "no angle gave results for both sections")
		m.AlphaDeg, m.ClDesign, m.ClMeasured, m.DeltaCl = []float64{}, []float64{}, []float64{}, []float64{}
		m.CmDesign, m.CmMeasured, m.DeltaCm = []float64{}, []float64{}, []float64{}
	}
	return m
}

// zeroLift returns the angle where the least-squares straight line
// through (α, Cl) crosses zero; NaN-free: 0 for fewer than two angles or
// no slope.
func zeroLift(alphas, cl []float64) float64 {
	n := float64(len(alphas))
	if n < 2 {
		return 0
	}
	var sa, sc, saa, sac float64
	for i, a := range alphas {
		sa, sc, saa, sac = sa+a, sc+cl[i], saa+a*a, sac+a*cl[i]
	}
	den := n*saa - sa*sa
	if den == 0 {
		return 0
	}
	slope := (n*sac - sa*sc) / den
	if slope == 0 {
		return 0
	}
	icpt := (sc - slope*sa) / n
	return -icpt / slope
}

// cpPair returns the pressure distributions at the design angle of
// opts.AlphaDeg nearest to opts.CpAlphaDeg, and their difference along
// the chord; nil when a case has no Cp.
func cpPair(name string, dr, mr *resultDoc, opts AeroOptions) *CpPair {
	k := -1
	for i, a := range opts.AlphaDeg {
		if dr.Cases[i] == nil || mr.Cases[i] == nil || len(dr.Cases[i].Cp) < 3 || len(mr.Cases[i].Cp) < 3 {
			continue
		}
		if k < 0 || math.Abs(a-opts.CpAlphaDeg) < math.Abs(opts.AlphaDeg[k]-opts.CpAlphaDeg) {
			k = i
		}
	}
	if k < 0 {
		return nil
	}
	p := &CpPair{AlphaDeg: opts.AlphaDeg[k], Stage: name, Design: dr.Cases[k].Cp, Measured: mr.Cases[k].Cp}
	du, dl := surfacesOf(p.Design)
	mu, ml := surfacesOf(p.Measured)
	p.Delta = &DeltaCp{AlphaDeg: p.AlphaDeg, Upper: deltaAlong(du, mu), Lower: deltaAlong(dl, ml)}
	return p
}

// surfacesOf splits a Cp distribution in node order at its point of least
// x into the upper and the lower surface, each as (x, Cp) sorted by x.
func surfacesOf(cp []CpPoint) (upper, lower [][2]float64) {
	le := 0
	for i, p := range cp {
		if p.X < cp[le].X {
			le = i
		}
	}
	for i, p := range cp {
		q := [2]float64{p.X, p.Cp}
		if i <= le {
			upper = append(upper, q)
		}
		if i >= le {
			lower = append(lower, q)
		}
	}
	for _, s := range [][][2]float64{upper, lower} {
		sort.SliceStable(s, func(a, b int) bool { return s[a][0] < s[b][0] })
	}
	return upper, lower
}

// deltaAlong returns, at each x of the design's surface d, the measured
// Cp there (linear between the measured points) less the design's.
// Stations outside the measured surface's x range are left out.
func deltaAlong(d, m [][2]float64) [][2]float64 {
	out := [][2]float64{}
	if len(m) < 2 {
		return out
	}
	for _, q := range d {
		x := q[0]
		if x < m[0][0] || x > m[len(m)-1][0] {
			continue
		}
		j := sort.Search(len(m), func(j int) bool { return m[j][0] >= x })
		var cp float64
		switch {
		case j == 0:
			cp = m[0][1]
		case m[j][0] == m[j-1][0]:
			cp = m[j][1]
		default:
			f := (x - m[j-1][0]) / (m[j][0] - m[j-1][0])
			cp = m[j-1][1] + f*(m[j][1]-m[j-1][1])
		}
		out = append(out, [2]float64{x, cp - q[1]})
	}
	return out
}
