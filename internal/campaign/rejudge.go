package campaign

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"runtime"
	"sort"
	"strings"
	"sync"

	"github.com/foilwright/foilwright/internal/scangen"
)

// ReadRecords reads the records WriteRecords wrote (one JSON object a
// line). An error names the file and the line.
func ReadRecords(path string) ([]Record, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	var recs []Record
	sc := bufio.NewScanner(f)
	sc.Buffer(make([]byte, 1<<20), 1<<26)
	for line := 1; sc.Scan(); line++ {
		if len(strings.TrimSpace(sc.Text())) == 0 {
			continue
		}
		var r Record
		if err := json.Unmarshal(sc.Bytes(), &r); err != nil {
			return nil, fmt.Errorf("%s:%d: not a campaign record: %v", path, line, err)
		}
		if r.Seed == 0 || r.Truth == nil {
			return nil, fmt.Errorf("%s:%d: not a campaign record: no seed or no truth", path, line)
		}
		recs = append(recs, r)
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("%s: %v", path, err)
	}
	return recs, nil
}

// Rejudge makes this build's trailing-edge judgements (judgeTE) again on
// records of a run, perhaps of another build of the tool: each record's
// case is generated again from its seed (with a fixture when fixture is
// set, as the run had it), and the judgements read only that truth and
// its points, never the section, so the records' stated kinds and
// rightness stand. It returns an error when a case generated again is
// not the one recorded (another generator, or fixture set otherwise than
// in the run): judging it would judge another case. workers cases are
// judged at once (0: one per CPU).
func Rejudge(recs []Record, fixture bool, workers int) error {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	errs := make([]error, len(recs))
	next := make(chan int)
	var wg sync.WaitGroup
	for range workers {
		wg.Go(func() {
			for i := range next {
				errs[i] = rejudgeOne(&recs[i], fixture)
			}
		})
	}
	for i := range recs {
		next <- i
	}
	close(next)
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}

// rejudgeOne rejudges one record (Rejudge).
func rejudgeOne(r *Record, fixture bool) error {
	if !r.OK {
		return nil
	}
	if r.Truth != nil && r.Truth.TEKind == scangen.TESharp {
		judgeTE(r, r.Truth) // reads the kind alone
		return nil
	}
	c, err := newCase(r.Seed, fixture)
	if err != nil {
		return err
	}
	tr := c.Scan.Truth
	if t := r.Truth; t == nil || t.TEKind != tr.TEKind || t.TEThickness != tr.TEThickness || t.Noise != tr.Noise ||
		t.Resolution != tr.Resolution || t.Chord != tr.Chord || c.Scan.Name != r.File {
		return fmt.Errorf("case %d: the case generated again is not the one recorded (another generator, or -fixture otherwise than in the run)", r.Seed)
	}
	judgeTE(r, tr)
	return nil
}

// TEFigures returns the rows of Figures that concern the trailing-edge
// judgement (for a rejudged run, whose other figures are the run's).
func TEFigures(recs []Record) []Figure {
	var out []Figure
	for _, f := range Figures(recs) {
		if strings.HasPrefix(f.Name, "trailing-edge") {
			out = append(out, f)
		}
	}
	return out
}

// WriteTEJudgements writes how the two judgements of the trailing edge
// split the successes: the cases each calls undecidable, by true kind →
// rival kind and why (the stop 26 one; the stop 23 one by its rule), and
// the cases the two judge differently with whether the stated kind was
// right, so that a reader sees what the change of judgement moves in
// both directions.
func WriteTEJudgements(w io.Writer, recs []Record) {
	type row struct {
		n, right int
		miss     []float64
	}
	count := func(m map[string]*row, k string, r *Record) {
		e := m[k]
		if e == nil {
			e = &row{}
			m[k] = e
		}
		e.n++
		if r.TERight {
			e.right++
		}
		if r.TEMiss26 >= 0 && r.TEWhy26 != "" {
			e.miss = append(e.miss, r.TEMiss26)
		}
	}
	new26, old23, moved := map[string]*row{}, map[string]*row{}, map[string]*row{}
	for i := range recs {
		r := &recs[i]
		if !r.OK {
			continue
		}
		if r.TEUndecidable26 {
			rival := r.TERival26
			if rival == "" {
				rival = "?"
			}
			count(new26, r.Truth.TEKind+" → "+rival+": "+r.TEWhy26, r)
		}
		if r.TEUndecidable {
			count(old23, r.Truth.TEKind+": "+stop23Why(r), r)
		}
		switch {
		case r.TEUndecidable && !r.TEUndecidable26:
			count(moved, r.Truth.TEKind+": undecidable (stop 23) → decided (stop 26)", r)
		case !r.TEUndecidable && r.TEUndecidable26:
			count(moved, r.Truth.TEKind+": decided (stop 23) → undecidable (stop 26)", r)
		}
	}
	write := func(title string, m map[string]*row, withMiss bool) {
		keys := make([]string, 0, len(m))
		for k := range m {
			keys = append(keys, k)
		}
		sort.Slice(keys, func(i, j int) bool {
			if m[keys[i]].n != m[keys[j]].n {
				return m[keys[i]].n > m[keys[j]].n
			}
			return keys[i] < keys[j]
		})
		fmt.Fprintf(w, "\n%s\n\n", title)
		if withMiss {
			fmt.Fprintln(w, "| cases | of them stated right | kind pair and why | median chance that such an end holds no point |")
			fmt.Fprintln(w, "| --- | --- | --- | --- |")
		} else {
			fmt.Fprintln(w, "| cases | of them stated right | kinds |")
			fmt.Fprintln(w, "| --- | --- | --- |")
		}
		for _, k := range keys {
			e := m[k]
			if withMiss {
				miss := "n/a"
				if len(e.miss) > 0 {
					miss = pct(quantile(e.miss, 0.5))
				}
				fmt.Fprintf(w, "| %d | %d | %s | %s |\n", e.n, e.right, k, miss)
			} else {
				fmt.Fprintf(w, "| %d | %d | %s |\n", e.n, e.right, k)
			}
		}
	}
	write("trailing edge undecidable, stop 26 judgement (true kind → best rival: why)", new26, true)
	write("trailing edge undecidable, stop 23 judgement (true kind: rule)", old23, false)
	write("trailing edge judged differently by the two judgements", moved, false)
}

// stop23Why names the rule of the stop 23 judgement that called a case
// undecidable, from what its record keeps.
func stop23Why(r *Record) string {
	switch {
	case r.Truth.TEKind == scangen.TERounded && r.TEEndPoints < 3:
		return "fewer than three points on the rounded end"
	case r.TESeparation >= 0 && r.TESeparation < teSeparation:
		return "points within their scatter of a rival (λ below the bound)"
	case r.Truth.TEKind == scangen.TEBlunt && r.TEEndPoints == 0:
		return "no point on the base, the sharp corner's gap plausible or the scan stops short"
	}
	return "other"
}
