"""Classes of measurement a practitioner has and the plain normal/sparse
draws lack, each layered on a normal or sparse case (--class NAME, or
--class all to take class k of the list for seed k mod its length).

Each class draws from a stream of its own, [seed, mode, 22, k], so the
plain cases of a seed stay the files they were; the class then changes
the shape, the sampling, the placement or the file's text:

    thick     t/c 25-40 %: NACA 4-digit thickness (Report 824) thickened aft
              into a flatback base of 1-10 % c (shapes.Flatback), or cut
    thin      t/c 4-6 % (propeller tips), any trailing edge
    camber    NACA 4-digit with 6-9 % camber (Report 824's mean line)
    reflex    the reflexed NACA 5-digit mean lines (naca.FiveDigitReflexLine)
    kt        Kármán–Trefftz by its exact conformal map, cusped (60 %) or with
              a 2-10 deg trailing edge (shapes.KarmanTrefftz)
    ballr     (by name only, not in "all") the ball's centres as in "ball",
              uncompensated, with the radius given (--probe-radius): scored
              against the part's own outline. The path is each point moved
              r along its normal, with points on the arcs of radius r round
              every corner (a sharp edge, a base's two) at the local spacing
    ball      a CMM whose probe ball was not compensated (radius 0.5-3 mm) or
              compensated by half: the points lie on the ball centre's path,
              the outline offset outward by r (a sharp edge becomes an arc of
              radius r); scored against that path, since nothing in a file
              of centres says r (see the README of this folder)
    graze     a scanner's grazing incidence: outward bias growing as
              1/cos(incidence) (one-sided: the spot spreads on the surface),
              thinned points and 1-4 dropouts of 0.5-3 % of the perimeter
    nose      hand-probed nose: 1-3 more passes over the nose appended as
              blocks at the file's end, each shifted along the normal by up
              to the noise (the probe re-approached)
    clamp     3-12 points of the fixture: a straight jaw face 0.02-0.10 c
              long, 0.01-0.15 c off the section near either end (planted
              outliers the tool must drop)
    far       a machine frame far from the origin (x ~ 1500 mm, y ~ 800 mm),
              written with 8 decimals or with 2
    inch      the part in inches (run with --units in)
    text      a UTF-8 BOM or none, CRLF or LF, a title and comments with
              Windows-1252 degree and plus-minus signs (or UTF-8), a comment
              line between passes, trailing blank lines
    z3d       x, y, z with the section at one station (z 100-2000 mm) and
              small z scatter (0.002-0.05 mm), the plane tilted < 0.5 deg
    numbered  a probe program's export: every line numbered (1, 2, 3, ... or
              from 0, no header) or labelled ("PNT17"), separated by commas,
              semicolons with decimal commas, tabs or blanks

Run by name only (not in "all"), or together as --class new25 (class k of
EXTRA25 for seed k mod its length):

    strokes   a CMM path in 3-7 strokes: the loop cut at random places,
              neighbouring strokes overlapping by 0.5-3 % of the perimeter
              (the overlap measured again by the next stroke, moved by up to
              the noise), each stroke run either way, the strokes written in
              any order (points along a stroke in order)
    shadow    a laser slice: 1000-4000 points, one surface 3-6 times denser
              than the other, and one surface shadowed: its points end
              0.5-4 % of the chord short of the trailing edge
    table     a laser slice with a stray line: the edge of the table or a
              fixture's face, a straight row of points 0.02-0.2 c below the
              section (tilted up to 2 deg), along 40-130 % of the chord, at
              the section's spacing (planted outliers the tool must drop)
    scale     chord 5 mm to 5 m, the file in mm, m or inches, the noise a
              fixed 0.002-0.05 mm (at most 0.2 % of the chord) in half the
              cases, the plain case's share of the chord in the others
    columns   a scanner's or CMM's export: a constant z column (half the
              cases), trailing columns (intensity, normals, a quality flag),
              commas, semicolons or tabs with decimal commas, blanks, a
              header naming the columns (some with units), CRLF line ends

Run by name only, or together as --class new26 (class k of EXTRA26 for
seed k mod its length):

    slice     a section cut from a triangle mesh (a 3D scan's or a CAD
              export's): the mesh's vertices along the outline at a chordal
              tolerance of 0.005-0.05 mm (a CAD export: dense at the nose and
              edge, sparse on the flat parts; some cap the edge length 2-6 %
              c) or at a near-even edge of 0.1-1 mm (a scan's mesh), noise on
              the vertices, flat facets between them; the
              slice gives every vertex and one crossing of each facet's
              diagonal, each point written twice in half the cases (the
              shared ends of the slice's segments), in x, y, z on a plane
              tilted 1-5 deg to the span
    turned    the section chord-vertical (twist near +90 or -90 deg) or
              upside down (near 180 deg), mirrored in half the cases
    machine   a CMM's machine frame: x ~ 1500 mm, y ~ -800 mm, z ~ 300 mm
              (x, y, z, the plane square to z within 0.3 deg), chord
              15-150 mm, the numbers quantised to 0.01 mm or 1 um steps and
              written with no trailing zeros
    gap       a fixture clamp hid 10-25 % of the chord of one surface
              somewhere between 25 % and 75 % chord
    repass    the part measured twice, re-clamped between: the second pass
              (at its own spacing) moved 0.02-0.1 mm in any direction from
              the first, the file the two passes one after the other (each
              starting anywhere; shuffled as the plain case says); the truth
              is the midway placement
    shape26   shapes beyond "thick"/"thin"/"camber": t/c 3-5 %, t/c 25-35 %
              with the plain case's trailing edge, or aft-loaded camber
              (NACA 4-digit, 3-6 % camber at 70-80 % chord)

Sources: the shapes' equations are named in naca.py and shapes.py; the
hazards' magnitudes are common practice (a CMM ball of 1-6 mm diameter,
fixtures beside the part, scanner bias at grazing incidence), not from a
published table.
"""

