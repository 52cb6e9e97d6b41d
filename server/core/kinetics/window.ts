/**
 * Tafel-window selection: the low-field limit, curvature checks and the automatic window.
 *
 * Variables: y = s·η (s = +1 anodic, −1 cathodic; η as given, after subtracting a known
 * j·R_u when one is given), x = ln|j|, and |j| (for a fitted R_u column). All in SI.
 */
import { linearLeastSquares } from '../numerics/index.js';
import type { LinearFit } from '../numerics/index.js';
import { thermalVoltage } from '../constants.js';
import { tQuantile95 } from './statistics.js';
import { MAX_SLOPE_RISE, MIN_DECADES, MIN_POINTS, MIN_R_SQUARED } from './warnings.js';

/** Lowest |η| any automatic window accepts: 50 mV (lower end of the 50–100 mV common-practice range, domain.md §3). */
export const LOW_FIELD_FLOOR = 0.05;
/**
 * Multiple of RT/(F·max(1, α̂)) that bounds the low-field region. With α_a + α_c ≥ max(1, α̂)
 * the reverse current is then below e^−4 ≈ 1.8 % of the forward current (domain.md §3:
 * "below ~2 % when |η| > ~100 mV for α ≈ 1"). Our choice, following that practice.
 */
export const LOW_FIELD_MULTIPLE = 4;
/** Width of the "high-current end" in the top-slope test, decades of current (project choice). */
export const TOP_SEGMENT_DECADES = 0.5;
/** Fewest points in that end segment (a slope with a residual needs ≥ 3; we take 4). */
export const TOP_SEGMENT_MIN_POINTS = 4;
/** Records with at most this many candidate upper ends are scanned end by end (project choice). */
const MAX_CANDIDATES = 150;
/** Most points a candidate window is tested on (strided subset beyond; project choice). */
const MAX_TEST_POINTS = 2000;
/** Candidates per stage of the coarse-then-fine scan on longer records (project choice). */
const COARSE_CANDIDATES = 40;
/** Most passes of the low-field / window iteration (it normally settles in 1–2; cap is a project choice). */
const MAX_WINDOW_PASSES = 5;

/** Plain-language statement of the automatic window rule, for the UI and reports. */
export const AUTO_WINDOW_RULE =
  'Automatic Tafel window: (1) leave out the low-field region, keeping only points with |η| of at least ' +
  'max(50 mV, 4·RT/(F·max(1, α))), where α is the transfer coefficient of the fitted line (103 mV at 25 °C for α ≤ 1; ' +
  'a first α comes from a straight line through all points above 50 mV, and the limit is updated after each fit); ' +
  'there the reverse reaction carries less than about 2 % of the current. (2) Leave out the high-current end where the ' +
  'curve bends: a window is rejected when the local Tafel slope rises (or falls) by more than 20 % across it, or over its ' +
  'top half-decade of current compared with the rest, and that change is statistically significant at 95 %; this is the sign of mass-transport ' +
  'limitation or an uncorrected ohmic drop. (3) A window needs at least 5 points, at least one decade of current and ' +
  'R² ≥ 0.99. Of the windows that start at the low-field limit and pass all tests, the widest is used. If none passes, ' +
  'all points above the low-field limit are fitted and the warnings say which test failed.';

/**
 * Lower |η| bound of the high-field region [V]: max(50 mV, 4·RT/(F·max(1, α̂))).
 * T [K], α̂ the current estimate of the transfer coefficient (use 1 before a fit).
 * Source: domain.md §3 (back reaction < ~2 %), common practice 50–100 mV; rule is ours.
 */
export function lowFieldLimit(temperatureK: number, alphaHat: number): number {
  const a = Number.isFinite(alphaHat) && alphaHat > 1 ? alphaHat : 1;
  return Math.max(LOW_FIELD_FLOOR, (LOW_FIELD_MULTIPLE * thermalVoltage(temperatureK)) / a);
}

/** Straight Tafel fit y = a + b·x (+ R·|j|) by QR least squares (numerics). */
export function tafelLinearFit(x: number[], y: number[], absJ: number[] | null, refinementSteps?: number): LinearFit {
  const X = x.map((xi, i) => (absJ ? [1, xi, absJ[i]] : [1, xi]));
  return linearLeastSquares(X, y, { hasIntercept: true, refinementSteps });
}

