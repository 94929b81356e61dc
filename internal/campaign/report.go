package campaign

import (
	"fmt"
	"io"
	"math"
	"regexp"
	"sort"
	"strings"
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

// A dimension splits the records into buckets for a breakdown.
type dimension struct {
	name string
	key  func(*Record) string
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
	if s.NACA != nil {
		if s.NACA.ClosedTE {
			name += " closed TE"
		} else {
			name += " open TE"
		}
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

func planeKey(r *Record) string {
	if p := r.Spec.Placement.Plane; p != "" {
		return "3D " + p
	}
	return "2D"
}

// dimensions are the breakdowns the report prints.
var dimensions = []dimension{
	{"category", func(r *Record) string { return r.Spec.Category }},
	{"shape", familyKey},
	{"true trailing edge", func(r *Record) string { return r.Truth.TEKind }},
	{"gap σ", sigmaBucket},
	{"good points", pointsBucket},
	{"noise (chord units)", noiseBucket},
	{"sampling zone", zoneKey},
	{"order", func(r *Record) string { return r.Spec.Order.Mode }},
	{"orientation", func(r *Record) string { return r.Spec.Placement.Orientation }},
	{"points in", planeKey},
	{"file", fileKey},
}

// WriteBreakdowns writes, for every dimension, a table of the main
// figures per bucket, so that a developer sees where the chain breaks.
func WriteBreakdowns(w io.Writer, recs []Record) {
	for _, d := range dimensions {
		groups := map[string][]*Record{}
		for i := range recs {
			k := d.key(&recs[i])
			groups[k] = append(groups[k], &recs[i])
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
