/**
 * The Cell page's computation hand-off and view-model: runs the cell core (sweep and, when
 * asked, the Monte Carlo band) on an SI cell section, and turns its SI results into what the
 * template prints: key figures, the design-point table, the K-factor, the Chart.js
 * configurations (public/js/charts.js only draws them), the sweep table, warnings, safety
 * cautions and the CSV download. No physics here: every number comes from the core; this
 * file converts units, rounds and arranges.
 */
import Papa from 'papaparse';
import { Decimal } from 'decimal.js';
import { InputError, PhysicsError } from '../core/errors.js';
import { sweepCell } from '../core/cell/sweep.js';
import { voltageBand, type VoltageBandResult } from '../core/cell/uncertainty.js';
import { kFactorLineVoltage, thermodynamicVoltageEfficiency } from '../core/cell/efficiency-figures.js';
import { tafelSlopePerDecade } from '../core/kinetics/models.js';
import type { CellSweepResult, ChemistryId, ProductId, SweepPoint } from '../core/cell/types.js';
import { CAUTIONS, SAFETY_DISCLAIMER, type Caution } from '../core/safety/cautions.js';
import { fromSI, UNIT_TABLES } from '../core/units.js';
import type { CellSection } from '../scenario/cell-section.js';
import { firstNonFinite } from './validate.js';
import { celsius, fixed, fmt } from './format.js';
import type { ElectrodeOrigin, ElectrodeRole } from './cell-form.js';

/** The core's answer for one cell section. */
export interface CellEvaluation {
  result: CellSweepResult;
  /** 95 % band over the sweep's current densities (and the design point, last), when asked and possible. */
  band?: VoltageBandResult;
  /** Why no band is shown although one was asked for (page only; the API answers 400 instead). */
  bandNote?: string;
}

/**
 * Run the core on a cell section: sweepCell, then voltageBand when `section.uncertainty` is
 * set. `strictBand`: a band request the core refuses (no kinetics carries standard errors)
 * throws (API); otherwise it becomes a note (page). Results are checked for non-finite numbers.
 */
export function evaluateCell(section: CellSection, options: { strictBand: boolean }): CellEvaluation {
  const result = sweepCell(section);
  const out: CellEvaluation = { result };
  if (section.uncertainty) {
    const js = [...section.currentDensities];
    if (section.designCurrentDensity !== undefined) js.push(section.designCurrentDensity);
    try {
      out.band = voltageBand(section, { samples: section.uncertainty.samples, seed: section.uncertainty.seed, currentDensities: js });
    } catch (err) {
      if (options.strictBand || !(err instanceof InputError)) throw err;
      out.bandNote = `No uncertainty band: ${err.issues[0]?.message ?? err.message}. Use fitted kinetics (datasets or saved fits), or enter standard errors by hand.`;
    }
  }
  // A non-finite number means the input drove a model outside its range: answer it, never send NaN.
  const at = firstNonFinite(out.result, 'result') ?? (out.band ? firstNonFinite(out.band.points, 'band') : null);
  if (at !== null) {
    throw new PhysicsError('(result)', `the model gave a non-finite value at ${at} for this input; check the inputs against the models' validity ranges`);
  }
  return out;
}

// ---------------------------------------------------------------------------------------------
// Display helpers

/** V → mV text with one decimal. */
function mV(v: number | undefined): string {
  return v === undefined ? '—' : fixed(fromSI(v, 'potential', 'mV'), 1);
}
function kAm2(j: number): string {
  return fmt(fromSI(j, 'currentDensity', 'kA/m2'), 4);
}
function percent(x: number | undefined, places = 1): string {
  return x === undefined ? '—' : fixed(new Decimal(x).times(100).toNumber(), places);
}
function r6(v: number): number {
  return Number(v.toPrecision(6));
}