export interface CurvatureCheck {
  /** (local slope at top − at bottom)/slope from a quadratic in ln|j|; NaN if not computable. */
  rise: number;
  riseSignificant: boolean;
  /** (slope of the top segment − main-trend slope there)/main-trend slope; NaN if not computable. */
  topRise: number;
  topSignificant: boolean;
}

/**
 * Curvature of a window in the Tafel plot (y vs x = ln|j|):
 * 1. quadratic y = a + b(x − x̄) + c(x − x̄)² (+ R|j|): slope rise across the window
 *    2c·(x_max − x_min)/b; significant when |c| > t_{0.975,dof}·SE(c);
 * 2. the top TOP_SEGMENT_DECADES of current (at least TOP_SEGMENT_MIN_POINTS points):
 *    straight-line slope there vs the slope the main trend (fit of the remaining points)
 *    predicts there (b + R·mean|j| when R is fitted); significant by the t test for equal
 *    slopes of two regression lines with pooled residual variance (common practice, e.g.
 *    Zar, Biostatistical Analysis, ch. on comparing regressions — from memory).
 * Method: our own rule built on these ordinary least-squares t tests.
 */
export function curvatureCheck(x: number[], y: number[], absJ: number[] | null): CurvatureCheck {
  const out: CurvatureCheck = { rise: NaN, riseSignificant: false, topRise: NaN, topSignificant: false };
  const n = x.length;
  let xmin = Infinity;
  let xmax = -Infinity;
  let xbar = 0;
  for (const v of x) {
    xmin = Math.min(xmin, v);
    xmax = Math.max(xmax, v);
    xbar += v;
  }
  xbar /= n;
  const span = xmax - xmin;
  if (!(span > 0)) return out;
  const pq = absJ ? 4 : 3;
  if (n >= pq + 1) {
    const X = x.map((xi, i) => {
      const d = xi - xbar;
      return absJ ? [1, d, d * d, absJ[i]] : [1, d, d * d];
    });
    const q = linearLeastSquares(X, y, { hasIntercept: true, refinementSteps: 0 });
    const b = q.coefficients[1];
    const c = q.coefficients[2];
    if (b > 0 && !q.aliased[2]) {
      out.rise = (2 * c * span) / b;
      out.riseSignificant = Math.abs(c) > tQuantile95(q.degreesOfFreedom) * q.standardErrors[2];
    }
  }
  // Top segment: the last TOP_SEGMENT_DECADES of current, at least TOP_SEGMENT_MIN_POINTS points.
  const order = x.map((_, i) => i).sort((i, k) => x[k] - x[i]);
  const cut = xmax - TOP_SEGMENT_DECADES * Math.LN10;
  const top: number[] = [];
  for (const i of order) if (x[i] >= cut || top.length < TOP_SEGMENT_MIN_POINTS) top.push(i);
  const inTop = new Set(top);
  const rest: number[] = [];
  for (let i = 0; i < n; i++) if (!inTop.has(i)) rest.push(i);
  const pm = absJ ? 3 : 2;
  if (rest.length >= pm + 1 && decadesOf(top.map((i) => x[i])) > 0) {
    const ft = tafelLinearFit(
      top.map((i) => x[i]),
      top.map((i) => y[i]),
      null,
      0,
    );
    const fm = tafelLinearFit(
      rest.map((i) => x[i]),
      rest.map((i) => y[i]),
      absJ ? rest.map((i) => absJ[i]) : null,
      0,
    );
    let mainSlope = fm.coefficients[1];
    if (absJ) {
      let meanJ = 0;
      for (const i of top) meanJ += absJ[i];
      mainSlope += fm.coefficients[2] * (meanJ / top.length);
    }
    // t test for equal slopes of two regression lines with a pooled residual variance.
    const dof = n - 2 - pm;
    if (mainSlope > 0 && !ft.aliased[1] && !fm.aliased[1] && dof > 0) {
      const pooled = (ft.rss + fm.rss) / dof;
      const seTop = ft.degreesOfFreedom > 0 ? ft.standardErrors[1] / ft.residualStandardDeviation : NaN; // 1/√Sxx
      const seMain = fm.residualStandardDeviation > 0 ? fm.standardErrors[1] / fm.residualStandardDeviation : NaN;
      const diff = ft.coefficients[1] - mainSlope;
      out.topRise = diff / mainSlope;
      const unitTop = Number.isFinite(seTop) ? seTop : 1 / Math.sqrt(sxx(top.map((i) => x[i])));
      const unitMain = Number.isFinite(seMain) ? seMain : 1 / Math.sqrt(sxx(rest.map((i) => x[i])));
      const se = Math.sqrt(pooled) * Math.hypot(unitTop, unitMain);
      out.topSignificant = Math.abs(diff) > tQuantile95(dof) * se;
    }
  }
  return out;
}

