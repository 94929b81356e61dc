'use strict';
// Tests of the print-check stage's sums against exact geometry, and of its
// parameter and section checks. Run with "npm test" (node --test).

const test = require('node:test');
const assert = require('node:assert/strict');
const { analyse, STRIPS } = require('../printcheck.js');
const { describe, params, run } = require('../stage.js');

const PLA = { lineWidthMM: 0.4, walls: 2, infillFraction: 0.2, densityGcm3: 1.24 };

function ellipse(a, b, n) {
  const xs = [], ys = [];
  for (let i = 0; i < n; i++) {
    const th = (2 * Math.PI * i) / n;
    xs.push(a + a * Math.cos(th));
    ys.push(b * Math.sin(th));
  }
  return [xs, ys];
}

function perimeter(xs, ys) {
  let p = 0;
  for (let i = 0; i < xs.length; i++) {
    const j = (i + 1) % xs.length;
    p += Math.hypot(xs[j] - xs[i], ys[j] - ys[i]);
  }
  return p;
}

// Half thickness of a NACA 4-digit section, NACA Report 824 (eq. for y_t,
// closed-trailing-edge coefficient -0.1036 as commonly used).
function naca4Half(t, x) {
  return 5 * t * (0.2969 * Math.sqrt(x) - 0.126 * x - 0.3516 * x * x + 0.2843 * x ** 3 - 0.1036 * x ** 4);
}

function naca0012(perSurface) {
  const xs = [], ys = [];
  for (let i = 0; i <= 2 * perSurface; i++) {
    const x = 0.5 * (1 + Math.cos((Math.PI * i) / perSurface));
    xs.push(x);
    ys.push((i <= perSurface ? 1 : -1) * naca4Half(0.12, x));
  }
  return [xs, ys];
}

test('a circle: the infill is the concentric disc inside the walls (exact)', () => {
  const [xs, ys] = ellipse(0.5, 0.5, 4000);
  const c = 100;
  const r = analyse(xs, ys, { ...PLA, chordMM: c });
  const inner = Math.PI * (50 - 0.8) ** 2; // radius less the wall, mm
  assert.ok(Math.abs(r.infill_mm2 / inner - 1) < 1e-5, `infill ${r.infill_mm2}, exact ${inner}`);
  assert.ok(Math.abs(r.area_mm2 / (Math.PI * 2500) - 1) < 1e-5);
  assert.equal(r.thin_te_mm, 0);
});

test("an ellipse: walls by Steiner's formula for the inner parallel body", () => {
  // For a convex body whose radius of curvature is at least s everywhere,
  // the points farther than s from the boundary cover A - P s + pi s^2
  // (Steiner's formula). An ellipse's least radius is b^2/a.
  const a = 0.5, b = 0.07; // chord 1, 14 % thick; b^2/a = 0.0098
  const [xs, ys] = ellipse(a, b, 8000);
  const c = 200; // mm; wall 0.8 mm = 0.004 chord
  const s = 0.8 / c;
  assert.ok(s < (b * b) / a);
  const r = analyse(xs, ys, { ...PLA, chordMM: c });
  const A = Math.PI * a * b, P = perimeter(xs, ys);
  const want = (A - P * s + Math.PI * s * s) * c * c;
  assert.ok(Math.abs(r.infill_mm2 / want - 1) < 1e-5, `infill ${r.infill_mm2}, Steiner ${want}`);
  assert.ok(Math.abs(r.walls_mm2 + r.infill_mm2 - r.area_mm2) < 1e-9 * r.area_mm2);
});

