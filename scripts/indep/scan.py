"""Seeded scans of a true outline: spacing, noise, outliers, duplicates,
placement and the point file.

A case is drawn from its seed and its mode ("normal": 150-3000 points, a
probe or a scanner; "sparse": 40-150 points, a CAD polyline, a drawing's
stations or a coarse probe). Everything about it is in the spec dict, which
draw() returns with the truth the scoring needs.

Spacing: the gaps along the arc length are log-normal (sigma 0 to 1.0)
over a density that is a slow wave along the outline times a bump at the
nose (a probe operator slows there); a scanner's beam grazing the surface
thins the points where the normal turns away from it, to none at all
where it is nearly tangent. Sparse drawings' stations follow the cosine
law in x on both surfaces instead.

Noise: normal to the true surface, white or partly correlated along the
outline (a Gaussian kernel over a few spacings), then the written numbers
are rounded to a fixed number of decimals.
"""

import numpy as np

import naca
import outline as ol


def _pick(rng, items, weights):
    w = np.asarray(weights, dtype=float)
    return items[int(rng.choice(len(items), p=w / w.sum()))]


def draw_section(rng, mode):
    """The shape and its trailing edge."""
    family = _pick(rng, ["sym", "four", "five"], [0.3, 0.4, 0.3])
    te = _pick(rng, ["sharp", "open", "cut", "rounded"], [0.35, 0.15, 0.25, 0.25])
    closed = te in ("sharp", "rounded") or (te == "cut" and rng.random() < 0.5)
    if family == "five":
        t = rng.uniform(0.08, 0.21)
        sec = naca.five_digit(int(rng.integers(1, 5)), int(rng.integers(1, 6)), t, closed)
    else:
        t = rng.uniform(0.06, 0.21)
        m = 0.0 if family == "sym" else rng.uniform(0.01, 0.06)
        p = int(rng.integers(2, 7)) / 10
        sec = naca.four_digit(m, p, t, closed)
    x_cut, radius = 1.0, 0.0
    if te == "cut":
        x_cut = rng.uniform(0.95, 0.995)
    if te == "rounded":
        # printed edges: 0.2 % to 0.8 % of the chord, never more than a
        # third of the section's thickness at 90 % chord.
        radius = min(rng.uniform(0.002, 0.008), naca.thickness(0.9, t, True) / 1.5)
    spec = {"section": sec.name, "family": family, "t": round(float(t), 6), "te": te,
            "closed_thickness": bool(closed), "x_cut": float(x_cut), "radius": float(radius)}
    if family != "five":
        spec["m"], spec["p"] = float(sec.line.m), float(sec.line.p)
    else:
        spec["line"] = int(sec.name[5:7])
    return sec, spec


def draw_sampling(rng, mode):
    s = {}
    if mode == "sparse":
        s["n"] = int(rng.integers(40, 151))
        s["law"] = _pick(rng, ["arc", "cosine"], [0.6, 0.4])
        s["sigma"] = float(rng.uniform(0, 0.6))
        s["noise"] = 0.0 if rng.random() < 0.5 else float(np.exp(rng.uniform(np.log(2e-6), np.log(1.5e-4))))
    else:
        s["n"] = int(np.round(np.exp(rng.uniform(np.log(150), np.log(3000)))))
        s["law"] = "arc"
        s["sigma"] = float(rng.uniform(0, 1.0))
        s["noise"] = 0.0 if rng.random() < 0.1 else float(np.exp(rng.uniform(np.log(2e-6), np.log(3.3e-4))))
    s["wave_amp"] = float(rng.uniform(0, 0.7))
    s["wave_k"] = int(rng.integers(1, 5))
    s["wave_phase"] = float(rng.uniform(0, 2 * np.pi))
    s["nose_boost"] = 0.0 if rng.random() < 0.5 else float(rng.uniform(0.5, 3.0))
    s["nose_width"] = float(rng.uniform(0.01, 0.05))  # of the perimeter
    s["graze"] = 0.0 if (mode == "sparse" or rng.random() < 0.7) else float(rng.uniform(0.05, 0.3))
    s["graze_dir_deg"] = float(90 + rng.uniform(-30, 30))
    s["correlated"] = 0.0 if rng.random() < 0.7 else float(rng.uniform(0.3, 0.9))
    s["corr_len"] = float(rng.uniform(2, 8))  # mean spacings
    s["outliers"] = 0.0 if rng.random() < 0.4 else float(rng.uniform(0, 0.03))
    s["duplicates"] = 0.0 if rng.random() < 0.6 else float(rng.uniform(0, 0.03))
    s["shuffle"] = bool(rng.random() < 0.3)
    s["reverse"] = bool(rng.random() < 0.5)
    return s