/** Products whose specific energy is shown, with display unit, per chemistry. */
const ENERGY_DISPLAY: Record<ChemistryId, Array<{ id: ProductId; label: string; unit: 'kWh/t' | 'kWh/kg' }>> = {
  'chlor-alkali': [
    { id: 'Cl2', label: 'Cl₂', unit: 'kWh/t' },
    { id: 'NaOH', label: 'NaOH (100 %)', unit: 'kWh/t' },
  ],
  'alkaline-water': [{ id: 'H2', label: 'H₂', unit: 'kWh/kg' }],
  'pem-water': [{ id: 'H2', label: 'H₂', unit: 'kWh/kg' }],
};

const PRODUCT_LABEL: Record<ProductId, string> = { Cl2: 'Cl₂', NaOH: 'NaOH', H2: 'H₂', O2: 'O₂' };

export interface Row {
  label: string;
  value: string;
  unit: string;
  note?: string;
  strong?: boolean;
}

export interface BreakdownRow {
  label: string;
  mv: string;
  share: string;
}

export interface KineticsRow {
  electrode: string;
  origin: string;
  model: string;
  alpha: string;
  slope: string;
  j0Ref: string;
  refT: string;
  ea: string;
  j0Cell: string;
  seLnJ0: string;
  seAlpha: string;
  correlation: string;
  fitDetail?: string;
}

export interface CellView {
  chemistry: ChemistryId;
  summary: Row[];
  design: { currentDensity: string; breakdown: BreakdownRow[]; rows: Row[] } | null;
  kFactor: Row[] | null;
  kinetics: KineticsRow[];
  resistances: Row[];
  charts: { voltage: object; efficiency: object };
  sweep: { headers: string[]; rows: string[][] };
  warnings: string[];
  bandMethod?: string;
  bandNote?: string;
  cautions: Array<{ title: string; text: string }>;
  disclaimer: string;
}

/** Colours of the breakdown areas (our own palette). */
const PART_COLOURS = {
  reversible: '#aab4c0',
  anode: '#c4553a',
  cathode: '#2f7fb8',
  massTransport: '#8a5aa8',
  membrane: '#d9a21b',
  gaps: '#2a9d8f',
  hardware: '#6b7785',
  total: '#1d2430',
  band: 'rgba(29, 36, 48, 0.18)',
  kFactor: '#b0302a',
};

function transparent(hex: string, alpha: number): string {
  const n = Number.parseInt(hex.slice(1), 16);
  return `rgba(${(n >> 16) & 255}, ${(n >> 8) & 255}, ${n & 255}, ${alpha})`;
}

/** Breakdown parts of a point in plotting order, V. */
function parts(p: SweepPoint): Array<{ key: keyof typeof PART_COLOURS; label: string; value: number }> {
  const b = p.breakdown;
  return [
    { key: 'reversible', label: 'Reversible voltage', value: b.reversible },
    { key: 'anode', label: 'Anode overpotential', value: b.anode },
    { key: 'cathode', label: 'Cathode overpotential', value: b.cathode },
    { key: 'massTransport', label: 'Mass transport', value: b.massTransport },
    { key: 'membrane', label: 'Membrane', value: b.membrane },
    { key: 'gaps', label: 'Electrolyte gaps', value: b.gaps.reduce((s, g) => s + g, 0) },
    { key: 'hardware', label: 'Hardware', value: b.hardware },
  ];
}

/** A "nice" lower bound of the voltage axis: the multiple of 0.5 V at or below E_rev (display choice). */
function voltageAxisMin(reversible: number): number {
  const STEP = 0.5;
  return Math.max(0, Math.floor(reversible / STEP) * STEP);
}

