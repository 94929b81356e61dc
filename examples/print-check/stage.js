#!/usr/bin/env node
'use strict';
// print-check: a foilwright stage written in Node.js, from the README's
// "A stage in another language" alone. It tells the maker of a printed
// blade whether a section prints with a given line width and wall count,
// and what it weighs per metre of span (printcheck.js does the sums).
//
// What a stage in any language does, in the order of the guide:
//   1. check the handshake cookie, or explain and exit 1;
//   2. serve gRPC on a Unix socket: stage.v1.Stage, the health service,
//      go-plugin's controller (Shutdown ends the process);
//   3. announce the socket on stdout in one line, and never write to
//      stdout again;
//   4. answer Describe and Run: fill in defaults, refuse bad parameters and
//      sections with ERROR_CODE_BAD_INPUT, give a foilwright.result/2
//      document;
//   5. log JSON lines to stderr; exit when the parent goes away.

const fs = require('node:fs');
const os = require('node:os');
const path = require('node:path');
const grpc = require('@grpc/grpc-js');
const protoLoader = require('@grpc/proto-loader');
const { analyse, badInput } = require('./printcheck.js');

const COOKIE_KEY = 'FOILWRIGHT_STAGE_COOKIE';
const COOKIE_VALUE = '5f1c0a52e9d84b7f-foilwright-stage';
const APP_PROTOCOL = 1; // stage.ProtocolVersion
const MAX_MESSAGE = 64 << 20;

const NAME = 'print-check';
const VERSION = '1.0.0';
const MAX_NODES = 20001;

// The parameters, as Describe gives them and as run() checks them.
const PARAMS = [
  {
    name: 'chord_mm', type: 'number', default: 0, min: 0, max: 10000, unit: 'mm',
    doc: 'chord of the printed section; 0 takes it from the section\'s frame, which a section in chord units does not have',
  },
  { name: 'line_width_mm', type: 'number', default: 0.4, min: 0.05, max: 3, unit: 'mm', doc: 'width of one extruded line' },
  { name: 'walls', type: 'integer', default: 2, min: 1, max: 50, unit: '', doc: 'lines traced along the outline' },
  { name: 'infill_fraction', type: 'number', default: 0.2, min: 0, max: 1, unit: '', doc: 'fraction of the space inside the walls that the infill fills' },
  { name: 'density_g_cm3', type: 'number', default: 1.24, min: 0.1, max: 25, unit: 'g/cm3', doc: 'density of the printed material' },
];

const SCALARS = [
  ['chord_mm', 'chord used, mm'],
  ['area_mm2', 'area of the section, mm2'],
  ['walls_mm2', 'area within wall_mm of the outline (solid), mm2'],
  ['infill_mm2', 'area inside the walls, mm2'],
  ['mass_g_per_m', 'mass per metre of span: density x (walls + infill_fraction x infill), g/m'],
  ['thickness_mm', 'largest thickness perpendicular to the chord line, mm'],
  ['thickness_at', 'where it is, chord fraction'],
  ['wall_mm', 'wall thickness, walls x line_width_mm'],
  ['thin_te_mm', 'length ahead of the trailing edge thinner than one line (not printable as drawn), mm'],
  ['solid_te_mm', 'length ahead of the trailing edge where the walls meet (solid, no infill), mm'],
];

// Units of a section document and their length in mm.
const UNIT_MM = { mm: 1, in: 25.4, m: 1000 };

// --- logging: hclog JSON lines on stderr -----------------------------------

const LEVELS = { trace: 0, debug: 1, info: 2, warn: 3, error: 4, off: 5 };
const logLevel = LEVELS[process.env.FOILWRIGHT_STAGE_LOG] ?? LEVELS.warn;

function log(level, message, fields = {}) {
  if (LEVELS[level] < logLevel) return;
  // Date.toISOString gives three fraction digits; the host reads any.
  const line = { '@level': level, '@message': message, '@timestamp': new Date().toISOString(), ...fields };
  process.stderr.write(JSON.stringify(line) + '\n');
}

// --- Describe --------------------------------------------------------------

