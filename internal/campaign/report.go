package campaign

import (
	"fmt"
	"io"
	"math"
	"regexp"
	"sort"
	"strings"

	"github.com/foilwright/foilwright/internal/scangen"
)

// WriteTable writes the figures as a Markdown table: figure | target |
// measured, with "✗" after a measurement that misses its target.
func WriteTable(w io.Writer, figs []Figure) {
	fmt.Fprintln(w, "| figure | target | measured |")
	fmt.Fprintln(w, "| --- | --- | --- |")
	for _, f := range figs {
		mark := ""
		if f.Checked && !f.Met {
			mark = " ✗"
		}
		fmt.Fprintf(w, "| %s | %s | %s%s |\n", f.Name, f.Target, f.Measured, mark)
	}
}

// A dimension splits the records into buckets for a breakdown: key puts a
// record in one bucket, or keys in several (a case with several hazards
// counts in each).
type dimension struct {
	name string
	key  func(*Record) string
	keys func(*Record) []string
}

// bucket helpers.
func sigmaBucket(r *Record) string {
	sm := r.Spec.Sampling
	switch {
	case sm.CAD != "":
		return "CAD stations"
	case sm.Sigma == 0:
		return "σ = 0"
	case sm.Sigma <= 0.25:
		return "σ ≤ 0.25"
	case sm.Sigma <= 0.5:
		return "σ ≤ 0.5"
	}
	return "σ > 0.5"
}

func pointsBucket(r *Record) string {
	n := r.Truth.GoodPoints
	switch {
	case n < 150:
		return "< 150"
	case n < 300:
		return "150–299"
	case n < 1000:
		return "300–999"
	case n <= 3000:
		return "1000–3000"
	}
	return "1e5"
}

func noiseBucket(r *Record) string {
	s := r.Truth.Noise
	switch {
	case s == 0:
		return "0"
	case s < 1e-4:
		return "< 1e-4 c"
	case s <= 0.05/152:
		return "1e-4 … 3.3e-4 c"
	}
	return "> 3.3e-4 c"
}

func familyKey(r *Record) string {
	s := r.Spec.Shape
	name := s.Family
	switch {
	case s.Blunt():
		name += " open TE"
	case s.NACA != nil || s.NACA5 != nil || s.Mod != nil:
		name += " closed TE"
	}
	if s.NACA5 != nil && s.NACA5.Reflex {
		name += ", reflexed"
	}
	if s.RoundRadius > 0 {
		name += ", rounded"
	}
	return name
}

func zoneKey(r *Record) string {
	sm := r.Spec.Sampling
	z := sm.Zone
	if z == "" {
		z = "no zone"
	}
	if sm.Missing > 0 {
		z += ", stretch missing"
	}
	return z
}

func fileKey(r *Record) string {
	f := r.Spec.File
	if strings.HasPrefix(f.Format, "dxf") {
		return f.Format
	}
	return f.Format + ", header " + f.Header
}

func thicknessKey(r *Record) string {
	t := r.Spec.Shape.Thickness()
	switch {
	case t == 0:
		return "Kármán–Trefftz"
	case t < 0.06:
		return "thin, < 6 %"
	case t < 0.25:
		return "6–24 %"
	}
	return "thick, ≥ 25 %"
}

// Hazards names the hazards of the measurement model beyond spacing,
// noise and outliers that a case of spec s carries, as the breakdown
// "measurement hazards" names them; "none" when it carries none.
func Hazards(s scangen.Spec) []string {
	return hazardKeys(&Record{Spec: s})
}

