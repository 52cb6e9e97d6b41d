/**
 * Electrode coating comparison in energy and money, side by side against a baseline option.
 *
 * For each option (2–6), at the design current density j over the total active area A:
 *   cell voltage in year t  U_t = U_start + ρ·(t − ½)          (ρ: voltage rise, V/yr; mid-year value)
 *   average over its life   Ū = U_start + ρ·n/2                  (n: coating life, whole years)
 *   specific energy         w_t = U_t·z·F/(CE·M)                 [J/kg]
 *   annual production       P = j·A·CE_base·M/(z·F)·3600·H       [kg/yr], held the same for every option
 *   annual energy           E_t = w_t·P                          [J/yr]; cost E_t/3.6e6·p
 *   coating capital         K = price·A, paid at the start
 *   equivalent annual cost  EAC = [K + Σ_t cost_t/(1+i)^t]·CRF(i, n)
 *   NPV vs baseline         (EAC_base − EAC)·(P/A, i, n_option)  (> 0: the option is worth more)
 *   simple payback          (K − K_base)/(average annual energy cost saving)
 * Comparing equivalent annual costs handles unequal coating lives (like-for-like renewal of
 * each coating is assumed); with equal lives the NPV equals −ΔK + Σ Δsaving_t/(1+i)^t.
 * Money in decimal (decimal.js); display rounding half-up, 2 places.
 * Source: Faraday's law; equivalent-annual-cost and NPV comparison are standard engineering
 * economics (common practice).
 */
import type { Decimal } from 'decimal.js';
import { FARADAY } from '../constants.js';
import { annuityFactor, capitalRecoveryFactor, money, MoneyDecimal, roundMoney } from './money.js';
import { type CellPerformance, cellPerformanceIssues, evaluateCell, requirePositive, throwIfIssues } from './performance.js';
import { JOULES_PER_KWH, PRODUCT_SPECS, type ProductId, SECONDS_PER_HOUR } from './products.js';
import { HOURS_PER_YEAR } from './costs.js';
import { sig } from './format.js';

/** A cell voltage and current efficiency given directly at the design point. */
export interface CellOperatingPoint {
  kind: 'point';
  /** V at the design current density (start of coating life). */
  cellVoltage: number;
  /** 0–1. */
  currentEfficiency: number;
}

export interface CoatingOption {
  name: string;
  performance: CellPerformance | CellOperatingPoint;
  /** Installed coating price per m² of active area, currency/m². */
  pricePerArea: number;
  /** Expected rise of the cell voltage, V per year (≥ 0). */
  voltageRisePerYear: number;
  /** Coating life, whole years ≥ 1. */
  lifeYears: number;
}

export interface CoatingComparisonInput {
  product: ProductId;
  /** Design current density, A/m². */
  currentDensity: number;
  /** Total active area coated, m². */
  activeArea: number;
  /** currency/kWh. */
  energyPrice: number;
  /** h/yr, (0, 8760]. */
  operatingHoursPerYear: number;
  /** fraction/yr, > −1. */
  discountRate: number;
  options: CoatingOption[];
  /** Index of the baseline option (default 0). */
  baselineIndex?: number;
}

export interface CoatingRow {
  name: string;
  isBaseline: boolean;
  /** V at the design point, start of life. */
  cellVoltage: number;
  currentEfficiency: number;
  /** J/kg at start of life. */
  specificEnergy: number;
  /** Life-average cell voltage, V. */
  averageCellVoltage: number;
  /** Life-average specific energy, J/kg. */
  averageSpecificEnergy: number;
  /** Life-average electrical energy per year, J/yr. */
  annualEnergy: number;
  /** Life-average energy cost, currency/yr. */
  annualEnergyCost: number;
  /** Baseline's average annual energy cost minus this option's (> 0: saves), currency/yr. */
  annualSavingVsBaseline: number;
  /** Coating capital, currency. */
  coatingCapital: number;
  /** This option's capital minus the baseline's, currency. */
  extraCapital: number;
  /** Years; 0 when it costs no more and saves; null when it never pays back (or is the baseline). */
  simplePaybackYears: number | null;
  /** Equivalent annual cost (capital + energy), currency/yr. */
  equivalentAnnualCost: number;
  /** NPV of choosing this option over the baseline, over this option's life, currency. */
  npvVsBaseline: number;
  lifeYears: number;
  display: {
    annualEnergyCost: string;
    annualSavingVsBaseline: string;
    coatingCapital: string;
    extraCapital: string;
    equivalentAnnualCost: string;
    npvVsBaseline: string;
    simplePaybackYears: string;
  };
  notes: string[];
}

export interface CoatingComparisonResult {
  baselineIndex: number;
  /** Annual production held for every option, kg/yr. */
  annualProduction: number;
  rows: CoatingRow[];
  warnings: string[];
}

