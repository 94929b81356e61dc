package campaign

import (
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/scangen"
)

// The meaning of the stop 26 bound, checked by drawing the noise: for a
// blunt base (Report 824's open edge of NACA 0012) with one point on it,
// against its sharp rival, the test that keeps the outline nearer to the
// noisy points (the sum of their squared distances from it) picks the
// sharp corner in at most 5 % of draws when λ ≥ (2·1.645)², and in more
// when λ is half of that. For two outlines known point by point the
// statistic is normal with mean λ and variance 4λ and errs in exactly
// Φ(−√λ/2) of draws (Neyman–Pearson lemma, normal law); with outlines
// the points slide along, the error is checked here by Monte Carlo
// (4000 draws each, 1000 under the race detector; a fixed seed).
func TestTEJudgeBoundErrorRate(t *testing.T) {
	open, _, _ := naca0012Ends(t, 0.005)
	sh := open.Shape
	e, ok := newTEEnds(sh)
	if !ok {
		t.Fatal("no sharp rival for the open edge")
	}
	rival := e.sharp()
	lines := evenLines(open, 0.004, 2.5)
	// The points within 0.02 c of the end: forward of that both outlines
	// are the same surface, and a point there adds nothing to either.
	var pts []geometry.Point
	for _, l := range lines {
		if p := sh.At(l.T); p.X >= 0.98 {
			pts = append(pts, p)
		}
	}
	half, slope := naca0012OpenEnd()
	d := half / math.Sqrt(1+slope*slope) // the base point's distance from the end tangent
	rng := rand.New(rand.NewPCG(26, 1))
	draws := 4000
	if raceEnabled {
		draws = 1000
	}
	wrongRate := func(s float64) float64 {
		wrong := 0
		for range draws {
			var stat float64
			for _, p := range pts {
				q := geometry.Point{X: p.X + s*rng.NormFloat64(), Y: p.Y + s*rng.NormFloat64()}
				dr, _ := polyDist(q, rival)
				dt, _ := sh.Nearest(q)
				stat += dr*dr - dt*dt
			}
			if stat < 0 {
				wrong++
			}
		}
		return float64(wrong) / float64(draws)
	}
	for _, tc := range []struct {
		lambda float64
		decide bool
	}{{teSeparation * 1.05, true}, {teSeparation / 2, false}} {
		noise := d / math.Sqrt(tc.lambda)
		v := teJudge(&scangen.Truth{Section: open, TEKind: open.TEKind, TEThickness: 2 * half, Noise: noise, Lines: lines})
		if math.Abs(v.Each[0]/tc.lambda-1) > 0.01 {
			t.Fatalf("λ against sharp %.4g, want %.4g", v.Each[0], tc.lambda)
		}
		if got := v.Each[0] >= teSeparation; got != tc.decide {
			t.Fatalf("λ %.4g: sharp ruled out %v, want %v", v.Each[0], got, tc.decide)
		}
		rate := wrongRate(noise)
		np := 0.5 * math.Erfc(math.Sqrt(tc.lambda)/2/math.Sqrt2)
		tol := 4 * math.Sqrt(0.05*0.95/float64(draws))
		if tc.decide && rate > 0.05+tol {
			t.Errorf("λ %.4g (decided): the sharp corner picked in %.2f %% of draws, want ≤ 5 %% (Φ(−√λ/2) = %.2f %%)", tc.lambda, 100*rate, 100*np)
		}
		if !tc.decide && rate < 0.05+tol {
			t.Errorf("λ %.4g (undecided): the sharp corner picked in %.2f %% of draws, want well over 5 %% (Φ(−√λ/2) = %.2f %%)", tc.lambda, 100*rate, 100*np)
		}
		t.Logf("λ %.4g: wrong in %.2f %% of draws, Φ(−√λ/2) = %.2f %%", tc.lambda, 100*rate, 100*np)
	}
}