function describe() {
  return {
    name: NAME,
    version: VERSION,
    summary: 'Whether a printed blade section prints with the given line width and walls, and its mass per metre',
    parameters: PARAMS.map((p) => ({
      name: p.name,
      type: p.type,
      default_json: JSON.stringify(p.default),
      has_min: true, min: p.min, has_max: true, max: p.max,
      choices: [], unit: p.unit, doc: p.doc, min_items: 0, max_items: 0,
    })),
    max_concurrency: 0,
    scalars: SCALARS.map(([name, doc]) => ({ name, doc })),
    max_nodes: MAX_NODES,
    packed: true,
    // What the stage runs from besides stage.js, hashed into a run's
    // manifest by the host.
    files: ['printcheck.js', 'package.json', 'package-lock.json', 'proto', 'node_modules'],
  };
}

// --- Run -------------------------------------------------------------------

// params checks the parameters object (JSON text) against PARAMS and
// returns it with the defaults filled in.
function params(text) {
  let obj;
  try {
    obj = JSON.parse(text.length ? text : '{}');
  } catch (e) {
    throw badInput(`parameters are not JSON: ${e.message}`);
  }
  if (obj === null || typeof obj !== 'object' || Array.isArray(obj)) {
    throw badInput('parameters must be a JSON object');
  }
  const known = new Map(PARAMS.map((p) => [p.name, p]));
  for (const k of Object.keys(obj)) {
    if (!known.has(k)) {
      throw badInput(`unknown parameter "${k}" (known: ${PARAMS.map((p) => p.name).join(', ')})`);
    }
  }
  const out = {};
  for (const p of PARAMS) {
    const v = Object.hasOwn(obj, p.name) ? obj[p.name] : p.default;
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      throw badInput(`parameter ${p.name}: want a ${p.type}, got ${JSON.stringify(v)}`);
    }
    if (p.type === 'integer' && !Number.isInteger(v)) {
      throw badInput(`parameter ${p.name}: want an integer, got ${v}`);
    }
    if (v < p.min || v > p.max) {
      throw badInput(`parameter ${p.name}: want a value in [${p.min}, ${p.max}], got ${v}`);
    }
    out[p.name] = v;
  }
  return out;
}

// nodes returns the section document (without its nodes, for a packed
// stage) and the nodes' x and y.
function section(req) {
  let doc;
  try {
    doc = JSON.parse(req.section_json.toString('utf8'));
  } catch (e) {
    throw badInput(`the section is not JSON: ${e.message}`);
  }
  if (doc === null || typeof doc !== 'object' || doc.format !== 'foilwright.section/1') {
    throw badInput('the section is not a foilwright.section/1 document');
  }
  let xs = req.node_x, ys = req.node_y;
  if (xs.length === 0 && Array.isArray(doc.nodes)) {
    // A host that does not pack: the nodes are in the document.
    xs = doc.nodes.map((p) => (Array.isArray(p) ? p[0] : NaN));
    ys = doc.nodes.map((p) => (Array.isArray(p) ? p[1] : NaN));
  }
  if (xs.length < 3) {
    throw badInput(`the section has ${xs.length} node(s); it needs at least 3`);
  }
  if (xs.length > MAX_NODES) {
    throw badInput(`the section has ${xs.length} nodes; this stage takes at most ${MAX_NODES}`);
  }
  return { doc, xs, ys };
}

// chord returns the chord in mm: the parameter when given, else the
// section's frame in its units. A warning says when the two differ.
function chord(doc, p, warnings, name) {
  const unit = UNIT_MM[doc.units];
  const frame = doc.frame && Number.isFinite(doc.frame.chord) && unit ? doc.frame.chord * unit : 0;
  if (p.chord_mm > 0) {
    if (frame > 0 && Math.abs(p.chord_mm - frame) > 1e-3 * frame) {
      warnings.push(`chord_mm ${p.chord_mm} used; the section's frame gives ${round(frame)} mm`);
    }
    return p.chord_mm;
  }
  if (frame > 0) return frame;
  throw badInput(`${name}: the section has no chord in mm, in or m (units ${JSON.stringify(doc.units ?? null)}, ${doc.frame ? 'a frame' : 'no frame'}): give chord_mm`);
}

function round(v) {
  return Number(v.toPrecision(4));
}