/** Allowed number of options (2–6, from the page design). */
const MIN_OPTIONS = 2;
const MAX_OPTIONS = 6;
/** Relative size below which an energy-cost difference is float noise (1e-12, our choice). */
const SAVING_NOISE = 1e-12;
/**
 * Longest simple payback reported as a number, years (1000, our choice: far beyond any
 * coating or plant life; a longer one is reported as "never pays back", payback null, which
 * also keeps a subnormal saving from overflowing the payback to Infinity).
 */
const MAX_PAYBACK_YEARS = 1000;

function validate(input: CoatingComparisonInput): void {
  const issues: { path: string; message: string }[] = [];
  if (!PRODUCT_SPECS[input.product]) issues.push({ path: 'product', message: 'must be one of Cl2, NaOH, H2, O2' });
  requirePositive(issues, 'currentDensity', input.currentDensity, 'A/m²');
  requirePositive(issues, 'activeArea', input.activeArea, 'm²');
  requirePositive(issues, 'energyPrice', input.energyPrice, 'per kWh');
  requirePositive(issues, 'operatingHoursPerYear', input.operatingHoursPerYear, 'h/yr');
  if (input.operatingHoursPerYear > HOURS_PER_YEAR) issues.push({ path: 'operatingHoursPerYear', message: `must be at most ${HOURS_PER_YEAR} h/yr` });
  if (!Number.isFinite(input.discountRate) || input.discountRate <= -1) issues.push({ path: 'discountRate', message: 'must be a finite rate > −1 (fraction per year)' });
  const opts = input.options;
  if (!Array.isArray(opts) || opts.length < MIN_OPTIONS || opts.length > MAX_OPTIONS) {
    issues.push({ path: 'options', message: `must list ${MIN_OPTIONS} to ${MAX_OPTIONS} coating options` });
  } else {
    opts.forEach((o, k) => {
      const path = `options.${k}`;
      if (typeof o.name !== 'string' || o.name.trim() === '') issues.push({ path: `${path}.name`, message: 'must not be empty' });
      const perf = o.performance;
      if (perf?.kind === 'point') {
        requirePositive(issues, `${path}.performance.cellVoltage`, perf.cellVoltage, 'V');
        if (!(perf.currentEfficiency > 0 && perf.currentEfficiency <= 1)) issues.push({ path: `${path}.performance.currentEfficiency`, message: 'must be in (0, 1]' });
      } else if (perf) {
        issues.push(...cellPerformanceIssues(perf, `${path}.performance`));
      } else {
        issues.push({ path: `${path}.performance`, message: 'is required' });
      }
      if (!Number.isFinite(o.pricePerArea) || o.pricePerArea < 0) issues.push({ path: `${path}.pricePerArea`, message: 'must be a finite price ≥ 0 per m²' });
      if (!Number.isFinite(o.voltageRisePerYear) || o.voltageRisePerYear < 0) issues.push({ path: `${path}.voltageRisePerYear`, message: 'must be a finite rise ≥ 0 V/yr' });
      if (!Number.isInteger(o.lifeYears) || o.lifeYears < 1) issues.push({ path: `${path}.lifeYears`, message: 'must be a whole number of years ≥ 1' });
    });
    const b = input.baselineIndex ?? 0;
    if (!Number.isInteger(b) || b < 0 || b >= opts.length) issues.push({ path: 'baselineIndex', message: `must be an option index 0–${opts.length - 1}` });
  }
  throwIfIssues('coating comparison input is not valid', issues);
}

function startPoint(o: CoatingOption, j: number, path: string): { cellVoltage: number; currentEfficiency: number } {
  if (o.performance.kind === 'point') return o.performance;
  return evaluateCell(o.performance, j, path);
}

interface Working {
  option: CoatingOption;
  cellVoltage: number;
  currentEfficiency: number;
  /** C/kg at the option's CE: z·F/(CE·M). */
  chargePerKg: number;
  capital: Decimal;
  /** Energy cost in each year 1..n. */
  yearlyCost: Decimal[];
  averageAnnualCost: Decimal;
  eac: Decimal;
}

/**
 * Compare electrode coatings (see the module note). Inputs SI except money: prices per kWh and
 * per m², rate per year, hours per year, life in years. Returns side-by-side rows.
 */
