"""Whether the good points of a case decide the kind of its trailing edge:
the stop 26 judgement, one test for every pair of kinds.

The truth's end is weighed against the best outline of each other kind
(sharp: the surfaces carried on along their end tangents to where they
meet; blunt: a base square to the chord across them, its station free;
rounded: a circle tangent to both, its radius free). The evidence for the
truth over a rival is

    lam = lam_pos + lam_gap

lam_pos: the squared distances of the noise-free good points from the
rival, summed, in scatters: the expected difference of -2 ln likelihood
under normal scatter, so that the likelihood-ratio test picks the truth
with probability Phi(sqrt(lam) / 2) (Neyman-Pearson lemma). The points
decide the kind when lam >= (2 * 1.645)^2 against every rival, that is
when the test is right in 95 % of draws.

lam_gap: where no good point lies on the end of either outline, the end
lies in the one gap between the two surfaces' last points; its length is
g_t round the true end and g_r round the rival's, and with the gaps a
renewal sequence of log-normal gaps (mean h, sigma of the logs, both from
the last gaps of the surfaces) -2 ln f(g) = 2 ln g + (ln g - mu)^2 /
sigma^2 + const, mu = ln h - sigma^2 / 2, so lam_gap = D(g_r) - D(g_t).
It counts only where the scan reached the end: each surface's last point
within the 95th percentile of the gaps that hold a given spot (their logs
have mean ln h + sigma^2 / 2) of its end corner.

A sharp truth is the nested simple case (a base or an arc of size -> 0
is a sharp edge): a test that keeps "sharp" unless the evidence against
it reaches the bound keeps it in at least 95 % of draws, so a sharp truth
is always decided; a blunt or rounded truth is decided against "sharp" when
such a test rejects "sharp" with 95 % power, which is the same bound,
(z_0.95 + z_0.95)^2. An end thinner than four scatters may read as the
kinds te_verdict accepts for it; those are not rivals, and the rivals
then must be at least that thick. Noise-free points: None (the caller
keeps its own rule).

Own code: nothing here is shared with the Go campaign's judge."""

import numpy as np

import outline as ol

SEPARATION = (2 * 1.6448536269514722) ** 2
SPAN = 0.08  # chord units forward of the end that are compared
GAP_SPAN = 8  # last gaps of each surface that give the spacing
SIGMA_FLOOR = 0.1  # least sigma of the log gaps (common practice: 10 % step variation)


def _resample(poly, n):
    """poly (forward to aft) at n points evenly spaced in arc length."""
    a = np.concatenate([[0], np.cumsum(np.hypot(*np.diff(poly, axis=0).T))])
    t = np.linspace(0, a[-1], n)
    return np.stack([np.interp(t, a, poly[:, 0]), np.interp(t, a, poly[:, 1])], axis=1)


def _dist(p, poly):
    """Distances of points p (m, 2) from the open polyline poly, with the
    segment index and its foot parameter."""
    a, b = poly[:-1], poly[1:]
    ab = b - a
    den = np.maximum(np.einsum("ij,ij->i", ab, ab), 1e-300)
    u = np.clip(((p[:, None, :] - a[None]) * ab[None]).sum(-1) / den[None], 0, 1)
    f = a[None] + ab[None] * u[..., None]
    d = np.hypot(p[:, None, 0] - f[..., 0], p[:, None, 1] - f[..., 1])
    k = np.argmin(d, axis=1)
    i = np.arange(len(p))
    return d[i, k], k, u[i, k]


def _aft_length(poly, k, u):
    """Arc length along poly from the foot (segment k, parameter u) to its end."""
    seg = np.hypot(*np.diff(poly, axis=0).T)
    return float((1 - u) * seg[k] + seg[k + 1 :].sum())


def _minimise(f, a, b, log=False, n=60):
    to, back = (np.log, np.exp) if log else ((lambda x: x), (lambda x: x))
    xs = np.linspace(to(a), to(b), n + 1)
    v = [f(back(x)) for x in xs]
    j = int(np.argmin(v))
    lo, hi = xs[max(j - 1, 0)], xs[min(j + 1, n)]
    g = (np.sqrt(5) - 1) / 2
    c, d = hi - g * (hi - lo), lo + g * (hi - lo)
    fc, fd = f(back(c)), f(back(d))
    for _ in range(40):
        if fc < fd:
            hi, d, fd = d, c, fc
            c = hi - g * (hi - lo)
            fc = f(back(c))
        else:
            lo, c, fc = c, d, fd
            d = lo + g * (hi - lo)
            fd = f(back(d))
    return min(min(v), fc, fd)


