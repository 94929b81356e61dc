#!/usr/bin/python3
"""Linear-strength vortex panels with the Kutta condition, vectorised numpy.

The peer of package plugins/builtin/vortexpanel for scripts/solver-bench.sh:
the same method (Katz & Plotkin, Low-Speed Aerodynamics, 2nd ed. (2001),
§11.4), with the same panel integrals, the same treatment of a cusped
trailing edge (extrapolation rows) and of a blunt one (a base panel carrying
a constant source), the same right-hand sides (α = 0 and α = 90°, one LU
solve) and the same per-angle results, written the way a numpy user would
write them: array operations over all panel pairs, no Python loop over
panels, np.linalg.solve (LAPACK dgesv on the system's BLAS, OpenBLAS on
Debian with libopenblas0) for the linear system.

Nodes are read as lines "x y" (chord units, the node order of package
geometry). Commands:

  vortex_numpy.py solve NODES ALPHA_DEG...   print cl, cm, cp of each angle as JSON
  vortex_numpy.py serve                      timing server for solver-bench.sh:
      reads "time NODES REPS ANGLES" lines from stdin and answers with the
      wall times in seconds of REPS full solutions (build, solve, results for
      ANGLES angles evenly spaced in [-10°, 10°]) after a warm-up of at least
      three solutions and 30 ms, then "cpu" and the processor time of each
      (time.process_time: user and system, all threads of the process);
      reads "lu N REPS" and answers the times of np.linalg.solve on a random
      N×N system with one right-hand side; "info" answers the numpy version
      and the BLAS library the process loaded.
"""

import json
import math
import sys
import time

import numpy as np

INV2PI = 1.0 / (2.0 * math.pi)
WARMUP = 0.030  # seconds of untimed solving before a timed batch
CUSP_ANGLE = 2.0 * math.pi / 180.0


def read_nodes(path):
    return np.loadtxt(path, dtype=np.float64, ndmin=2)


class Panels:
    """Per-panel geometry: start point, unit tangent, length; arc length."""

    def __init__(self, nodes):
        n = len(nodes) - 1
        self.nodes = nodes
        self.n = n
        self.blunt = not (nodes[0, 0] == nodes[n, 0] and nodes[0, 1] == nodes[n, 1])
        a = nodes[:n]
        b = nodes[1:]
        if self.blunt:  # base panel from the last node to the first
            a = np.vstack([a, nodes[n]])
            b = np.vstack([b, nodes[0]])
        d = b - a
        s = np.hypot(d[:, 0], d[:, 1])
        self.x0, self.y0 = a[:, 0].copy(), a[:, 1].copy()
        self.tx, self.ty, self.s = d[:, 0] / s, d[:, 1] / s, s
        self.arc = np.concatenate([[0.0], np.cumsum(s[:n])])
        self.cusp = False
        if not self.blunt:
            cos_te = -(self.tx[0] * self.tx[n - 1] + self.ty[0] * self.ty[n - 1])
            self.cusp = cos_te > math.cos(CUSP_ANGLE)
        self.size = n + 2 if self.blunt else n + 1


