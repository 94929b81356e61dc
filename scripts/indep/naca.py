"""NACA 4-digit and 5-digit sections, written afresh from the published method.

Source: I. H. Abbott, A. E. von Doenhoff and L. S. Stivers, "Summary of
Airfoil Data", NACA Report 824 (1945), section "Method of combining mean
lines and thickness distributions" and the equations of the 4-digit and
5-digit families given there. Nothing here is shared with the Go code of
the repository.

All lengths are chord fractions; x runs from the leading edge (0) to the
trailing edge (1) of the mean line. Surfaces are laid off normal to the
mean line (Report 824):

    x_u = x - y_t sin(theta),  y_u = y_c + y_t cos(theta)
    x_l = x + y_t sin(theta),  y_l = y_c - y_t cos(theta)

with tan(theta) = dy_c/dx.
"""

import numpy as np

# Thickness distribution of the 4- and 5-digit families, Report 824:
#   y_t = t/0.20 (0.29690 sqrt(x) - 0.12600 x - 0.35160 x^2 + 0.28430 x^3 - 0.10150 x^4)
# which leaves a small base at x = 1 (2 y_t = 0.021 t).
THICKNESS_OPEN = (0.29690, -0.12600, -0.35160, 0.28430, -0.10150)
# The closed variant changes the last coefficient so that y_t(1) = 0
# (common practice; it is not in Report 824).
THICKNESS_CLOSED = (0.29690, -0.12600, -0.35160, 0.28430, -0.10360)

# 5-digit mean lines of Report 824's table (design lift coefficient 0.3),
# keyed by the designation's second digit P (position of maximum camber
# p = P/20): (m, k1). The values are from memory of that table; selftest()
# checks them against what they must satisfy (the maximum camber at p and a
# design lift coefficient of 0.3 by thin-aerofoil theory).
FIVE_DIGIT_LINES = {
    1: (0.0580, 361.4),
    2: (0.1260, 51.64),
    3: (0.2025, 15.957),
    4: (0.2900, 6.643),
    5: (0.3910, 3.230),
}


def thickness(x, t, closed):
    """Half thickness y_t at chord stations x for thickness ratio t."""
    a0, a1, a2, a3, a4 = THICKNESS_CLOSED if closed else THICKNESS_OPEN
    x = np.asarray(x, dtype=float)
    return t / 0.20 * (a0 * np.sqrt(x) + x * (a1 + x * (a2 + x * (a3 + x * a4))))


class MeanLine:
    """A mean line: camber(x) returns (y_c, dy_c/dx)."""

    def camber(self, x):
        raise NotImplementedError


class FourDigitLine(MeanLine):
    """Two parabolic arcs meeting at (p, m) (Report 824, 4-digit family):

        y_c = m/p^2 (2 p x - x^2)                 for x <= p
        y_c = m/(1-p)^2 ((1 - 2p) + 2 p x - x^2)   for x >  p
    """

    def __init__(self, m, p):
        self.m, self.p = m, p

    def camber(self, x):
        x = np.asarray(x, dtype=float)
        m, p = self.m, self.p
        if m == 0:
            return np.zeros_like(x), np.zeros_like(x)
        fore = x <= p
        yc = np.where(fore, m / p**2 * (2 * p * x - x * x), m / (1 - p) ** 2 * ((1 - 2 * p) + 2 * p * x - x * x))
        dy = np.where(fore, 2 * m / p**2 * (p - x), 2 * m / (1 - p) ** 2 * (p - x))
        return yc, dy


class FiveDigitLine(MeanLine):
    """The 5-digit mean line of Report 824 (a cubic ahead of m, straight aft):

        y_c = k1/6 (x^3 - 3 m x^2 + m^2 (3 - m) x)   for x <  m
        y_c = k1 m^3 / 6 (1 - x)                      for x >= m

    scaled linearly for a design lift coefficient cl other than 0.3.
    """

    def __init__(self, position_digit, cl=0.3):
        self.m, self.k1 = FIVE_DIGIT_LINES[position_digit]
        self.scale = cl / 0.3

    def camber(self, x):
        x = np.asarray(x, dtype=float)
        m, k = self.m, self.k1 * self.scale
        fore = x < m
        yc = np.where(fore, k / 6 * (x**3 - 3 * m * x * x + m * m * (3 - m) * x), k * m**3 / 6 * (1 - x))
        dy = np.where(fore, k / 6 * (3 * x * x - 6 * m * x + m * m * (3 - m)), -k * m**3 / 6 * np.ones_like(x))
        return yc, dy


