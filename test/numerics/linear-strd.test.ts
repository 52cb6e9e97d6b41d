/**
 * Linear least squares against the 11 NIST StRD linear datasets.
 * Source of data and certified values: NIST Statistical Reference Datasets,
 * https://www.itl.nist.gov/div898/strd/ (copies in test/fixtures/nist-strd/linear/).
 * Accuracy is scored by NIST's log relative error (LRE ≈ correct significant digits).
 * Required digits: 9 on the lower/average sets and Longley, Wampler1–3; 7 on Filip and
 * Wampler4; 6 on Wampler5. Those limits follow from float64 data: NIST's certified values
 * are for the exact decimal data, and Filip (degree-10 polynomial, condition ~1e15 before
 * scaling) and Wampler4/5 (huge residuals) amplify the binary rounding of x and y.
 */
import { describe, expect, it } from 'vitest';
import { linearLeastSquares } from '../../server/core/numerics/index.js';
import { expectClose, logRelativeError } from '../helpers/close.js';
import { loadLinearDataset, STRD_LINEAR_NAMES } from '../fixtures/strd-models.js';

/** Certified values carry 15 significant digits (nist-strd/README.md). */
const CAP = 15;
const REQUIRED: Record<(typeof STRD_LINEAR_NAMES)[number], number> = {
  Norris: 9,
  Pontius: 9,
  NoInt1: 9,
  NoInt2: 9,
  Longley: 9,
  Wampler1: 9,
  Wampler2: 9,
  Wampler3: 9,
  Filip: 7,
  Wampler4: 7,
  Wampler5: 6,
};

function minLre(est: number[], cert: number[]): { lre: number; index: number } {
  let best = { lre: Infinity, index: -1 };
  est.forEach((v, j) => {
    const l = logRelativeError(v, cert[j], CAP);
    if (l < best.lre) best = { lre: l, index: j };
  });
  return best;
}

describe('linearLeastSquares on NIST StRD linear datasets', () => {
  it.each(STRD_LINEAR_NAMES.map((n) => [n]))('%s: coefficients, SDs, residual SD and R² to the required LRE', (name) => {
    const ds = loadLinearDataset(name);
    const need = REQUIRED[name];
    const fit = linearLeastSquares(ds.X, ds.y);
    expect(fit.rank, `${name}: rank`).toBe(ds.certified.beta.length);
    expect(fit.warnings, `${name}: warnings`).toEqual([]);
    const b = minLre(fit.coefficients, ds.certified.beta);
    expect(b.lre, `${name}: coefficient b${b.index} LRE ${b.lre.toFixed(2)} (est ${fit.coefficients[b.index]}, cert ${ds.certified.beta[b.index]})`).toBeGreaterThanOrEqual(need);
    const sd = minLre(fit.standardErrors, ds.certified.sd);
    expect(sd.lre, `${name}: SD of b${sd.index} LRE ${sd.lre.toFixed(2)} (est ${fit.standardErrors[sd.index]}, cert ${ds.certified.sd[sd.index]})`).toBeGreaterThanOrEqual(need);
    const s = logRelativeError(fit.residualStandardDeviation, ds.certified.residualSD, CAP);
    expect(s, `${name}: residual SD LRE (est ${fit.residualStandardDeviation}, cert ${ds.certified.residualSD})`).toBeGreaterThanOrEqual(need);
    const r2 = logRelativeError(fit.rSquared, ds.certified.rSquared, CAP);
    expect(r2, `${name}: R² LRE (est ${fit.rSquared}, cert ${ds.certified.rSquared})`).toBeGreaterThanOrEqual(need);
    expect(fit.degreesOfFreedom).toBe(ds.y.length - ds.certified.beta.length);
    expect(fit.covarianceScaling).toBe('residual-variance');
  });

  it('Norris slope and intercept match the certified values (NIST StRD Norris)', () => {
    const ds = loadLinearDataset('Norris');
    const fit = linearLeastSquares(ds.X, ds.y);
    // NIST StRD Norris certified B0, B1 and residual SD (15 digits); rtol 1e-12 ≈ LRE 12.
    expectClose(fit.coefficients[0], -0.262323073774029, { rtol: 1e-12 }, 'Norris B0');
    expectClose(fit.coefficients[1], 1.00211681802045, { rtol: 1e-12 }, 'Norris B1');
    expectClose(fit.residualStandardDeviation, 0.884796396144373, { rtol: 1e-12 }, 'Norris residual SD');
  });
});