function voltageChart(ev: CellEvaluation): object {
  const { result, band } = ev;
  const pts = result.points;
  const x = (p: SweepPoint) => r6(fromSI(p.currentDensity, 'currentDensity', 'kA/m2'));
  const datasets: object[] = [];
  const first = pts[0] ? parts(pts[0]) : [];
  first.forEach((part, k) => {
    const values = pts.map((p) => parts(p)[k].value);
    if (part.key !== 'reversible' && values.every((v) => v === 0)) return;
    datasets.push({
      label: part.label,
      data: pts.map((p, i) => ({ x: x(p), y: r6(values[i]) })),
      stack: 'parts',
      fill: datasets.length === 0 ? 'origin' : '-1',
      borderColor: PART_COLOURS[part.key],
      backgroundColor: transparent(PART_COLOURS[part.key], 0.55),
      borderWidth: 1,
      pointRadius: 0,
      order: 3,
    });
  });
  datasets.push({
    label: 'Cell voltage U',
    data: pts.map((p) => ({ x: x(p), y: r6(p.cellVoltage) })),
    stack: 'total',
    fill: false,
    borderColor: PART_COLOURS.total,
    backgroundColor: PART_COLOURS.total,
    borderWidth: 2,
    pointRadius: 2,
    order: 1,
  });
  if (band) {
    const sweepBand = band.points.slice(0, pts.length);
    datasets.push({
      label: '95 % band (lower)',
      data: sweepBand.map((b) => ({ x: r6(fromSI(b.currentDensity, 'currentDensity', 'kA/m2')), y: r6(b.monteCarlo.lower) })),
      stack: 'bandLower',
      fill: false,
      borderColor: 'rgba(29, 36, 48, 0.5)',
      borderDash: [4, 3],
      borderWidth: 1,
      pointRadius: 0,
      order: 2,
    });
    datasets.push({
      label: '95 % band (upper)',
      data: sweepBand.map((b) => ({ x: r6(fromSI(b.currentDensity, 'currentDensity', 'kA/m2')), y: r6(b.monteCarlo.upper) })),
      stack: 'bandUpper',
      fill: '-1',
      borderColor: 'rgba(29, 36, 48, 0.5)',
      backgroundColor: PART_COLOURS.band,
      borderDash: [4, 3],
      borderWidth: 1,
      pointRadius: 0,
      order: 2,
    });
  }
  const k = result.kFactor;
  if (k) {
    const ends = [k.range[0], k.range[1]];
    datasets.push({
      label: 'K-factor line U0 + K·j',
      data: ends.map((j) => ({ x: r6(fromSI(j, 'currentDensity', 'kA/m2')), y: r6(kFactorLineVoltage(k, j)) })),
      stack: 'kFactor',
      fill: false,
      borderColor: PART_COLOURS.kFactor,
      borderDash: [8, 4],
      borderWidth: 1.5,
      pointRadius: 0,
      order: 0,
    });
  }
  return sweepLineChart('Cell voltage and its parts (stacked)', datasets, {
    y: { type: 'linear', stacked: true, min: voltageAxisMin(result.reversiblePotential), title: { display: true, text: 'Voltage / V' } },
  }, { reverseLegend: true });
}

/**
 * Chart.js line chart of a current-density sweep: x in kA/m², the given y scales beside it,
 * title on top and legend below (reversed for stacked parts, so it reads top to bottom).
 */
function sweepLineChart(title: string, datasets: object[], yScales: Record<string, object>, opts: { reverseLegend?: boolean } = {}): object {
  return {
    type: 'line',
    data: { datasets },
    options: {
      interaction: { mode: 'nearest', intersect: false },
      plugins: {
        title: { display: true, text: title },
        legend: { position: 'bottom', ...(opts.reverseLegend ? { reverse: true } : {}), labels: { boxWidth: 14 } },
      },
      scales: {
        x: { type: 'linear', title: { display: true, text: 'Current density / kA/m²' } },
        ...yScales,
      },
    },
  };
}

