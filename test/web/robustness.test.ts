/**
 * Adversarial robustness pass over every JSON endpoint and page form.
 *
 * Starting from a valid request for each endpoint, every field is mutated in turn (deleted,
 * wrong type, extreme or out-of-range numbers, empty and oversized arrays, unknown keys, deep
 * junk) and each answer is checked against the product rule (DEVELOPERS.md "Errors"):
 *
 *  - API: status 200 or 4xx, never 5xx; a 4xx body has `error.message`, and a 400 names at
 *    least one field in `error.issues[].path`; a 200 body has no `null` where a number belongs
 *    (JSON turns NaN/Infinity into null) except under the documented nullable keys, and no
 *    text of a stack trace.
 *  - Pages: status 200 or 400 (never 5xx), no stack trace in the HTML, and a 400 shows the
 *    error box with the posted value kept in its field.
 *  - Studies: a refused save creates and alters no file; ten parallel saves of one study leave
 *    a valid file and no temporary files; parallel page saves of two sections keep both.
 *
 * Beside the tables: malformed bodies and uploads, odd study ids and query strings, stored
 * studies with extreme numbers, parallel saves, and one focused test per defect this pass fixed
 * ("regressions" at the end).
 *
 * Every body and value here is invented for the test. Size: about 3000 in-process requests
 * (mostly API cases of a few ms each; the count is printed at the end), about 13 s on an idle
 * 2-core machine. To trim it, use `level: 'light'`, `skip` or `short` in the tables.
 */
import { createHash } from 'node:crypto';
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import type { Server } from 'node:http';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.js';
import { FARADAY, GAS_CONSTANT } from '../../server/core/constants.js';
import { parseStudyText } from '../../server/scenario/store.js';

let dir: string;
let server: Server;

