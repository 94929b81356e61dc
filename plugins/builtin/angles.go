package builtin

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// ParseAngles reads angles of attack written "a,b,c" or "start:stop:step"
// (stop included when the steps reach it), in degrees, for the alpha_deg
// parameter every built-in stage takes. Every angle must be finite and
// within [-90, 90], and there may be at most MaxAngles.
func ParseAngles(s string) ([]float64, error) {
	num := func(f string) (float64, error) {
		x, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
			return 0, fmt.Errorf("%q is not a number", strings.TrimSpace(f))
		}
		return x, nil
	}
	var out []float64
	if parts := strings.Split(s, ":"); len(parts) > 1 {
		if len(parts) != 3 {
			return nil, fmt.Errorf("a range is start:stop:step, got %d field(s)", len(parts))
		}
		var v [3]float64
		for i, p := range parts {
			x, err := num(p)
			if err != nil {
				return nil, err
			}
			v[i] = x
		}
		start, stop, step := v[0], v[1], v[2]
		if step == 0 || (stop-start)*step < 0 {
			return nil, fmt.Errorf("step %g does not lead from %g to %g", step, start, stop)
		}
		// Count the steps once, allowing for rounding in (stop-start)/step,
		// and compute each angle from its index so errors do not add up.
		n := math.Floor((stop-start)/step + 1e-9)
		if n+1 > MaxAngles {
			return nil, fmt.Errorf("%g angles, at most %d allowed", n+1, MaxAngles)
		}
		for i := 0; i <= int(n); i++ {
			out = append(out, start+float64(i)*step)
		}
	} else {
		for _, f := range strings.Split(s, ",") {
			x, err := num(f)
			if err != nil {
				return nil, err
			}
			out = append(out, x)
		}
		if len(out) > MaxAngles {
			return nil, fmt.Errorf("%d angles, at most %d allowed", len(out), MaxAngles)
		}
	}
	for _, a := range out {
		if math.Abs(a) > 90 {
			return nil, fmt.Errorf("angle %g is outside [-90, 90] degrees", a)
		}
	}
	return out, nil
}
