package curve

import "github.com/foilwright/foilwright/internal/par"

// goldenAhead returns numeric.Golden(f, a, b, iters): the same points
// evaluated in the same order, the same brackets and the same result.
// The search itself is one evaluation after another, each placed by the
// one before; here, while a point is evaluated, a second core evaluates the
// point the step after would take if the new value turns out the lower
// of the pair (half the time it does, and that step then costs nothing),
// and the search's first pair is evaluated at once. f must be safe to
// call from two goroutines at once and return the same value for the
// same point (a spline problem's fits are and do).
func goldenAhead(f func(float64) float64, a, b float64, iters int) float64 {
	const g = 0.6180339887498949
	c, d := b-g*(b-a), a+g*(b-a)
	var fc, fd float64
	par.For(2, 2, func(_, k int) {
		if k == 0 {
			fc = f(c)
		} else {
			fd = f(d)
		}
	})
	// step is one reduction of numeric.Golden's bracket: it returns the
	// new bracket and the point whose value it needs (in c when low, else
	// in d).
	type bracket struct{ a, b, c, d, fc, fd float64 }
	step := func(s bracket) (bracket, float64, bool) {
		if s.fc < s.fd {
			s.b, s.d, s.fd = s.d, s.c, s.fc
			s.c = s.b - g*(s.b-s.a)
			return s, s.c, true
		}
		s.a, s.c, s.fc = s.c, s.d, s.fd
		s.d = s.a + g*(s.b-s.a)
		return s, s.d, false
	}
	s := bracket{a, b, c, d, fc, fd}
	var ahead, aheadV float64 // the point evaluated ahead, and its value
	haveAhead := false
	for range iters {
		next, x, low := step(s)
		var v float64
		if haveAhead && ahead == x {
			v = aheadV
			haveAhead = false
		} else {
			// The step after, if the new value is the lower of the pair.
			guess := next
			if low {
				guess.fc, guess.fd = 0, 1
			} else {
				guess.fc, guess.fd = 1, 0
			}
			_, y, _ := step(guess)
			haveAhead = y != x
			par.For(2, 2, func(_, k int) {
				if k == 0 {
					v = f(x)
				} else if haveAhead {
					aheadV = f(y)
				}
			})
			ahead = y
		}
		if low {
			next.fc = v
		} else {
			next.fd = v
		}
		s = next
	}
	return (s.a + s.b) / 2
}
