import { describe, expect, it } from 'vitest';
import { expectClose } from '../helpers/close.js';
import {
  anodeGasHydrogenFraction,
  anodeGasPurity,
  busbarMagneticField,
  checkBoilingMargin,
  checkHydrogenInChlorine,
  checkHydrogenInOxygen,
  checkLimitingCurrent,
  checkMagneticField,
  gasProductionRate,
  hydrogenInChlorineLowerLimit,
  hydrogenPermeationFlux,
  waterSaturationTemperature,
  assessSafety,
} from '../../server/core/safety/index.js';
import { InputError } from '../../server/core/errors.js';

/**
 * Reference values below use F = 96 485.332 12 C/mol (CODATA 2018, exact since 2019, quoted
 * to 10 digits); its relative rounding (3.4e-11) with margin sets the tolerance.
 */
const F_RTOL = 1e-10;

describe('water saturation temperature (IAPWS-IF97, region 4)', () => {
  // Verification values of the saturation-temperature equation, IAPWS R7-97(2012).
  it.each([
    [0.1e6, 372.755919],
    [1e6, 453.035632],
    [10e6, 584.149488],
  ])('T_s(%d Pa) = %f K', (p, t) => {
    // Quoted to 1e-6 K: allow half a unit of the last digit.
    expectClose(waterSaturationTemperature(p), t, { atol: 5e-7 });
  });

  it('rejects pressures off the saturation line', () => {
    expect(() => waterSaturationTemperature(100)).toThrow(InputError);
    expect(() => waterSaturationTemperature(30e6)).toThrow(InputError);
  });
});

describe('hydrogen in oxygen (LFL 4 vol %: Zabetakis 1965; GEST 91/168)', () => {
  // Screens 1 % (alarm) and 2 % (trip, half the LFL): common practice, check-values §10 —
  // numbers from memory there (e.g. Haug et al. 2017; Schalenbach et al. 2016).
  it('ok below 1 %, caution from 1 %, alarm from 2 % (half the LFL)', () => {
    expect(checkHydrogenInOxygen(0.005).level).toBe('ok');
    expect(checkHydrogenInOxygen(0.015).level).toBe('caution');
    expect(checkHydrogenInOxygen(0.02).level).toBe('alarm');
    expect(checkHydrogenInOxygen(0.05).level).toBe('alarm');
    const c = checkHydrogenInOxygen(0.015, { where: 'minimum load' });
    expectClose(c.limit, 0.02, { rtol: 1e-15 });
    expectClose(c.cautionLimit, 0.01, { rtol: 1e-15 });
    expect(c.message).toMatch(/1\.50 vol %/);
    expect(c.message).toMatch(/minimum load/);
    expect(c.source).toMatch(/Zabetakis/);
    expect(c.id).toBe('hydrogen-in-oxygen.minimum-load');
  });

  it('plant thresholds replace the screens', () => {
    const c = checkHydrogenInOxygen(0.012, { thresholds: { caution: 0.005, alarm: 0.01 } });
    expect(c.level).toBe('alarm');
    expect(c.source).toMatch(/plant thresholds/);
    expect(() => checkHydrogenInOxygen(0.01, { thresholds: { caution: 0.02, alarm: 0.01 } })).toThrow(InputError);
    expect(() => checkHydrogenInOxygen(1.2)).toThrow(InputError);
  });
});

describe('hydrogen in chlorine (GEST 91/168 table via check-values §10)', () => {
  it('lower explosion limit against temperature and pressure', () => {
    const c = (celsius: number) => hydrogenInChlorineLowerLimit(celsius + 273.15).value;
    expectClose(c(25), 0.03, { rtol: 1e-15 }, '25 °C');
    expectClose(c(0), 0.035, { rtol: 1e-15 }, '0 °C');
    expectClose(c(-10), 0.035, { rtol: 1e-15 }, '−10 °C takes the lower neighbour');
    expectClose(c(-60), 0.05, { rtol: 1e-15 }, '−60 °C');
    expectClose(c(90), 0.03, { rtol: 1e-15 }, '90 °C');
    expectClose(hydrogenInChlorineLowerLimit().value, 0.03, { rtol: 1e-15 }, 'no temperature');
    expectClose(hydrogenInChlorineLowerLimit(298.15, 13.5e5).value, 0.025, { rtol: 1e-15 }, '13.5 bar(a)');
  });

  it('screens at ¼ and ½ of the limit: 0.5 % ok, 1 % caution, 1.5 % alarm at 85 °C', () => {
    const T = 358.15;
    expect(checkHydrogenInChlorine(0.005, { temperature: T }).level).toBe('ok');
    expect(checkHydrogenInChlorine(0.01, { temperature: T }).level).toBe('caution');
    expect(checkHydrogenInChlorine(0.015, { temperature: T }).level).toBe('alarm');
    expect(checkHydrogenInChlorine(0.015, { temperature: T }).message).toMatch(/explode/);
  });
});