function efficiencyChart(ev: CellEvaluation): object {
  const { result } = ev;
  const pts = result.points;
  const x = (p: SweepPoint) => r6(fromSI(p.currentDensity, 'currentDensity', 'kA/m2'));
  const datasets: object[] = [];
  const products = Object.keys(pts[0]?.currentEfficiency.byProduct ?? {}) as ProductId[];
  // Products with the same current efficiency at every point share one line (e.g. Cl₂ and NaOH).
  const groups: ProductId[][] = [];
  for (const id of products) {
    const same = groups.find((g) => pts.every((p) => p.currentEfficiency.byProduct[g[0]] === p.currentEfficiency.byProduct[id]));
    if (same) same.push(id);
    else groups.push([id]);
  }
  const ceColours = ['#1f5f8b', '#8a5aa8', '#2a9d8f', '#6b7785'];
  groups.forEach((g, i) => {
    datasets.push({
      label: `Current efficiency ${g.map((id) => PRODUCT_LABEL[id]).join(', ')} / %`,
      data: pts.map((p) => ({ x: x(p), y: r6((p.currentEfficiency.byProduct[g[0]] ?? 1) * 100) })),
      yAxisID: 'ce',
      borderColor: ceColours[i % ceColours.length],
      backgroundColor: ceColours[i % ceColours.length],
      borderWidth: 1.5,
      pointRadius: 1.5,
      borderDash: [2, 2],
    });
  });
  const energyColours = ['#c4553a', '#d9a21b'];
  ENERGY_DISPLAY[result.chemistry].forEach((e, i) => {
    datasets.push({
      label: `Specific energy ${e.label}, DC / ${e.unit}`,
      data: pts.map((p) => ({ x: x(p), y: r6(fromSI(p.specificEnergy[e.id] ?? 0, 'specificEnergy', e.unit)) })),
      yAxisID: 'w',
      borderColor: energyColours[i % energyColours.length],
      backgroundColor: energyColours[i % energyColours.length],
      borderWidth: 2,
      pointRadius: 1.5,
    });
    if (pts[0]?.specificEnergyAC) {
      datasets.push({
        label: `Specific energy ${e.label}, AC / ${e.unit}`,
        data: pts.map((p) => ({ x: x(p), y: r6(fromSI(p.specificEnergyAC?.[e.id] ?? 0, 'specificEnergy', e.unit)) })),
        yAxisID: 'w',
        borderColor: energyColours[i % energyColours.length],
        backgroundColor: energyColours[i % energyColours.length],
        borderWidth: 1,
        borderDash: [6, 3],
        pointRadius: 0,
      });
    }
  });
  const unit = ENERGY_DISPLAY[result.chemistry][0].unit;
  return sweepLineChart('Current efficiency and specific energy', datasets, {
    ce: { type: 'linear', position: 'left', title: { display: true, text: 'Current efficiency / %' } },
    w: { type: 'linear', position: 'right', grid: { drawOnChartArea: false }, title: { display: true, text: `Specific energy / ${unit}` } },
  });
}

function energyRows(p: SweepPoint, chemistry: ChemistryId, bandPoint: VoltageBandResult['points'][number] | undefined, mainProduct: ProductId | undefined): Row[] {
  const rows: Row[] = [];
  for (const e of ENERGY_DISPLAY[chemistry]) {
    const dc = p.specificEnergy[e.id];
    let note: string | undefined;
    if (bandPoint && mainProduct === e.id) {
      note = `95 % band ${fmt(fromSI(bandPoint.specificEnergy.monteCarlo.lower, 'specificEnergy', e.unit), 4)}–${fmt(fromSI(bandPoint.specificEnergy.monteCarlo.upper, 'specificEnergy', e.unit), 4)} ${e.unit}`;
    }
    rows.push({ label: `Specific energy ${e.label}, DC`, value: dc === undefined ? '—' : fmt(fromSI(dc, 'specificEnergy', e.unit), 4), unit: e.unit, note });
    const ac = p.specificEnergyAC?.[e.id];
    if (ac !== undefined) rows.push({ label: `Specific energy ${e.label}, AC`, value: fmt(fromSI(ac, 'specificEnergy', e.unit), 4), unit: e.unit, note: 'DC ÷ rectifier efficiency' });
  }
  return rows;
}