def draw_placement(rng):
    chord = float(np.exp(rng.uniform(np.log(10), np.log(2000))))  # mm
    return {
        "chord_mm": chord,
        "twist_deg": float(rng.uniform(-25, 35)),
        "offset_mm": [float(rng.uniform(-1000, 1000)), float(rng.uniform(-1000, 1000))],
        "flip": _pick(rng, ["none", "x", "y"], [0.7, 0.15, 0.15]),
        "format": _pick(rng, ["csv", "space", "tab"], [0.5, 0.3, 0.2]),
    }


def _density(s_norm, s_le, sm):
    """Relative point density along the outline (s_norm in [0, 1))."""
    rho = 1 + sm["wave_amp"] * np.sin(2 * np.pi * sm["wave_k"] * s_norm + sm["wave_phase"])
    d = (s_norm - s_le + 0.5) % 1 - 0.5
    rho = rho * (1 + sm["nose_boost"] * np.exp(-0.5 * (d / sm["nose_width"]) ** 2))
    return rho


def _arc_positions(rng, arc, s_le, sm, n):
    """n arc-length positions with log-normal gaps over the density."""
    total = arc[-1]
    grid = np.linspace(0, total, 20001)
    rho = _density(grid / total, s_le / total, sm)
    R = np.concatenate([[0], np.cumsum((rho[1:] + rho[:-1]) / 2 * np.diff(grid))])
    gaps = np.exp(sm["sigma"] * rng.standard_normal(n))
    r = np.cumsum(gaps)
    r = (r - r[0]) / r[-1] * R[-1] * (n - 1) / n  # n gaps round the loop, the last closing it
    r = (r + rng.uniform(0, R[-1])) % R[-1]
    return np.sort(np.interp(r, R, grid))