export function compareCoatings(input: CoatingComparisonInput): CoatingComparisonResult {
  validate(input);
  const p = PRODUCT_SPECS[input.product];
  const baselineIndex = input.baselineIndex ?? 0;
  const warnings: string[] = [];
  const zF = p.electronsPerMolecule * FARADAY.value;
  const points = input.options.map((o, k) => startPoint(o, input.currentDensity, `options.${k}.performance`));
  const ceBase = points[baselineIndex].currentEfficiency;
  const secondsPerYear = input.operatingHoursPerYear * SECONDS_PER_HOUR;
  const annualProduction = ((input.currentDensity * input.activeArea * ceBase * p.molarMass) / zF) * secondsPerYear;
  const price = money(input.energyPrice, 'energyPrice');

  const work: Working[] = input.options.map((option, k) => {
    const { cellVoltage, currentEfficiency } = points[k];
    const chargePerKg = zF / (currentEfficiency * p.molarMass);
    const yearlyCost: Decimal[] = [];
    for (let t = 1; t <= option.lifeYears; t++) {
      const u = cellVoltage + option.voltageRisePerYear * (t - 0.5);
      const joules = u * chargePerKg * annualProduction;
      yearlyCost.push(money(joules).div(JOULES_PER_KWH).times(price));
    }
    const sum = yearlyCost.reduce((a, c) => a.plus(c), new MoneyDecimal(0));
    const capital = money(option.pricePerArea, `options.${k}.pricePerArea`).times(money(input.activeArea));
    const growth = new MoneyDecimal(input.discountRate).plus(1);
    let discount = new MoneyDecimal(1);
    let pv = capital;
    for (const c of yearlyCost) {
      discount = discount.div(growth);
      pv = pv.plus(c.times(discount));
    }
    const eac = pv.times(capitalRecoveryFactor(input.discountRate, option.lifeYears));
    return { option, cellVoltage, currentEfficiency, chargePerKg, capital, yearlyCost, averageAnnualCost: sum.div(option.lifeYears), eac };
  });

  const base = work[baselineIndex];
  const rows: CoatingRow[] = work.map((w, k) => {
    const o = w.option;
    const isBaseline = k === baselineIndex;
    const averageCellVoltage = w.cellVoltage + (o.voltageRisePerYear * o.lifeYears) / 2;
    let saving = base.averageAnnualCost.minus(w.averageAnnualCost);
    // Float64 energy figures carry ~1e-16 relative noise; a saving below SAVING_NOISE of the
    // baseline cost is no saving (else a tie would show a payback of 1e15 years).
    if (saving.abs().lte(base.averageAnnualCost.abs().times(SAVING_NOISE))) saving = new MoneyDecimal(0);
    const extraCapital = w.capital.minus(base.capital);
    const npv = base.eac.minus(w.eac).times(annuityFactor(input.discountRate, o.lifeYears));
    const notes: string[] = [];
    let payback: Decimal | null = null;
    if (!isBaseline) {
      if (extraCapital.lte(0) && saving.gte(0)) payback = new MoneyDecimal(0);
      else if (extraCapital.gt(0) && saving.gt(0)) payback = extraCapital.div(saving);
      else notes.push(extraCapital.gt(0) ? 'costs more and saves no energy: never pays back' : 'cheaper to buy but dearer to run');
      if (payback !== null && !payback.lte(MAX_PAYBACK_YEARS)) {
        // A saving so small (e.g. a few hours of operation a year, or a subnormal saving whose
        // payback would overflow float64) that the extra capital never comes back.
        payback = null;
        notes.push(`saves too little energy to pay back the extra capital (simple payback over ${MAX_PAYBACK_YEARS} years): never pays back`);
      }
      if (payback !== null && payback.gt(o.lifeYears)) notes.push(`simple payback ${sig(payback.toNumber(), 3)} yr is longer than the coating life`);
      if (Math.abs(w.currentEfficiency - ceBase) > 1e-12) notes.push('current efficiency differs from the baseline: energy compared at equal production');
    }
    return {
      name: o.name,
      isBaseline,
      cellVoltage: w.cellVoltage,
      currentEfficiency: w.currentEfficiency,
      specificEnergy: w.cellVoltage * w.chargePerKg,
      averageCellVoltage,
      averageSpecificEnergy: averageCellVoltage * w.chargePerKg,
      annualEnergy: averageCellVoltage * w.chargePerKg * annualProduction,
      annualEnergyCost: w.averageAnnualCost.toNumber(),
      annualSavingVsBaseline: saving.toNumber(),
      coatingCapital: w.capital.toNumber(),
      extraCapital: extraCapital.toNumber(),
      simplePaybackYears: payback === null ? null : payback.toNumber(),
      equivalentAnnualCost: w.eac.toNumber(),
      npvVsBaseline: npv.toNumber(),
      lifeYears: o.lifeYears,
      display: {
        annualEnergyCost: roundMoney(w.averageAnnualCost),
        annualSavingVsBaseline: roundMoney(saving),
        coatingCapital: roundMoney(w.capital),
        extraCapital: roundMoney(extraCapital),
        equivalentAnnualCost: roundMoney(w.eac),
        npvVsBaseline: roundMoney(npv),
        simplePaybackYears: payback === null ? '—' : roundMoney(payback, 1),
      },
      notes,
    };
  });
  const lives = new Set(input.options.map((o) => o.lifeYears));
  if (lives.size > 1) {
    warnings.push('Coating lives differ: options are compared by equivalent annual cost, assuming each coating is renewed like for like.');
  }
  return { baselineIndex, annualProduction, rows, warnings };
}