function sxx(v: number[]): number {
  let m = 0;
  for (const a of v) m += a;
  m /= v.length;
  let s = 0;
  for (const a of v) s += (a - m) ** 2;
  return s;
}

/** Span of |j| in decades over the given x = ln|j| values. */
export function decadesOf(x: number[]): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of x) {
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  return (hi - lo) / Math.LN10;
}

export interface WindowTest {
  points: number;
  decades: number;
  rSquared: number;
  slope: number;
  curvature: CurvatureCheck;
  pass: boolean;
  reasons: string[];
}

/** Apply the automatic-window tests to one candidate window. */
export function testWindow(x: number[], y: number[], absJ: number[] | null): WindowTest {
  const n = x.length;
  const reasons: string[] = [];
  const decades = decadesOf(x);
  const p = absJ ? 3 : 2;
  const res: WindowTest = { points: n, decades, rSquared: NaN, slope: NaN, curvature: { rise: NaN, riseSignificant: false, topRise: NaN, topSignificant: false }, pass: false, reasons };
  if (n < MIN_POINTS) reasons.push(`only ${n} point(s) (at least ${MIN_POINTS} needed)`);
  if (decades < MIN_DECADES) reasons.push(`spans ${decades.toFixed(2)} decade(s) of current (at least ${MIN_DECADES} needed)`);
  if (n >= p + 1 && decades > 0) {
    const fit = tafelLinearFit(x, y, absJ, 0);
    res.rSquared = fit.rSquared;
    res.slope = fit.coefficients[1];
    if (!(res.slope > 0)) reasons.push('the Tafel slope is not positive');
    if (!(fit.rSquared >= MIN_R_SQUARED)) reasons.push(`R² = ${fit.rSquared.toFixed(4)} < ${MIN_R_SQUARED}`);
    const c = curvatureCheck(x, y, absJ);
    res.curvature = c;
    if (c.riseSignificant && Math.abs(c.rise) > MAX_SLOPE_RISE) {
      reasons.push(`the local slope changes by ${(c.rise * 100).toFixed(0)} % across the window`);
    }
    if (c.topSignificant && Math.abs(c.topRise) > MAX_SLOPE_RISE) {
      reasons.push(`the slope at the high-current end differs by ${(c.topRise * 100).toFixed(0)} % from the main trend`);
    }
  }
  res.pass = reasons.length === 0;
  return res;
}

export interface AutoWindowResult {
  /** Positions (into the y-sorted arrays) of the chosen points. */
  positions: number[];
  lowFieldLimit: number;
  passed: boolean;
  /** When !passed: why the widest candidate failed. */
  reasons: string[];
  /** Number of points above the low-field limit. */
  eligible: number;
  /**
   * Points the window tests were run on for the reported window (the chosen one, or the widest
   * candidate when none passed): all of them, or an evenly strided subset of MAX_TEST_POINTS.
   */
  testedPoints: number;
}

/**
 * Automatic Tafel window (rule in AUTO_WINDOW_RULE). Inputs sorted by y ascending:
 * y = s·η [V], x = ln|j|, absJ = |j| (or null when R_u is not fitted), temperature [K].
 * A first α comes from a straight line through all points with y ≥ 50 mV. Windows start at
 * the first point with y ≥ the low-field limit and end at a candidate upper point; the
 * widest passing window wins; the low-field limit is then updated with the fitted α (at
 * most MAX_WINDOW_PASSES times; a window that passed is kept if a later pass finds none).
 */