test('NACA 0012: thickness and the thin trailing edge from the Report 824 equations', () => {
  const [xs, ys] = naca0012(400);
  const c = 120;
  const r = analyse(xs, ys, { ...PLA, chordMM: c });
  // Largest thickness 0.12 c near x = 0.3 (Report 824: the 4-digit
  // thickness is largest at 30 % chord).
  assert.ok(Math.abs(r.thickness_mm - 0.12 * c) < 2e-3 * c, `thickness ${r.thickness_mm}`);
  assert.ok(Math.abs(r.thickness_at - 0.3) < 0.01, `at ${r.thickness_at}`);
  // Where the section is one line thick: 2 y_t(x) c = 0.4 mm, solved here
  // by bisection on the equation itself.
  let lo = 0.5, hi = 1;
  for (let i = 0; i < 60; i++) {
    const m = (lo + hi) / 2;
    if (2 * naca4Half(0.12, m) * c > 0.4) lo = m; else hi = m;
  }
  const strip = c / STRIPS;
  assert.ok(Math.abs(r.thin_te_mm - (1 - lo) * c) < 2 * strip + 0.01, `thin ${r.thin_te_mm}, want ${(1 - lo) * c}`);
  // The walls of both sides meet where the section is 2 x 0.8 mm thick
  // or less, at most; the inset walls meet a little ahead of that at a
  // wedge (common practice: a slicer's perimeters fill a thin edge).
  let lo2 = 0.5, hi2 = 1;
  for (let i = 0; i < 60; i++) {
    const m = (lo2 + hi2) / 2;
    if (2 * naca4Half(0.12, m) * c > 1.6) lo2 = m; else hi2 = m;
  }
  assert.ok(r.solid_te_mm >= (1 - lo2) * c - strip, `solid ${r.solid_te_mm}, thickness 1.6 mm at ${(1 - lo2) * c} mm`);
  assert.ok(r.solid_te_mm < 2 * (1 - lo2) * c, `solid ${r.solid_te_mm}`);
});

test('mass per metre: density times the walls and the infill that is filled', () => {
  const [xs, ys] = naca0012(200);
  const full = analyse(xs, ys, { ...PLA, chordMM: 150, infillFraction: 1 });
  // Solid: 1 mm2 over 1 m is 1 cm3.
  assert.ok(Math.abs(full.mass_g_per_m - 1.24 * full.area_mm2) < 1e-9 * full.mass_g_per_m);
  const hollow = analyse(xs, ys, { ...PLA, chordMM: 150, infillFraction: 0 });
  assert.ok(Math.abs(hollow.mass_g_per_m - 1.24 * hollow.walls_mm2) < 1e-9 * hollow.mass_g_per_m);
  const more = analyse(xs, ys, { ...PLA, chordMM: 150, infillFraction: 0, walls: 4 });
  assert.ok(more.walls_mm2 > hollow.walls_mm2);
});

test('parameters: defaults filled in, bad ones refused as bad input', () => {
  assert.deepEqual(params(Buffer.from('{}').toString()), {
    chord_mm: 0, line_width_mm: 0.4, walls: 2, infill_fraction: 0.2, density_g_cm3: 1.24,
  });
  for (const bad of ['{"wall": 2}', '{"walls": 2.5}', '{"walls": "2"}', '{"line_width_mm": 9}', '[1]', '{', 'null']) {
    assert.throws(() => params(bad), (e) => e.badInput === true, bad);
  }
  const info = describe();
  assert.match(info.name, /^[a-z][a-z0-9]*(-[a-z0-9]+)*$/);
  for (const p of info.parameters) {
    assert.match(p.name, /^[a-z][a-z0-9]*(_[a-z0-9]+)*$/);
    assert.doesNotThrow(() => params(`{"${p.name}": ${p.default_json}}`));
  }
});

test('run: the chord from the frame in its units, or chord_mm; refusals', () => {
  const [xs, ys] = naca0012(100);
  const req = (doc, p) => ({
    section_json: Buffer.from(JSON.stringify(doc)), params_json: Buffer.from(p),
    node_x: xs, node_y: ys, section_name: 'r700.json',
  });
  const inch = JSON.parse(run(req({ format: 'foilwright.section/1', units: 'in', frame: { chord: 5 } }, '{}')));
  assert.equal(inch.format, 'foilwright.result/2');
  assert.equal(inch.stage, 'print-check');
  assert.ok(Math.abs(inch.scalars.chord_mm - 127) < 1e-12);
  const given = JSON.parse(run(req({ format: 'foilwright.section/1', units: 'mm', frame: { chord: 118 } }, '{"chord_mm": 120}')));
  assert.equal(given.scalars.chord_mm, 120);
  assert.ok(given.warnings.some((w) => w.includes('frame gives 118 mm')));
  assert.throws(() => run(req({ format: 'foilwright.section/1', units: 'chord' }, '{}')), (e) => e.badInput && /give chord_mm/.test(e.message));
  assert.throws(() => run(req({ format: 'foilwright.result/2' }, '{"chord_mm": 100}')), (e) => e.badInput);
  assert.throws(() => run({ ...req({ format: 'foilwright.section/1' }, '{"chord_mm": 100}'), node_x: [1, 0], node_y: [0, 0] }), (e) => e.badInput);
});