def _cosine_positions(o, arc, n):
    """Stations at the cosine law in x on both surfaces, and the ends."""
    q = o.normalized()
    k = n // 2
    xs = (1 - np.cos(np.linspace(0, np.pi, k + 1))) / 2
    out = []
    for piece in (ol.PIECE_UPPER, ol.PIECE_LOWER):
        idx = np.nonzero(o.piece == piece)[0]
        x = q[idx, 0]
        # the arc position where each surface first reaches each station
        order = np.argsort(x)
        out.append(np.interp(xs, x[order], arc[idx][order]))
    pos = np.unique(np.round(np.concatenate(out), 12))
    end = np.nonzero(o.piece == ol.PIECE_END)[0]
    if len(end):
        pos = np.concatenate([pos, arc[end][[len(end) // 2]]])
    return np.sort(pos)


def _at(poly, arc, s):
    """Points and outward normals on the closed polyline at arc positions s."""
    closed = np.vstack([poly, poly[:1]])
    seg = np.clip(np.searchsorted(arc, s, side="right") - 1, 0, len(poly) - 1)
    a, b = closed[seg], closed[seg + 1]
    L = np.hypot(*(b - a).T)
    u = (s - arc[seg]) / np.maximum(L, 1e-300)
    p = a + (b - a) * u[:, None]
    t = (b - a) / np.maximum(L, 1e-300)[:, None]
    nrm = np.stack([t[:, 1], -t[:, 0]], axis=1)  # CCW: outward is right of travel
    return p, nrm, seg


def _strip(t):
    """A number's text without trailing zeros ("1502.100" -> "1502.1")."""
    if "." in t:
        t = t.rstrip("0").rstrip(".")
    return "0" if t in ("-0", "") else t


def draw(seed, mode, planes=0.0, cls=None):
    """Draws case seed of mode; returns (spec, truth, lines) where lines are
    the point file's lines after its header and truth holds the frame and
    each line's kind. With planes > 0 that share of the cases is written in
    3D, in a plane tilted up to 40 degrees from z with scatter across it
    (a CMM's x, y, z), drawn from a stream of its own so that every case
    is otherwise the same file as without. cls names a class of hidden.py
    that changes the case (its own stream; None: the plain case)."""
    rng = np.random.default_rng([seed, 0 if mode == "normal" else 1, 21])
    sec, sspec = draw_section(rng, mode)
    sm = draw_sampling(rng, mode)
    pl = draw_placement(rng)
    hz = None
    if cls:
        import hidden

        hz = hidden.Hazard(cls, seed, mode)
        sec, sspec = hz.section(sec, sspec)
        hz.sampling(sm)
        hz.placement(pl)
        o = hz.outline(sec, sspec)
    else:
        o = ol.Outline(sec, sspec["te"], sspec["x_cut"], sspec["radius"])
    q = o.normalized()
    closed = np.vstack([q, q[:1]])
    arc = np.concatenate([[0], np.cumsum(np.hypot(*np.diff(closed, axis=0).T))])
    perim = arc[-1]
    arc_v = arc[:-1]
    s_le = arc_v[int(np.argmin(np.hypot(q[:, 0], q[:, 1])))]
    if sm["law"] == "cosine":
        s = _cosine_positions(o, arc_v, sm["n"])
    else:
        s = _arc_positions(rng, arc, s_le, sm, sm["n"])
    p, nrm, seg = _at(q, arc, s)
    piece = o.piece[seg]
    # A scanner's beam grazing the surface.
    if sm["graze"] > 0:
        a = np.radians(sm["graze_dir_deg"])
        c = np.abs(nrm @ np.array([np.cos(a), np.sin(a)]))
        keep = rng.random(len(p)) < np.clip(c / sm["graze"] - 0.3, 0, 1)
        p, nrm, s, piece = p[keep], nrm[keep], s[keep], piece[keep]
    n = len(p)
    # Noise normal to the surface (chord units).
    e = rng.standard_normal(n)
    if sm["correlated"] > 0 and n > 3:
        w = rng.standard_normal(n)
        half = int(np.ceil(3 * sm["corr_len"]))
        k = np.exp(-0.5 * (np.arange(-half, half + 1) / sm["corr_len"]) ** 2)
        wp = np.concatenate([w[-half:], w, w[:half]])  # the loop wraps
        sm_w = np.convolve(wp, k, mode="valid")
        sm_w /= np.std(sm_w)
        e = np.sqrt(1 - sm["correlated"]) * e + np.sqrt(sm["correlated"]) * sm_w
    p = p + nrm * (sm["noise"] * e)[:, None]
    kinds = ["good"] * n
    # Gross outliers: a slipped probe hit, off the surface by 0.3-3 % of the
    # chord (outward, or inward where the section is thick enough).
    n_out = int(round(sm["outliers"] * n))
    if n_out:
        idx = rng.choice(n, size=n_out, replace=False)
        for i in idx:
            mag = rng.uniform(0.003, 0.03)
            x = min(max(p[i, 0], 0.0), 1.0)
            half_t = float(naca.thickness(x, sspec["t"], True))
            sign = -1.0 if (rng.random() < 0.4 and 0.05 < x < 0.7 and mag < 0.5 * half_t) else 1.0
            p[i] = p[i] + sign * mag * nrm[i]
            kinds[i] = "outlier"
    okey = s
    if hz is not None:
        ctx = {"sm": sm, "perimeter": perim, "s_le": s_le, "q": q, "piece": o.piece, "chord_mm": pl["chord_mm"],
               "at": lambda ss: _at(q, arc, ss)}
        p, nrm, s, piece, kinds, okey = hz.points(p, nrm, s, piece, kinds, okey, ctx)
        n = len(p)
    # Placement in the part: scale, rotate nose-up by the twist, offset,
    # then the flip (a part measured nose-other-way, or upside down).
    ch, tw = pl["chord_mm"], np.radians(pl["twist_deg"])
    rot = np.array([[np.cos(-tw), -np.sin(-tw)], [np.sin(-tw), np.cos(-tw)]])
    off = np.array(pl["offset_mm"])

    def place(v):
        v = (np.atleast_2d(v) * ch) @ rot.T
        if pl["flip"] == "x":
            v[:, 0] = -v[:, 0]
        elif pl["flip"] == "y":
            v[:, 1] = -v[:, 1]
        return v + off

    part = place(p)
    decimals = pl.get("decimals") or int(np.clip(np.ceil(-np.log10(2e-5 * ch)), 2, 6))
    fmt = "%%.%df" % decimals
    sep = {"csv": ",", "space": " ", "tab": "\t"}[pl["format"]]
    plane = None
    if hz is not None and hz.plane is not None:
        # one station of a blade in a CMM's x, y, z: the section's plane
        # nearly square to z, small scatter across it
        r3 = hz.rng
        tilt, az = np.radians(hz.plane["tilt_deg"]), r3.uniform(0, 2 * np.pi)
        nz = np.array([np.sin(tilt) * np.cos(az), np.sin(tilt) * np.sin(az), np.cos(tilt)])
        U = np.array([1.0, 0, 0]) - nz[0] * nz
        U /= np.linalg.norm(U)
        V = np.cross(nz, U)
        O = np.array([0.0, 0.0, hz.plane["z"]])
        across = hz.plane["scatter_mm"] * r3.standard_normal(len(part))
        part3 = O + part[:, :1] * U + part[:, 1:2] * V + across[:, None] * nz
        plane = {"origin": O, "u": U, "v": V, "normal": nz}
    elif planes > 0:
        r3 = np.random.default_rng([seed, 0 if mode == "normal" else 1, 21, 3])
        if r3.random() < planes:
            tilt, az = np.radians(r3.uniform(0, 40)), r3.uniform(0, 2 * np.pi)
            nz = np.array([np.sin(tilt) * np.cos(az), np.sin(tilt) * np.sin(az), np.cos(tilt)])
            a = np.array([1.0, 0, 0]) if abs(nz[0]) < 0.9 else np.array([0, 1.0, 0])
            U = a - (a @ nz) * nz
            U /= np.linalg.norm(U)
            V = np.cross(nz, U)
            O = r3.uniform(-500, 500, 3)
            across = sm["noise"] * ch * r3.uniform(0, 1) * r3.standard_normal(len(part))
            part3 = O + part[:, :1] * U + part[:, 1:2] * V + across[:, None] * nz
            plane = {"origin": O, "u": U, "v": V, "normal": nz}
    if plane is None:
        rows = [(fmt % x) + sep + (fmt % y) for x, y in part]
    else:
        rows = [(fmt % x) + sep + (fmt % y) + sep + (fmt % z) for x, y, z in part3]
    if pl.get("strip"):  # a machine's export: no trailing zeros
        rows = [sep.join(_strip(v) for v in row.split(sep)) for row in rows]
    order = np.argsort(okey, kind="stable")
    if sm["reverse"]:
        order = order[::-1]
    start = int(rng.integers(0, n))
    if hz is None or not hz.keep_start:
        order = np.roll(order, -start)
    rows = [rows[i] for i in order]
    kinds = [kinds[i] for i in order]
    s_rows = [float(s[i]) for i in order]
    piece_rows = [int(piece[i]) for i in order]
    of = [-1] * n
    n_dup = int(round(sm["duplicates"] * n))
    if n_dup:
        for i in sorted(rng.choice(n, size=n_dup, replace=False), reverse=True):
            rows.insert(i + 1, rows[i])
            kinds.insert(i + 1, "duplicate")
            s_rows.insert(i + 1, s_rows[i])
            piece_rows.insert(i + 1, piece_rows[i])
            of.insert(i + 1, i)
        # indices of originals moved: recompute from row text
        first = {}
        for j, r in enumerate(rows):
            if kinds[j] != "duplicate":
                first.setdefault(r, j)
        of = [first.get(rows[j], -1) if kinds[j] == "duplicate" else -1 for j in range(len(rows))]
    if sm["shuffle"]:
        perm = rng.permutation(len(rows))
        inv = np.empty_like(perm)
        inv[perm] = np.arange(len(perm))
        rows = [rows[i] for i in perm]
        kinds = [kinds[i] for i in perm]
        s_rows = [s_rows[i] for i in perm]
        piece_rows = [piece_rows[i] for i in perm]
        of = [int(inv[of[i]]) if of[i] >= 0 else -1 for i in perm]
    header = [("x,y" if plane is None else "x,y,z")] if pl["format"] == "csv" else []
    if hz is not None:
        lines, line_of, fopts = hz.text(header, rows, sep)
        first_line = line_of[0]
    else:
        lines = header + rows
        first_line = len(header) + 1  # file line of rows[0]
        line_of, fopts = None, None
    le_part, te_part = place(np.array([0.0, 0.0]))[0], place(np.array([1.0, 0.0]))[0]
    truth = {
        "outline": o,
        "normalized": q,
        "perimeter": float(perim),
        "chord_mm": ch,
        "le_mm": le_part,
        "te_mm": te_part,
        "te_kind": o.te_kind,
        "te_size": o.te_size / o.chord_raw,  # chord units
        "scatter": float(np.hypot(sm["noise"], 10.0**-decimals / ch / np.sqrt(12))),
        "decimals": decimals,
        "mirrored": pl["flip"] != "none",
        "kinds": kinds,
        "s": s_rows,
        "piece": piece_rows,
        "of": of,
        "first_line": first_line,
        "plane": plane,
        "line_of": line_of,
        "file": fopts,
        "hazard": hz,
    }
    if plane is not None:
        truth["le_3d"] = plane["origin"] + le_part[0] * plane["u"] + le_part[1] * plane["v"]
        truth["te_3d"] = plane["origin"] + te_part[0] * plane["u"] + te_part[1] * plane["v"]
    spec = {"seed": seed, "mode": mode, "shape": sspec, "sampling": sm, "placement": pl, "points": n,
            "plane": None if plane is None else {k: v.tolist() for k, v in plane.items()}}
    if hz is not None:
        if cls == "ball":
            hz.spec["ball_mm_actual"] = float(hz.spec["ball_c"] * ch / o.chord_raw)
        if cls == "ballr":  # the radius in the file's units, as the user knows it
            spec["prep_args"] = ["--probe-radius", "%.6g" % (hz.spec["ball_c"] * ch)]
        spec["class"] = hz.spec
        spec["units"] = pl.get("units", "mm")
    return spec, truth, lines