function designView(ev: CellEvaluation): CellView['design'] {
  const { result, band } = ev;
  const p = result.designPoint;
  if (!p) return null;
  const U = p.cellVoltage;
  const b = p.breakdown;
  const share = (v: number) => percent(v / U, 1);
  const breakdown: BreakdownRow[] = [
    { label: 'Reversible voltage E_rev', mv: mV(b.reversible), share: share(b.reversible) },
    { label: 'Anode overpotential η_a', mv: mV(b.anode), share: share(b.anode) },
    { label: 'Cathode overpotential |η_c|', mv: mV(b.cathode), share: share(b.cathode) },
    { label: 'Mass transport η_mt', mv: mV(b.massTransport), share: share(b.massTransport) },
    { label: 'Membrane j·R_m', mv: mV(b.membrane), share: share(b.membrane) },
    ...b.gaps.map((g, i) => ({ label: `Gap ${i + 1} j·R_gap`, mv: mV(g), share: share(g) })),
    { label: 'Hardware j·R_hw', mv: mV(b.hardware), share: share(b.hardware) },
    { label: 'Cell voltage U', mv: mV(U), share: '100.0' },
  ];
  const bandPoint = band ? band.points[band.points.length - 1] : undefined;
  const rows: Row[] = [
    {
      label: 'Cell voltage U',
      value: fixed(U, 3),
      unit: 'V',
      strong: true,
      note: bandPoint ? `95 % band ${fixed(bandPoint.monteCarlo.lower, 3)}–${fixed(bandPoint.monteCarlo.upper, 3)} V (Monte Carlo)` : undefined,
    },
  ];
  for (const [id, ce] of Object.entries(p.currentEfficiency.byProduct) as Array<[ProductId, number]>) {
    rows.push({ label: `Current efficiency ${PRODUCT_LABEL[id]}`, value: percent(ce, 2), unit: '%' });
  }
  rows.push(...energyRows(p, result.chemistry, bandPoint, band?.mainProduct));
  if (p.voltageEfficiency) {
    rows.push({ label: 'Voltage efficiency (HHV)', value: percent(p.voltageEfficiency.hhv, 1), unit: '%', note: 'U_tn,HHV(25 °C)/U' });
    if (p.voltageEfficiency.lhv !== undefined) rows.push({ label: 'Voltage efficiency (LHV)', value: percent(p.voltageEfficiency.lhv, 1), unit: '%', note: 'U_LHV(25 °C)/U' });
  } else {
    // Chlor-alkali habit: the thermodynamic voltage efficiency E_rev/U.
    rows.push({ label: 'Voltage efficiency', value: percent(thermodynamicVoltageEfficiency(result.reversiblePotential, U), 1), unit: '%', note: 'E_rev/U' });
  }
  rows.push({
    label: 'Heat load',
    value: fmt(fromSI(p.heatLoad, 'power', 'kW'), 3),
    unit: 'kW/m²',
    note: p.heatLoad >= 0 ? '(U − U_tn)·j, to be removed by cooling' : '(U − U_tn)·j < 0: heat must be supplied',
  });
  for (const [id, rate] of Object.entries(p.productionRate) as Array<[ProductId, number]>) {
    rows.push({ label: `Production ${PRODUCT_LABEL[id]}`, value: fmt(fromSI(rate, 'massRate', 'kg/h'), 4), unit: 'kg/(m²·h)' });
  }
  const ce = p.currentEfficiency;
  if (ce.oxygenInChlorinePercent !== undefined) rows.push({ label: 'O₂ in anode chlorine', value: fmt(ce.oxygenInChlorinePercent, 3), unit: 'vol %' });
  if (ce.hydrogenInOxygenPercent !== undefined) rows.push({ label: 'H₂ in anode oxygen', value: fmt(ce.hydrogenInOxygenPercent, 3), unit: 'vol %' });
  return { currentDensity: kAm2(p.currentDensity), breakdown, rows };
}

/** K [V/(A/m²)] → V per kA/m² (the trade's unit). */
function perKA(k: number): number {
  return new Decimal(k).times(UNIT_TABLES.currentDensity['kA/m2']).toNumber();
}