export function selectAutoWindow(y: number[], x: number[], absJ: number[] | null, fitY: number[], temperatureK: number): AutoWindowResult {
  // First estimate of α from a straight line through the points above the 50 mV floor, so
  // that steep-slope electrodes (α > 1) are not shut out by the α ≤ 1 limit of 4RT/F.
  let alphaHat = 1;
  {
    const sel: number[] = [];
    for (let k = 0; k < y.length; k++) if (y[k] >= LOW_FIELD_FLOOR) sel.push(k);
    // ≥ 3 points: a slope with at least one residual degree of freedom (project choice).
    if (sel.length >= 3 && decadesOf(sel.map((k) => x[k])) > 0) {
      const pre = tafelLinearFit(
        sel.map((k) => x[k]),
        sel.map((k) => fitY[k]),
        null,
        0,
      );
      const b = pre.coefficients[1];
      if (b > 0) alphaHat = thermalVoltage(temperatureK) / b;
    }
  }
  let lastStart = -1;
  let best: AutoWindowResult = { positions: [], lowFieldLimit: lowFieldLimit(temperatureK, 1), passed: false, reasons: [], eligible: 0, testedPoints: 0 };
  for (let pass = 0; pass < MAX_WINDOW_PASSES; pass++) {
    const limit = lowFieldLimit(temperatureK, alphaHat);
    let start = y.findIndex((v) => v >= limit);
    if (start < 0) start = y.length;
    const eligible = y.length - start;
    if (start === lastStart) break;
    lastStart = start;
    const firstEnd = start + MIN_POINTS - 1;
    let chosen: number[] | null = null;
    let widestFail: string[] = [];
    let widestTested = 0;
    let chosenTested = 0;
    let chosenSlope = NaN;
    const tryEnd = (end: number): boolean => {
      const pos: number[] = [];
      // Long windows are tested on an evenly strided subset (first and last kept): the
      // tests judge shape, and 2000 points carry it; the final fit uses every point.
      const len = end - start + 1;
      if (len <= MAX_TEST_POINTS) for (let k = start; k <= end; k++) pos.push(k);
      else for (let q = 0; q < MAX_TEST_POINTS; q++) pos.push(start + Math.round((q * (len - 1)) / (MAX_TEST_POINTS - 1)));
      const t = testWindow(
        pos.map((k) => x[k]),
        pos.map((k) => fitY[k]),
        absJ ? pos.map((k) => absJ[k]) : null,
      );
      if (t.pass) {
        chosen = [];
        for (let k = start; k <= end; k++) chosen.push(k);
        chosenSlope = t.slope;
        chosenTested = pos.length;
        return true;
      }
      if (widestFail.length === 0) {
        widestFail = t.reasons;
        widestTested = pos.length;
      }
      return false;
    };
    // Scan candidate upper ends from the widest down. Short records: every end. Long
    // records: a coarse scan, then a finer scan between the first passing end and the
    // failing end above it (keeps the cost bounded; resolution ≈ count/MAX_CANDIDATES²).
    if (firstEnd < y.length) {
      const count = y.length - firstEnd;
      const coarse = count <= MAX_CANDIDATES ? 1 : Math.ceil(count / COARSE_CANDIDATES);
      let failedAbove = y.length; // smallest failing end above the pass
      for (let e = y.length - 1; e >= firstEnd; e -= coarse) {
        if (tryEnd(e)) {
          if (coarse > 1 && failedAbove - e > 1) {
            const passEnd = e;
            const fine = Math.max(1, Math.ceil((failedAbove - passEnd - 1) / COARSE_CANDIDATES));
            for (let e2 = failedAbove - 1; e2 > passEnd; e2 -= fine) if (tryEnd(e2)) break;
          }
          break;
        }
        failedAbove = e;
      }
    }
    if (firstEnd >= y.length) widestFail = [`only ${eligible} point(s) have |η| ≥ ${(limit * 1000).toFixed(0)} mV (at least ${MIN_POINTS} needed)`];
    const all: number[] = [];
    for (let k = start; k < y.length; k++) all.push(k);
    if (!chosen) {
      // Keep a window that passed on an earlier pass (the updated limit only added points).
      if (!best.passed) best = { positions: all, lowFieldLimit: limit, passed: false, reasons: widestFail, eligible, testedPoints: widestTested || all.length };
      break;
    }
    best = { positions: chosen, lowFieldLimit: limit, passed: true, reasons: [], eligible, testedPoints: chosenTested };
    alphaHat = thermalVoltage(temperatureK) / chosenSlope;
    // Settled when the limit moves by less than 1e-12 V (far below any η resolution; project choice).
    if (Math.abs(lowFieldLimit(temperatureK, alphaHat) - limit) < 1e-12) break;
  }
  return best;
}
