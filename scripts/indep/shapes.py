"""Shapes beyond the NACA families of naca.py, for the practitioner's classes
of hidden.py: Kármán–Trefftz sections (cusped or with a small trailing-edge
angle) and thick flatback sections (a blunt base made by thickening the
aft part, as thick wind-turbine root sections have).

Each is a naca.Section-like object: name, t (the largest thickness, chord
fractions, measured on the outline) and upper(beta), lower(beta) running
from the nose (beta = 0) to the trailing edge (beta = pi), which is what
outline.Outline needs.

Kármán–Trefftz: the exact conformal map (Milne-Thomson, Theoretical
Aerodynamics, ch. 6; Kármán & Trefftz 1918)

    z = n a (1 + w) / (1 - w),   w = ((zeta - a) / (zeta + a))^n,   n = 2 - tau/pi

of a circle through zeta = a with its centre at (-eps_x, eps_y) a, which
gives a trailing edge of included angle tau (tau = 0: the Joukowski map
z = zeta + a^2/zeta and a cusp). selftest() checks both properties.
"""

import numpy as np

import naca


class KarmanTrefftz:
    """A Kármán–Trefftz section: thickness parameter eps_x, camber eps_y
    (circle centre at (-eps_x, eps_y), a = 1), trailing-edge angle tau_deg."""

    def __init__(self, eps_x, eps_y, tau_deg):
        self.eps_x, self.eps_y, self.tau_deg = eps_x, eps_y, tau_deg
        self.n = 2 - np.radians(tau_deg) / np.pi
        self.centre = complex(-eps_x, eps_y)
        self.radius = abs(1 - self.centre)
        self.theta_te = float(np.angle(1 - self.centre))
        zeta = self.centre + self.radius * np.exp(1j * (self.theta_te + np.pi))
        self.phi_ref = float(np.angle((zeta - 1) / (zeta + 1)))
        z_te = self.raw(np.array([self.theta_te]))[0]
        # The nose: the outline point farthest from the trailing edge.
        th = self.theta_te + np.linspace(0, 2 * np.pi, 200001)[1:-1]
        d = np.abs(self.raw(th) - z_te)
        k = int(np.argmax(d))
        a, b = th[k - 1], th[k + 1]
        for _ in range(80):  # golden section on the distance
            c1, c2 = b - 0.618034 * (b - a), a + 0.618034 * (b - a)
            if abs(self.raw(np.array([c1]))[0] - z_te) > abs(self.raw(np.array([c2]))[0] - z_te):
                b = c2
            else:
                a = c1
        self.theta_nose = (a + b) / 2
        self.z_te, self.z_nose = z_te, self.raw(np.array([self.theta_nose]))[0]
        self.name = "KT %.3f/%.3f %s" % (eps_x, eps_y, "cusp" if tau_deg == 0 else "%.1fdeg" % tau_deg)
        b = np.linspace(0, np.pi, 4001)
        up, lo = self.upper(b), self.lower(b)
        xs = np.linspace(0.001, 0.999, 999)
        iu, il = np.argsort(up[:, 0]), np.argsort(lo[:, 0])
        self.t = float(np.max(np.interp(xs, up[iu, 0], up[iu, 1]) - np.interp(xs, lo[il, 0], lo[il, 1])))

    def raw(self, theta):
        """The mapped circle points at circle angles theta (the raw z plane)."""
        zeta = self.centre + self.radius * np.exp(1j * np.asarray(theta, dtype=float))
        u = (zeta - 1) / (zeta + 1)
        # One branch of the power for the whole circle: its image under u
        # is a circle through 0 (at the trailing edge), on which arg u stays
        # within 90 degrees of arg u at the point opposite the edge.
        ang = self.phi_ref + np.angle(u * np.exp(-1j * self.phi_ref))
        w = np.abs(u) ** self.n * np.exp(1j * self.n * ang)
        return self.n * (1 + w) / (1 - w)

    def _norm(self, z):
        q = (z - self.z_nose) / (self.z_te - self.z_nose)
        return np.stack([q.real, q.imag], axis=-1)

    def _theta(self, beta, upper):
        f = (1 - np.cos(np.asarray(beta, dtype=float))) / 2  # dense at the nose and the edge
        if upper:
            return self.theta_nose - (self.theta_nose - self.theta_te) * f
        return self.theta_nose + (self.theta_te + 2 * np.pi - self.theta_nose) * f

    def upper(self, beta):
        return self._norm(self.raw(self._theta(beta, True)))

    def lower(self, beta):
        return self._norm(self.raw(self._theta(beta, False)))


class Flatback(naca.Section):
    """A NACA 4-digit section (closed thickness) thickened aft into a blunt
    base of height h (chord fractions): y_t + h/2 x^2, a smooth blend that
    leaves the nose unchanged (common practice for flatback root sections:
    thicken the aft part symmetrically about the mean line)."""

    def __init__(self, m, p, t, h):
        base = naca.four_digit(m, p, t, True)
        super().__init__("%s flatback %.1f%%" % (base.name, 100 * h), base.line, t, True)
        self.h = h

    def surfaces(self, x):
        x = np.asarray(x, dtype=float)
        yt = naca.thickness(x, self.t, True) + self.h / 2 * x * x
        yc, dy = self.line.camber(x)
        th = np.arctan(dy)
        s, c = np.sin(th), np.cos(th)
        return (np.stack([x - yt * s, yc + yt * c], axis=-1), np.stack([x + yt * s, yc - yt * c], axis=-1))


def selftest():
    """The Kármán–Trefftz map at tau = 0 is the Joukowski map; its trailing
    edge's included angle is tau (both exact properties of the map)."""
    bad = []
    kt = KarmanTrefftz(0.1, 0.05, 0.0)
    th = np.linspace(0.1, 6.0, 50)
    zeta = kt.centre + kt.radius * np.exp(1j * th)
    if np.max(np.abs(kt.raw(th) - (zeta + 1 / zeta))) > 1e-9:
        bad.append("KT at tau 0 differs from the Joukowski map z = zeta + 1/zeta")
    for tau in (0.0, 4.0, 10.0):
        kt = KarmanTrefftz(0.08, 0.04, tau)
        h = 1e-5
        z = kt.raw(kt.theta_te + np.array([h, -h])) - kt.z_te
        u, lo = np.array([z[0].real, z[0].imag]), np.array([z[1].real, z[1].imag])
        ang = np.degrees(np.arccos(np.dot(u, lo) / np.hypot(*u) / np.hypot(*lo)))
        if abs(ang - tau) > 0.05:
            bad.append("KT tau %.1f: trailing-edge angle %.3f deg" % (tau, ang))
        if abs(np.hypot(*(kt.upper(np.array([0.0]))[0] - kt.lower(np.array([0.0]))[0]))) > 1e-12:
            bad.append("KT tau %.1f: surfaces do not meet at the nose" % tau)
    fb = Flatback(0.02, 0.4, 0.3, 0.05)
    gap = fb.upper(np.array([np.pi]))[0] - fb.lower(np.array([np.pi]))[0]
    if abs(np.hypot(*gap) - 0.05) > 1e-3:
        bad.append("flatback base %.4f, want 0.05" % np.hypot(*gap))
    return bad