def _minimise_arc(f, a, b, step, n=60, extra=400):
    """Least f(r) over radii [a, b] for the rounded rival, f(r, True)
    giving (lam, station of the arc's tip). Where the surfaces close at a
    small angle the tip runs along them much faster than r grows, and the
    radii whose arc passes through a base's points may fill a few per cent
    of r, less than a step of a plain grid on ln r; so every step of the
    grid over which the tip moves more than step (the scatter) is split
    until it moves about that much (extra points at most, shared out in
    proportion), and the best point is refined by golden section between
    its neighbours."""
    lr = np.linspace(np.log(a), np.log(b), n + 1)
    vals = [f(np.exp(x), True) for x in lr]
    tips = np.array([np.nan if t is None else t for _, t in vals])
    jump = np.abs(np.diff(tips))
    want = np.where(np.isfinite(jump) & (jump > step), np.ceil(np.nan_to_num(jump) / step) - 1, 0).astype(int)
    if want.sum() > extra:
        want = np.ceil(want * extra / want.sum()).astype(int)
    xs, vs = [lr[0]], [vals[0][0]]
    for j, m in enumerate(want):
        for x in lr[j] + (lr[j + 1] - lr[j]) * np.arange(1, m + 1) / (m + 1):
            xs.append(x)
            vs.append(f(np.exp(x)))
        xs.append(lr[j + 1])
        vs.append(vals[j + 1][0])
    j = int(np.argmin(vs))
    lo, hi = xs[max(j - 1, 0)], xs[min(j + 1, len(xs) - 1)]
    g = (np.sqrt(5) - 1) / 2
    c, d = hi - g * (hi - lo), lo + g * (hi - lo)
    fc, fd = f(np.exp(c)), f(np.exp(d))
    for _ in range(40):
        if fc < fd:
            hi, d, fd = d, c, fc
            c = hi - g * (hi - lo)
            fc = f(np.exp(c))
        else:
            lo, c, fc = c, d, fd
            d = lo + g * (hi - lo)
            fd = f(np.exp(d))
    return min(min(vs), fc, fd)


def _spacing(upper, lower):
    """(mean gap, sigma of the log gaps) of the last GAP_SPAN gaps of each
    surface; sigma from the median absolute deviation of each surface's log
    gaps about its own median (robust to a point measured twice)."""
    h, dev = 0.0, []
    for g in (np.diff(upper[: GAP_SPAN + 1]), np.diff(lower[-GAP_SPAN - 1 :])):
        h = max(h, float(np.mean(g)))
        lg = np.log(np.maximum(g, 1e-12))
        dev.extend(np.abs(lg - np.median(lg)))
    sigma = SIGMA_FLOOR
    if len(dev) >= 4:
        sigma = max(sigma, 1.4826 * float(np.median(dev)))
    return h, sigma