// hazardKeys names the hazards of the measurement model beyond spacing,
// noise and outliers that a case carries; "none" when it carries none.
func hazardKeys(r *Record) []string {
	s := r.Spec
	var ks []string
	add := func(on bool, k string) {
		if on {
			ks = append(ks, k)
		}
	}
	add(s.Noise.Grazing > 0, "noise grows where the beam grazes")
	add(s.Noise.StepMM > 0, "stair-stepped coordinates")
	add(s.Noise.OffsetMM != 0, "probe-radius compensation error")
	if c := s.Noise.Correlated; c != nil {
		add(c.Form == scangen.CorrelatedWander, "correlated noise: wander along the outline")
		add(c.Form == scangen.CorrelatedMesh, "correlated noise: mesh slice")
	}
	add(s.Order.Overlap > 0, "passes overlap at the "+s.Order.Meet)
	add(s.Order.PassShiftMM > 0, "second pass moved")
	add(s.Defects.Repeat > 0, "stretch measured again")
	add(s.Sampling.Surface != "", "one surface denser")
	add(s.Defects.BurstMax > 4 && s.Defects.Outliers > 0, "outlier clusters up to 8")
	add(s.Defects.Outliers > 0.03, "outliers > 3 %")
	add(s.Order.Start == "nose", "loop starts at the nose")
	add(s.Order.Start == "te", "loop starts at the trailing edge")
	add(s.Shape.KT != nil && s.Shape.KT.TEAngleDeg < 3, "Kármán–Trefftz edge angle < 3°")
	add(s.Shape.Mod != nil && s.Shape.Mod.TESlope < 0.1, "cusped edge")
	if f := s.Defects.Fixture; f != nil {
		ks = append(ks, "fixture face "+f.Place)
	}
	if len(ks) == 0 {
		ks = []string{"none"}
	}
	return ks
}

// habitKeys names the habits of the file's writer a case carries.
func habitKeys(r *Record) []string {
	f := r.Spec.File
	var ks []string
	add := func(on bool, k string) {
		if on {
			ks = append(ks, k)
		}
	}
	add(f.CRLF, "CR LF")
	add(f.BOM, "byte order mark")
	add(f.Sci, "scientific notation")
	add(f.Title != "", "title line")
	add(f.Breaks > 0, "blank and comment lines between points")
	add(f.TrailingSep, "trailing separator")
	if len(ks) == 0 {
		ks = []string{"none"}
	}
	return ks
}

func planeKey(r *Record) string {
	if p := r.Spec.Placement.Plane; p != "" {
		return "3D " + p
	}
	return "2D"
}

// dimensions are the breakdowns the report prints.
var dimensions = []dimension{
	{name: "category", key: func(r *Record) string { return r.Spec.Category }},
	{name: "shape", key: familyKey},
	{name: "thickness", key: thicknessKey},
	{name: "measurement hazards", keys: hazardKeys},
	{name: "file habits", keys: habitKeys},
	{name: "true trailing edge", key: func(r *Record) string { return r.Truth.TEKind }},
	{name: "gap σ", key: sigmaBucket},
	{name: "good points", key: pointsBucket},
	{name: "noise (chord units)", key: noiseBucket},
	{name: "sampling zone", key: zoneKey},
	{name: "order", key: func(r *Record) string { return r.Spec.Order.Mode }},
	{name: "orientation", key: func(r *Record) string { return r.Spec.Placement.Orientation }},
	{name: "points in", key: planeKey},
	{name: "file", key: fileKey},
}