function kFactorView(result: CellSweepResult): Row[] | null {
  const k = result.kFactor;
  if (!k) return null;
  return [
    { label: 'K-factor', value: fmt(perKA(k.value), 4), unit: 'V per kA/m²', note: `± ${fmt(perKA(k.standardError), 2)} (standard error)`, strong: true },
    { label: 'Intercept U0', value: fixed(k.intercept, 3), unit: 'V', note: `± ${fmt(k.interceptStandardError, 2)} V` },
    { label: 'R²', value: fixed(k.rSquared, 5), unit: '' },
    { label: 'Fitted over', value: `${kAm2(k.range[0])}–${kAm2(k.range[1])}`, unit: 'kA/m²', note: `${k.pointsUsed} points` },
  ];
}

function kineticsRows(section: CellSection, result: CellSweepResult, origins: Partial<Record<ElectrodeRole, ElectrodeOrigin>>): KineticsRow[] {
  return (['anode', 'cathode'] as const).map((role) => {
    const k = section[role].kinetics;
    const alpha = k.model === 'tafel' ? k.transferCoefficient : role === 'anode' ? k.anodicTransferCoefficient : k.cathodicTransferCoefficient;
    const origin = origins[role];
    const fit = origin?.fit;
    const u = k.uncertainty;
    const row: KineticsRow = {
      electrode: role === 'anode' ? 'Anode' : 'Cathode',
      origin: origin?.note ?? section.provenance?.[role]?.note ?? '',
      model: k.model === 'tafel' ? 'Tafel' : `Butler–Volmer (α_a ${fmt(k.anodicTransferCoefficient, 3)}, α_c ${fmt(k.cathodicTransferCoefficient, 3)})`,
      alpha: fmt(alpha, 4),
      slope: fmt(fromSI(tafelSlopePerDecade(alpha, section.temperature), 'potential', 'mV'), 4),
      j0Ref: fmt(k.exchangeCurrentDensity, 4),
      refT: k.referenceTemperature === undefined ? 'cell T' : celsius(k.referenceTemperature, 1),
      ea: k.activationEnergy === undefined ? '—' : fmt(fromSI(k.activationEnergy, 'energyPerMol', 'kJ/mol'), 3),
      j0Cell: fmt(result.exchangeCurrentDensities[role], 4),
      seLnJ0: u ? fmt(u.lnExchangeCurrentDensitySE, 3) : '—',
      seAlpha: u ? fmt(u.transferCoefficientSE, 3) : '—',
      correlation: u ? fixed(u.correlation, 3) : '—',
    };
    if (fit) {
      row.fitDetail = `${fit.points} points, |η| ${mV(fit.window[0])}–${mV(fit.window[1])} mV, R² = ${fixed(fit.rSquared, 4)}${fit.status === 'ok' ? '' : ` (${fit.status})`}`;
    }
    return row;
  });
}

function resistanceRows(result: CellSweepResult): Row[] {
  const r = result.resistances;
  const cm2 = (v: number) => fmt(fromSI(v, 'areaResistance', 'ohm*cm2'), 4);
  return [
    { label: 'Membrane', value: cm2(r.membrane), unit: 'Ω·cm²' },
    ...r.gaps.map((g, i) => ({ label: `Gap ${i + 1}`, value: cm2(g), unit: 'Ω·cm²' })),
    { label: 'Hardware', value: cm2(r.hardware), unit: 'Ω·cm²' },
    { label: 'Total ohmic', value: cm2(r.total), unit: 'Ω·cm²', strong: true },
  ];
}