beforeAll(async () => {
  dir = mkdtempSync(path.join(os.tmpdir(), 'studies-robustness-'));
  const app = createApp({ studyDir: dir });
  // One listening server for all requests (supertest would otherwise open one per request).
  server = await new Promise<Server>((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
});
afterAll(async () => {
  console.log(`robustness: ${sent} requests`);
  await new Promise<void>((resolve) => server.close(() => resolve()));
  rmSync(dir, { recursive: true, force: true });
});

const EXAMPLE = 'example-brackwater-pilot';

/** Requests sent by this file (printed at the end, to keep the tables' size in view). */
let sent = 0;
function http() {
  sent++;
  return request(server);
}

// ---------------------------------------------------------------------------------------------
// Checks shared by every case

/** Text of a JavaScript stack frame ("at fn (/path/file.ts:12:3)") or a raw runtime error. */
const STACK_TRACE = /\bat\s+(?:[\w$.<>[\] ]+\s+\()?(?:file:\/\/|node:)?[\w@./\\-]*\.(?:ts|js|mjs|cjs):\d+/;
const RUNTIME_ERROR = /Cannot read propert|is not a function|is not iterable|undefined is not|Maximum call stack|\[object Object\]/;

/**
 * Keys whose value may be `null` in a 200 answer, each documented:
 *  - standardError, ci95: "null when the data do not determine the parameter" (DEVELOPERS.md, API).
 *  - simplePaybackYears: "simplePaybackYears | null" in the compare answer (server/web/economics.ts);
 *    null for the baseline and when an option never pays back.
 *  - closedForm, design: "closedForm: null | {…}", "design: null | {…}" in the cost answer
 *    (server/web/economics.ts): no closed form for a model cell, no design point unless asked.
 *  - chemistry: a name, not a number, in the cost and compare answers (`ChemistryId | null` in
 *    server/web/economics-view.ts): null when neither the body nor a study names it.
 */
const NULLABLE_KEYS = new Set(['standardError', 'ci95', 'simplePaybackYears', 'closedForm', 'design', 'chemistry']);
/**
 * Keys nullable only inside a per-point residual record of a kinetic fit: "`fitted`/`residual`
 * are null for points the model does not describe (other branch)" (server/core/kinetics/types.ts).
 */
const NULLABLE_IN_RESIDUALS = new Set(['fitted', 'residual']);

/** Problems in a 200 JSON body: nulls outside the nullable keys, non-finite numbers, stack text. */
function problemsIn200(value: unknown, where = 'body', key = ''): string[] {
  if (value === null) {
    const allowed = NULLABLE_KEYS.has(key) || (NULLABLE_IN_RESIDUALS.has(key) && /\.residuals\[\d+\]\.\w+$/.test(where));
    return allowed ? [] : [`null at ${where}`];
  }
  if (typeof value === 'number') return Number.isFinite(value) ? [] : [`non-finite number at ${where}`];
  if (typeof value === 'string') return STACK_TRACE.test(value) || RUNTIME_ERROR.test(value) ? [`internal error text at ${where}: ${value.slice(0, 120)}`] : [];
  if (Array.isArray(value)) return value.flatMap((v, i) => problemsIn200(v, `${where}[${i}]`, key));
  if (value && typeof value === 'object') return Object.entries(value).flatMap(([k, v]) => problemsIn200(v, `${where}.${k}`, k));
  return [];
}

/** Problems of one JSON API answer (empty when the answer keeps the rule). */
function apiProblems(res: request.Response): string[] {
  const out: string[] = [];
  if (STACK_TRACE.test(res.text ?? '')) out.push('stack trace in the body');
  if (res.status >= 500 || res.status < 200 || (res.status >= 300 && res.status < 400)) {
    out.push(`status ${res.status}`);
    return out;
  }
  if (res.status >= 400) {
    const err = res.body?.error;
    if (!err || typeof err.message !== 'string' || err.message.trim() === '') out.push(`${res.status} without error.message`);
    else if (RUNTIME_ERROR.test(err.message)) out.push(`internal error text in the message: ${err.message.slice(0, 160)}`);
    if (res.status === 400) {
      const issues = err?.issues;
      if (!Array.isArray(issues) || issues.length === 0) out.push('400 without issues');
      else
        for (const i of issues) {
          if (typeof i?.path !== 'string' || i.path.trim() === '') out.push(`issue without a path: ${JSON.stringify(i)}`);
          if (typeof i?.message !== 'string' || i.message.trim() === '') out.push(`issue without a message: ${JSON.stringify(i)}`);
        }
    }
    return out;
  }
  out.push(...problemsIn200(res.body));
  return out;
}

// ---------------------------------------------------------------------------------------------
// Mutations of a JSON body

type Key = string | number;
const DELETE = Symbol('delete');

/** A value written into the JSON text verbatim (e.g. 1e400, which JSON.parse reads as Infinity). */
class Raw {
  constructor(readonly text: string) {}
}

type Mutation = [label: string, value: unknown];

/** JSON text of a body, with Raw values spliced in verbatim. */
function toJson(body: unknown): string {
  const raws: string[] = [];
  const text = JSON.stringify(body, (_k, v: unknown) => {
    if (v instanceof Raw) {
      raws.push(v.text);
      return `@@raw${raws.length - 1}@@`;
    }
    return v;
  });
  return text.replace(/"@@raw(\d+)@@"/g, (_m, i: string) => raws[Number(i)]!);
}

function clone<T>(v: T): T {
  return structuredClone(v);
}

/** Copy of `root` with the value at `at` replaced (or deleted with DELETE). */
function withValue(root: unknown, at: Key[], value: unknown): unknown {
  if (at.length === 0) return value;
  const copy = clone(root) as Record<Key, unknown>;
  let node = copy as Record<Key, unknown>;
  for (const k of at.slice(0, -1)) node = node[k] as Record<Key, unknown>;
  const last = at[at.length - 1]!;
  if (value === DELETE) {
    if (Array.isArray(node) && typeof last === 'number') node.splice(last, 1);
    else delete node[last];
  } else node[last] = value;
  return copy;
}

function valueAt(root: unknown, at: Key[]): unknown {
  let node = root as Record<Key, unknown>;
  for (const k of at) node = node[k] as Record<Key, unknown>;
  return node;
}

/**
 * Every path of a body: object keys, and the first element of each array (arrays are uniform),
 * or every element of the arrays `every` picks (arrays whose elements differ in kind).
 */
function pathsOf(value: unknown, at: Key[] = [], maxDepth = 8, every?: (p: Key[]) => boolean): Key[][] {
  const out: Key[][] = [];
  if (at.length >= maxDepth) return out;
  if (Array.isArray(value)) {
    const count = every?.(at) ? value.length : Math.min(1, value.length);
    for (let i = 0; i < count; i++) {
      out.push([...at, i]);
      out.push(...pathsOf(value[i], [...at, i], maxDepth, every));
    }
  } else if (value && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) {
      out.push([...at, k]);
      out.push(...pathsOf(v, [...at, k], maxDepth, every));
    }
  }
  return out;
}

/** JSON text nested `depth` levels deep. */
function deepJunk(depth: number): Raw {
  return new Raw(`${'{"a":['.repeat(depth)}1${']}'.repeat(depth)}`);
}

/** Length of the "huge array" mutation: above every per-request array limit that is ≤ 3000, within the body limit. */
const HUGE = 3000;

/**
 * The mutations tried on one value, by its type. `light` keeps one probe per kind of fault
 * (missing, null, wrong type, Infinity, negative, zero, overflow) for bodies whose schemas
 * another table walks in full.
 */
function mutationsOf(v: unknown, level: 'full' | 'light' = 'full'): Mutation[] {
  const wrongType: Mutation = typeof v === 'string' ? ['a number', 5] : ['a string', 'abc'];
  const common: Mutation[] = [['missing', DELETE], ['null', null], wrongType];
  if (!Array.isArray(v)) common.push(['an array', []]);
  if (typeof v === 'number') {
    const numeric: Mutation[] = [
      ['1e400 (Infinity after parse)', new Raw('1e400')],
      ['-1', -1],
      ['0', 0],
      ['1e308', 1e308],
    ];
    if (level === 'light') return [...common, ...numeric];
    return [
      ...common,
      ...numeric,
      ['a boolean', true],
      ['a numeric string', String(v)],
      ['-1e308', -1e308],
      ['-0', new Raw('-0')],
      ['1e-320 (subnormal)', 1e-320],
      ['1.5 (fraction, CE > 1)', 1.5],
      ['value + 0.5 (not whole)', v + 0.5],
      ['1e6', 1e6],
    ];
  }
  if (typeof v === 'string') {
    const out: Mutation[] = [...common, ['empty', ''], ['long text', 'x'.repeat(20_000)]];
    if (level === 'full') out.push(['markup', '<b onmouseover=alert(1)>x</b>'], ['an object', {}]);
    return out;
  }
  if (typeof v === 'boolean') return [...common, ['"true"', 'true'], ['1', 1]];
  if (Array.isArray(v)) {
    const out: Mutation[] = [...common, ['an object', {}], ['empty array', []], ['array of junk', [null, 'x', {}, [], true]]];
    if (level === 'full' && v.length > 0) out.push([`${HUGE} copies`, Array.from({ length: HUGE }, () => clone(v[0]))]);
    return out;
  }
  if (v && typeof v === 'object') {
    const out: Mutation[] = [...common, ['empty object', {}], ['unknown extra key', { ...(v as object), zzUnknownKey: 1 }]];
    if (level === 'full') {
      const json = JSON.stringify(v);
      out.push(['__proto__ key', new Raw(json === '{}' ? '{"__proto__":{"polluted":1}}' : `{"__proto__":{"polluted":1},${json.slice(1)}`)]);
      out.push(['deeply nested junk inside', { ...(v as object), zzJunk: deepJunk(200) }]);
    }
    return out;
  }
  return common;
}

interface Case {
  label: string;
  json: string;
}

/** Cases for a valid body: each path × each mutation, plus whole-body junk. */
function casesFor(base: unknown, opts: { level?: 'full' | 'light'; skip?: (p: Key[]) => boolean; maxDepth?: number; every?: (p: Key[]) => boolean } = {}): Case[] {
  const level = opts.level ?? 'full';
  const cases: Case[] = [
    { label: '(body) empty object', json: '{}' },
    { label: '(body) array', json: '[]' },
    { label: '(body) string', json: '"abc"' },
    { label: '(body) null', json: 'null' },
    { label: '(body) number', json: '42' },
    { label: '(body) nested 5000 deep', json: deepJunk(5000).text },
  ];
  for (const at of pathsOf(base, [], opts.maxDepth, opts.every)) {
    if (opts.skip?.(at)) continue;
    const original = valueAt(base, at);
    for (const [label, value] of mutationsOf(original, level)) {
      cases.push({ label: `${at.join('.')} ← ${label}`, json: toJson(withValue(base, at, value)) });
    }
  }
  return cases;
}

/** Send every case and return the broken ones (path ← mutation: problem). */
async function runApiCases(method: 'post' | 'put', url: string, cases: Case[], after?: (c: Case, res: request.Response) => string[]): Promise<string[]> {
  const failures: string[] = [];
  for (const c of cases) {
    const res = await http()[method](url).set('Content-Type', 'application/json').send(c.json);
    const problems = [...apiProblems(res), ...(after ? after(c, res) : [])];
    if (problems.length) failures.push(`${c.label}: ${problems.join('; ')} [${res.status} ${(res.text ?? '').slice(0, 200)}]`);
  }
  expect(({} as Record<string, unknown>).polluted, 'Object.prototype polluted').toBeUndefined();
  return failures;
}

// ---------------------------------------------------------------------------------------------
// Valid bodies (invented; shapes as in the other API tests of this folder)

/** Thermal factor F/(RT), 1/V. */
const fOf = (T: number) => FARADAY.value / (GAS_CONSTANT.value * T);

/** Noise-free Butler–Volmer points j(η) = j0[exp(αa f η) − exp(−αc f η)] (invented parameters). */
function bvPoints(etas: number[], T = 353.15, j0 = 10, aa = 0.5, ac = 0.5) {
  const f = fOf(T);
  return etas.map((eta) => ({ currentDensity: j0 * (Math.exp(aa * f * eta) - Math.exp(-ac * f * eta)), overpotential: eta }));
}

function tafelFitBody() {
  const etas = Array.from({ length: 12 }, (_, i) => 0.08 + 0.02 * i);
  return {
    points: bvPoints(etas),
    model: 'tafel',
    temperature: 353.15,
    window: { minOverpotential: 0.05, maxOverpotential: 0.4 },
    uncompensatedResistance: 0,
    branch: 'anodic',
  };
}

function bvFitBody() {
  const etas = Array.from({ length: 16 }, (_, i) => -0.2 + (0.4 * i) / 15).filter((e) => Math.abs(e) > 1e-9);
  return {
    points: bvPoints(etas),
    model: 'butler-volmer',
    temperature: 353.15,
    electrons: 1,
    anodicLimitingCurrentDensity: 1e5,
    cathodicTransferCoefficient: 0.5,
    tieTransferCoefficients: false,
  };
}

function arrheniusBody() {
  // j0 = 30 A/m² at 353.15 K with Ea = 40 kJ/mol (invented), a 10 % standard error each.
  const Ea = 40_000;
  const j0 = (T: number) => 30 * Math.exp(-(Ea / GAS_CONSTANT.value) * (1 / T - 1 / 353.15));
  return {
    fits: [333.15, 343.15, 353.15, 363.15].map((T) => ({ temperature: T, exchangeCurrentDensity: j0(T), standardError: 0.1 * j0(T) })),
    referenceTemperature: 353.15,
  };
}

/**
 * A chlor-alkali cell definition (SI) with every kind of field the schema has: Tafel kinetics
 * with standard errors, a membrane with an activation energy, two gaps (correlation and given
 * conductivity), parasitic current efficiency, a short sweep and a small band. Invented values
 * of the usual magnitudes (88 °C, 1.2 bar, 3.6 mol/kg NaCl, 11.8 mol/kg NaOH).
 */
function cellBody(): Record<string, unknown> {
  return {
    chemistry: 'chlor-alkali',
    temperature: 361.15,
    pressure: 1.2e5,
    composition: { brineNaCl: 3.6, causticNaOH: 11.8 },
    anode: {
      kinetics: {
        model: 'tafel',
        exchangeCurrentDensity: 75,
        transferCoefficient: 1.85,
        referenceTemperature: 361.15,
        activationEnergy: 35e3,
        uncertainty: { lnExchangeCurrentDensitySE: 0.4, transferCoefficientSE: 0.19, correlation: -0.99 },
      },
    },
    cathode: {
      kinetics: {
        model: 'tafel',
        exchangeCurrentDensity: 18.6,
        transferCoefficient: 1.38,
        referenceTemperature: 361.15,
        activationEnergy: 30e3,
        uncertainty: { lnExchangeCurrentDensitySE: 0.19, transferCoefficientSE: 0.05, correlation: -0.99 },
      },
    },
    ohmic: {
      membrane: { areaResistance: 5.5e-5, referenceTemperature: 361.15, activationEnergy: 15e3 },
      gaps: [
        { thickness: 3e-4, electrolyte: 'NaCl', voidFraction: 0.35, voidModel: 'bruggeman' },
        { thickness: 1e-3, conductivity: 95, voidFraction: 0.15, voidModel: 'bruggeman' },
      ],
      hardware: 5e-6,
    },
    currentEfficiency: { model: 'parasitic', currentDensity: 200 },
    currentDensities: [1000, 3000, 5500],
    designCurrentDensity: 5500,
    rectifierEfficiency: 0.97,
    kFactorRange: [3000, 6000],
    uncertainty: { samples: 40, seed: 7 },
    provenance: { anode: { kind: 'manual', note: 'invented for the test' } },
  };
}

function sizeBody() {
  return {
    chemistry: 'chlor-alkali',
    product: 'Cl2',
    productionRate: 0.35,
    currentDensity: 5000,
    cellArea: 2.7,
    cell: { linear: { intercept: 2.35, slope: 1e-4 } },
    currentEfficiency: 0.96,
    coProductCurrentEfficiency: { H2: 1 },
    rectifier: { maxVoltage: 450, maxCurrent: 16000, efficiency: 0.97 },
    thermoneutralVoltage: 2.31,
  };
}

function shuntBody() {
  return {
    cells: 25,
    cellCurrent: 15000,
    cellVoltage: 2.9,
    cellResistance: 3.7e-5,
    circuits: [
      { name: 'anolyte', channelResistance: 250, manifoldSegmentResistance: 0.2 },
      { name: 'catholyte', conductivity: 50, channel: { length: 1, crossSection: 1e-4 }, manifoldSegment: { length: 0.05, crossSection: 5e-3 } },
    ],
  };
}

function costBody() {
  return {
    product: 'Cl2',
    cell: { linear: { intercept: 2.35, slope: 1.0e-4 } },
    currentEfficiency: 0.96,
    electricityPrice: 0.06,
    capitalCostPerArea: 9000,
    operatingHours: 8000,
    discountRate: 0.08,
    lifetime: 10,
    currentDensities: [1500, 3500, 5500, 8000],
    searchRange: { min: 1000, max: 9000 },
    designCurrentDensity: 6000,
    sensitivityFraction: 0.2,
    currency: 'EUR',
  };
}

function compareBody() {
  return {
    product: 'Cl2',
    currentDensity: 5000,
    plant: { activeArea: 100 },
    electricityPrice: 0.05,
    operatingHours: 8000,
    discountRate: 0.1,
    baseline: 0,
    currency: 'EUR',
    options: [
      { name: 'old', cell: { linear: { intercept: 2.5, slope: 1e-4 } }, currentEfficiency: 0.95, pricePerArea: 0, voltageRisePerYear: 0, lifeYears: 5 },
      { name: 'new', cell: { linear: { intercept: 2.4, slope: 1e-4 } }, currentEfficiency: 0.95, pricePerArea: 300, voltageRisePerYear: 0.01, lifeYears: 5 },
    ],
  };
}

/** Electrode swaps on a cell definition (the example cell): kinetics entered, and a saved dataset. */
function compareSwapBody() {
  const cell = cellBody();
  delete cell.uncertainty;
  delete cell.provenance;
  return {
    product: 'Cl2',
    cell,
    currentDensity: 5000,
    plant: { cells: 40, cellArea: 2.7 },
    electricityPrice: 0.05,
    operatingHours: 8000,
    discountRate: 0.1,
    options: [
      { name: 'as built', pricePerArea: 0, voltageRisePerYear: 0, lifeYears: 8 },
      { name: 'new anode', anode: { kinetics: { model: 'tafel', exchangeCurrentDensity: 150, transferCoefficient: 1.9 }, limitingCurrentDensity: 2e4 }, pricePerArea: 1200, voltageRisePerYear: 0.005, lifeYears: 8 },
      { name: 'dataset cathode', cathode: { dataset: 'cathode-c-88c' }, pricePerArea: 900, voltageRisePerYear: 0.005, lifeYears: 8 },
    ],
  };
}

// ---------------------------------------------------------------------------------------------
// JSON API tables

describe('JSON API: each field mutated in turn never gives a 5xx, a nameless 400 or a null number', () => {
  it('POST /api/v1/kinetics/fit (Tafel and Butler–Volmer bodies)', async () => {
    const failures = [
      ...(await runApiCases('post', '/api/v1/kinetics/fit', casesFor(tafelFitBody()))),
      // The Butler–Volmer body: only the fields the Tafel body does not have.
      ...(await runApiCases('post', '/api/v1/kinetics/fit', casesFor(bvFitBody(), { level: 'light', skip: (p) => p[0] === 'points' || p[0] === 'temperature' }))),
    ];
    expect(failures).toEqual([]);
  });

  it('POST /api/v1/kinetics/arrhenius', async () => {
    expect(await runApiCases('post', '/api/v1/kinetics/arrhenius', casesFor(arrheniusBody()))).toEqual([]);
  });

  it('POST /api/v1/cell/sweep (the example cell)', async () => {
    // The cathode has the anode's schema: walked once, through the anode.
    expect(await runApiCases('post', '/api/v1/cell/sweep', casesFor(cellBody(), { level: 'light', skip: (p) => p[0] === 'cathode' && p.length > 2 }))).toEqual([]);
  });

  it('POST /api/v1/plant/size', async () => {
    expect(await runApiCases('post', '/api/v1/plant/size', casesFor(sizeBody()))).toEqual([]);
  });

  it('POST /api/v1/plant/shunt', async () => {
    expect(await runApiCases('post', '/api/v1/plant/shunt', casesFor(shuntBody()))).toEqual([]);
  });

  it('POST /api/v1/plant/cost', async () => {
    expect(await runApiCases('post', '/api/v1/plant/cost', casesFor(costBody()))).toEqual([]);
  });

  it('POST /api/v1/plant/compare (plant-data options, and electrode swaps on a cell definition)', async () => {
    const failures = [
      ...(await runApiCases('post', '/api/v1/plant/compare', casesFor(compareBody()))),
      ...(await runApiCases(
        'post',
        `/api/v1/plant/compare?study=${EXAMPLE}`,
        // Only the swap options: the top-level fields are walked with the first body, the base
        // cell's own fields in the cell sweep table.
        casesFor(compareSwapBody(), { level: 'light', skip: (p) => p[0] !== 'options' || p[1] === 0, every: (p) => p.length === 1 && p[0] === 'options' }),
      )),
    ];
    expect(failures).toEqual([]);
  });

  it('answers odd query strings on the study-aware APIs with 4xx, never 5xx', async () => {
    const failures: string[] = [];
    for (const q of ['study=../../etc/passwd', 'study=nope', 'study=a&study=b', 'study=', `study=${'x'.repeat(5000)}`, 'study[a]=1']) {
      for (const url of ['/api/v1/plant/cost', '/api/v1/plant/compare']) {
        const res = await http().post(`${url}?${q}`).send(url.endsWith('cost') ? costBody() : compareBody());
        const p = apiProblems(res);
        if (p.length) failures.push(`${url}?${q}: ${p.join('; ')}`);
      }
    }
    expect(failures).toEqual([]);
  });
});

// ---------------------------------------------------------------------------------------------
// Studies API: refused saves write nothing; parallel saves leave a valid file

/** Name → sha256 of every file in the study folder. */
function snapshot(): Record<string, string> {
  const out: Record<string, string> = {};
  for (const f of readdirSync(dir).sort()) out[f] = createHash('sha256').update(readFileSync(path.join(dir, f))).digest('hex');
  return out;
}

async function exampleStudy(): Promise<Record<string, unknown>> {
  const res = await http().get(`/api/v1/studies/${EXAMPLE}`);
  expect(res.status).toBe(200);
  return res.body as Record<string, unknown>;
}

/** A smaller copy of the example study (two datasets of a few points) for the mutation tables. */
async function smallStudy(): Promise<Record<string, unknown>> {
  const s = await exampleStudy();
  const datasets = (s.datasets as Array<Record<string, unknown>>).slice(0, 2).map((d) => ({ ...d, points: (d.points as unknown[]).slice(0, 5) }));
  return { ...s, name: 'Robustness target (test)', datasets };
}

describe('malformed request bodies', () => {
  it('answer 4xx with a message, and a 400 names "(body)" (was: a 400 with no issue for a bad Content-Encoding)', async () => {
    const api = '/api/v1/plant/cost';
    const cases: Array<[string, () => request.Test]> = [
      ['bogus gzip', () => http().post(api).set('Content-Type', 'application/json').set('Content-Encoding', 'gzip').send('{}')],
      ['unknown encoding', () => http().post(api).set('Content-Type', 'application/json').set('Content-Encoding', 'br-nope').send('{}')],
      ['latin1 charset', () => http().post(api).set('Content-Type', 'application/json; charset=latin1').send('{}')],
      ['text/plain', () => http().post(api).set('Content-Type', 'text/plain').send(toJson(costBody()))],
      ['multipart', () => http().post(api).field('product', 'Cl2')],
      ['truncated JSON', () => http().post(api).set('Content-Type', 'application/json').send('{"product": "Cl2", ')],
      ['invalid UTF-8', () => http().post(api).set('Content-Type', 'application/json').send(Buffer.from([0x7b, 0x22, 0xff, 0xfe, 0x22, 0x3a, 0x31, 0x7d]))],
      ['13 MB', () => http().post(api).set('Content-Type', 'application/json').send(`{"pad":"${'x'.repeat(13 * 1024 * 1024)}"}`)],
    ];
    const failures: string[] = [];
    for (const [label, send] of cases) {
      const res = await send();
      const p = apiProblems(res);
      if (res.status < 400) p.push(`expected 4xx, got ${res.status}`);
      if (p.length) failures.push(`${label}: ${p.join('; ')} [${res.status} ${res.text.slice(0, 160)}]`);
    }
    for (const [label, body] of [
      ['6000 fields', Array.from({ length: 6000 }, (_, i) => `f${i}=1`).join('&')],
      ['6 MB form', `a=${'x'.repeat(6 * 1024 * 1024)}`],
    ] as const) {
      const res = await http().post('/cell').type('form').send(body);
      if (res.status !== 413 || !/class="errorbox"/.test(res.text) || STACK_TRACE.test(res.text)) failures.push(`page ${label}: ${res.status}`);
    }
    expect(failures).toEqual([]);
  });
});

describe('Kinetics page uploads', () => {
  it('junk data files answer a 400 page with the error box, never a 5xx', async () => {
    const fields = { source: 'file', temperatureC: '25', potentialKind: 'overpotential', currentUnit: 'A/m2', potentialUnit: 'V', model: 'tafel', windowMode: 'auto', irMode: 'none', currentColumn: '1', potentialColumn: '2' };
    const post = (files: Array<[string, Buffer]>, extra: Record<string, string> = {}) => {
      let r = http().post('/kinetics');
      for (const [k, v] of Object.entries({ ...fields, ...extra })) r = r.field(k, v);
      for (const [field, buf] of files) r = r.attach(field, buf, 'data.csv');
      return r;
    };
    const cases: Array<[string, () => request.Test]> = [
      ['binary', () => post([['dataFile', Buffer.from([0, 1, 2, 255, 254, 10, 13, 0])]])],
      ['UTF-16 text', () => post([['dataFile', Buffer.from('\ufeff1\t0.1\n2\t0.2\n', 'utf16le')]])],
      ['over 4 MB', () => post([['dataFile', Buffer.alloc(4 * 1024 * 1024 + 10, 49)]])],
      ['header only', () => post([['dataFile', Buffer.from('j;eta\n')]])],
      ['NaN and Infinity', () => post([['dataFile', Buffer.from('NaN\tNaN\nInfinity\t1\n1e400\t1\n')]])],
      ['one row', () => post([['dataFile', Buffer.from('1\t0.1')]])],
      ['two files', () => post([['dataFile', Buffer.from('1\t0.1')], ['dataFile', Buffer.from('2\t0.2')]])],
      ['wrong file field', () => post([['other', Buffer.from('1\t0.1')]])],
      ['61 fields', () => post([], Object.fromEntries(Array.from({ length: 61 }, (_, i) => [`f${i}`, 'x'])))],
      ['paste over 5 MB', () => http().post('/kinetics').field('source', 'paste').field('data', 'x'.repeat(5 * 1024 * 1024 + 10))],
    ];
    const failures: string[] = [];
    for (const [label, send] of cases) {
      const res = await send();
      const p = pageProblems(res);
      if (res.status !== 400) p.push(`expected 400, got ${res.status}`);
      if (p.length) failures.push(`${label}: ${p.join('; ')}`);
    }
    expect(failures).toEqual([]);
  });
});

describe('studies API', () => {
  it('PUT with a mutated study: 400 leaves the saved file byte for byte; 200 writes a valid study', async () => {
    const base = await smallStudy();
    const created = await http().post('/api/v1/studies').send(base);
    expect(created.status).toBe(201);
    const id = created.body.id as string;
    const file = path.join(dir, `${id}.study.json`);
    const cases = casesFor(base, {
      level: 'light',
      // The sections share their schemas with the API bodies mutated above, and the study's
      // parameter records are plain numbers: the sections themselves, the top-level fields, and
      // one dataset and one fit down to their fields are enough to exercise the save path.
      skip: (p) => (['cell', 'plant', 'coatings', 'costs'].includes(String(p[0])) && p.length > 1) || (p[0] === 'fits' && p.length > 3) || p.includes('points'),
      maxDepth: 3,
    });
    const failures: string[] = [];
    for (const c of cases) {
      const before = snapshot();
      const res = await http().put(`/api/v1/studies/${id}`).set('Content-Type', 'application/json').send(c.json);
      const problems = apiProblems(res);
      const after = snapshot();
      if (res.status === 200) {
        try {
          parseStudyText(readFileSync(file, 'utf8'));
        } catch (err) {
          problems.push(`saved file no longer valid: ${(err as Error).message.slice(0, 200)}`);
        }
        if (Object.keys(after).length !== Object.keys(before).length) problems.push('a 200 PUT changed the number of files');
        // Put the base back for the next case.
        const restore = await http().put(`/api/v1/studies/${id}`).send(base);
        expect(restore.status).toBe(200);
      } else if (JSON.stringify(after) !== JSON.stringify(before)) {
        problems.push(`a ${res.status} PUT changed the study folder`);
      }
      if (problems.length) failures.push(`${c.label}: ${problems.join('; ')} [${res.status} ${(res.text ?? '').slice(0, 160)}]`);
    }
    expect(failures).toEqual([]);
  });

  it('POST with a mutated study: a refused save creates no file', async () => {
    const base = await smallStudy();
    // Top-level fields only (the PUT table above walks deeper).
    const cases = casesFor(base, { level: 'light', maxDepth: 1 });
    const failures: string[] = [];
    for (const c of cases) {
      const before = snapshot();
      const res = await http().post('/api/v1/studies').set('Content-Type', 'application/json').send(c.json);
      const problems = apiProblems(res);
      if (res.status !== 201 && JSON.stringify(snapshot()) !== JSON.stringify(before)) problems.push(`a ${res.status} POST changed the study folder`);
      if (res.status === 201) {
        const f = path.join(dir, `${res.body.id as string}.study.json`);
        try {
          parseStudyText(readFileSync(f, 'utf8'));
        } catch (err) {
          problems.push(`created file not valid: ${(err as Error).message.slice(0, 200)}`);
        }
        rmSync(f);
      }
      if (problems.length) failures.push(`${c.label}: ${problems.join('; ')} [${res.status} ${(res.text ?? '').slice(0, 160)}]`);
    }
    expect(failures).toEqual([]);
  });

  it('answers odd study ids with 4xx and writes nothing', async () => {
    const base = await smallStudy();
    const before = snapshot();
    const failures: string[] = [];
    for (const raw of ['..%2F..%2Fetc%2Fpasswd', '..', '.', 'UPPER-case', 'x'.repeat(81), 'nope', '%00', 'a%20b', EXAMPLE, '%E2%80%AE']) {
      for (const method of ['get', 'put'] as const) {
        if (method === 'get' && raw === EXAMPLE) continue; // reading an example is allowed; writing it is not
        const res = method === 'get' ? await http().get(`/api/v1/studies/${raw}`) : await http().put(`/api/v1/studies/${raw}`).send(base);
        const p = apiProblems(res);
        if (res.status < 400) p.push(`expected 4xx, got ${res.status}`);
        if (p.length) failures.push(`${method.toUpperCase()} ${raw}: ${p.join('; ')}`);
      }
      if (raw === EXAMPLE) continue;
      const dl = await http().get(`/studies/${raw}/download`);
      if (dl.status >= 500 || dl.status < 400 || STACK_TRACE.test(dl.text)) failures.push(`download ${raw}: ${dl.status}`);
    }
    expect(failures).toEqual([]);
    expect(snapshot()).toEqual(before);
  });

  it('parallel page saves of different sections of one study keep every section', async () => {
    const base = await smallStudy();
    const { cell: _c, costs: _k, ...rest } = base;
    const created = await http().post('/api/v1/studies').send({ ...rest, name: 'Parallel page saves' });
    expect(created.status).toBe(201);
    const id = created.body.id as string;
    // The example's filled-in forms, posted to the new study.
    const cellForm = formOf((await http().get('/cell')).text, 'cell-form').values;
    delete cellForm.band;
    const costsForm = formOf((await http().get('/costs')).text, 'costs-form').values;
    const saves = await Promise.all([
      ...Array.from({ length: 4 }, (_, k) => http().post('/cell').type('form').send(encodeForm({ ...cellForm, study: id, jSteps: String(4 + k), action: 'save' }))),
      ...Array.from({ length: 4 }, (_, k) => http().post('/costs').type('form').send(encodeForm({ ...costsForm, study: id, cellMode: 'linear', price: String(50 + k), action: 'save' }))),
    ]);
    for (const r of saves) expect(r.status, r.text.slice(0, 300)).toBe(303);
    const saved = parseStudyText(readFileSync(path.join(dir, `${id}.study.json`), 'utf8'));
    expect(saved.cell, 'cell section kept').toBeDefined();
    expect(saved.costs, 'costs section kept').toBeDefined();
    expect(readdirSync(dir).filter((f) => f.includes('.tmp'))).toEqual([]);
  });

  it('ten parallel PUTs of one study leave one valid file equal to one of them, and no temporary files', async () => {
    const base = await smallStudy();
    const created = await http().post('/api/v1/studies').send({ ...base, name: 'Parallel target' });
    expect(created.status).toBe(201);
    const id = created.body.id as string;
    const names = Array.from({ length: 10 }, (_, i) => `Parallel save ${i}`);
    const results = await Promise.all(names.map((name) => http().put(`/api/v1/studies/${id}`).send({ ...base, name })));
    for (const r of results) expect(r.status, r.text).toBe(200);
    const saved = parseStudyText(readFileSync(path.join(dir, `${id}.study.json`), 'utf8'));
    expect(names).toContain(saved.name);
    expect(readdirSync(dir).filter((f) => f.includes('.tmp'))).toEqual([]);
    const read = await http().get(`/api/v1/studies/${id}`);
    expect(read.status).toBe(200);
    expect(read.body.name).toBe(saved.name);
  });
});

// ---------------------------------------------------------------------------------------------
// Pages

function unescapeHtml(s: string): string {
  return s.replace(/&#34;/g, '"').replace(/&#39;/g, "'").replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&amp;/g, '&');
}

function attr(tag: string, name: string): string | undefined {
  const m = new RegExp(`\\s${name}="([^"]*)"`).exec(tag);
  return m ? unescapeHtml(m[1]!) : undefined;
}

type FieldKind = 'text' | 'hidden' | 'select' | 'textarea' | 'check';

/** The fields a browser would post from the form `id` (text, hidden, checked boxes, selected options, textareas). */
function formOf(html: string, id: string): { values: Record<string, string>; kinds: Record<string, FieldKind> } {
  const start = html.indexOf(`id="${id}"`);
  expect(start, `form ${id} on the page`).toBeGreaterThan(0);
  const form = html.slice(html.lastIndexOf('<form', start), html.indexOf('</form>', start));
  const values: Record<string, string> = {};
  const kinds: Record<string, FieldKind> = {};
  for (const m of form.matchAll(/<input\b[^>]*>/g)) {
    const tag = m[0];
    const name = attr(tag, 'name');
    if (!name) continue;
    const type = attr(tag, 'type') ?? 'text';
    if (type === 'file' || type === 'submit' || type === 'button') continue;
    if (type === 'radio' || type === 'checkbox') {
      if (!/\schecked\b/.test(tag)) continue;
      kinds[name] = 'check';
    } else kinds[name] = type === 'hidden' ? 'hidden' : 'text';
    values[name] = attr(tag, 'value') ?? '';
  }
  for (const m of form.matchAll(/<select\b([^>]*)>([\s\S]*?)<\/select>/g)) {
    const name = attr(m[1]!, 'name');
    if (!name) continue;
    const options = [...m[2]!.matchAll(/<option\b([^>]*)>/g)].map((o) => ({ value: attr(o[1]!, 'value') ?? '', selected: /\sselected\b/.test(o[1]!) }));
    values[name] = (options.find((o) => o.selected) ?? options[0])?.value ?? '';
    kinds[name] = 'select';
  }
  for (const m of form.matchAll(/<textarea\b([^>]*)>([\s\S]*?)<\/textarea>/g)) {
    const name = attr(m[1]!, 'name');
    if (!name) continue;
    values[name] = unescapeHtml(m[2]!);
    kinds[name] = 'textarea';
  }
  return { values, kinds };
}

/** urlencoded body; an array value repeats the field (what a browser sends for two fields of one name). */
function encodeForm(fields: Record<string, string | string[]>): string {
  const p = new URLSearchParams();
  for (const [k, v] of Object.entries(fields)) for (const one of Array.isArray(v) ? v : [v]) p.append(k, one);
  return p.toString();
}

/**
 * Whether the re-rendered form still holds `value` in field `name`. A non-empty leading part
 * counts: the forms cut an oversized value (longer than the field's maxlength) before echoing it.
 */
function keepsValue(html: string, name: string, kind: FieldKind, value: string): boolean {
  const kept = (shown: string) => shown.trim() !== '' && (shown.trim() === value.trim() || (value.length > 80 && value.startsWith(shown)));
  if (kind === 'textarea') {
    const m = new RegExp(`<textarea\\b[^>]*name="${name.replace(/[.]/g, '\\.')}"[^>]*>([\\s\\S]*?)</textarea>`).exec(html);
    return m ? kept(unescapeHtml(m[1]!)) : false;
  }
  for (const m of html.matchAll(/<input\b[^>]*>/g)) {
    if (attr(m[0], 'name') === name && kept(attr(m[0], 'value') ?? '')) return true;
  }
  return false;
}

type PageMutation = [label: string, value: string | string[] | typeof DELETE];

/**
 * Mutations of one form field, by kind; `short` for fields whose values another table walks.
 * "Sent twice" and "missing" are also tried for every field at once (see the page table): the
 * forms read every field before checking any, so one request finds a reader that breaks.
 */
function pageMutations(kind: FieldKind, value: string, short = false): PageMutation[] {
  if (kind === 'select' || kind === 'check' || kind === 'hidden') return [['missing', DELETE], ['unknown choice', 'zz-nope'], ['empty', '']];
  if (kind === 'textarea') return [['junk text', 'abc\n1 2 3\n\u0000\t;;'], ['empty', '']];
  if (value !== '' && !Number.isFinite(Number(value))) return [['long text', 'y'.repeat(5000)], ['markup', '<b>x</b>"\'&']];
  // A blank field of a mode not in use is read but not used: two probes are enough.
  if (value === '' || short) return [['text', 'abc'], ['1e300', '1e300'], ...(short && value !== '' ? [['0', '0'] as PageMutation] : [])];
  return [['missing', DELETE], ['text', 'abc'], ['1e400 (Infinity)', '1e400'], ['1e300', '1e300'], ['-1', '-1'], ['0', '0']];
}

interface PageSpec {
  path: string;
  formId: string;
  /** Fields left out of the table (repeated rows share code with the first rows). */
  skip?: (name: string) => boolean;
  /** Fields given the short mutation list (their values are also covered by an API table). */
  short?: (name: string) => boolean;
  /** Changes to the scraped form before mutating (e.g. switch the band off to keep requests quick). */
  adjust?: (values: Record<string, string>) => void;
}

const PAGES: PageSpec[] = [
  { path: '/kinetics', formId: 'kinetics-form' },
  {
    path: '/cell',
    formId: 'cell-form',
    // anode.* and gap1.* share their code with cathode.* and gap2/3.*; the kinetics values
    // themselves are walked through in the cell sweep table; the membrane in the modes table.
    skip: (n) => n.startsWith('cathode.') || n.startsWith('gap2.') || n.startsWith('gap3.') || n.startsWith('membrane.'),
    // Every field here feeds the cell definition the sweep table walks in full: short list.
    short: () => true,
    // Band off and a short sweep keep each request quick (the band has its own tests).
    adjust: (v) => {
      delete v.band;
      v.jSteps = '4';
    },
  },
  { path: '/plant', formId: 'plant-form', skip: (n) => /^circuit[123]/.test(n), short: (n) => n.startsWith('circuit0') },
  // Option 0 is the baseline; option 1 stands for every other option (same code).
  { path: '/coatings', formId: 'coatings-form', skip: (n) => /^opt[23]_/.test(n), short: (n) => /^opt[01]_/.test(n) },
  { path: '/costs', formId: 'costs-form', adjust: (v) => (v.jPoints = '6') },
  { path: '/safety', formId: 'safety-form' },
];

/**
 * Fields a form cuts to a few characters before echoing them (a shown value is then a leading
 * part of the posted one). None any more: the kinetics form used to keep 4 characters of a
 * column number ("1e300" came back as "1e30"); it now shows back what was typed.
 */
const CUT_FIELDS: Record<string, number> = {};

/** Problems of one page answer. */
function pageProblems(res: request.Response, mutated?: { name: string; kind: FieldKind; value: string | string[] | typeof DELETE }): string[] {
  const out: string[] = [];
  const html = res.text ?? '';
  if (STACK_TRACE.test(html)) out.push('stack trace in the page');
  if (RUNTIME_ERROR.test(html)) out.push(`internal error text in the page: ${RUNTIME_ERROR.exec(html)![0]}`);
  if (res.status === 303) return out; // save redirects
  if (res.status !== 200 && res.status !== 400) out.push(`status ${res.status}`);
  const isHtml = /text\/html/.test(String(res.headers['content-type']));
  if (res.status === 400) {
    if (!isHtml) out.push('400 that is not a page');
    if (!/class="errorbox"/.test(html)) out.push('400 without the error box');
    if (mutated && typeof mutated.value === 'string' && mutated.value.trim() !== '' && (mutated.kind === 'text' || mutated.kind === 'textarea')) {
      const cut = CUT_FIELDS[mutated.name];
      const posted = cut ? mutated.value.slice(0, cut) : mutated.value;
      if (!keepsValue(html, mutated.name, mutated.kind, posted)) out.push(`400 did not keep the value of ${mutated.name}`);
    }
  }
  if (res.status === 200 && isHtml && /class="errorbox"/.test(html) && /Something went wrong/.test(html)) out.push('200 with an internal error box');
  return out;
}

describe('page forms: each field mutated in turn answers 200 or 400 with the error box', () => {
  for (const spec of PAGES) {
    it(`POST ${spec.path}`, async () => {
      const page = await http().get(spec.path);
      expect(page.status).toBe(200);
      const { values, kinds } = formOf(page.text, spec.formId);
      spec.adjust?.(values);
      const base = await http().post(spec.path).type('form').send(encodeForm(values));
      expect(base.status, 'the scraped form itself computes').toBe(200);
      const failures: string[] = [];
      for (const name of Object.keys(values)) {
        if (name === 'study' || spec.skip?.(name)) continue;
        for (const [label, value] of pageMutations(kinds[name]!, values[name]!, spec.short?.(name))) {
          const fields: Record<string, string | string[]> = { ...values };
          if (value === DELETE) delete fields[name];
          else fields[name] = value;
          const res = await http().post(spec.path).type('form').send(encodeForm(fields));
          const p = pageProblems(res, { name, kind: kinds[name]!, value });
          if (p.length) failures.push(`${name} ← ${label}: ${p.join('; ')} [${res.status}]`);
        }
      }
      // Every field at once: sent twice, missing, blank.
      const names = Object.keys(values).filter((n) => n !== 'study');
      for (const [label, fields] of [
        ['every field sent twice', Object.fromEntries(Object.entries(values).map(([k, v]) => [k, k === 'study' ? v : [v, v]]))],
        ['every field missing', { study: values.study! }],
        ['every field blank', { ...Object.fromEntries(names.map((n) => [n, ' '])), study: values.study! }],
        ['empty body', {}],
      ] as Array<[string, Record<string, string | string[]>]>) {
        const res = await http().post(spec.path).type('form').send(encodeForm(fields));
        const p = pageProblems(res);
        if (p.length) failures.push(`${label}: ${p.join('; ')} [${res.status}]`);
      }
      // The study field and the action.
      for (const [label, extra] of [
        ['study unknown', { study: 'nope' }],
        ['study traversal', { study: '../../etc/passwd' }],
        ['study sent twice', { study: [EXAMPLE, 'nope'] }],
        ['study missing', { study: DELETE }],
        ['action unknown', { action: 'zz-nope' }],
        ['action sent twice', { action: ['save', 'csv'] }],
      ] as Array<[string, Record<string, string | string[] | typeof DELETE>]>) {
        const fields: Record<string, string | string[]> = { ...values };
        for (const [k, v] of Object.entries(extra)) {
          if (v === DELETE) delete fields[k];
          else fields[k] = v;
        }
        const res = await http().post(spec.path).type('form').send(encodeForm(fields));
        const p = pageProblems(res);
        if (p.length) failures.push(`${label}: ${p.join('; ')} [${res.status}]`);
      }
      expect(failures).toEqual([]);
    });
  }

  /**
   * Modes the default forms do not show (other sources, models, membrane and gap kinds, cell
   * sources, option kinds): each switched on, then the fields it brings in probed briefly.
   */
  const VARIANTS: Array<[page: PageSpec, fields: Record<string, string>]> = [
    [PAGES[0]!, { model: 'butler-volmer', irMode: 'fit', anodicLimitMode: 'fit', tie: '1', potentialKind: 'overpotential' }],
    [PAGES[0]!, { windowMode: 'manual', windowMin: '50', windowMax: '300', anodicLimitMode: 'value', anodicLimit: '20000', reference: 'custom', referenceCustom: '0.2', equilibriumVs: 'rhe', pH: '14', currentUnit: 'mA/cm2', branch: 'anodic' }],
    [PAGES[0]!, { source: 'paste', data: '100\t1.35\n300\t1.38\n1000\t1.41\n3000\t1.45\n10000\t1.50', potentialKind: 'overpotential', potentialUnit: 'V', irMode: 'none', describedDataset: '' }],
    [PAGES[1]!, { 'membrane.mode': 'conductivity', 'membrane.thickness': '0.2', 'membrane.conductivity': '10', 'ce.model': 'constant', 'ce.value': '95', 'gap1.mode': 'conductivity', 'gap1.conductivity': '50', compositionUnit: 'wt%', brineNaCl: '20', causticNaOH: '32' }],
    [PAGES[1]!, { 'anode.source': 'dataset', 'anode.windowMin': '50', 'anode.windowMax': '300', 'anode.model': 'butler-volmer' }],
    [PAGES[1]!, { 'anode.model': 'butler-volmer', 'anode.alphaA': '0.5', 'anode.alphaC': '0.5', 'anode.slopeMode': 'slope', 'anode.tafelSlope': '40', 'membrane.mode': 'springer', 'membrane.springerThickness': '0.18', 'membrane.waterContent': '14' }],
    [PAGES[2]!, { cellSource: 'study-cell', circuit0Mode: 'resistance', circuit0ChannelR: '200', circuit0ManifoldR: '0.2', rateUnit: 't/year', product: 'NaOH', shuntCells: '50' }],
    [PAGES[3]!, { opt0_kind: 'linear', opt0_u0: '2.9', opt0_kFactor: '0.1', opt0_ce: '96', opt1_anode: 'entered', opt1_anodeSlope: '40', opt1_anodeJ0: '100', sizeMode: 'cells', cells: '100', cellArea: '2.7', baseline: '1' }],
    [PAGES[3]!, { sizeMode: 'area', area: '1000', opt1_cathode: 'entered', opt1_cathodeSlope: '120', opt1_cathodeJ0: '10', count: '3' }],
    [PAGES[4]!, { cellMode: 'study' }],
    [PAGES[5]!, { hydrogenSource: 'cell-model' }],
  ];

  it('other modes of each form: switched on, and their own fields probed', async () => {
    const failures: string[] = [];
    for (const [spec, over] of VARIANTS) {
      const page = await http().get(spec.path);
      const { values, kinds } = formOf(page.text, spec.formId);
      spec.adjust?.(values);
      const base = { ...values, ...over };
      const res = await http().post(spec.path).type('form').send(encodeForm(base));
      const p = pageProblems(res);
      if (p.length) failures.push(`${spec.path} ${JSON.stringify(over)}: ${p.join('; ')} [${res.status}]`);
      for (const name of Object.keys(over)) {
        if (kinds[name] !== 'text' || over[name] === '') continue;
        for (const value of ['abc', '1e300', '0']) {
          const r = await http().post(spec.path).type('form').send(encodeForm({ ...base, [name]: value }));
          const q = pageProblems(r, { name, kind: 'text', value });
          if (q.length) failures.push(`${spec.path} ${name} ← ${value} (mode ${JSON.stringify(over).slice(0, 60)}): ${q.join('; ')} [${r.status}]`);
        }
      }
    }
    expect(failures).toEqual([]);
  });

  it('GET pages with odd query strings answer 200 or 400, never 5xx or a stack trace', async () => {
    const queries = [
      'study=..%2F..%2Fetc%2Fpasswd',
      'study=nope',
      'study=a&study=b',
      'study=',
      `study=${'z'.repeat(4000)}`,
      'dataset=nope&dataset=b',
      'saved=%3Cscript%3E&saved=1',
      'study[x]=1&%E0%A4%A=broken-escape',
    ];
    const failures: string[] = [];
    for (const p of ['/', '/kinetics', '/cell', '/plant', '/coatings', '/costs', '/safety']) {
      for (const q of queries) {
        const res = await http().get(`${p}?${q}`);
        const problems = pageProblems(res);
        if (problems.length) failures.push(`GET ${p}?${q}: ${problems.join('; ')}`);
        if (res.text.includes('<script>')) failures.push(`GET ${p}?${q}: query text echoed as markup`);
      }
    }
    expect(failures).toEqual([]);
  });
});

describe('page saves that fail write nothing', () => {
  it('an invalid form posted with action=save leaves every study file as it was', async () => {
    const base = await smallStudy();
    const created = await http().post('/api/v1/studies').send({ ...base, name: 'Page save target' });
    expect(created.status).toBe(201);
    const id = created.body.id as string;
    // For each page, one clearly bad field (a negative or non-numeric value the page must refuse).
    const bad: Record<string, Record<string, string>> = {
      '/cell': { temperatureC: 'abc' },
      '/plant': { productionRate: '-5' },
      '/coatings': { hours: '9999' },
      '/costs': { life: '0' },
      '/safety': { temperature: 'abc' },
      '/kinetics': { temperatureC: 'hot', fitName: 'Robustness fit' },
    };
    const failures: string[] = [];
    for (const spec of PAGES) {
      for (const study of [id, EXAMPLE]) {
        const page = await http().get(`${spec.path}?study=${study}`);
        const { values } = formOf(page.text, spec.formId);
        spec.adjust?.(values);
        const before = snapshot();
        const res = await http()
          .post(spec.path)
          .type('form')
          .send(encodeForm({ ...values, ...bad[spec.path], study, action: 'save' }));
        if (res.status !== 400) failures.push(`${spec.path} (${study}): expected 400, got ${res.status}`);
        if (JSON.stringify(snapshot()) !== JSON.stringify(before)) failures.push(`${spec.path} (${study}): the refused save changed the study folder`);
      }
    }
    expect(failures).toEqual([]);
  });
});

// ---------------------------------------------------------------------------------------------
// Focused regression tests for the defects this pass found (each failed before its fix)

function issuePaths(res: request.Response): string[] {
  return ((res.body?.error?.issues ?? []) as Array<{ path: string }>).map((i) => i.path);
}

describe('regressions', () => {
  it('plant sizing refuses an absurd plant scale with a 400 naming the target (was: out of memory or a 500)', async () => {
    // 100 kg/s of Cl2 at 1 A/m² on 10 cm² cells needs ~1e11 cells: the core laid out every
    // electrolyser and the process ran out of memory.
    const huge = await http().post('/api/v1/plant/size').send({ ...sizeBody(), productionRate: 100, currentDensity: 1, cellArea: 0.001 });
    expect(huge.status, huge.text).toBe(400);
    expect(issuePaths(huge)).toEqual(['productionRate']);
    expect(huge.body.error.issues[0].message).toMatch(/cells/);
    for (const over of [{ productionRate: 1e308 }, { productionRate: 1e-12 }, { currentDensity: 1e-320 }, { cellArea: 1e-320 }, { currentEfficiency: 1e-320 }]) {
      const res = await http().post('/api/v1/plant/size').send({ ...sizeBody(), ...over });
      expect(res.status, `${JSON.stringify(over)}: ${res.text}`).toBe(400);
      expect(issuePaths(res)).toEqual(['productionRate']);
    }
    // A large real plant still sizes: 30 kg/s of Cl2 at 5 kA/m² on 2.7 m² cells (≈ 6000 cells).
    const big = await http().post('/api/v1/plant/size').send({ ...sizeBody(), productionRate: 30 });
    expect(big.status, big.text).toBe(200);
    expect(big.body.cells).toBeGreaterThan(5000);
  });

  it('a result that overflows float range is a 400 naming "(result)", not a 500', async () => {
    const cases: Array<[string, unknown]> = [
      ['/api/v1/plant/size', { ...sizeBody(), thermoneutralVoltage: 1e308 }],
      ['/api/v1/plant/size', { ...sizeBody(), rectifier: { maxVoltage: 450, maxCurrent: 16000, efficiency: 1e-320 } }],
      ['/api/v1/plant/compare', { ...compareBody(), electricityPrice: 1e308 }],
      ['/api/v1/plant/cost', { ...costBody(), currentDensities: [1e308, 1000] }],
    ];
    for (const [url, body] of cases) {
      const res = await http().post(url).send(body as object);
      expect(res.status, `${url} ${res.text}`).toBe(400);
      expect(issuePaths(res)).toEqual(['(result)']);
      expect(res.body.error.message).toMatch(/non-finite number at \S+/);
    }
  });

  it('a coating that saves a subnormal amount answers 200 with payback null (never pays back), not an overflow', async () => {
    const res = await http().post('/api/v1/plant/compare').send({ ...compareBody(), operatingHours: 1e-320 });
    expect(res.status, res.text).toBe(200);
    expect(res.body.options[1].simplePaybackYears).toBeNull();
    expect(res.body.options[1].notes.join(' ')).toMatch(/never pays back/);
    expect(apiProblems(res)).toEqual([]);
  });

  it('a cost study whose closed form leaves float range answers 200 with closedForm null and a note', async () => {
    // K = 1e-320 Ω·m²: √(C·CRF/(p·K·H)) overflows; the numeric optimum is still found.
    const res = await http().post('/api/v1/plant/cost').send({ ...costBody(), cell: { linear: { intercept: 2.35, slope: 1e-320 } } });
    expect(res.status, res.text).toBe(200);
    expect(res.body.closedForm).toBeNull();
    expect(res.body.closedFormNote).toMatch(/out of numeric range/);
    expect(apiProblems(res)).toEqual([]);
  });

  it('the kinetics API refuses temperatures outside the Kinetics page range (−50 to 400 °C)', async () => {
    for (const T of [1e6, 1e-320, 1.5, 700]) {
      const fit = await http().post('/api/v1/kinetics/fit').send({ ...tafelFitBody(), temperature: T });
      expect(fit.status, `fit at ${T} K`).toBe(400);
      expect(issuePaths(fit)).toEqual(['temperature']);
      const body = arrheniusBody();
      body.fits[0]!.temperature = T;
      const arr = await http().post('/api/v1/kinetics/arrhenius').send(body);
      expect(arr.status, `Arrhenius at ${T} K`).toBe(400);
      expect(issuePaths(arr)).toEqual(['fits[0].temperature']);
      const ref = await http().post('/api/v1/kinetics/arrhenius').send({ ...arrheniusBody(), referenceTemperature: T });
      expect(issuePaths(ref)).toEqual(['referenceTemperature']);
    }
    const ok = await http().post('/api/v1/kinetics/fit').send({ ...tafelFitBody(), temperature: 673.15 });
    expect(ok.status, ok.text).toBe(200);
  });

  it('study upload: a wrong field, two files or an oversized file re-render the page with 400 and the error box (was: 500)', async () => {
    const before = snapshot();
    const attempts: Array<[string, () => request.Test]> = [
      ['wrong field', () => http().post('/studies/upload').attach('other', Buffer.from('{}'), 'x.study.json')],
      ['two files', () => http().post('/studies/upload').attach('studyFile', Buffer.from('{}'), 'a.study.json').attach('studyFile', Buffer.from('{}'), 'b.study.json')],
      ['oversized file', () => http().post('/studies/upload').attach('studyFile', Buffer.alloc(5 * 1024 * 1024 + 1, 32), 'big.study.json')],
      ['binary junk', () => http().post('/studies/upload').attach('studyFile', Buffer.from([0, 255, 1, 254, 0x7b]), 'junk.study.json')],
      ['a JSON array', () => http().post('/studies/upload').field('studyText', '[1, 2]')],
      ['text sent twice', () => http().post('/studies/upload').type('form').send('studyText=a&studyText=b')],
      ['nothing', () => http().post('/studies/upload')],
    ];
    for (const [label, send] of attempts) {
      const res = await send();
      expect(res.status, label).toBe(400);
      expect(res.text, label).toContain('class="errorbox"');
      expect(pageProblems(res), label).toEqual([]);
    }
    expect(snapshot()).toEqual(before);
  });

  it('Plant page: an absurd scale is a 400 page with the value kept; over 2000 cells in series skips the shunt solve with a note', async () => {
    const page = await http().get('/plant');
    const { values } = formOf(page.text, 'plant-form');
    const absurd = await http().post('/plant').type('form').send(encodeForm({ ...values, productionRate: '1000000', currentDensity: '0.001', cellArea: '0.001' }));
    expect(absurd.status).toBe(400);
    expect(absurd.text).toContain('class="errorbox"');
    expect(keepsValue(absurd.text, 'productionRate', 'text', '1000000')).toBe(true);
    // 30 000 t/day of Cl2 at 5.5 kA/m² on 2.7 m² cells is ≈ 66 000 cells; a 1 MV rectifier puts
    // them all in one electrolyser.
    const tall = await http().post('/plant').type('form').send(encodeForm({ ...values, productionRate: '30000', rectifierVoltage: '1000000' }));
    expect(tall.status).toBe(200);
    expect(tall.text).toMatch(/shunt currents are computed for at most 2000/);
  });

  it('Costs page: inputs that stop the optimum search are a 400 page (was: 422)', async () => {
    const page = await http().get('/costs');
    const { values } = formOf(page.text, 'costs-form');
    for (const over of [{ ce: '1e-300' }, { life: '1e-320' }] as Array<Record<string, string>>) {
      const res = await http().post('/costs').type('form').send(encodeForm({ ...values, ...over }));
      expect(res.status, JSON.stringify(over)).toBe(400);
      expect(res.text).toContain('class="errorbox"');
    }
    // A rate of 1e-300 % or a life of 1e-300 yr no longer stops the search: the capital recovery
    // factor takes its i → 0 limit 1/n, or its finite value ≈ i/(n·ln(1+i)).
    for (const over of [{ rate: '1e-300' }, { life: '1e-300' }] as Array<Record<string, string>>) {
      const res = await http().post('/costs').type('form').send(encodeForm({ ...values, ...over }));
      expect(res.status, JSON.stringify(over)).toBe(200);
      expect(pageProblems(res)).toEqual([]);
    }
  });

  it('a stored cell beyond the plausibility bounds is refused when the study is saved', async () => {
    const study = clone(await smallStudy()) as Record<string, any>;
    study.name = 'Implausible pressure';
    study.cell.pressure = 1e300;
    const created = await http().post('/api/v1/studies').send(study);
    expect(created.status, created.text).toBe(400);
    expect(issuePaths(created)).toEqual(['cell.pressure']);
  });

  it('stored sections with extreme (schema-valid) numbers open every page with 200 or 400, never a crash', async () => {
    const base = await smallStudy();
    const extremes: Array<(s: Record<string, any>) => void> = [
      (s) => (s.plant.productionRate = 1e300),
      (s) => (s.plant.productionRate = 1e-300),
      (s) => (s.plant.currentDensity = 1e-300),
      (s) => (s.plant.rectifier.maxVoltage = 1e300),
      (s) => (s.costs.currentDensities = [1e308, 1e307]),
      (s) => (s.coatings.electricityPrice = 1e308),
      (s) => (s.cell.pressure = 1e8), // the plausibility bound (1e300 Pa is now refused by the cell schema)
      (s) => (s.operating.temperature = 1e300),
    ];
    const failures: string[] = [];
    for (const [k, change] of extremes.entries()) {
      const study = clone(base) as Record<string, any>;
      study.name = `Extreme ${k}`;
      change(study);
      const created = await http().post('/api/v1/studies').send(study);
      expect(created.status, created.text).toBe(201);
      for (const p of ['/', '/kinetics', '/cell', '/plant', '/coatings', '/costs', '/safety']) {
        const res = await http().get(`${p}?study=${created.body.id as string}`);
        const problems = pageProblems(res);
        if (problems.length) failures.push(`extreme ${k} ${p}: ${problems.join('; ')}`);
      }
    }
    expect(failures).toEqual([]);
  });
});