// WriteBreakdowns writes, for every dimension, a table of the main
// figures per bucket, so that a developer sees where the chain breaks.
func WriteBreakdowns(w io.Writer, recs []Record) {
	for _, d := range dimensions {
		groups := map[string][]*Record{}
		for i := range recs {
			ks := []string(nil)
			if d.keys != nil {
				ks = d.keys(&recs[i])
			} else {
				ks = []string{d.key(&recs[i])}
			}
			for _, k := range ks {
				groups[k] = append(groups[k], &recs[i])
			}
		}
		keys := make([]string, 0, len(groups))
		for k := range groups {
			keys = append(keys, k)
		}
		sort.Strings(keys)
		fmt.Fprintf(w, "\n%s\n\n", d.name)
		fmt.Fprintln(w, "| bucket | cases | prep ok | wrong | TE right | node err p95 | chord err p95 | twist err p95 | good dropped p95 | outliers caught |")
		fmt.Fprintln(w, "| --- | --- | --- | --- | --- | --- | --- | --- | --- | --- |")
		for _, k := range keys {
			rs := groups[k]
			var ok, wrong, te, planted, caught int
			var node, chord, twist, drop []float64
			for _, r := range rs {
				if !r.OK {
					continue
				}
				ok++
				if r.Wrong != "" {
					wrong++
				}
				if r.TERight {
					te++
				}
				planted += r.Planted
				caught += r.Caught
				node, chord, twist = append(node, r.NodeErr), append(chord, r.ChordErr), append(twist, r.TwistErr)
				if r.Good > 0 {
					drop = append(drop, share(r.GoodDropped, r.Good))
				}
			}
			fmt.Fprintf(w, "| %s | %d | %s | %d | %s | %s | %s | %s | %s | %s |\n", k, len(rs), pct(share(ok, len(rs))), wrong,
				pct(share(te, ok)), num(quantile(node, 0.95)), pct(quantile(chord, 0.95)), deg(quantile(twist, 0.95)),
				pct(quantile(drop, 0.95)), pct(share(caught, planted)))
		}
	}
}

func num(x float64) string {
	if math.IsNaN(x) {
		return "n/a"
	}
	return fmt.Sprintf("%.3g c", x)
}

func deg(x float64) string {
	if math.IsNaN(x) {
		return "n/a"
	}
	return fmt.Sprintf("%.3g°", x)
}

// Message normalisation for the failure histogram: file names and
// numbers vary from case to case.
var (
	fileName = regexp.MustCompile(`case-\d+\.[a-z]+`)
	number   = regexp.MustCompile(`[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?`)
)

// reasonKey returns the failure message with file names and numbers
// replaced, so that the same failure on different cases counts together.
func reasonKey(msg string) string {
	return number.ReplaceAllString(fileName.ReplaceAllString(msg, "FILE"), "#")
}

// WriteFailures writes the histogram of failure messages (the first line
// of the error, with file names and numbers masked), the most frequent
// top first, each with an example case, then the same for the wrong
// answers by what was wrong, and the trailing-edge kinds confused.
func WriteFailures(w io.Writer, recs []Record, top int) {
	type entry struct {
		key     string
		count   int
		example uint64
	}
	hist := func(keyOf func(*Record) string) []entry {
		m := map[string]*entry{}
		for i := range recs {
			k := keyOf(&recs[i])
			if k == "" {
				continue
			}
			e := m[k]
			if e == nil {
				e = &entry{key: k, example: recs[i].Seed}
				m[k] = e
			}
			e.count++
		}
		out := make([]entry, 0, len(m))
		for _, e := range m {
			out = append(out, *e)
		}
		sort.Slice(out, func(i, j int) bool {
			if out[i].count != out[j].count {
				return out[i].count > out[j].count
			}
			return out[i].key < out[j].key
		})
		return out
	}
	write := func(title string, es []entry) {
		fmt.Fprintf(w, "\n%s\n\n| count | message | example case |\n| --- | --- | --- |\n", title)
		for i, e := range es {
			if i == top {
				fmt.Fprintf(w, "| … | %d more kinds | |\n", len(es)-top)
				break
			}
			fmt.Fprintf(w, "| %d | %s | %d |\n", e.count, strings.ReplaceAll(e.key, "|", "/"), e.example)
		}
	}
	write("failures (first line of the error)", hist(func(r *Record) string {
		if r.OK {
			return ""
		}
		return reasonKey(r.Err)
	}))
	write("wrong answers (exit 0, beyond the stated uncertainty)", hist(func(r *Record) string {
		if r.Wrong == "" {
			return ""
		}
		return r.Wrong + " (" + r.Spec.Category + ")"
	}))
	write("trailing-edge kind confused (true → stated)", hist(func(r *Record) string {
		if !r.OK || r.TERight {
			return ""
		}
		if r.TEUndecidable {
			return r.Truth.TEKind + " → " + r.TEGot + " (undecidable at this sampling)"
		}
		return r.Truth.TEKind + " → " + r.TEGot
	}))
}