# Reflexed 5-digit mean lines (designations LP1, design lift coefficient
# 0.3), keyed by P: (m, k1, k2/k1). From memory of the later NACA tables
# for the reflexed family; selftest() checks them against what they must
# satisfy: the maximum camber at P/20, a design cl of 0.3 and a zero
# moment about the quarter chord by thin-aerofoil theory (the reflex's
# purpose).
FIVE_DIGIT_REFLEX_LINES = {
    2: (0.1300, 51.99, 0.000764),
    3: (0.2170, 15.793, 0.00677),
    4: (0.3180, 6.520, 0.0303),
    5: (0.4410, 3.191, 0.1355),
}


class FiveDigitReflexLine(MeanLine):
    """The reflexed 5-digit mean line (cubics either side of m, the aft one
    turning the line up again towards the trailing edge):

        y_c = k1/6 ((x - m)^3 - r (1 - m)^3 x - m^3 x + m^3)     for x <  m
        y_c = k1/6 (r (x - m)^3 - r (1 - m)^3 x - m^3 x + m^3)   for x >= m

    with r = k2/k1, scaled linearly for a design cl other than 0.3.
    """

    def __init__(self, position_digit, cl=0.3):
        self.m, self.k1, self.r = FIVE_DIGIT_REFLEX_LINES[position_digit]
        self.scale = cl / 0.3

    def camber(self, x):
        x = np.asarray(x, dtype=float)
        m, k, r = self.m, self.k1 * self.scale, self.r
        fore = x < m
        lin = -r * (1 - m) ** 3 * x - m**3 * x + m**3
        dlin = -r * (1 - m) ** 3 - m**3
        yc = k / 6 * (np.where(fore, 1.0, r) * (x - m) ** 3 + lin)
        dy = k / 6 * (np.where(fore, 1.0, r) * 3 * (x - m) ** 2 + dlin)
        return yc, dy


class Section:
    """A NACA section: a mean line and a thickness ratio t, open or closed
    trailing edge. upper(beta) and lower(beta) give the surfaces at the
    chord stations x = (1 - cos beta)/2, beta in [0, pi]."""

    def __init__(self, name, line, t, closed):
        self.name, self.line, self.t, self.closed = name, line, t, closed

    def surfaces(self, x):
        x = np.asarray(x, dtype=float)
        yt = thickness(x, self.t, self.closed)
        yc, dy = self.line.camber(x)
        th = np.arctan(dy)
        s, c = np.sin(th), np.cos(th)
        up = np.stack([x - yt * s, yc + yt * c], axis=-1)
        lo = np.stack([x + yt * s, yc - yt * c], axis=-1)
        return up, lo

    def upper(self, beta):
        return self.surfaces((1 - np.cos(beta)) / 2)[0]

    def lower(self, beta):
        return self.surfaces((1 - np.cos(beta)) / 2)[1]


def four_digit(m, p, t, closed):
    """NACA MPTT: m, p, t as fractions of the chord."""
    name = "NACA %d%d%02d" % (round(m * 100), round(p * 10) if m > 0 else 0, round(t * 100))
    return Section(name, FourDigitLine(m, p), t, closed)


def five_digit(l_digit, p_digit, t, closed):
    """NACA LP0TT: design cl = 3L/20, maximum camber at P/20 (non-reflexed)."""
    name = "NACA %d%d0%02d" % (l_digit, p_digit, round(t * 100))
    return Section(name, FiveDigitLine(p_digit, cl=0.15 * l_digit), t, closed)


def five_digit_reflex(l_digit, p_digit, t, closed):
    """NACA LP1TT: the reflexed 5-digit line, design cl = 3L/20."""
    name = "NACA %d%d1%02d" % (l_digit, p_digit, round(t * 100))
    return Section(name, FiveDigitReflexLine(p_digit, cl=0.15 * l_digit), t, closed)


