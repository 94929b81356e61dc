package plot

import (
	"math"
	"strconv"
	"strings"

	gplot "gonum.org/v1/plot"
)

// niceTicks marks an axis with about n labelled ticks at steps of 1, 2, 2.5
// or 5 times a power of ten, and unlabelled minor ticks between them.
type niceTicks struct{ n int }

// Ticks implements gonum's plot.Ticker.
func (t niceTicks) Ticks(lo, hi float64) []gplot.Tick {
	if !(hi > lo) || math.IsInf(hi-lo, 0) {
		return []gplot.Tick{{Value: lo, Label: tickLabel(lo, 0)}}
	}
	n := max(t.n, 2)
	// Pick the step whose count of ticks comes nearest n.
	raw := (hi - lo) / float64(n)
	exp := math.Floor(math.Log10(raw))
	step, minor, decimals, best := 0.0, 0.0, 0, math.Inf(1)
	for _, e := range []float64{exp - 1, exp, exp + 1} {
		mag := math.Pow(10, e)
		for _, m := range []struct{ step, minor float64 }{{1, 5}, {2, 4}, {2.5, 5}, {5, 5}} {
			count := (hi - lo) / (m.step * mag)
			miss := math.Abs(math.Log(count / float64(n)))
			if m.step == 2.5 {
				miss += 0.35 // a less familiar step: only when clearly better
			}
			if miss < best-1e-9 {
				best, step, minor = miss, m.step*mag, m.minor
				decimals = -int(e)
				if m.step == 2.5 {
					decimals++
				}
			}
		}
	}
	decimals = max(decimals, 0)
	var ticks []gplot.Tick
	for k := math.Ceil(lo/step - 1e-9); k*step <= hi+step*1e-9; k++ {
		v := k * step
		ticks = append(ticks, gplot.Tick{Value: v, Label: tickLabel(v, decimals)})
	}
	sub := step / minor
	for k := math.Ceil(lo/sub - 1e-9); k*sub <= hi+sub*1e-9; k++ {
		if math.Mod(k, minor) != 0 {
			ticks = append(ticks, gplot.Tick{Value: k * sub})
		}
	}
	return ticks
}

// tickLabel formats v with the given decimals, with a true minus sign and
// no negative zero.
func tickLabel(v float64, decimals int) string {
	s := strconv.FormatFloat(v, 'f', decimals, 64)
	if strings.Trim(s, "-0.") == "" {
		s = strings.TrimPrefix(s, "-")
	}
	return strings.Replace(s, "-", "\u2212", 1)
}