describe('anode-gas hydrogen from crossover', () => {
  it('x = f/(f + g): 1e-5 over 1e-3 mol/(m²·s) → 0.990 099 %', () => {
    expectClose(anodeGasHydrogenFraction(1e-5, 1e-3), 1e-5 / 1.01e-3, { rtol: 1e-15 });
  });

  it('O₂ production at 4 kA/m² = 4000/(4F) = 0.010 364 3 mol/(m²·s) (Faraday)', () => {
    // Independent computation: Python 3, 4000/(4 × 96485.33212) (CODATA 2018 F).
    expectClose(gasProductionRate(4000, 4), 0.01036426965661773, { rtol: F_RTOL });
  });

  it('Fick permeation P·p/d', () => {
    expectClose(hydrogenPermeationFlux(1e-14, 1e6, 1e-4), 1e-4, { rtol: 1e-15 });
  });

  it('purity worsens at minimum load; the trip current density reproduces the trip fraction', () => {
    const flux = 2e-6; // mol/(m²·s), invented
    const r = anodeGasPurity({ chemistry: 'water', crossoverFlux: flux, operatingCurrentDensity: 5000, minimumCurrentDensity: 500 });
    expect(r.minimumLoad.hydrogenFraction).toBeGreaterThan(r.operating.hydrogenFraction);
    // x ≈ f·4F/j for x ≪ 1: 2e-6 × 4 × 96485 / 500 = 0.154 % at minimum load.
    // Exact x = f/(f + j/4F) = 0.001 541 385 776 (independent computation: Python 3, CODATA 2018 F).
    expectClose(r.minimumLoad.hydrogenFraction, 0.001541385776023605, { rtol: F_RTOL });
    const jTrip = r.lowestCurrentDensityBelowTrip;
    expectClose(anodeGasHydrogenFraction(flux, gasProductionRate(jTrip, 4)), 0.02, { rtol: 1e-12 }, 'round trip');
    expect(r.checks).toHaveLength(2);
  });

  it('chlor-alkali uses Cl₂ (z = 2) and the chlorine limit', () => {
    const r = anodeGasPurity({ chemistry: 'chlor-alkali', crossoverFlux: 1e-4, operatingCurrentDensity: 6000, minimumCurrentDensity: 1500, temperature: 358.15 });
    // x = f/(f + j/2F) = 1e-4/(1e-4 + 6000/(2 × 96485.33212)) (independent computation: Python 3).
    expectClose(r.operating.hydrogenFraction, 0.0032058670989408705, { rtol: F_RTOL });
    expect(r.operating.check.id).toMatch(/^hydrogen-in-chlorine/);
    expect(r.minimumLoad.check.level).toBe('caution'); // ≈ 1.27 vol %: between 0.75 and 1.5 %
  });
});

describe('temperature against boiling', () => {
  it('80 °C at 1 bar is ok; 95 °C caution; 98 °C alarm; elevation moves the limit', () => {
    const bar = 1e5; // T_s = 99.61 °C (IF97)
    expect(checkBoilingMargin(353.15, bar).level).toBe('ok');
    expect(checkBoilingMargin(368.15, bar).level).toBe('caution');
    expect(checkBoilingMargin(371.15, bar).level).toBe('alarm');
    expect(checkBoilingMargin(368.15, bar, { boilingPointElevation: 10 }).level).toBe('ok');
    const c = checkBoilingMargin(368.15, bar);
    expectClose(c.limit, 372.755919 - 3, { atol: 5e-7 }); // IF97 T_s(0.1 MPa) − 3 K margin
    expect(c.message).toMatch(/99\.6 °C/);
  });
});

describe('current density against a limiting current', () => {
  it('ok to 80 %, caution above, alarm from 95 %, and no steady state at or above j_lim', () => {
    expect(checkLimitingCurrent(5000, 10000).level).toBe('ok');
    expect(checkLimitingCurrent(8000, 10000).level).toBe('ok');
    expect(checkLimitingCurrent(8500, 10000).level).toBe('caution');
    expect(checkLimitingCurrent(9600, 10000).level).toBe('alarm');
    expect(checkLimitingCurrent(11000, 10000).message).toMatch(/no steady state/);
    expect(() => checkLimitingCurrent(1, 0)).toThrow(InputError);
  });
});

describe('busbar magnetic field', () => {
  it('B = μ0·I/(2πd): 100 kA at 1 m ≈ 20 mT (μ0/2π ≈ 2e-7 T·m/A, CODATA 2018)', () => {
    expectClose(busbarMagneticField(100e3, 1), 0.02, { rtol: 1e-9 });
    expect(checkMagneticField(100e3, 1).level).toBe('caution');
    expect(checkMagneticField(100, 10).level).toBe('ok');
    expect(checkMagneticField(300e3, 0.1).level).toBe('alarm'); // 0.6 T
  });
});

describe('assessSafety', () => {
  it('runs the checks it has data for, reports the worst level, and filters the cautions', () => {
    const a = assessSafety({
      chemistry: 'water',
      anodeGas: { crossoverFlux: 2e-6, operatingCurrentDensity: 5000, minimumCurrentDensity: 300 },
      boiling: { temperature: 353.15, pressure: 1e5 },
    });
    expect(a.checks).toHaveLength(3);
    expect(['ok', 'caution', 'alarm']).toContain(a.worst);
    expect(a.cautions.some((c) => c.topic === 'chlorine')).toBe(false);
    expect(a.disclaimer).toMatch(/local codes, standards/i);
    expect(a.lowestCurrentDensityBelowTrip).not.toBeNull();
    const ca = assessSafety({ chemistry: 'chlor-alkali' });
    expect(ca.checks).toHaveLength(0);
    expect(ca.worst).toBe('ok');
    expect(ca.cautions.some((c) => c.topic === 'hydrogen-chlorine')).toBe(true);
  });
});