def influence(p):
    """The influence matrix: rows 0..n-1 zero normal flow at the panel
    midpoints, row n the Kutta condition, row n+1 (blunt) zero normal flow at
    the base panel's midpoint; columns 0..n the node strengths, n+1 the base
    source."""
    n, m = p.n, p.size
    rows = n + 1 if p.blunt else n
    x0, y0, tx, ty, s = p.x0, p.y0, p.tx, p.ty, p.s
    # Collocation points (midpoints) and their outward normals, as columns.
    px = (x0[:rows] + 0.5 * s[:rows] * tx[:rows])[:, None]
    py = (y0[:rows] + 0.5 * s[:rows] * ty[:rows])[:, None]
    nx, ny = ty[:rows, None], -tx[:rows, None]
    # Every collocation point in the frame of every surface panel j < n.
    sj, txj, tyj = s[:n], tx[:n], ty[:n]
    dx = px - x0[:n]
    dy = py - y0[:n]
    x = dx * txj + dy * tyj
    y = dy * txj - dx * tyj
    xs = x - sj
    yy = y * y
    beta = np.arctan2(y * sj, x * xs + yy)
    lnr = 0.5 * np.log((x * x + yy) / (xs * xs + yy))
    # A panel's own midpoint: y = 0, β = π, ln(r1/r2) = 0.
    d = np.arange(min(rows, n))
    x[d, d] = 0.5 * sj[d]
    y[d, d] = 0.0
    beta[d, d] = math.pi
    lnr[d, d] = 0.0
    i1u = x * beta - y * lnr
    i1v = x * lnr - sj + y * beta
    i1u /= sj
    i1v /= sj
    tn = txj * nx + tyj * ny
    ln = txj * ny - tyj * nx
    a = np.zeros((m, m))
    # Start-node (γ_j) and end-node (γ_j+1) coefficients of panel j.
    ca = -(beta - i1u) * INV2PI * tn + (lnr - i1v) * INV2PI * ln
    cb = -i1u * INV2PI * tn + i1v * INV2PI * ln
    r = np.arange(rows)
    if p.blunt:
        r[n] = n + 1  # the base row comes after the Kutta row
    a[r, :n] = ca
    a[r, 1 : n + 1] += cb
    if p.blunt:
        j = n
        dx = px[:n, 0] - x0[j]
        dy = py[:n, 0] - y0[j]
        x = dx * tx[j] + dy * ty[j]
        y = dy * tx[j] - dx * ty[j]
        xs = x - s[j]
        yy = y * y
        beta = np.arctan2(y * s[j], x * xs + yy)
        lnr = 0.5 * np.log((x * x + yy) / (xs * xs + yy))
        tn = tx[j] * nx[:n, 0] + ty[j] * ny[:n, 0]
        ln = tx[j] * ny[:n, 0] - ty[j] * nx[:n, 0]
        a[:n, n + 1] = lnr * INV2PI * tn + beta * INV2PI * ln
        a[n + 1, n + 1] = 0.5  # the base panel's own σ/2
    a[n, 0] = 1.0
    a[n, n] = 1.0
    if p.cusp:  # extrapolation of γ replaces the two trailing-edge rows
        a[0] = 0.0
        q = s[0] / s[1]
        a[0, 0], a[0, 1], a[0, 2] = 1.0, -(1.0 + q), q
        a[n - 1] = 0.0
        q = s[n - 1] / s[n - 2]
        a[n - 1, n], a[n - 1, n - 1], a[n - 1, n - 2] = 1.0, -(1.0 + q), q
    return a


def rhs(p):
    """Right-hand sides for V∞ = (1, 0) and (0, 1)."""
    n = p.n
    b = np.zeros((p.size, 2))
    b[:n, 0] = -p.ty[:n]
    b[:n, 1] = p.tx[:n]
    if p.cusp:
        b[0] = 0.0
        b[n - 1] = 0.0
    if p.blunt:
        b[n + 1, 0] = -p.ty[n]
        b[n + 1, 1] = p.tx[n]
    return b


def results(p, sol, alphas):
    """Per-angle results by superposition of the two solutions."""
    n = p.n
    sa, ca = np.sin(alphas), np.cos(alphas)
    v = np.outer(ca, sol[:, 0]) + np.outer(sa, sol[:, 1])  # angles × unknowns
    g = v[:, : n + 1]
    cp = 1.0 - g * g
    ga, gb = g[:, :n], g[:, 1:]
    s = p.s[:n]
    circ = (0.5 * s * (ga + gb)).sum(axis=1)
    icp = s * (1.0 - (ga * ga + ga * gb + gb * gb) / 3.0)
    ixcp = s * s * (0.5 - (ga * ga / 12.0 + ga * gb / 6.0 + gb * gb / 4.0))
    nx, ny = p.ty[:n], -p.tx[:n]
    fx = -(icp * nx).sum(axis=1)
    fy = -(icp * ny).sum(axis=1)
    rx, ry = p.x0[:n] - 0.25, p.y0[:n]
    cm = ((rx * ny - ry * nx) * icp - ixcp).sum(axis=1)
    cl = -2.0 * circ
    cl_p = fy * ca - fx * sa
    out = {
        "gamma": g,
        "cp": cp,
        "cl": cl,
        "cl_pressure": cl_p,
        "cl_diff": cl - cl_p,
        "cd_pressure": fx * ca + fy * sa,
        "cm": cm,
        "base_source": v[:, n + 1] if p.blunt else np.zeros(len(alphas)),
    }
    # Front stagnation point: the steepest change of sign of γ from
    # negative to positive along the nodes.
    up = (ga < 0) & (gb >= 0)
    slope = np.where(up, (gb - ga) / s, 0.0)
    k = slope.argmax(axis=1)
    rows = np.arange(len(alphas))
    found = slope[rows, k] > 0
    f = -ga[rows, k] / (gb[rows, k] - ga[rows, k])
    nd = p.nodes
    sx = nd[k, 0] + (nd[k + 1, 0] - nd[k, 0]) * f
    sy = nd[k, 1] + (nd[k + 1, 1] - nd[k, 1]) * f
    out["stagnation"] = np.where(found[:, None], np.stack([sx, sy, p.arc[k] + f * s[k]], axis=1), 0.0)
    out["stagnation_panel"] = np.where(found, k, -1)
    return out


