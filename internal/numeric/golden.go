package numeric

// Golden returns the minimiser of f on [a, b] by golden-section search,
// after iters reductions of the bracket by the golden ratio (Kiefer,
// Sequential minimax search for a maximum, Proc. AMS 4 (1953) 502–506).
// The bracket shrinks to 0.618^iters of its width; the midpoint of the
// last bracket is returned. f is assumed unimodal on [a, b].
func Golden(f func(float64) float64, a, b float64, iters int) float64 {
	const g = 0.6180339887498949
	c, d := b-g*(b-a), a+g*(b-a)
	fc, fd := f(c), f(d)
	for range iters {
		if fc < fd {
			b, d, fd = d, c, fc
			c = b - g*(b-a)
			fc = f(c)
		} else {
			a, c, fc = c, d, fd
			d = a + g*(b-a)
			fd = f(d)
		}
	}
	return (a + b) / 2
}
