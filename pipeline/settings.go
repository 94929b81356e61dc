package pipeline

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/tidwall/gjson"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/frame"
	"github.com/foilwright/foilwright/geometry/planar"
	"github.com/foilwright/foilwright/geometry/pointfile"
	"github.com/foilwright/foilwright/geometry/props"
	"github.com/foilwright/foilwright/internal/enum"
	"github.com/foilwright/foilwright/prep"
	"github.com/foilwright/foilwright/repanel"
)

// prepKey describes one "prepare" key: whether an input may override it,
// and how to read and store it.
type prepKey struct {
	name    string
	reading bool
	read    func(c *collector, path string, v gjson.Result, s *prep.Settings)
}

var (
	positive = numRange{lo: 0, hi: math.Inf(1), loOpen: true}
	nonNeg   = numRange{lo: 0, hi: math.Inf(1)}
	cluster  = numRange{lo: -repanel.ClusterLimit, hi: repanel.ClusterLimit}
	unit     = numRange{lo: 0, hi: 1}
)

func numKey(name string, reading bool, r numRange, field func(*prep.Settings) **float64) prepKey {
	return prepKey{name, reading, func(c *collector, path string, v gjson.Result, s *prep.Settings) {
		if x, ok := c.wantNumber(path, v, r); ok {
			*field(s) = &x
		}
	}}
}

func enumKey(name string, reading bool, field func(*prep.Settings) *string, allowed ...string) prepKey {
	return prepKey{name, reading, func(c *collector, path string, v gjson.Result, s *prep.Settings) {
		if e, ok := c.wantEnum(path, v, allowed...); ok {
			*field(s) = e
		}
	}}
}

// prepKeys lists every "prepare" key (PREP_OPTIONS). The numeric ranges
// that the geometry packages do not fix themselves are ours: a value outside
// them is a slip, not a setting (common practice for outlier_sigma is 3 to 5).
var prepKeys = []prepKey{
	{"format", true, func(c *collector, path string, v gjson.Result, s *prep.Settings) {
		if e, ok := c.wantEnum(path, v, append([]string{"auto"}, pointfile.Formats()...)...); ok && e != "auto" {
			s.Format = e
		}
	}},
	{"columns", true, func(c *collector, path string, v gjson.Result, s *prep.Settings) {
		if str, ok := c.wantString(path, v, true); ok {
			if err := checkColumns(str); err != nil {
				c.add(v.Index, path, "%v", err)
				return
			}
			s.Columns = str
		}
	}},
	enumKey("units", true, func(s *prep.Settings) *string { return &s.Units }, enum.Strings(geometry.Units())...),
	{"cut", true, func(c *collector, path string, v gjson.Result, s *prep.Settings) {
		if str, ok := c.wantString(path, v, true); ok {
			if err := checkCut(str); err != nil {
				c.add(v.Index, path, "%v", err)
				return
			}
			s.Cut = str
		}
	}},
	{"layer", true, func(c *collector, path string, v gjson.Result, s *prep.Settings) {
		if str, ok := c.wantString(path, v, true); ok {
			s.Layer = str
		}
	}},
	numKey("band", true, positive, func(s *prep.Settings) **float64 { return &s.Band }),
	numKey("flat_tol", true, positive, func(s *prep.Settings) **float64 { return &s.FlatTol }),
	numKey("merge_tol", false, nonNeg, func(s *prep.Settings) **float64 { return &s.MergeTol }),
	numKey("outlier_sigma", false, numRange{lo: 0, hi: 100, loOpen: true}, func(s *prep.Settings) **float64 { return &s.OutlierSigma }),
	{"keep_outliers", false, func(c *collector, path string, v gjson.Result, s *prep.Settings) {
		if b, ok := c.wantBool(path, v); ok {
			s.KeepOutliers = &b
		}
	}},
	{"loop", false, func(c *collector, path string, v gjson.Result, s *prep.Settings) {
		if n, ok := c.wantInt(path, v, 0, 1000); ok {
			s.Loop = &n
		}
	}},
	{"noise", false, func(c *collector, path string, v gjson.Result, s *prep.Settings) {
		if v.Type == gjson.String {
			if v.Str != "auto" {
				c.add(v.Index, path, `want "auto" or a number at least 0, got %q`, v.Str)
			}
			return
		}
		if v.Type != gjson.Number {
			c.add(v.Index, path, `want "auto" or a number, got %s`, describe(v))
			return
		}
		if x, ok := c.wantNumber(path, v, nonNeg); ok {
			s.Noise = &x
		}
	}},
	numKey("fit_tol", false, positive, func(s *prep.Settings) **float64 { return &s.FitTol }),
	{"probe_radius", false, func(c *collector, path string, v gjson.Result, s *prep.Settings) {
		// A length on the part, never a share of the chord: the chord is
		// what the radius changes.
		const want = `want a ball radius such as 1.5 or "1.5mm" (0 or more, in a length unit, not a share of the chord)`
		switch v.Type {
		case gjson.Number:
			if x, ok := c.wantNumber(path, v, nonNeg); ok {
				s.ProbeRadius = strconv.FormatFloat(x, 'g', -1, 64)
			}
		case gjson.String:
			l, err := geometry.ParseLength(v.Str)
			if err != nil || l.Unit == geometry.ChordUnit || !(l.Value >= 0) {
				c.add(v.Index, path, want+", got %q", v.Str)
				return
			}
			s.ProbeRadius = strings.TrimSpace(v.Str)
		default:
			c.add(v.Index, path, want+", got %s", describe(v))
		}
	}},
	{"te", false, func(c *collector, path string, v gjson.Result, s *prep.Settings) {
		if v.Type == gjson.String && v.Str == frame.TEClose {
			s.TE = v.Str // the earlier form of te_thickness 0
			return
		}
		if e, ok := c.wantEnum(path, v, enum.Names(frame.Treatments())...); ok {
			s.TE = e
		}
	}},
	numKey("te_blend", false, numRange{lo: 0, hi: 1, loOpen: true}, func(s *prep.Settings) **float64 { return &s.TEBlend }),
	lengthKey("te_thickness", func(s *prep.Settings) *string { return &s.TEThickness }),
	lengthKey("te_blend_length", func(s *prep.Settings) *string { return &s.TEBlendLength }),
	numKey("panel_tol", false, numRange{lo: 0, hi: 0.1, loOpen: true}, func(s *prep.Settings) **float64 { return &s.PanelTol }),
	{"le_at", false, func(c *collector, path string, v gjson.Result, s *prep.Settings) {
		var xy [2]float64
		n, good := 0, true
		if !c.wantArray(path, v, func(i int, ipath string, el gjson.Result) {
			n++
			x, ok := c.wantNumber(ipath, el, anyFinite)
			good = good && ok
			if i < 2 {
				xy[i] = x
			}
		}) {
			return
		}
		if n != 2 {
			c.add(v.Index, path, "want [x, y], got %d number(s)", n)
			return
		}
		if good {
			s.LEAt = &xy
		}
	}},
	enumKey("mirror", false, func(s *prep.Settings) *string { return &s.Mirror }, enum.Names(frame.MirrorModes())...),
	{"panels", false, func(c *collector, path string, v gjson.Result, s *prep.Settings) {
		if v.Type == gjson.String && v.Str == "auto" {
			return // the count chosen for panel_tol
		}
		if n, ok := c.wantInt(path, v, 16, 2000); ok {
			s.Panels = &n
		}
	}},
	enumKey("spacing", false, func(s *prep.Settings) *string { return &s.Spacing }, repanel.Laws()...),
	numKey("le_cluster", false, cluster, func(s *prep.Settings) **float64 { return &s.LECluster }),
	numKey("te_cluster", false, cluster, func(s *prep.Settings) **float64 { return &s.TECluster }),
	numKey("curvature_weight", false, unit, func(s *prep.Settings) **float64 { return &s.CurvatureWeight }),
	enumKey("thickness_mode", false, func(s *prep.Settings) *string { return &s.ThicknessMode }, enum.Names(props.ThicknessModes())...),
	enumKey("camber_mode", false, func(s *prep.Settings) *string { return &s.CamberMode }, enum.Names(props.CamberModes())...),
}