function run(req) {
  const name = req.section_name || 'section';
  const p = params(req.params_json.toString('utf8'));
  const { doc, xs, ys } = section(req);
  const warnings = [];
  const c = chord(doc, p, warnings, name);
  const r = analyse(xs, ys, {
    chordMM: c, lineWidthMM: p.line_width_mm, walls: p.walls,
    infillFraction: p.infill_fraction, densityGcm3: p.density_g_cm3,
  });
  if (r.thin_te_mm > 0) {
    warnings.push(`the last ${round(r.thin_te_mm)} mm ahead of the trailing edge is thinner than one ${p.line_width_mm} mm line: the printer cannot lay it, so the edge comes out short or rounded`);
  }
  if (r.infill_mm2 === 0) {
    warnings.push(`the walls (${round(r.wall_mm)} mm) meet everywhere: the section prints solid`);
  }
  // foilwright.result/2: keys in a fixed order, scalars sorted by name,
  // so that the same request gives the same bytes.
  const scalars = {};
  for (const k of Object.keys(r).sort()) scalars[k] = r[k];
  const result = {
    format: 'foilwright.result/2',
    stage: NAME,
    version: VERSION,
    scalars,
    cases: [],
    warnings,
  };
  log('debug', 'ran', { section: name, chord_mm: c, mass_g_per_m: r.mass_g_per_m });
  return Buffer.from(JSON.stringify(result) + '\n');
}

// --- serving ---------------------------------------------------------------

function load(file) {
  const def = protoLoader.loadSync(path.join(__dirname, 'proto', file), {
    keepCase: true, longs: Number, enums: String, defaults: true, arrays: true,
  });
  return grpc.loadPackageDefinition(def);
}

function main() {
  if (process.env[COOKIE_KEY] !== COOKIE_VALUE) {
    process.stderr.write('print-check is a foilwright stage: run it through foilwright (a pipeline file, or "foilwright stages check"), not by hand.\n');
    process.exit(1);
  }
  const versions = (process.env.PLUGIN_PROTOCOL_VERSIONS || '').split(',');
  if (!versions.includes(String(APP_PROTOCOL))) {
    process.stderr.write(`print-check speaks stage protocol ${APP_PROTOCOL}; the host offers ${versions.join(', ') || 'none'}\n`);
    process.exit(1);
  }

  const stageV1 = load('stage.proto').stage.v1;
  const health = load('health.proto').grpc.health.v1;
  const controller = load('controller.proto').plugin;

  const server = new grpc.Server({
    'grpc.max_receive_message_length': MAX_MESSAGE,
    'grpc.max_send_message_length': MAX_MESSAGE,
  });
  server.addService(stageV1.Stage.service, {
    Describe: (_call, done) => done(null, describe()),
    Run: (call, done) => {
      try {
        done(null, { result_json: run(call.request), artifacts: [], warnings: [], error_code: 'ERROR_CODE_UNSPECIFIED', error_message: '', timings_ms: {} });
      } catch (e) {
        if (!e.badInput) log('error', 'run failed', { error: String(e && e.stack) });
        // Failures travel in the reply, not as gRPC errors (which the host
        // takes for a broken transport).
        done(null, {
          result_json: Buffer.alloc(0),
          error_code: e.badInput ? 'ERROR_CODE_BAD_INPUT' : 'ERROR_CODE_INTERNAL',
          error_message: `${call.request.section_name || 'section'}: ${e.message}`,
        });
      }
    },
  });
  server.addService(health.Health.service, {
    Check: (call, done) => {
      if (call.request.service === '' || call.request.service === 'plugin') {
        done(null, { status: 'SERVING' });
      } else {
        done({ code: grpc.status.NOT_FOUND, details: `unknown service ${call.request.service}` });
      }
    },
  });
  server.addService(controller.GRPCController.service, {
    Shutdown: (_call, done) => {
      done(null, {});
      setImmediate(() => stop(0));
    },
  });

  const dir = process.env.PLUGIN_UNIX_SOCKET_DIR || os.tmpdir();
  const sock = path.join(dir, `print-check-${process.pid}.sock`);
  const stop = (code) => {
    server.forceShutdown();
    fs.rmSync(sock, { force: true });
    process.exit(code);
  };
  server.bindAsync(`unix://${sock}`, grpc.ServerCredentials.createInsecure(), (err) => {
    if (err) {
      log('error', 'cannot serve', { socket: sock, error: err.message });
      process.exit(1);
    }
    // CORE|APP|network|address|protocol: the one line ever written to stdout.
    process.stdout.write(`1|${APP_PROTOCOL}|unix|${sock}|grpc\n`);
    log('debug', 'serving', { socket: sock });
  });

  // End with the parent: the host sets a death signal on Linux; this covers
  // the rest.
  const parent = process.ppid;
  setInterval(() => {
    try {
      process.kill(parent, 0);
    } catch {
      stop(0);
    }
  }, 500).unref();
  process.on('SIGTERM', () => stop(0));
}

if (require.main === module) {
  main();
}

module.exports = { describe, params, run };