def solve(nodes, alphas):
    p = Panels(nodes)
    a = influence(p)
    sol = np.linalg.solve(a, rhs(p))
    return results(p, sol, alphas)


def sweep(count):
    return np.radians(-10.0 + 20.0 * np.arange(count) / max(count - 1, 1))


def blas_library():
    """The BLAS shared library this process loaded, from /proc/self/maps."""
    try:
        with open("/proc/self/maps") as maps:
            libs = sorted({line.split()[-1] for line in maps if "blas" in line.split()[-1].lower()})
    except OSError:
        return "BLAS library unknown"
    return " ".join(libs) if libs else "no BLAS library found"


def serve():
    rng = np.random.default_rng(1)
    cache = {}
    for line in sys.stdin:
        f = line.split()
        if not f:
            continue
        if f[0] == "time":
            path, reps, count = f[1], int(f[2]), int(f[3])
            if path not in cache:
                cache[path] = read_nodes(path)
            nodes, alphas = cache[path], sweep(count)
            # Warm up as the Go side does: at least three solutions and 30 ms.
            t0, k = time.perf_counter(), 0
            while k < 3 or time.perf_counter() - t0 < WARMUP:
                solve(nodes, alphas)
                k += 1
            ts, cpu = [], []
            for _ in range(reps):
                c, t = time.process_time(), time.perf_counter()
                solve(nodes, alphas)
                ts.append(time.perf_counter() - t)
                cpu.append(time.process_time() - c)
            print(" ".join("%.9g" % t for t in ts) + " cpu " + " ".join("%.9g" % c for c in cpu), flush=True)
            continue
        elif f[0] == "info":
            print("numpy %s, %s" % (np.__version__, blas_library()), flush=True)
            continue
        elif f[0] == "lu":
            n, reps = int(f[1]), int(f[2])
            a = rng.standard_normal((n, n))
            b = rng.standard_normal((n, 1))
            np.linalg.solve(a, b)
            ts = []
            for _ in range(reps):
                t = time.perf_counter()
                np.linalg.solve(a, b)
                ts.append(time.perf_counter() - t)
        else:
            print("error unknown command " + f[0], flush=True)
            continue
        print(" ".join("%.9g" % t for t in ts), flush=True)


def main(argv):
    if len(argv) >= 3 and argv[1] == "solve":
        alphas = np.radians([float(a) for a in argv[3:]])
        r = solve(read_nodes(argv[2]), alphas)
        json.dump(
            {
                "cl": r["cl"].tolist(),
                "cm": r["cm"].tolist(),
                "cl_pressure": r["cl_pressure"].tolist(),
                "cd_pressure": r["cd_pressure"].tolist(),
                "base_source": r["base_source"].tolist(),
                "stagnation_x": r["stagnation"][:, 0].tolist(),
                "cp": r["cp"].tolist(),
            },
            sys.stdout,
        )
        print()
        return 0
    if len(argv) == 2 and argv[1] == "serve":
        serve()
        return 0
    print(__doc__, file=sys.stderr)
    return 2


if __name__ == "__main__":
    sys.exit(main(sys.argv))