def judge(truth):
    """(decided, rival kind, lam, {kind: lam}) of the stop 26 judgement, or
    None where it does not apply (noise-free points, no end found)."""
    kind, s = truth["te_kind"], truth["scatter"]
    if not s > 0:
        return None
    if kind == "sharp":
        return True, "", float("inf"), {}
    q = truth["normalized"]
    piece = np.asarray(ol_piece(truth))
    closed = np.vstack([q, q[:1]])
    arc = np.concatenate([[0], np.cumsum(np.hypot(*np.diff(closed, axis=0).T))])
    perim = arc[-1]
    iu, il = np.nonzero(piece == ol.PIECE_UPPER)[0], np.nonzero(piece == ol.PIECE_LOWER)[0]
    s_lo = arc[il[-1]]  # the lower end corner
    end_len = perim - s_lo
    up = q[iu][::-1]
    lo = q[il]
    up = _resample(up[up[:, 0] >= 1 - 1.5 * SPAN], 200)
    lo = _resample(lo[lo[:, 0] >= 1 - 1.5 * SPAN], 200)
    cu, cl = up[-1], lo[-1]
    # End tangents over the last 0.001 c of arc, and where they meet.
    def tangent(p):
        a = np.concatenate([[0], np.cumsum(np.hypot(*np.diff(p[::-1], axis=0).T))])
        j = int(np.searchsorted(a, 1e-3))
        d = p[-1] - p[::-1][min(j, len(p) - 1)]
        return d / np.hypot(*d)
    tu, tl = tangent(up), tangent(lo)
    m = np.array([[tu[0], -tl[0]], [tu[1], -tl[1]]])
    if abs(np.linalg.det(m)) < 1e-12:
        return None
    ea, eb = np.linalg.solve(m, cl - cu)
    if ea < 0 or eb < 0:
        return None
    f = np.linspace(0, 1, 51)[1:, None]
    up_x = np.vstack([up, cu + tu * ea * f])
    lo_x = np.vstack([lo, cl + tl * eb * f])
    good = np.array([k == "good" for k in truth["kinds"]])
    s_pts = np.asarray(truth["s"], dtype=float)[good]
    pc = np.asarray(truth["piece"])[good]
    p_all = np.stack([np.interp(s_pts, arc, closed[:, 0]), np.interp(s_pts, arc, closed[:, 1])], axis=1)
    near = p_all[:, 0] >= 1 - SPAN
    pts = p_all[near]
    if len(pts) == 0:
        return None
    on_end = int(np.sum(pc == ol.PIECE_END))
    su, sl = np.sort(s_pts[pc == ol.PIECE_UPPER]), np.sort(s_pts[pc == ol.PIECE_LOWER])
    gap = None
    if on_end == 0 and len(su) >= 2 and len(sl) >= 2:
        h, sig = _spacing(su, sl)
        du, dl = su[0], s_lo - sl[-1]
        if h > 0 and max(du, dl) <= h * np.exp(sig * sig / 2 + 1.6448536269514722 * sig):
            mu = np.log(h) - sig * sig / 2
            dev = lambda g: 2 * np.log(max(g, 1e-12)) + (np.log(max(g, 1e-12)) - mu) ** 2 / sig**2
            gap = (dev, du + end_len + dl)

    def lam(polys):
        res = [_dist(pts, p) for p in polys]
        d = np.stack([r[0] for r in res])
        which = np.argmin(d, axis=0)
        out = float(np.sum((d.min(axis=0) / s) ** 2))
        if gap is not None and not np.any(which == 2):
            g = 0.0
            for j in (0, 1):
                sel = np.nonzero(which == j)[0]
                if len(sel) == 0:
                    return out
                i = sel[np.argmax(pts[sel, 0])]
                g += _aft_length(polys[j], res[j][1][i], res[j][2][i])
            if len(polys) > 2:
                g += float(np.sum(np.hypot(*np.diff(polys[2], axis=0).T)))
            out += gap[0](g) - gap[0](gap[1])
        return out

    def cut(p, x):
        j = int(np.argmax(p[:, 0] >= x)) if np.any(p[:, 0] >= x) else len(p) - 1
        if j == 0 or p[j, 0] < x:
            return p, p[-1]
        w = (x - p[j - 1, 0]) / (p[j, 0] - p[j - 1, 0])
        c = p[j - 1] + w * (p[j] - p[j - 1])
        return np.vstack([p[:j], c]), c

    small = truth["te_size"] < 4 * s
    least = 4 * s if small else 0.0

    def blunt(x):
        u, a = cut(up_x, x)
        l, b = cut(lo_x, x)
        w = np.hypot(*(a - b))
        if w == 0 or w < least:
            return float("inf")
        return lam([u, l, np.vstack([a, b])])

    # Inward normals of the upper polyline (right of aft travel).
    dd = np.gradient(up_x, axis=0)
    dd /= np.hypot(dd[:, 0], dd[:, 1])[:, None]
    inward = np.stack([dd[:, 1], -dd[:, 0]], axis=1)

    def rounded(r, with_tip=False):
        c = up_x + r * inward
        g = _dist(c, lo_x)[0] - r
        ks = np.nonzero((g[:-1] >= 0) & (g[1:] < 0))[0]
        if len(ks) == 0:
            return (float("inf"), None) if with_tip else float("inf")
        k = ks[-1]
        w = g[k] / (g[k] - g[k + 1])
        centre = c[k] + w * (c[k + 1] - c[k])
        pu = up_x[k] + w * (up_x[k + 1] - up_x[k])
        _, kl, ul = _dist(centre[None], lo_x)
        pl = lo_x[kl[0]] + ul[0] * (lo_x[kl[0] + 1] - lo_x[kl[0]])
        au = np.arctan2(*(pu - centre)[::-1])
        al = np.arctan2(*(pl - centre)[::-1])
        if al > au:
            al -= 2 * np.pi
        t = np.linspace(au, al, 65)
        arc_pts = centre + r * np.stack([np.cos(t), np.sin(t)], axis=1)
        v = lam([np.vstack([up_x[: k + 1], pu]), np.vstack([lo_x[: kl[0] + 1], pl]), arc_pts])
        return (v, float(arc_pts[:, 0].max())) if with_tip else v

    each = {}
    if not small:
        each["sharp"] = lam([up_x, lo_x])
    x_lo = min(cu[0], cl[0]) - SPAN / 4
    x_hi = up_x[-1, 0]
    if kind == "rounded" and not small:
        each["blunt"] = _minimise(blunt, x_lo, x_hi)
    if kind == "blunt":
        r_lo, r_hi = max(least / 2, 1e-6), 4 * float(np.hypot(*(cu - cl)))
        if r_lo < r_hi:
            each["rounded"] = _minimise_arc(rounded, r_lo, r_hi, s)
    if not each:
        return True, "", float("inf"), each
    rival = min(each, key=each.get)
    return bool(each[rival] >= SEPARATION), rival, float(each[rival]), each