function sweepTable(ev: CellEvaluation): CellView['sweep'] {
  const { result, band } = ev;
  const energy = ENERGY_DISPLAY[result.chemistry][0];
  const products = Object.keys(result.points[0]?.currentEfficiency.byProduct ?? {}) as ProductId[];
  const mainCe: ProductId = result.chemistry === 'chlor-alkali' ? 'Cl2' : 'H2';
  const headers = [
    'j / kA/m²',
    'U / V',
    ...(band ? ['95 % band / V'] : []),
    'η_a / mV',
    '|η_c| / mV',
    'η_mt / mV',
    'Membrane / mV',
    'Gaps / mV',
    'Hardware / mV',
    `CE ${PRODUCT_LABEL[products.includes(mainCe) ? mainCe : products[0] ?? mainCe]} / %`,
    `w ${energy.label} DC / ${energy.unit}`,
    'Heat / kW/m²',
  ];
  const rows = result.points.map((p, i) => {
    const b = p.breakdown;
    const bp = band?.points[i];
    return [
      kAm2(p.currentDensity),
      fixed(p.cellVoltage, 3),
      ...(band ? [bp ? `${fixed(bp.monteCarlo.lower, 3)}–${fixed(bp.monteCarlo.upper, 3)}` : '—'] : []),
      mV(b.anode),
      mV(b.cathode),
      mV(b.massTransport),
      mV(b.membrane),
      mV(b.gaps.reduce((s, g) => s + g, 0)),
      mV(b.hardware),
      percent(p.currentEfficiency.byProduct[mainCe] ?? p.currentEfficiency.byProduct[products[0]], 2),
      fmt(fromSI(p.specificEnergy[energy.id] ?? Number.NaN, 'specificEnergy', energy.unit), 4),
      fmt(fromSI(p.heatLoad, 'power', 'kW'), 3),
    ];
  });
  return { headers, rows };
}

/** First sentence of a caution text (the panel stays short; the Safety page has the rest). */
function firstSentence(text: string): string {
  const m = /^(.+?[.!?])(\s|$)/.exec(text);
  return m ? m[1] : text;
}

const CAUTION_TOPICS: Record<ChemistryId, Caution['topic'][]> = {
  'chlor-alkali': ['chlorine', 'hydrogen-chlorine', 'hydrogen', 'caustic', 'dc-current-magnetic-field'],
  'alkaline-water': ['hydrogen', 'caustic', 'dc-current-magnetic-field', 'pressure'],
  'pem-water': ['hydrogen', 'dc-current-magnetic-field', 'pressure'],
};

export function cautionsFor(chemistry: ChemistryId): Array<{ title: string; text: string }> {
  return CAUTION_TOPICS[chemistry]
    .map((topic) => CAUTIONS.find((c) => c.topic === topic))
    .filter((c): c is Caution => c !== undefined)
    .map((c) => ({ title: c.title, text: firstSentence(c.text) }));
}

/** The page's view of an evaluated cell. */
export function cellView(
  section: CellSection,
  ev: CellEvaluation,
  origins: Partial<Record<ElectrodeRole, ElectrodeOrigin>>,
  extraWarnings: string[],
): CellView {
  const { result, band } = ev;
  const d = result.designPoint;
  const summary: Row[] = [];
  if (d) {
    summary.push({ label: `Cell voltage at ${kAm2(d.currentDensity)} kA/m²`, value: fixed(d.cellVoltage, 3), unit: 'V', strong: true });
    const e = ENERGY_DISPLAY[result.chemistry][0];
    const w = d.specificEnergy[e.id];
    if (w !== undefined) summary.push({ label: `Specific energy ${e.label} (DC)`, value: fmt(fromSI(w, 'specificEnergy', e.unit), 4), unit: e.unit });
  }
  if (result.kFactor) {
    summary.push({ label: 'K-factor', value: fmt(perKA(result.kFactor.value), 3), unit: 'V per kA/m²' });
    summary.push({ label: 'U0', value: fixed(result.kFactor.intercept, 3), unit: 'V' });
  }
  summary.push({
    label: 'Reversible voltage E_rev',
    value: fixed(result.reversiblePotential, 3),
    unit: 'V',
    note: result.reversiblePotentialSource === 'override' ? 'given' : 'from thermodynamics',
  });
  summary.push({ label: 'Thermoneutral voltage U_tn', value: fixed(result.thermoneutralVoltage, 3), unit: 'V' });

  const view: CellView = {
    chemistry: result.chemistry,
    summary,
    design: designView(ev),
    kFactor: kFactorView(result),
    kinetics: kineticsRows(section, result, origins),
    resistances: resistanceRows(result),
    charts: { voltage: voltageChart(ev), efficiency: efficiencyChart(ev) },
    sweep: sweepTable(ev),
    warnings: [...new Set([...extraWarnings, ...result.warnings, ...(band?.warnings ?? [])])],
    cautions: cautionsFor(result.chemistry),
    disclaimer: SAFETY_DISCLAIMER,
  };
  if (band) view.bandMethod = band.method;
  if (ev.bandNote) view.bandNote = ev.bandNote;
  return view;
}