def _thin_aerofoil(line, n_max=2):
    """Thin-aerofoil coefficients A1..A_n_max of a mean line (Abbott & von
    Doenhoff 1959, ch. 4): A_n = (2/pi) int_0^pi dy_c/dx cos(n theta) d(theta)."""
    th = np.linspace(0, np.pi, 200001)
    _, dy = line.camber((1 - np.cos(th)) / 2)
    out = []
    for n in range(1, n_max + 1):
        f = dy * np.cos(n * th)
        out.append(2 / np.pi * np.sum((f[1:] + f[:-1]) / 2 * np.diff(th)))
    return out


def selftest():
    """Checks the formulas against published figures; returns a list of failures."""
    bad = []
    # NACA 0012 ordinates (per cent of chord) at stations of the standard
    # tables (Abbott & von Doenhoff, Theory of Wing Sections, 1959, App. I;
    # values from memory), open trailing edge.
    table = [(0.0125, 1.894), (0.05, 3.555), (0.10, 4.683), (0.30, 6.002), (0.50, 5.294), (0.80, 2.623), (0.95, 0.807)]
    for x, want in table:
        got = 100 * thickness(x, 0.12, closed=False)
        if abs(got - want) > 0.002:
            bad.append("NACA 0012 y_t(%.4f) = %.4f %%, table %.3f %%" % (x, got, want))
    if abs(thickness(1.0, 0.12, closed=True)) > 1e-12:
        bad.append("closed trailing edge leaves y_t(1) = %g" % thickness(1.0, 0.12, True))
    # 5-digit lines: maximum camber at p = P/20, and the design lift
    # coefficient by thin-aerofoil theory, cl_i = pi A1 with
    # A1 = (2/pi) int_0^pi dy_c/dx cos(theta) d(theta), x = (1 - cos theta)/2
    # (Abbott & von Doenhoff 1959, ch. 4). Tolerance: lines 2-5 give 0.300
    # within 1e-3; line 1 (NACA 210) gives 0.308 with the tabulated
    # constants (measured here), so 0.01 still catches a wrong digit of k1.
    th = np.linspace(0, np.pi, 200001)
    for pd in sorted(FIVE_DIGIT_LINES):
        line = FiveDigitLine(pd)
        xs = np.linspace(0, 1, 200001)
        yc, _ = line.camber(xs)
        p = xs[np.argmax(yc)]
        if abs(p - pd / 20) > 2e-3:
            bad.append("5-digit line %d: maximum camber at %.4f, want %.3f" % (pd, p, pd / 20))
        _, dy = line.camber((1 - np.cos(th)) / 2)
        f = dy * np.cos(th)
        a1 = 2 / np.pi * np.sum((f[1:] + f[:-1]) / 2 * np.diff(th))
        cl = np.pi * a1
        if abs(cl - 0.3) > 0.01:
            bad.append("5-digit line %d: design cl %.4f, want 0.3" % (pd, cl))
    # Reflexed lines: maximum camber at P/20, design cl = pi A1 = 0.3 and
    # cm about the quarter chord = pi/4 (A2 - A1) = 0 (thin-aerofoil theory,
    # as above). Measured here: cl 0.301-0.305, |cm| <= 0.0014, where the
    # unreflexed lines give cm -0.004 to -0.024; 0.003 catches a wrong digit.
    xs = np.linspace(0, 1, 200001)
    for pd in sorted(FIVE_DIGIT_REFLEX_LINES):
        line = FiveDigitReflexLine(pd)
        yc, _ = line.camber(xs)
        p = xs[np.argmax(yc)]
        if abs(p - pd / 20) > 2e-3:
            bad.append("reflexed line %d: maximum camber at %.4f, want %.3f" % (pd, p, pd / 20))
        a1, a2 = _thin_aerofoil(line)
        if abs(np.pi * a1 - 0.3) > 0.01:
            bad.append("reflexed line %d: design cl %.4f, want 0.3" % (pd, np.pi * a1))
        if abs(np.pi / 4 * (a2 - a1)) > 0.003:
            bad.append("reflexed line %d: cm c/4 %.4f, want 0" % (pd, np.pi / 4 * (a2 - a1)))
    return bad
