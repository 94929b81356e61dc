'use strict';
// The calculation of the print-check stage, apart from the protocol so that
// it can be tested on its own (test/printcheck.test.js).
//
// A section printed on a fused-filament printer is made of walls (the
// outline traced `walls` times, lines `line_width_mm` wide) and a sparse
// infill inside them. From the section's nodes and its chord in mm this
// works out, in the normalised frame (x along the chord, y across it):
//
//   - the section's area, and how it splits into walls (every point
//     within walls * line_width_mm of the outline) and infill (the rest);
//   - the mass per metre of span, density * (walls + infill_fraction * infill);
//   - the thickness across the chord (perpendicular to the chord line) and
//     where it is largest;
//   - how far forward of the trailing edge the section is thinner than one
//     line (the printer cannot lay a line there: it leaves the edge short or
//     rounds it) and thinner than the walls of both sides (solid, no infill).
//
// The walls are the points within the wall thickness of the outline, as a
// slicer's inset perimeters make them; the area is integrated in vertical
// strips, each cut by the outline (even-odd), the part of each cut farther
// than the wall thickness from the outline found by bisection on the
// distance to the outline's segments.

const STRIPS = 4000; // vertical strips across the chord
const BISECT = 52; // bisection steps: below 1e-15 of a strip's length

// analyse returns the figures of the section with nodes xs, ys (chord
// units, normalised frame, a closed loop or one whose first and last node
// the trailing edge joins) for the settings p: {chordMM, lineWidthMM,
// walls, infillFraction, densityGcm3}. It throws an Error with .badInput
// set when the nodes cannot make a section.
function analyse(xs, ys, p) {
  const n = xs.length;
  if (n < 3 || ys.length !== n) {
    throw badInput(`a section needs at least 3 nodes with x and y, got ${n}`);
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(xs[i]) || !Number.isFinite(ys[i])) {
      throw badInput(`node ${i} is not a finite point`);
    }
  }
  // The segments of the closed outline (the last node joins the first:
  // a blunt trailing edge's base closes the loop).
  const segs = [];
  let area2 = 0;
  let xmin = Infinity;
  let xmax = -Infinity;
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n;
    const ax = xs[i], ay = ys[i], bx = xs[j], by = ys[j];
    area2 += ax * by - bx * ay;
    xmin = Math.min(xmin, ax);
    xmax = Math.max(xmax, ax);
    if (ax !== bx || ay !== by) {
      segs.push({ ax, ay, bx, by, lo: Math.min(ax, bx), hi: Math.max(ax, bx) });
    }
  }
  const area = Math.abs(area2) / 2;
  if (!(area > 0) || !(xmax > xmin)) {
    throw badInput('the nodes enclose no area');
  }

  const c = p.chordMM;
  const wall = (p.walls * p.lineWidthMM) / c; // wall thickness, chord units
  const line = p.lineWidthMM / c; // one line, chord units

  const h = (xmax - xmin) / STRIPS;
  let infill = 0;
  let tMax = 0;
  let tMaxAt = xmin;
  let lastThick = -Infinity; // aft-most strip at least one line thick
  let lastInfill = -Infinity; // aft-most strip with infill
  const near = [];
  for (let k = 0; k < STRIPS; k++) {
    const x = xmin + (k + 0.5) * h;
    // Crossings of the vertical line at x; segments within the wall
    // thickness of it, for the distances.
    const ycut = [];
    near.length = 0;
    for (const s of segs) {
      if (s.lo <= x + wall && s.hi >= x - wall) {
        near.push(s);
      }
      if ((s.ax <= x) !== (s.bx <= x)) {
        ycut.push(s.ay + ((x - s.ax) / (s.bx - s.ax)) * (s.by - s.ay));
      }
    }
    ycut.sort((a, b) => a - b);
    let t = 0;
    let inner = 0;
    for (let q = 0; q + 1 < ycut.length; q += 2) {
      const ya = ycut[q], yb = ycut[q + 1];
      t += yb - ya;
      inner += innerLength(x, ya, yb, near, wall);
    }
    if (t > tMax) {
      tMax = t;
      tMaxAt = x;
    }
    if (t >= line) lastThick = x;
    if (inner > 0) lastInfill = x;
    infill += inner * h;
  }
  const walls = Math.max(area - infill, 0);
  const c2 = c * c;
  const areaMM2 = area * c2;
  const wallsMM2 = walls * c2;
  const infillMM2 = infill * c2;
  // 1 mm² of section over 1 m of span is 1 cm³.
  const massGPerM = p.densityGcm3 * (wallsMM2 + p.infillFraction * infillMM2);
  const aft = (x) => (x === -Infinity ? xmax - xmin : Math.max(xmax - x - h / 2, 0));
  return {
    chord_mm: c,
    area_mm2: areaMM2,
    walls_mm2: wallsMM2,
    infill_mm2: infillMM2,
    mass_g_per_m: massGPerM,
    thickness_mm: tMax * c,
    thickness_at: tMaxAt,
    thin_te_mm: aft(lastThick) * c,
    solid_te_mm: aft(lastInfill) * c,
    wall_mm: p.walls * p.lineWidthMM,
  };
}

// innerLength returns the length of the part of the cut from (x, ya) to
// (x, yb) that lies farther than wall from every segment in near (the
// segments that can be that close). The distance to the outline rises from
// zero at each end of the cut; the search takes the cut's point farthest
// from the outline by golden section (stopping at the first point farther
// than wall), then each end of the inner part by bisection.
function innerLength(x, ya, yb, near, wall) {
  const d = (y) => distance(x, y, near, wall);
  const g = (Math.sqrt(5) - 1) / 2;
  let lo = ya, hi = yb;
  let m1 = hi - g * (hi - lo), m2 = lo + g * (hi - lo);
  let d1 = d(m1), d2 = d(m2);
  // The distance is capped at wall: a point that reaches it will do.
  for (let i = 0; i < BISECT && d1 < wall && d2 < wall; i++) {
    if (d1 < d2) {
      lo = m1; m1 = m2; d1 = d2;
      m2 = lo + g * (hi - lo); d2 = d(m2);
    } else {
      hi = m2; m2 = m1; d2 = d1;
      m1 = hi - g * (hi - lo); d1 = d(m1);
    }
  }
  const top = d1 >= d2 ? m1 : m2;
  if (Math.max(d1, d2) < wall) return 0;
  // Lower end: between ya (distance 0) and top (distance >= wall).
  let a = ya, b = top;
  for (let i = 0; i < BISECT; i++) {
    const m = (a + b) / 2;
    if (d(m) < wall) a = m; else b = m;
  }
  const low = b;
  a = top; b = yb;
  for (let i = 0; i < BISECT; i++) {
    const m = (a + b) / 2;
    if (d(m) < wall) b = m; else a = m;
  }
  return Math.max(a - low, 0);
}

// distance returns the distance from (x, y) to the nearest segment of
// near, or cap when none is nearer.
function distance(x, y, near, cap) {
  let best = cap * cap;
  for (const s of near) {
    const ex = s.bx - s.ax, ey = s.by - s.ay;
    const px = x - s.ax, py = y - s.ay;
    let u = (px * ex + py * ey) / (ex * ex + ey * ey);
    if (u < 0) u = 0; else if (u > 1) u = 1;
    const dx = px - u * ex, dy = py - u * ey;
    const d2 = dx * dx + dy * dy;
    if (d2 < best) best = d2;
  }
  return Math.sqrt(best);
}

function badInput(msg) {
  const e = new Error(msg);
  e.badInput = true;
  return e;
}

module.exports = { analyse, badInput, STRIPS };