def ol_piece(truth):
    """The piece of every vertex of the normalised outline."""
    return truth["outline"].piece


def selftest():
    """The judgement's lam against the sharp rival for NACA 0012 with its
    open edge (NACA Report 824: half-thickness y and slope m at x = 1 from
    y_t = 5t(0.2969 sqrt(x) - 0.1260 x - 0.3516 x^2 + 0.2843 x^3 - 0.1015 x^4))
    and one point at the middle of the base is that point's squared distance
    from the end tangent in scatters, y / sqrt(1 + m^2), exact; with no
    base point and even spacing, the rounded rival leaves the same gap and
    the case is undecided. Returns a list of failures."""
    import naca

    t = 0.12
    y = 5 * t * (0.2969 - 0.1260 - 0.3516 + 0.2843 - 0.1015)
    m = 5 * t * (0.2969 / 2 - 0.1260 - 2 * 0.3516 + 3 * 0.2843 - 4 * 0.1015)
    o = ol.Outline(naca.four_digit(0, 0, t, False), "open")
    q = o.normalized()
    closed = np.vstack([q, q[:1]])
    arc = np.concatenate([[0], np.cumsum(np.hypot(*np.diff(closed, axis=0).T))])
    il = np.nonzero(o.piece == ol.PIECE_LOWER)[0]
    s_lo, perim = arc[il[-1]], arc[-1]
    h, bad = 0.004, []
    d = np.arange(h / 2, 0.1, h)
    for base in (True, False):
        s = list(d) + list(s_lo - d) + ([(s_lo + perim) / 2] if base else [])
        piece = [ol.PIECE_UPPER] * len(d) + [ol.PIECE_LOWER] * len(d) + ([ol.PIECE_END] if base else [])
        truth = {"te_kind": "blunt", "te_size": o.te_size / o.chord_raw, "scatter": 2e-4, "normalized": q, "outline": o,
                 "kinds": ["good"] * len(s), "s": s, "piece": piece}
        got = judge(truth)
        if base:
            want = (y / np.sqrt(1 + m * m) / 2e-4) ** 2
            if got is None or abs(got[3]["sharp"] / want - 1) > 0.01:
                bad.append("tejudge: base point, lam against sharp %s, want %.6g" % (None if got is None else got[3]["sharp"], want))
        elif got is None or got[0] or got[1] != "rounded":
            bad.append("tejudge: no base point, even spacing: %s, want undecided against rounded" % (got,))
    return bad


class _Pieces:
    """A stand-in outline for judge(): only its pieces are read."""

    def __init__(self, piece):
        self.piece = piece


def main(argv):
    """tejudge.py FILE: judges the cases of FILE, a JSON list of truths
    written by another program (each: te_kind, te_size and scatter in chord
    units; outline, the closed outline in the normalised frame from the
    upper end corner, counter-clockwise, without its first point repeated;
    outline_piece, 0 upper, 1 lower, 2 end, per vertex; s and piece, the
    arc length from the first vertex and the piece of every good point),
    and prints one JSON object a line: decided, rival, lam, each (null
    where the judgement does not apply). The Go campaign's test of its own
    judgement against this one uses it."""
    import json

    with open(argv[1]) as f:
        cases = json.load(f)
    for c in cases:
        truth = {
            "te_kind": c["te_kind"],
            "te_size": float(c["te_size"]),
            "scatter": float(c["scatter"]),
            "normalized": np.asarray(c["outline"], dtype=float),
            "outline": _Pieces(np.asarray(c["outline_piece"], dtype=int)),
            "kinds": ["good"] * len(c["s"]),
            "s": c["s"],
            "piece": c["piece"],
        }
        got = judge(truth)
        if got is None:
            print(json.dumps(None))
            continue
        fin = lambda x: x if np.isfinite(x) else None
        print(json.dumps({"decided": got[0], "rival": got[1], "lam": fin(got[2]), "each": {k: fin(v) for k, v in got[3].items()}}))


if __name__ == "__main__":
    import sys

    main(sys.argv)
