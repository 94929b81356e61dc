package campaign

import (
	"bufio"
	"bytes"
	"encoding/json"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"testing"

	"github.com/foilwright/foilwright/internal/scangen"
)

// indepPython returns the Python that FOILWRIGHT_INDEP_PYTHON names when
// it has numpy, or "": the independent check stays out of the normal
// suite (DEVELOPERS.md: go test does not call it), and a developer who
// changes either judgement runs this test with it set.
func indepPython() string {
	py := os.Getenv("FOILWRIGHT_INDEP_PYTHON")
	if py == "" || exec.Command(py, "-c", "import numpy").Run() != nil {
		return ""
	}
	return py
}

// indepTruth is a case as scripts/indep/tejudge.py reads it (see its main).
type indepTruth struct {
	TEKind       string       `json:"te_kind"`
	TESize       float64      `json:"te_size"`
	Scatter      float64      `json:"scatter"`
	Outline      [][2]float64 `json:"outline"`
	OutlinePiece []int        `json:"outline_piece"`
	S            []float64    `json:"s"`
	Piece        []int        `json:"piece"`
}

// newIndepTruth writes the truth of a case for tejudge.py: the outline
// sampled evenly in arc length on each piece (the lower surface's last
// vertex the lower end corner), the good points by their arc length.
func newIndepTruth(tr *scangen.Truth) indepTruth {
	sh := tr.Section.Shape
	c := indepTruth{TEKind: tr.TEKind, TESize: tr.TEThickness, Scatter: math.Sqrt(tr.Noise*tr.Noise + tr.Resolution*tr.Resolution/12)}
	add := func(piece int, s0, s1 float64, n, from, to int) {
		for j := from; j <= to; j++ {
			p := sh.At(sh.ParamAt(s0 + (s1-s0)*float64(j)/float64(n)))
			c.Outline = append(c.Outline, [2]float64{p.X, p.Y})
			c.OutlinePiece = append(c.OutlinePiece, piece)
		}
	}
	s1, s2, s3 := sh.ArcAt(1), sh.ArcAt(2), sh.Length()
	add(0, 0, s1, 4000, 0, 3999)
	add(1, s1, s2, 4000, 0, 4000)
	add(2, s2, s3, 400, 1, 399)
	piece := map[scangen.PieceKind]int{scangen.Upper: 0, scangen.Lower: 1}
	for _, l := range tr.Lines {
		if l.Kind != scangen.LineGood {
			continue
		}
		k, ok := piece[sh.Kind(l.T)]
		if !ok {
			k = 2
		}
		c.S = append(c.S, sh.ArcAt(l.T))
		c.Piece = append(c.Piece, k)
	}
	return c
}

// The independent check's judgement (scripts/indep/tejudge.py, written
// apart, numpy) and teJudge make the same calls on the same cases:
// generated cases with a blunt or a rounded end, their truths handed to
// both. They estimate the spacing's irregularity differently (a median
// absolute deviation against an interquartile range) and draw their
// rivals on different polylines, so a case whose λ lies near the bound
// may go either way; the test asks that the calls agree wherever neither
// λ lies within 10 % of the bound, and on at least 90 % of all cases.
func TestTEJudgeAgreesWithIndep(t *testing.T) {
	py := indepPython()
	if py == "" {
		t.Skip("FOILWRIGHT_INDEP_PYTHON does not name a Python with numpy: the independent check is opt-in")
	}
	n := 40
	if raceEnabled {
		n = 10
	}
	var cases []indepTruth
	var want []teVerdict
	var seeds []uint64
	for s := uint64(1); len(cases) < n && s < 2000; s++ {
		c, err := NewCase(s)
		if err != nil {
			t.Fatal(err)
		}
		tr := c.Scan.Truth
		if tr.TEKind == scangen.TESharp || tr.Section.Shape.Pieces() < 3 {
			continue
		}
		v := teJudge(tr)
		if !v.OK {
			continue
		}
		cases = append(cases, newIndepTruth(tr))
		want = append(want, v)
		seeds = append(seeds, s)
	}
	path := filepath.Join(t.TempDir(), "truths.json")
	data, err := json.Marshal(cases)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(py, filepath.Join("..", "..", "scripts", "indep", "tejudge.py"), path)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("tejudge.py: %v\n%s", err, stderr.String())
	}
	sc := bufio.NewScanner(bytes.NewReader(out))
	agree, k := 0, 0
	near := func(l float64) bool { return math.Abs(l/teSeparation-1) < 0.1 }
	for ; sc.Scan(); k++ {
		if k >= len(want) {
			t.Fatalf("tejudge.py printed more lines than %d cases", len(want))
		}
		var got *struct {
			Decided bool
			Rival   string
			Lam     *float64
		}
		if err := json.Unmarshal(sc.Bytes(), &got); err != nil {
			t.Fatalf("tejudge.py line %d: %v", k+1, err)
		}
		w := want[k]
		if got == nil {
			t.Errorf("case %d (%s): tejudge.py does not judge it, teJudge does (decided %v)", seeds[k], cases[k].TEKind, w.Decided)
			continue
		}
		if got.Decided == w.Decided {
			agree++
			continue
		}
		lam := math.Inf(1)
		if got.Lam != nil {
			lam = *got.Lam
		}
		if !near(lam) && !near(w.Lambda) {
			t.Errorf("case %d (%s): teJudge decided %v (rival %s, λ %.4g), tejudge.py %v (rival %s, λ %.4g)",
				seeds[k], cases[k].TEKind, w.Decided, w.Rival, w.Lambda, got.Decided, got.Rival, lam)
		}
	}
	if k != len(want) {
		t.Fatalf("tejudge.py judged %d cases of %d", k, len(want))
	}
	if float64(agree) < 0.9*float64(k) {
		t.Errorf("the two judgements agree on %d of %d cases, want ≥ 90 %%", agree, k)
	}
	t.Logf("agree on %d of %d cases with a blunt or a rounded end", agree, k)
}