import numpy as np

import naca
import outline as ol
import shapes

CLASSES = ["thick", "thin", "camber", "reflex", "kt", "ball", "graze", "nose", "clamp", "far", "inch", "text", "z3d", "numbered"]
# Classes run by name only: "all" keeps taking CLASSES by seed, so that its
# cases stay the files they were.
EXTRA25 = ["strokes", "shadow", "table", "scale", "columns"]
EXTRA26 = ["slice", "turned", "machine", "gap", "repass", "shape26"]
EXTRA = ["ballr"] + EXTRA25 + EXTRA26


def pick(seed, name):
    """The class of a seed for --class name (a class or "all")."""
    if name == "all":
        return CLASSES[seed % len(CLASSES)]
    if name == "new25":
        return EXTRA25[seed % len(EXTRA25)]
    if name == "new26":
        return EXTRA26[seed % len(EXTRA26)]
    if name not in CLASSES + EXTRA:
        raise ValueError("unknown class %r (have %s)" % (name, ", ".join(CLASSES + EXTRA)))
    return name


class Hazard:
    """One class applied to one case; every draw from its own stream."""

    def __init__(self, name, seed, mode):
        self.name = name
        self.rng = np.random.default_rng([seed, 0 if mode == "normal" else 1, 22, (CLASSES + EXTRA).index(name)])
        self.spec = {"class": name}
        self.plane = None
        self.keep_start = False  # the file starts where the class's order starts

    # --- the shape -------------------------------------------------------
    def section(self, sec, sspec):
        r, n = self.rng, self.name
        te = sspec["te"]
        if n == "thick":
            t = r.uniform(0.25, 0.40)
            m = 0.0 if r.random() < 0.4 else r.uniform(0.01, 0.04)
            p = int(r.integers(3, 5)) / 10
            if r.random() < 0.7:
                h = r.uniform(0.01, 0.10)
                sec = shapes.Flatback(m, p, t, h)
                sspec.update(te="open", closed_thickness=False, x_cut=1.0, radius=0.0, flatback=h)
            else:
                sec = naca.four_digit(m, p, t, True)
                sspec.update(te="cut", closed_thickness=True, x_cut=r.uniform(0.93, 0.99), radius=0.0)
            sspec.update(section=sec.name, family="sym" if m == 0 else "four", t=float(t))
        elif n == "thin":
            t = r.uniform(0.04, 0.06)
            m = 0.0 if r.random() < 0.3 else r.uniform(0.005, 0.04)
            p = int(r.integers(2, 7)) / 10
            sec = naca.four_digit(m, p, t, sspec["closed_thickness"])
            sspec.update(section=sec.name, family="sym" if m == 0 else "four", t=float(t))
        elif n == "camber":
            t = r.uniform(0.08, 0.18)
            m, p = r.uniform(0.06, 0.09), int(r.integers(3, 7)) / 10
            sec = naca.four_digit(m, p, t, sspec["closed_thickness"])
            sspec.update(section=sec.name, family="four", t=float(t))
        elif n == "reflex":
            t = r.uniform(0.08, 0.18)
            sec = naca.five_digit_reflex(int(r.integers(1, 5)), int(r.integers(2, 6)), t, sspec["closed_thickness"])
            sspec.update(section=sec.name, family="five", t=float(t))
        elif n == "shape26":
            u = r.random()
            if u < 1 / 3:
                t = r.uniform(0.03, 0.05)
                m = 0.0 if r.random() < 0.3 else r.uniform(0.005, 0.03)
                p = int(r.integers(2, 7)) / 10
                self.spec["kind"] = "very thin"
            elif u < 2 / 3:
                t = r.uniform(0.25, 0.35)
                m = 0.0 if r.random() < 0.4 else r.uniform(0.01, 0.04)
                p = int(r.integers(3, 5)) / 10
                self.spec["kind"] = "very thick"
            else:
                t = r.uniform(0.08, 0.16)
                m, p = r.uniform(0.03, 0.06), r.uniform(0.7, 0.8)
                self.spec["kind"] = "aft-loaded"
            sec = naca.four_digit(m, p, t, sspec["closed_thickness"])
            sspec.update(section=sec.name, family="sym" if m == 0 else "four", t=float(t))
        elif n == "kt":
            tau = 0.0 if r.random() < 0.6 else r.uniform(2, 10)
            sec = shapes.KarmanTrefftz(r.uniform(0.04, 0.14), r.uniform(0.0, 0.10), tau)
            sspec.update(section=sec.name, family="kt", t=float(sec.t), te="sharp", closed_thickness=True, x_cut=1.0, radius=0.0)
        else:
            return sec, sspec
        if sspec["te"] == "rounded":
            sspec["radius"] = float(min(r.uniform(0.002, 0.008), naca.thickness(0.9, sspec["t"], True) / 1.5))
        return sec, sspec

    def outline(self, sec, sspec):
        """The true outline (the ball's path for "ball")."""
        try:
            o = ol.Outline(sec, sspec["te"], sspec["x_cut"], sspec["radius"])
        except ValueError:  # no rounding circle fits a thin section's end
            sspec.update(te="sharp", radius=0.0)
            o = ol.Outline(sec, "sharp")
        if self.name == "ball":
            o = OffsetOutline(o, self.spec["ball_c"])
        return o

    # --- sampling and placement --------------------------------------------
    def sampling(self, sm):
        r, n = self.rng, self.name
        if n == "graze":
            sm["graze"] = float(r.uniform(0.05, 0.3))
            sm["noise"] = max(sm["noise"], 1e-5)
        elif n == "strokes":
            sm["shuffle"] = False
            self.keep_start = True
        elif n == "shadow":
            sm["n"] = int(np.round(np.exp(r.uniform(np.log(1000), np.log(4000)))))
        elif n == "repass":
            self.keep_start = True
        elif n == "slice":
            sm["outliers"] = 0.0  # a mesh has no slipped probe hits
            sm["duplicates"] = 1.0 if r.random() < 0.5 else 0.0
            sm["noise"] = float(np.exp(r.uniform(np.log(2e-6), np.log(1e-4))))
            self.spec.update(doubled=sm["duplicates"] > 0)
        elif n == "scale":
            self.chord = float(np.exp(r.uniform(np.log(5), np.log(5000))))
            if r.random() < 0.5:
                mm = float(np.exp(r.uniform(np.log(0.002), np.log(0.05))))
                sm["noise"] = min(mm / self.chord, 2e-3)
                self.spec["noise_mm"] = mm

    def placement(self, pl):
        r, n = self.rng, self.name
        if n == "scale":
            ch = self.chord
            u = r.random()
            if ch > 1000 and u < 0.7 or 100 < ch <= 1000 and u < 0.3:
                units, f = "m", 1000.0
            elif u > 0.8:
                units, f = "in", 25.4
            else:
                units, f = "mm", 1.0
            pl["chord_mm"] = ch / f
            pl["offset_mm"] = [v / f for v in pl["offset_mm"]]
            pl["units"] = units
            self.spec.update(chord_mm=ch, units=units)
        elif n == "slice":
            pl["chord_mm"] = float(np.exp(r.uniform(np.log(40), np.log(600))))
            pl["decimals"] = 4
            self.plane = {"tilt_deg": float(r.uniform(1, 5)), "z": float(r.uniform(-200, 800)), "scatter_mm": 0.0}
            if r.random() < 0.5:  # a scan's mesh: edges of a near-even length
                edge = float(np.exp(r.uniform(np.log(0.1), np.log(1.0))))
                self.spec.update(mesh="scan", edge_mm=edge, tol_c=1.0, max_edge_c=edge / pl["chord_mm"])
            else:  # a CAD export: the chordal tolerance, the edge capped or not
                tol = float(np.exp(r.uniform(np.log(0.005), np.log(0.05))))
                self.spec.update(mesh="cad", tol_mm=tol, tol_c=tol / pl["chord_mm"],
                                 max_edge_c=float(r.uniform(0.02, 0.06)) if r.random() < 0.5 else 0.0)
            self.spec["plane"] = self.plane
        elif n == "turned":
            pl["twist_deg"] = float([90.0, -90.0, 180.0][int(r.integers(0, 3))] + r.uniform(-8, 8))
            pl["flip"] = ["none", "x", "y"][int(r.choice(3, p=[0.5, 0.25, 0.25]))]
            self.spec.update(twist_deg=pl["twist_deg"], flip=pl["flip"])
        elif n == "machine":
            pl["offset_mm"] = [float(r.uniform(1400, 1600)), float(r.uniform(-900, -700))]
            pl["chord_mm"] = float(np.exp(r.uniform(np.log(15), np.log(150))))
            pl["decimals"] = 2 if r.random() < 0.5 else 3
            pl["strip"] = True
            self.plane = {"tilt_deg": float(r.uniform(0, 0.3)), "z": float(r.uniform(250, 350)), "scatter_mm": 0.0}
            self.spec.update(plane=self.plane, step_mm=10.0 ** -pl["decimals"])
        elif n == "repass":
            pl["chord_mm"] = float(np.exp(r.uniform(np.log(40), np.log(300))))
            d = r.uniform(0.02, 0.1)
            a = r.uniform(0, 2 * np.pi)
            self.spec.update(shift_mm=float(d), shift_dir_deg=float(np.degrees(a)))
        elif n == "columns" and r.random() < 0.5:
            self.plane = {"tilt_deg": 0.0, "z": float(np.round(r.uniform(-500, 2000), 1)), "scatter_mm": 0.0}
            self.spec["plane"] = self.plane
        elif n == "ballr":
            pl["chord_mm"] = float(np.exp(r.uniform(np.log(60), np.log(600))))
            rad = r.uniform(0.5, 3.0)
            self.spec.update(ball_mm=float(rad), ball_c=float(rad / pl["chord_mm"]))
        elif n == "ball":
            pl["chord_mm"] = float(np.exp(r.uniform(np.log(60), np.log(600))))
            rad = r.uniform(0.5, 3.0)
            half = bool(r.random() < 0.3)
            self.spec.update(ball_mm=float(rad), half=half)
            self.spec["ball_c"] = float(rad * (0.5 if half else 1.0) / pl["chord_mm"])
        elif n == "far":
            pl["offset_mm"] = [float(r.uniform(1200, 1800)), float(r.uniform(-900, 900))]
            pl["chord_mm"] = float(np.exp(r.uniform(np.log(50), np.log(1000))))
            pl["decimals"] = 8 if r.random() < 0.5 else 2
        elif n == "inch":
            pl["chord_mm"] /= 25.4
            pl["offset_mm"] = [v / 25.4 for v in pl["offset_mm"]]
            pl["units"] = "in"
        elif n == "z3d":
            self.plane = {"tilt_deg": float(r.uniform(0, 0.5)), "z": float(r.uniform(100, 2000)),
                          "scatter_mm": float(np.exp(r.uniform(np.log(0.002), np.log(0.05))))}
            self.spec["plane"] = self.plane

    def points(self, p, nrm, s, piece, kinds, okey, ctx):
        """Changes the drawn points (chord units, before placement); returns
        (p, nrm, s, piece, kinds, okey), okey being the key of the file order."""
        r, n = self.rng, self.name
        if n == "graze":
            a = np.radians(ctx["sm"]["graze_dir_deg"])
            c = np.maximum(np.abs(nrm @ np.array([np.cos(a), np.sin(a)])), 0.15)
            b = r.uniform(0.5, 2.0) * ctx["sm"]["noise"]
            p = p + nrm * (b * (1 / c - 1))[:, None]
            self.spec["bias_c"] = float(b)
            keep = np.ones(len(p), bool)
            per = ctx["perimeter"]
            for _ in range(int(r.integers(1, 5))):
                c0, w = r.uniform(0, per), r.uniform(0.005, 0.03) * per
                keep &= ((s - c0) % per) > w
            p, nrm, s, piece, okey = p[keep], nrm[keep], s[keep], piece[keep], okey[keep]
            kinds = [k for k, on in zip(kinds, keep) if on]
        elif n == "nose":
            per, s_le = ctx["perimeter"], ctx["s_le"]
            near = np.abs((s - s_le + per / 2) % per - per / 2)
            passes = int(r.integers(1, 4))
            w = r.uniform(0.02, 0.08) * per
            dens = max(np.sum(near < w), 4)
            extra_p, extra_n, extra_s, extra_pc, extra_k = [], [], [], [], []
            for j in range(passes):
                k = max(int(dens * r.uniform(0.5, 1.5)), 4)
                sj = np.sort((s_le + r.uniform(-w, w, k)) % per)
                pj, nj, seg = ctx["at"](sj)
                shift = r.uniform(-1, 1) * ctx["sm"]["noise"]
                pj = pj + nj * (shift + ctx["sm"]["noise"] * r.standard_normal(k))[:, None]
                extra_p.append(pj), extra_n.append(nj), extra_s.append(sj), extra_pc.append(ctx["piece"][seg])
                extra_k.append(2 * per + j * per + np.arange(k) / k)
            p = np.vstack([p] + extra_p)
            nrm = np.vstack([nrm] + extra_n)
            s = np.concatenate([s] + extra_s)
            piece = np.concatenate([piece] + extra_pc)
            okey = np.concatenate([okey] + extra_k)
            kinds = kinds + ["good"] * sum(len(e) for e in extra_s)
            self.spec.update(passes=passes, pass_width_c=float(w))
        elif n == "ballr":
            d = self.spec["ball_c"]
            p = p + nrm * d
            q, per = ctx["q"], ctx["perimeter"]
            # The arcs of radius d round every corner of the outline (a
            # sharp edge, a base's two), at the spacing of the points near
            # each: the ball rolls round a corner on its own radius.
            t = np.roll(q, -1, axis=0) - q
            t /= np.hypot(t[:, 0], t[:, 1])[:, None]
            seg_n = np.stack([t[:, 1], -t[:, 0]], axis=1)
            prev_n = np.roll(seg_n, 1, axis=0)
            turn = np.arctan2(prev_n[:, 0] * seg_n[:, 1] - prev_n[:, 1] * seg_n[:, 0], np.sum(prev_n * seg_n, axis=1))
            closed = np.vstack([q, q[:1]])
            arc_s = np.concatenate([[0], np.cumsum(np.hypot(*np.diff(closed, axis=0).T))])
            added = 0
            for i in np.nonzero(turn > np.radians(3))[0]:
                a0 = np.arctan2(prev_n[i, 1], prev_n[i, 0])
                si = arc_s[i]
                near = np.sort((s[np.abs((s - si + per / 2) % per - per / 2) < 0.03 * per] - si + per / 2) % per)
                h = float(np.median(np.diff(near))) if len(near) > 2 else 0.01 * per
                k = int(d * turn[i] / h)
                if k < 1:
                    continue
                th = a0 + turn[i] * (np.arange(k) + r.uniform(0, 1, k)) / k
                rad = np.stack([np.cos(th), np.sin(th)], axis=1)
                pa = q[i] + rad * (d + ctx["sm"]["noise"] * r.standard_normal(k))[:, None]
                p = np.vstack([p, pa])
                nrm = np.vstack([nrm, rad])
                s = np.concatenate([s, np.full(k, si)])
                piece = np.concatenate([piece, np.full(k, ol.PIECE_END)])
                # in the file between the points either side of the corner
                key = si if i > 0 else per
                okey = np.concatenate([okey, key - 1e-12 * per + (th - a0) / turn[i] * 1e-12 * per])
                kinds = kinds + ["good"] * k
                added += k
            self.spec.update(arc_points=added)
        elif n == "clamp":
            k = int(r.integers(3, 13))
            length, off = r.uniform(0.02, 0.10), r.uniform(0.01, 0.15)
            q = ctx["q"]
            # a jaw face beside the aft or the fore end, below the section
            # or beyond the end, along the chord
            end = r.random() < 0.6
            x0 = (0.9 if end else 0.05) + r.uniform(-0.05, 0.05)
            near = q[np.argmin(np.abs(q[:, 0] - x0) + 10 * (q[:, 1] > 0))]
            if r.random() < 0.5:
                a = near + np.array([0.0, -off])
                pts = a + np.outer(np.linspace(-length / 2, length / 2, k), [1.0, 0.0])
            else:
                tip = np.array([1.0 + off, 0.0]) if end else np.array([-off, 0.0])
                pts = tip + np.outer(np.linspace(-length / 2, length / 2, k), [0.0, 1.0])
            pts = pts + ctx["sm"]["noise"] * r.standard_normal(pts.shape)
            p = np.vstack([p, pts])
            nrm = np.vstack([nrm, np.tile([0.0, 1.0], (k, 1))])
            s = np.concatenate([s, np.full(k, -1.0)])
            piece = np.concatenate([piece, np.full(k, -1)])
            okey = np.concatenate([okey, 3 * ctx["perimeter"] + np.arange(k) / k])
            kinds = kinds + ["outlier"] * k
            self.spec.update(clamp_points=k, clamp_len_c=float(length), clamp_off_c=float(off))
        elif n == "strokes":
            p, nrm, s, piece, kinds, okey = self._strokes(p, nrm, s, piece, kinds, ctx)
        elif n == "shadow":
            keep = np.ones(len(p), bool)
            good = np.array([k == "good" for k in kinds])
            sparse_side = ol.PIECE_UPPER if r.random() < 0.5 else ol.PIECE_LOWER
            ratio = r.uniform(3, 6)
            keep &= ~((piece == sparse_side) & (r.random(len(p)) > 1 / ratio))
            shadowed = ol.PIECE_UPPER if r.random() < 0.5 else ol.PIECE_LOWER
            short = r.uniform(0.005, 0.04)
            keep &= ~((piece == shadowed) & good & (p[:, 0] > 1 - short))
            p, nrm, s, piece, okey = p[keep], nrm[keep], s[keep], piece[keep], okey[keep]
            kinds = [k for k, on in zip(kinds, keep) if on]
            self.spec.update(sparse="upper" if sparse_side == ol.PIECE_UPPER else "lower", ratio=float(ratio),
                             shadowed="upper" if shadowed == ol.PIECE_UPPER else "lower", short_c=float(short))
        elif n == "slice":
            p, nrm, s, piece, kinds, okey = self._slice(ctx)
        elif n == "gap":
            side = ol.PIECE_UPPER if r.random() < 0.5 else ol.PIECE_LOWER
            w = r.uniform(0.10, 0.25)
            x0 = r.uniform(0.25, 0.75 - w)
            keep = ~((piece == side) & (p[:, 0] > x0) & (p[:, 0] < x0 + w))
            p, nrm, s, piece, okey = p[keep], nrm[keep], s[keep], piece[keep], okey[keep]
            kinds = [k for k, on in zip(kinds, keep) if on]
            self.spec.update(side="upper" if side == ol.PIECE_UPPER else "lower", gap_from=float(x0), gap_c=float(w))
        elif n == "repass":
            # The second pass at its own spacing: the first pass's arc
            # positions moved by up to half a step each, then both passes
            # moved half the shift either way (chord units of the placement).
            per = ctx["perimeter"]
            srt = np.sort(s)
            h = float(np.median(np.diff(srt))) if len(s) > 2 else 0.01 * per
            s2 = np.sort((s[np.array([k == "good" for k in kinds])] + r.uniform(-0.5, 0.5, int(sum(k == "good" for k in kinds))) * h) % per)
            p2, n2, seg = ctx["at"](s2)
            p2 = p2 + n2 * (ctx["sm"]["noise"] * r.standard_normal(len(s2)))[:, None]
            ch = ctx["chord_mm"]
            a = np.radians(self.spec["shift_dir_deg"])
            half = 0.5 * self.spec["shift_mm"] / ch * np.array([np.cos(a), np.sin(a)])
            p = np.vstack([p - half, p2 + half])
            nrm = np.vstack([nrm, n2])
            s = np.concatenate([s, s2])
            piece = np.concatenate([piece, ctx["piece"][seg]])
            # a file of the two passes one after the other, each starting
            # where its operator began
            okey = np.concatenate([(okey - r.uniform(0, per)) % per, 2 * per + (s2 - r.uniform(0, per)) % per])
            kinds = kinds + ["good"] * len(s2)
            self.spec.update(second_pass=len(s2))
        elif n == "table":
            q = ctx["q"]
            off = r.uniform(0.02, 0.2)
            tilt = np.radians(r.uniform(-2, 2))
            x0, x1 = r.uniform(-0.2, 0.3), r.uniform(0.7, 1.1)
            h = float(np.median(np.diff(np.sort(s)))) * r.uniform(0.5, 2.0)
            k = int(min(max((x1 - x0) / max(h, 1e-6), 10), 600))
            x = np.sort(r.uniform(x0, x1, k)) if r.random() < 0.3 else np.linspace(x0, x1, k)
            y = q[:, 1].min() - off + (x - (x0 + x1) / 2) * np.tan(tilt)
            pts = np.stack([x, y], axis=1) + max(ctx["sm"]["noise"], 1e-6) * r.standard_normal((k, 2))
            p = np.vstack([p, pts])
            nrm = np.vstack([nrm, np.tile([0.0, -1.0], (k, 1))])
            s = np.concatenate([s, np.full(k, -1.0)])
            piece = np.concatenate([piece, np.full(k, -1)])
            per = ctx["perimeter"]
            okey = np.concatenate([okey, (3 if r.random() < 0.5 else -3) * per + np.arange(k) / k])
            kinds = kinds + ["outlier"] * k
            self.spec.update(table_points=k, table_off_c=float(off), table_from=float(x0), table_to=float(x1))
        return p, nrm, s, piece, kinds, okey

    def _slice(self, ctx):
        """The slice of a triangle mesh: vertices along the outline at the
        chordal tolerance (each facet's chord within tol of the curve,
        no longer than max_edge), noise on the vertices, every vertex and
        one point on each facet (where the slicing plane crosses the facet's
        diagonal: a random fraction of the way along it)."""
        r = self.rng
        q, per = ctx["q"], ctx["perimeter"]
        if self.spec["mesh"] == "scan":
            ctx["sm"]["noise"] = max(ctx["sm"]["noise"], 0.01 / ctx["chord_mm"])
        tol, cap = self.spec["tol_c"], self.spec["max_edge_c"] or np.inf
        closed = np.vstack([q, q[:1]])
        arc = np.concatenate([[0], np.cumsum(np.hypot(*np.diff(closed, axis=0).T))])
        n = len(q)
        verts = [0]
        i = 0
        while True:
            # the farthest vertex j whose chord from i stays within tol
            lo, hi = i + 1, min(i + 1, n)
            step = 1
            while hi < n and self._chord_ok(closed, i, hi, tol) and arc[hi] - arc[i] <= cap:
                lo = hi
                step *= 2
                hi = min(i + step, n)
            if hi >= n and self._chord_ok(closed, i, n, tol) and arc[n] - arc[i] <= cap:
                break
            while hi - lo > 1:
                mid = (lo + hi) // 2
                if self._chord_ok(closed, i, mid, tol) and arc[mid] - arc[i] <= cap:
                    lo = mid
                else:
                    hi = mid
            i = lo
            verts.append(i)
        sv = arc[np.array(verts)]
        pv, nv, segv = ctx["at"](sv)
        pv = pv + nv * (ctx["sm"]["noise"] * r.standard_normal(len(sv)))[:, None]
        nxt = np.roll(np.arange(len(sv)), -1)
        f = r.uniform(0.05, 0.95, len(sv))
        pf = pv * (1 - f)[:, None] + pv[nxt] * f[:, None]
        s_next = np.where(nxt == 0, per, sv[nxt])
        sf = sv * (1 - f) + s_next * f
        _, nf, segf = ctx["at"](sf % per)
        p = np.vstack([pv, pf])
        nrm = np.vstack([nv, nf])
        s = np.concatenate([sv, sf % per])
        piece = np.concatenate([ctx["piece"][segv], ctx["piece"][segf]])
        okey = np.concatenate([sv, sf])
        self.spec.update(vertices=len(sv))
        return p, nrm, s, piece, ["good"] * len(s), okey

    @staticmethod
    def _chord_ok(closed, i, j, tol):
        a, b = closed[i], closed[j]
        mid = closed[i + 1 : j]
        if len(mid) == 0:
            return True
        ab = b - a
        L = np.hypot(*ab)
        if L == 0:
            return False
        d = np.abs((mid[:, 0] - a[0]) * ab[1] - (mid[:, 1] - a[1]) * ab[0]) / L
        return bool(d.max() <= tol)

    def _strokes(self, p, nrm, s, piece, kinds, ctx):
        """The loop cut into strokes that overlap, each run either way, the
        strokes in any order; okey orders the file."""
        r = self.rng
        per, noise = ctx["perimeter"], ctx["sm"]["noise"]
        k = int(r.integers(3, 8))
        cuts = np.sort(r.uniform(0, per, k))
        # strokes at least 5 % of the perimeter long
        for j in range(1, k):
            cuts[j] = max(cuts[j], cuts[j - 1] + 0.05 * per)
        cuts = cuts[cuts < cuts[0] + 0.95 * per]
        k = len(cuts)
        stroke = (np.searchsorted(cuts, s % per, side="right") - 1) % k
        start = cuts[stroke]
        local = (s - start) % per
        extra_p, extra_n, extra_s, extra_pc, extra_st, extra_loc = [], [], [], [], [], []
        dens = len(s) / per
        overlaps = []
        for j in range(k):
            # stroke j runs on over the start of stroke j+1
            if r.random() < 0.8:
                ov = r.uniform(0.005, 0.03) * per
                m = max(int(round(ov * dens * r.uniform(0.7, 1.3))), 1)
                nxt = cuts[(j + 1) % k]
                sj = np.sort((nxt + r.uniform(0, ov, m)) % per)
                pj, nj, seg = ctx["at"](sj)
                shift = r.uniform(-1, 1) * noise
                pj = pj + nj * (shift + noise * r.standard_normal(m))[:, None]
                extra_p.append(pj), extra_n.append(nj), extra_s.append(sj), extra_pc.append(ctx["piece"][seg])
                extra_st.append(np.full(m, j)), extra_loc.append((sj - cuts[j]) % per)
                overlaps.append(float(ov / per))
        if extra_p:
            p = np.vstack([p] + extra_p)
            nrm = np.vstack([nrm] + extra_n)
            s = np.concatenate([s] + extra_s)
            piece = np.concatenate([piece] + extra_pc)
            stroke = np.concatenate([stroke] + extra_st)
            local = np.concatenate([local] + extra_loc)
            kinds = kinds + ["good"] * sum(len(e) for e in extra_s)
        rank = r.permutation(k)
        back = r.random(k) < 0.5
        okey = rank[stroke] * 2 * per + np.where(back[stroke], 2 * per - local, local) * 0.5
        self.spec.update(strokes=k, overlaps=len(overlaps), reversed=int(back.sum()))
        return p, nrm, s, piece, kinds, okey

    # --- the file's text ---------------------------------------------------
    def text(self, header, rows, sep):
        """Returns (lines, line numbers of the rows, file options)."""
        opts = {"encoding": "utf-8", "newline": "\n", "bom": False, "trailing": 0}
        if self.name == "numbered":
            return self._numbered(rows, sep, opts)
        if self.name == "columns":
            return self._columns(rows, sep, opts)
        if self.name != "text":
            return header + rows, list(range(len(header) + 1, len(header) + len(rows) + 1)), opts
        r = self.rng
        opts.update(encoding="cp1252" if r.random() < 0.6 else "utf-8", newline="\r\n" if r.random() < 0.6 else "\n",
                    bom=bool(r.random() < 0.4), trailing=int(r.integers(0, 4)))
        if opts["encoding"] == "cp1252":
            opts["bom"] = False  # no BOM in a code-page file
        title = ["Section probe run %d, 20.%d\u00b0C \u00b1 0.5\u00b0C" % (r.integers(1, 9), r.integers(0, 9)),
                 "# part: rotor blade, station %d mm, angle 4.5\u00b0" % r.integers(100, 900),
                 "# operator: initials only; probe \u00f8 2 mm"]
        title = title[: int(r.integers(1, 4))]
        lines = title + header
        cut = int(r.integers(len(rows) // 4, 3 * len(rows) // 4 + 1)) if r.random() < 0.5 else -1
        nums = []
        for j, row in enumerate(rows):
            if j == cut:
                lines.append("# pass 2")
            lines.append(row)
            nums.append(len(lines))
        lines += [""] * opts["trailing"]
        opts["title_lines"] = len(title)
        return lines, nums, opts

    def _numbered(self, rows, sep, opts):
        r = self.rng
        label = bool(r.random() < 0.5)
        start = int(r.integers(0, 2))
        out_sep = ["," , ";", "\t", " "][int(r.choice(4, p=[0.5, 0.2, 0.15, 0.15]))]
        prefix = ["PNT", "P", "Pt_", "point"][int(r.integers(0, 4))]
        lines = []
        for j, row in enumerate(rows):
            fields = row.split(sep)
            if out_sep == ";":
                fields = [f.replace(".", ",") for f in fields]
            tag = ("%s%d" % (prefix, j + 1)) if label else str(j + start)
            lines.append(out_sep.join([tag] + fields))
        self.spec.update(label=label, sep={",": "comma", ";": "semicolon", "\t": "tab", " ": "blank"}[out_sep])
        return lines, list(range(1, len(lines) + 1)), opts

    def _columns(self, rows, sep, opts):
        r = self.rng
        three = self.plane is not None
        extra = ["", "i", "n", "q"][int(r.integers(0, 4))]
        out_sep = [",", ";", "\t", " "][int(r.choice(4, p=[0.35, 0.3, 0.2, 0.15]))]
        comma = out_sep == ";" or (out_sep == "\t" and r.random() < 0.4)
        units = bool(r.random() < 0.5)
        names = ["x", "y"] + (["z"] if three else [])
        if r.random() < 0.5:
            names = [c.upper() for c in names]
        if units:
            names = ["%s [mm]" % c for c in names]
        names += {"": [], "i": ["intensity"], "n": ["nx", "ny", "nz"], "q": ["quality"]}[extra]
        header = [out_sep.join(names)]
        if not extra and r.random() < 0.3:
            header = []  # two or three coordinates need no names
        lines = list(header)
        for row in rows:
            fields = row.split(sep)
            if extra == "i":
                fields.append(str(int(r.integers(0, 256))))
            elif extra == "n":
                v = r.standard_normal(3)
                v /= np.linalg.norm(v)
                fields += ["%.4f" % c for c in v]
            elif extra == "q":
                fields.append(str(int(r.random() < 0.95)))
            if comma:
                fields = [f.replace(".", ",") for f in fields]
            lines.append(out_sep.join(fields))
        opts["newline"] = "\r\n" if r.random() < 0.5 else "\n"
        self.spec.update(sep={",": "comma", ";": "semicolon", "\t": "tab", " ": "blank"}[out_sep], decimal_comma=comma,
                         extra=extra or "none", header=bool(header), crlf=opts["newline"] == "\r\n")
        return lines, list(range(len(header) + 1, len(lines) + 1)), opts

    def write(self, path, lines, opts):
        text = opts["newline"].join(lines) + opts["newline"]
        data = text.encode(opts["encoding"])
        if opts["bom"]:
            data = b"\xef\xbb\xbf" + data
        with open(path, "wb") as f:
            f.write(data)


class OffsetOutline:
    """The path of a probe ball's centre round an outline: every point
    moved outward by d (chord units of the outline) along its normal, with
    an arc of radius d round every corner (a sharp edge, a base's corners).
    Same attributes as outline.Outline, in the offset path's own frame:
    a sharp edge becomes a rounded one of radius d, a rounded one of radius
    R grows to R + d, a base stays straight (blunt) with rounded corners."""

    def __init__(self, o, d):
        q = o.pts
        n = len(q)
        nxt = np.roll(q, -1, axis=0)
        t = nxt - q
        t /= np.hypot(t[:, 0], t[:, 1])[:, None]
        seg_n = np.stack([t[:, 1], -t[:, 0]], axis=1)  # outward of each segment (CCW)
        prev_n = np.roll(seg_n, 1, axis=0)
        pts, piece, centre, te = [], [], None, None
        for i in range(n):
            a, b = prev_n[i], seg_n[i]
            turn = np.degrees(np.arctan2(a[0] * b[1] - a[1] * b[0], a @ b))
            if turn > 3:  # a convex corner: an arc round it
                th0, th1 = np.arctan2(a[1], a[0]), np.arctan2(b[1], b[0])
                th1 = th0 + (th1 - th0) % (2 * np.pi)
                k = max(int(np.ceil((th1 - th0) / np.radians(0.3))), 2)
                th = np.linspace(th0, th1, k)
                pts.append(q[i] + d * np.stack([np.cos(th), np.sin(th)], axis=1))
                piece += [ol.PIECE_END] * k
                if o.te_kind == "sharp" and np.hypot(*(q[i] - o.te)) < 1e-12:
                    centre = q[i]
            else:
                m = a + b
                m /= np.hypot(*m)
                pts.append((q[i] + d * m / max(m @ b, 0.5))[None])
                piece.append(o.piece[i])
        self.pts = np.vstack(pts)
        self.piece = np.array(piece)
        self.radius = o.radius
        if o.te_kind == "sharp":
            if centre is None:
                raise ValueError("ball offset: no corner at the sharp edge")
            self.te_kind, self.te_size, self.arc = "rounded", 2 * d, (centre, d)
        elif o.te_kind == "rounded":
            c, rr = o.arc
            self.te_kind, self.te_size, self.arc = "rounded", 2 * (rr + d), (c, rr + d)
        else:
            self.te_kind, self.te_size, self.arc = "blunt", o.te_size, None
            end = o.pts[o.piece == ol.PIECE_END]
            mid = (end[0] + end[-1]) / 2
            bn = np.array([end[-1, 1] - end[0, 1], -(end[-1, 0] - end[0, 0])])
            te = mid + d * bn / np.hypot(*bn)
        self.te, self.le, self.chord_raw, self.phi = ol.frame_of(self._farthest, self.arc, te)

    def _farthest(self, q):
        return self.pts[int(np.argmax(np.hypot(self.pts[:, 0] - q[0], self.pts[:, 1] - q[1])))]

    normalize = ol.Outline.normalize
    normalized = ol.Outline.normalized


def selftest():
    """The ball's path: every outline vertex lies d from the path (a
    Minkowski sum's boundary with a disc), and a sharp edge's path is an
    arc of radius d round the corner."""
    bad = []
    o = ol.Outline(naca.four_digit(0.04, 0.4, 0.12, True), "sharp")
    d = 0.01
    off = OffsetOutline(o, d)
    dist = ol.nearest(off.pts, o.pts[::7])
    if abs(dist.min() - d) > 2e-5 or abs(dist.max() - d) > 2e-5:
        bad.append("ball path: outline %.6f-%.6f from the path, want %.4f" % (dist.min(), dist.max(), d))
    if off.te_kind != "rounded" or abs(np.hypot(*(off.te - o.te)) - d) > 1e-12:
        bad.append("ball path: the sharp edge's tip is not d from the corner")
    return bad