// ---------------------------------------------------------------------------------------------
// CSV

/** Keep text cells from being read as spreadsheet formulas (CSV injection). */
function csvText(s: string): string {
  return /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
}

/** A number for the CSV: 10 significant digits, plain decimal. */
function csvNumber(v: number | undefined): string {
  if (v === undefined || !Number.isFinite(v)) return '';
  return new Decimal(v).toSignificantDigits(10).toString();
}

/**
 * The sweep as CSV (RFC 4180, CRLF): one row per current density with the voltage breakdown,
 * current efficiency per product, DC (and AC) specific energy, heat load and the band. Units
 * in the header names; a first comment row names the study.
 */
export function sweepCsv(ev: CellEvaluation, studyName: string): string {
  const { result, band } = ev;
  const points = result.points;
  const gapCount = points[0]?.breakdown.gaps.length ?? 0;
  const products = Object.keys(points[0]?.currentEfficiency.byProduct ?? {}) as ProductId[];
  const energy = ENERGY_DISPLAY[result.chemistry];
  const hasAC = points[0]?.specificEnergyAC !== undefined;
  const header = [
    'current density [kA/m2]',
    'cell voltage [V]',
    ...(band ? ['band 2.5% [V]', 'band 97.5% [V]'] : []),
    'reversible [V]',
    'anode overpotential [V]',
    'cathode overpotential magnitude [V]',
    'mass transport [V]',
    'membrane [V]',
    ...Array.from({ length: gapCount }, (_, i) => `gap ${i + 1} [V]`),
    'hardware [V]',
    ...products.map((id) => `current efficiency ${id} [-]`),
    ...energy.map((e) => `specific energy ${e.id} DC [${e.unit}]`),
    ...(hasAC ? energy.map((e) => `specific energy ${e.id} AC [${e.unit}]`) : []),
    'heat load [kW/m2]',
  ];
  const rows = points.map((p, i) => {
    const b = p.breakdown;
    const bp = band?.points[i];
    return [
      csvNumber(fromSI(p.currentDensity, 'currentDensity', 'kA/m2')),
      csvNumber(p.cellVoltage),
      ...(band ? [csvNumber(bp?.monteCarlo.lower), csvNumber(bp?.monteCarlo.upper)] : []),
      csvNumber(b.reversible),
      csvNumber(b.anode),
      csvNumber(b.cathode),
      csvNumber(b.massTransport),
      csvNumber(b.membrane),
      ...b.gaps.map(csvNumber),
      csvNumber(b.hardware),
      ...products.map((id) => csvNumber(p.currentEfficiency.byProduct[id])),
      ...energy.map((e) => csvNumber(p.specificEnergy[e.id] === undefined ? undefined : fromSI(p.specificEnergy[e.id] as number, 'specificEnergy', e.unit))),
      ...(hasAC ? energy.map((e) => csvNumber(p.specificEnergyAC?.[e.id] === undefined ? undefined : fromSI(p.specificEnergyAC[e.id] as number, 'specificEnergy', e.unit))) : []),
      csvNumber(fromSI(p.heatLoad, 'power', 'kW')),
    ];
  });
  const comment = csvText(`# Cell sweep: ${studyName}; chemistry ${result.chemistry}; E_rev ${csvNumber(result.reversiblePotential)} V; U_tn ${csvNumber(result.thermoneutralVoltage)} V`);
  return `${Papa.unparse([[comment]], { newline: '\r\n' })}\r\n${Papa.unparse([header, ...rows], { newline: '\r\n' })}\r\n`;
}