// Rejudging the records of a run, read back from their file, gives the
// judgements the run made: the judgements read the truth of each seed
// and its points, never the section (a sharp truth its kind alone). A
// record whose case the seed does not give again is refused.
func TestRejudgeMatchesRun(t *testing.T) {
	// A few cases of each kind of end.
	want := map[string]int{scangen.TESharp: 1, scangen.TEBlunt: 2, scangen.TERounded: 2}
	var seeds []uint64
	for s := uint64(1); s < 400 && len(seeds) < 5; s++ {
		c, err := NewCase(s)
		if err != nil {
			t.Fatal(err)
		}
		if k := c.Scan.Truth.TEKind; want[k] > 0 {
			want[k]--
			seeds = append(seeds, s)
		}
	}
	if len(seeds) < 5 {
		t.Fatalf("seeds 1–399 hold too few cases of each end: %v", seeds)
	}
	run, err := Run(seeds, Options{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "r.jsonl")
	if err := WriteRecords(path, run); err != nil {
		t.Fatal(err)
	}
	recs, err := ReadRecords(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) != len(run) {
		t.Fatalf("%d records read, %d written", len(recs), len(run))
	}
	ok := 0
	for i := range recs {
		r := &recs[i]
		if r.OK {
			ok++
		}
		// Judged otherwise on purpose: Rejudge must set every field.
		r.TEUndecidable, r.TEUndecidable26, r.TEEndPoints = !r.TEUndecidable, !r.TEUndecidable26, -7
		r.TESeparation, r.TELambda26, r.TEMiss26, r.TERival26, r.TEWhy26 = 1e9, 1e9, 1e9, "x", "x"
	}
	if ok == 0 {
		t.Fatal("no case succeeded")
	}
	if err := Rejudge(recs, false, 2); err != nil {
		t.Fatal(err)
	}
	for i, r := range recs {
		g := run[i]
		if !r.OK {
			continue
		}
		if r.TEUndecidable != g.TEUndecidable || r.TEEndPoints != g.TEEndPoints || r.TESeparation != g.TESeparation ||
			r.TEUndecidable26 != g.TEUndecidable26 || r.TERival26 != g.TERival26 || r.TELambda26 != g.TELambda26 ||
			r.TEWhy26 != g.TEWhy26 || r.TEMiss26 != g.TEMiss26 || r.TERight != g.TERight || r.TEGot != g.TEGot {
			t.Errorf("case %d (%s): rejudged %+v, run %+v", r.Seed, r.Truth.TEKind,
				[]any{r.TEUndecidable, r.TEEndPoints, r.TESeparation, r.TEUndecidable26, r.TERival26, r.TELambda26, r.TEWhy26, r.TEMiss26},
				[]any{g.TEUndecidable, g.TEEndPoints, g.TESeparation, g.TEUndecidable26, g.TERival26, g.TELambda26, g.TEWhy26, g.TEMiss26})
		}
	}
	// (A sharp truth is judged by its kind alone, without its case.)
	for i := range recs {
		if recs[i].OK && recs[i].Truth.TEKind != scangen.TESharp {
			recs[i].Truth.TEThickness += 1e-3
			break
		}
	}
	if err := Rejudge(recs, false, 2); err == nil || !strings.Contains(err.Error(), "not the one recorded") {
		t.Errorf("a record another case: error %v, want \"not the one recorded\"", err)
	}
}

// ReadRecords names the file and the line of a record it cannot read.
func TestReadRecordsErrors(t *testing.T) {
	dir := t.TempDir()
	for _, tc := range []struct{ body, want string }{
		{`{"Seed":1,"Truth":{"te_kind":"sharp"}}` + "\n" + `{"Seed":2,`, ":2: not a campaign record"},
		{`{"Seed":1,"Truth":{"te_kind":"sharp"}}` + "\n\n" + `{"File":"x"}`, ":3: not a campaign record: no seed or no truth"},
	} {
		path := filepath.Join(dir, "r.jsonl")
		if err := os.WriteFile(path, []byte(tc.body), 0o644); err != nil {
			t.Fatal(err)
		}
		_, err := ReadRecords(path)
		if err == nil || !strings.Contains(err.Error(), path+tc.want) {
			t.Errorf("%q: error %v, want %q", tc.body, err, path+tc.want)
		}
	}
}