// lengthKey reads a length: a number (input units) or a string with a
// unit, "0.5mm" or "0.002c".
func lengthKey(name string, field func(*prep.Settings) *string) prepKey {
	return prepKey{name, false, func(c *collector, path string, v gjson.Result, s *prep.Settings) {
		switch v.Type {
		case gjson.Number:
			if x, ok := c.wantNumber(path, v, anyFinite); ok {
				*field(s) = strconv.FormatFloat(x, 'g', -1, 64)
			}
		case gjson.String:
			if _, err := geometry.ParseLength(v.Str); err != nil {
				c.add(v.Index, path, `want a length such as 0.5, "0.5mm" or "0.002c", got %q`, v.Str)
				return
			}
			*field(s) = strings.TrimSpace(v.Str)
		default:
			c.add(v.Index, path, `want a length such as 0.5, "0.5mm" or "0.002c", got %s`, describe(v))
		}
	}}
}

// prepKeyIndex maps a key name to its entry in prepKeys.
var prepKeyIndex = func() map[string]int {
	m := map[string]int{}
	for i, k := range prepKeys {
		m[k.name] = i
	}
	return m
}()

// overlay returns s with the reading settings that o sets (an input's own
// reading keys) replacing those of s.
func overlay(s, o prep.Settings) prep.Settings {
	if o.Format != "" {
		s.Format = o.Format
	}
	if o.Columns != "" {
		s.Columns = o.Columns
	}
	if o.Units != "" {
		s.Units = o.Units
	}
	if o.Cut != "" {
		s.Cut = o.Cut
	}
	if o.Layer != "" {
		s.Layer = o.Layer
	}
	if o.Band != nil {
		s.Band = o.Band
	}
	if o.FlatTol != nil {
		s.FlatTol = o.FlatTol
	}
	return s
}

// checkColumns checks a column choice: two or three 1-based column numbers,
// or two or three header names, separated by commas.
func checkColumns(s string) error {
	parts := strings.Split(s, ",")
	if len(parts) < 2 || len(parts) > 3 {
		return fmt.Errorf("want 2 or 3 columns separated by commas, got %q", s)
	}
	numbers := 0
	seen := map[string]bool{}
	for _, p := range parts {
		p = strings.TrimSpace(p)
		if p == "" {
			return fmt.Errorf("empty column in %q", s)
		}
		if seen[p] {
			return fmt.Errorf("column %q chosen twice", p)
		}
		seen[p] = true
		if n, err := strconv.Atoi(p); err == nil {
			if n < 1 {
				return fmt.Errorf("column numbers start at 1, got %d", n)
			}
			numbers++
		}
	}
	if numbers != 0 && numbers != len(parts) {
		return fmt.Errorf("mix of column numbers and names in %q", s)
	}
	return nil
}

// checkCut checks a cutting plane with the reader's own parser.
func checkCut(s string) error {
	if _, err := planar.ParseSpec(s); err != nil {
		return errors.New(strings.TrimPrefix(err.Error(), "geometry: "))
	}
	return nil
}

func finite(s string) (float64, error) {
	x, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
	if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
		return 0, fmt.Errorf("%q is not a finite number", strings.TrimSpace(s))
	}
	return x, nil
}
