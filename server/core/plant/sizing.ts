/**
 * Stack and rectifier sizing from a production target (Faraday's law).
 *
 *   total current       I = ṁ·z·F/(CE·M)                        [A]
 *   active area          A = I/j_design                           [m²]
 *   cells                N = ceil(A/A_cell)
 *   operating j          j_op with N·A_cell·j_op·CE(j_op) = ṁ·z·F/M (meets the target exactly)
 *   cells in series      n_max = floor(U_rect,max / U(j_design)) per electrolyser
 *   electrolysers        E = ceil(N/n_max), cells shared as evenly as possible
 *   DC power             P = N·U·I_cell;  AC power = P/η_rectifier
 *   heat load            Q̇ = (U − U_tn)·N·I_cell  (> 0: cooling duty)
 *
 * Assumptions (also written into the design basis): one rectifier per electrolyser; all cells of
 * an electrolyser in electrical series (bipolar) carrying the same current; the rectifier is
 * checked at the design current density (the operating j is never above it); shunt currents
 * not included here (see shunt.ts); gas volumes at 0 °C and 101.325 kPa as ideal gases; the heat
 * load charges all the current at (U − U_tn) (the enthalpy of side reactions is not separated),
 * with U_tn at 25 °C unless a value at the operating temperature is passed in.
 * Source: Faraday's law; sizing steps common practice (domain primer §8).
 */
import { FARADAY } from '../constants.js';
import { InputError } from '../errors.js';
import { fromSI } from '../units.js';
import { sci, sig, percent } from './format.js';
import { findRootBracketed } from './optimize1d.js';
import {
  type CellPerformance,
  type CellPoint,
  cellPerformanceIssues,
  evaluateCell,
  requireFraction,
  requirePositive,
  throwIfIssues,
} from './performance.js';
import {
  CHEMISTRY_SPECS,
  type FeedId,
  NORMAL_MOLAR_VOLUME,
  PRODUCT_SPECS,
  type PlantChemistry,
  type ProductId,
  SECONDS_PER_HOUR,
} from './products.js';

export interface RectifierSpec {
  /** Largest DC output voltage, V. */
  maxVoltage: number;
  /** Largest DC output current, A. */
  maxCurrent: number;
  /** AC→DC conversion efficiency (rectifier and transformer), 0–1. */
  efficiency: number;
}

export interface SizingInput {
  chemistry: PlantChemistry;
  /** Production target of one product, kg/s (NaOH as 100 %). */
  target: { product: ProductId; massRate: number };
  /** Design current density, A/m². */
  designCurrentDensity: number;
  /** Active (membrane) area of one cell, m². */
  activeAreaPerCell: number;
  rectifier: RectifierSpec;
  /** The cell; its current efficiency is that of the target product. */
  cell: CellPerformance;
  /** U_tn override, V. Default: the model's value, else the chemistry's 25 °C value. */
  thermoneutralVoltage?: number;
  /** Current efficiency of co-products (0–1); each defaults to the target's. */
  coProductCurrentEfficiency?: Partial<Record<ProductId, number>>;
}

export interface ProductFlow {
  id: ProductId;
  name: string;
  isTarget: boolean;
  currentEfficiency: number;
  /** kg/s. */
  massRate: number;
  /** mol/s. */
  molarRate: number;
  /** Gas volume rate at 0 °C, 101.325 kPa (ideal gas), m³/s; null for non-gases. */
  normalVolumeRate: number | null;
  /** The same in Nm³/h; null for non-gases. */
  normalCubicMetresPerHour: number | null;
}

export interface FeedFlow {
  id: FeedId;
  name: string;
  /** kg/s. */
  massRate: number;
  /** mol/s. */
  molarRate: number;
  note: string;
}

export interface SizingResult {
  chemistry: PlantChemistry;
  target: { product: ProductId; massRate: number };
  /** The plant as first sized at the design current density. */
  design: {
    currentDensity: number;
    cellVoltage: number;
    currentEfficiency: number;
    /** Total current needed at the design CE, A. */
    totalCurrent: number;
    /** I/j_design, m². */
    activeArea: number;
    /** Active area over cell area before rounding up. */
    cellsExact: number;
  };
  /** The plant as built (whole cells), meeting the target exactly. */
  operating: {
    currentDensity: number;
    cellVoltage: number;
    currentEfficiency: number;
    /** Current through each cell (= each electrolyser), A. */
    cellCurrent: number;
    /** Sum of the cell currents (charge passed per second), A. */
    totalCurrent: number;
    /** Installed active area, m². */
    activeArea: number;
  };
  cells: {
    total: number;
    activeAreaPerCell: number;
    /** Largest number of cells in series that the rectifier voltage allows. */
    maxInSeries: number;
  };
  electrolysers: {
    count: number;
    /** Cells in each electrolyser (shared as evenly as possible). */
    cellsEach: number[];
    /** Electrolyser (rectifier) current at the operating point, A. */
    current: number;
    /** Voltage of the largest electrolyser at the operating point, V. */
    voltage: number;
    /** Same at the design current density, V. */
    voltageAtDesign: number;
    /** Fraction of the rectifier voltage used at design (largest electrolyser). */
    rectifierVoltageUse: number;
    /** Fraction of the rectifier current used at design. */
    rectifierCurrentUse: number;
  };
  power: {
    /** W. */
    dc: number;
    /** W. */
    ac: number;
    /** Conversion loss AC − DC, W. */
    conversionLoss: number;
    /** Heat to remove (> 0) or supply (< 0), W. */
    heatLoad: number;
    thermoneutralVoltage: number;
    thermoneutralSource: string;
    heatLoadBasis: 'cell model' | '(U − U_tn)·I';
  };
  /** Energy per kg of the target product, J/kg. */
  specificEnergy: { dc: number; ac: number };
  products: ProductFlow[];
  feeds: FeedFlow[];
  /** Plain-text lines an engineer can paste into a design note. */
  designBasis: string[];
  warnings: string[];
}

/**
 * Largest cell count a sizing lays out (1 000 000, our choice, the same bound as the web
 * layer's front-door check): the largest chlor-alkali and water-electrolysis plants have some
 * thousands to tens of thousands of cells; more than a million means a unit slip (kg/s taken
 * as t/d, cm² as m², A/cm² as A/m²), and laying out such a plant would exhaust memory.
 */
export const MAX_PLANT_CELLS = 1_000_000;
/**
 * Smallest target, as a fraction of what one cell makes at the design point (1e-6, our choice,
 * the same bound as the web layer's): below it the "plant" is one cell idling at under a
 * millionth of its design current density, which no sizing question asks.
 */
export const MIN_CELL_FRACTION = 1e-6;

/** Relative slack when a cell count is an integer up to rounding (1e-9, our choice). */
const WHOLE_COUNT_SLACK = 1e-9;
/** Warn when the operating current density falls this far below design (10 %, our choice). */
const OPERATING_SHORTFALL_WARNING = 0.1;

/** ceil(x), treating x within WHOLE_COUNT_SLACK of an integer as that integer. */
function ceilWhole(x: number): number {
  const r = Math.round(x);
  if (Math.abs(x - r) <= WHOLE_COUNT_SLACK * Math.max(1, Math.abs(x))) return r;
  return Math.ceil(x);
}

/** floor(x), treating x within WHOLE_COUNT_SLACK of an integer as that integer. */
function floorWhole(x: number): number {
  const r = Math.round(x);
  if (Math.abs(x - r) <= WHOLE_COUNT_SLACK * Math.max(1, Math.abs(x))) return r;
  return Math.floor(x);
}

function validate(input: SizingInput): void {
  const issues: { path: string; message: string }[] = [];
  const chem = CHEMISTRY_SPECS[input.chemistry];
  if (!chem) {
    issues.push({ path: 'chemistry', message: "must be 'chlor-alkali' or 'water'" });
  } else if (!input.target || !chem.products.includes(input.target.product)) {
    issues.push({ path: 'target.product', message: `must be one of ${chem.products.join(', ')} for ${input.chemistry}` });
  }
  requirePositive(issues, 'target.massRate', input.target?.massRate, 'kg/s');
  requirePositive(issues, 'designCurrentDensity', input.designCurrentDensity, 'A/m²');
  requirePositive(issues, 'activeAreaPerCell', input.activeAreaPerCell, 'm²');
  requirePositive(issues, 'rectifier.maxVoltage', input.rectifier?.maxVoltage, 'V');
  requirePositive(issues, 'rectifier.maxCurrent', input.rectifier?.maxCurrent, 'A');
  requireFraction(issues, 'rectifier.efficiency', input.rectifier?.efficiency);
  issues.push(...cellPerformanceIssues(input.cell, 'cell'));
  if (input.thermoneutralVoltage !== undefined) requirePositive(issues, 'thermoneutralVoltage', input.thermoneutralVoltage, 'V');
  for (const [id, ce] of Object.entries(input.coProductCurrentEfficiency ?? {})) {
    if (chem && !chem.products.includes(id as ProductId)) {
      issues.push({ path: `coProductCurrentEfficiency.${id}`, message: `is not a product of ${input.chemistry}` });
    }
    requireFraction(issues, `coProductCurrentEfficiency.${id}`, ce);
  }
  throwIfIssues('plant sizing input is not valid', issues);
}

/**
 * Refuse a plant whose cell count N = ṁ·z·F/(CE·M·j·A_cell) (Faraday's law) is not finite,
 * above MAX_PLANT_CELLS or below MIN_CELL_FRACTION of one cell: InputError on the production
 * target (`target.massRate`), naming the count and the likely unit slip. A real plant has at
 * least one cell, so a count between MIN_CELL_FRACTION and 1 is sized as one cell.
 */
function checkPlantScale(input: SizingInput, cellsExact: number): void {
  const at = `cells of ${sig(input.activeAreaPerCell)} m² at ${sig(input.designCurrentDensity)} A/m²`;
  if (!(cellsExact <= MAX_PLANT_CELLS)) {
    const count = Number.isFinite(cellsExact) ? sci(cellsExact, 2) : 'more than 1e308';
    throw new InputError(
      'target.massRate',
      `would need ${count} ${at}, above the ${sci(MAX_PLANT_CELLS)} cells a sizing lays out; check the units of the production rate (kg/s), design current density (A/m²) and cell area (m²)`,
    );
  }
  if (!(cellsExact >= MIN_CELL_FRACTION)) {
    throw new InputError(
      'target.massRate',
      `would need only ${sci(cellsExact, 2)} of one cell (${at}), below ${sci(MIN_CELL_FRACTION)} of a cell; check the units of the production rate (kg/s), design current density (A/m²) and cell area (m²)`,
    );
  }
}

/**
 * Operating current density that meets the target exactly with `cells` whole cells:
 * solve N·A_cell·j·CE(j) = ṁ·z·F/M for j ≤ j_design. With constant CE this is
 * j = I/(N·A_cell) in closed form; with a cell model, a bracketed root search stepping down
 * from j_design (the root nearest the design point is taken).
 */
function operatingCurrentDensity(input: SizingInput, cells: number, chargeRate: number, design: CellPoint): CellPoint {
  const area = cells * input.activeAreaPerCell;
  if (input.cell.kind === 'linear') {
    return evaluateCell(input.cell, chargeRate / (design.currentEfficiency * area), 'cell');
  }
  const g = (j: number) => area * j * evaluateCell(input.cell, j, 'cell').currentEfficiency - chargeRate;
  const jHigh = input.designCurrentDensity;
  if (g(jHigh) <= 0) return design; // exact fit at design (cells not rounded up)
  let jLow = jHigh;
  // Bracket by 10 % steps down from the design point (at most 200 steps, to 0.9^200 ≈ 7e-10 of
  // j_design); root to 1e-12 relative. Project choices.
  for (let k = 0; k < 200 && g(jLow) > 0; k++) jLow *= 0.9;
  const root = findRootBracketed(g, jLow, jLow / 0.9 > jHigh ? jHigh : jLow / 0.9, { rtol: 1e-12 });
  if (root.status !== 'converged') {
    throw new InputError('cell', `no operating current density meets the target with ${cells} cells (${root.message})`);
  }
  return evaluateCell(input.cell, root.x, 'cell');
}

/**
 * Size the cell room and rectifiers for a production target. See the module note for the
 * formulas. Units: SI in, SI out (A, V, W, m², kg/s, mol/s, J/kg; gas volumes also Nm³/h).
 * Throws InputError (with paths) for a non-positive rate, CE outside (0, 1], a target that
 * needs more than MAX_PLANT_CELLS cells or less than MIN_CELL_FRACTION of one (at
 * `target.massRate`; a fraction of a cell above that is sized as one whole cell), or a
 * rectifier that cannot take even one cell at the design point (current or voltage).
 */
export function sizePlant(input: SizingInput): SizingResult {
  validate(input);
  const chem = CHEMISTRY_SPECS[input.chemistry];
  const target = PRODUCT_SPECS[input.target.product];
  const F = FARADAY.value;
  const warnings: string[] = [];

  // Charge per second that the target needs at 100 % CE: ṁ·z·F/M [A].
  const chargeRate = (input.target.massRate * target.electronsPerMolecule * F) / target.molarMass;
  const design = evaluateCell(input.cell, input.designCurrentDensity, 'cell');
  const designCurrent = chargeRate / design.currentEfficiency;
  const designArea = designCurrent / input.designCurrentDensity;
  const cellsExact = designArea / input.activeAreaPerCell;
  checkPlantScale(input, cellsExact);
  const cells = Math.max(1, ceilWhole(cellsExact));

  // Rectifier limits at the design point.
  const designCellCurrent = input.activeAreaPerCell * input.designCurrentDensity;
  if (designCellCurrent > input.rectifier.maxCurrent) {
    throw new InputError(
      'rectifier.maxCurrent',
      `rectifier too small for one cell: a cell of ${sig(input.activeAreaPerCell)} m² at ${sig(input.designCurrentDensity)} A/m² takes ${sig(designCellCurrent)} A, above the rectifier's ${sig(input.rectifier.maxCurrent)} A`,
    );
  }
  const maxInSeries = floorWhole(input.rectifier.maxVoltage / design.cellVoltage);
  if (maxInSeries < 1) {
    throw new InputError(
      'rectifier.maxVoltage',
      `rectifier too small for one cell: the cell needs ${sig(design.cellVoltage)} V at the design point, above the rectifier's ${sig(input.rectifier.maxVoltage)} V`,
    );
  }
  const electrolyserCount = Math.ceil(cells / maxInSeries);
  const base = Math.floor(cells / electrolyserCount);
  const extra = cells - base * electrolyserCount;
  const cellsEach = Array.from({ length: electrolyserCount }, (_, k) => (k < extra ? base + 1 : base));
  const largest = cellsEach[0];

  // Operating point with whole cells.
  const op = operatingCurrentDensity(input, cells, chargeRate, design);
  const installedArea = cells * input.activeAreaPerCell;
  const cellCurrent = input.activeAreaPerCell * op.currentDensity;
  const totalCurrent = cells * cellCurrent;

  // Power and heat.
  const dc = totalCurrent * op.cellVoltage;
  const ac = dc / input.rectifier.efficiency;
  let thermoneutralVoltage: number;
  let thermoneutralSource: string;
  if (input.thermoneutralVoltage !== undefined) {
    thermoneutralVoltage = input.thermoneutralVoltage;
    thermoneutralSource = 'given with the input';
  } else if (input.cell.kind === 'model') {
    thermoneutralVoltage = input.cell.thermoneutralVoltage;
    thermoneutralSource = 'from the cell model';
  } else {
    thermoneutralVoltage = chem.thermoneutralVoltage.value;
    thermoneutralSource = chem.thermoneutralVoltage.source;
  }
  const heatFromModel = op.heatLoadPerArea !== undefined;
  const heatLoad = heatFromModel ? (op.heatLoadPerArea as number) * installedArea : (op.cellVoltage - thermoneutralVoltage) * totalCurrent;

  // Products and feeds.
  const products: ProductFlow[] = chem.products.map((id) => {
    const p = PRODUCT_SPECS[id];
    const isTarget = id === target.id;
    const ce = isTarget ? op.currentEfficiency : input.coProductCurrentEfficiency?.[id] ?? op.currentEfficiency;
    const molarRate = (ce * totalCurrent) / (p.electronsPerMolecule * F);
    const normalVolumeRate = p.gas ? molarRate * NORMAL_MOLAR_VOLUME : null;
    return {
      id,
      name: p.name,
      isTarget,
      currentEfficiency: ce,
      massRate: molarRate * p.molarMass,
      molarRate,
      normalVolumeRate,
      normalCubicMetresPerHour: normalVolumeRate === null ? null : normalVolumeRate * SECONDS_PER_HOUR,
    };
  });
  const feeds: FeedFlow[] = chem.feeds.map((f) => {
    const basis = products.find((p) => p.id === f.basis) as ProductFlow;
    const molarRate = basis.molarRate * f.molesPerMoleOfBasis;
    return { id: f.id, name: f.name, massRate: molarRate * f.molarMass, molarRate, note: f.note };
  });
  const targetFlow = products.find((p) => p.isTarget) as ProductFlow;
  const specificDc = dc / targetFlow.massRate;
  const specificAc = ac / targetFlow.massRate;

  const voltage = largest * op.cellVoltage;
  const voltageAtDesign = largest * design.cellVoltage;
  const electrolysers = {
    count: electrolyserCount,
    cellsEach,
    current: cellCurrent,
    voltage,
    voltageAtDesign,
    rectifierVoltageUse: voltageAtDesign / input.rectifier.maxVoltage,
    rectifierCurrentUse: designCellCurrent / input.rectifier.maxCurrent,
  };

  // Warnings.
  const shortfall = 1 - op.currentDensity / input.designCurrentDensity;
  if (shortfall > OPERATING_SHORTFALL_WARNING) {
    warnings.push(
      `Rounding up to ${cells} whole cell${cells === 1 ? '' : 's'} puts the operating current density ${percent(shortfall, 3)} below design (${sig(op.currentDensity)} vs ${sig(input.designCurrentDensity)} A/m²); consider a different cell area or design current density.`,
    );
  }
  if (heatLoad < 0) {
    warnings.push(
      `The cell voltage ${sig(op.cellVoltage)} V is below the thermoneutral voltage ${sig(thermoneutralVoltage)} V: the cells absorb heat, so the electrolyte must be heated, not cooled.`,
    );
  }
  if (extra !== 0) {
    warnings.push(
      `The ${cells} cells do not divide evenly among ${electrolyserCount} electrolysers: ${extra} have ${base + 1} cells and ${electrolyserCount - extra} have ${base}; voltages differ accordingly.`,
    );
  }
  // Below 90 % CE the data are questioned (project choice; industrial chlor-alkali runs at
  // 95–97 %, check-values §9a, from memory).
  if (op.currentEfficiency < 0.9) {
    warnings.push(`Current efficiency ${percent(op.currentEfficiency, 3)} at the operating point is low for an industrial cell; check the data.`);
  }

  const designBasis = buildDesignBasis({
    input,
    chemName: chem.name,
    targetName: target.name,
    design,
    op,
    cells,
    cellsExact,
    maxInSeries,
    electrolysers,
    dc,
    ac,
    heatLoad,
    heatFromModel,
    thermoneutralVoltage,
    thermoneutralSource,
    specificDc,
    specificAc,
    products,
    feeds,
  });

  return {
    chemistry: input.chemistry,
    target: { ...input.target },
    design: {
      currentDensity: input.designCurrentDensity,
      cellVoltage: design.cellVoltage,
      currentEfficiency: design.currentEfficiency,
      totalCurrent: designCurrent,
      activeArea: designArea,
      cellsExact,
    },
    operating: {
      currentDensity: op.currentDensity,
      cellVoltage: op.cellVoltage,
      currentEfficiency: op.currentEfficiency,
      cellCurrent,
      totalCurrent,
      activeArea: installedArea,
    },
    cells: { total: cells, activeAreaPerCell: input.activeAreaPerCell, maxInSeries },
    electrolysers,
    power: {
      dc,
      ac,
      conversionLoss: ac - dc,
      heatLoad,
      thermoneutralVoltage,
      thermoneutralSource,
      heatLoadBasis: heatFromModel ? 'cell model' : '(U − U_tn)·I',
    },
    specificEnergy: { dc: specificDc, ac: specificAc },
    products,
    feeds,
    designBasis,
    warnings,
  };
}

interface BasisParts {
  input: SizingInput;
  chemName: string;
  targetName: string;
  design: CellPoint;
  op: CellPoint;
  cells: number;
  cellsExact: number;
  maxInSeries: number;
  electrolysers: SizingResult['electrolysers'];
  dc: number;
  ac: number;
  heatLoad: number;
  heatFromModel: boolean;
  thermoneutralVoltage: number;
  thermoneutralSource: string;
  specificDc: number;
  specificAc: number;
  products: ProductFlow[];
  feeds: FeedFlow[];
}

/** The plain-text design basis (engineer's units: t/d, kA/m², kA, MW, kWh/t, Nm³/h). */
function buildDesignBasis(b: BasisParts): string[] {
  const tPerDay = (kgPerS: number) => sig(fromSI(kgPerS, 'massRate', 't/day'), 5);
  const kAm2 = (j: number) => sig(fromSI(j, 'currentDensity', 'kA/m2'), 4);
  const unitsNote = b.input.chemistry === 'water' ? 'kWh/kg' : 'kWh/t';
  const specific = (w: number) => sig(fromSI(w, 'specificEnergy', unitsNote), 5);
  const perElectrolyser = [...new Set(b.electrolysers.cellsEach)].join(' or ');
  const lines = [
    `Design basis — ${b.chemName}. Design-study estimate; local codes, standards and licensed engineering practice govern.`,
    `Target: ${tPerDay(b.input.target.massRate)} t/d ${b.targetName} (${sig(b.input.target.massRate, 5)} kg/s).`,
    `Cell: ${sig(b.input.activeAreaPerCell)} m² active area; design ${kAm2(b.design.currentDensity)} kA/m² at ${sig(b.design.cellVoltage)} V, current efficiency ${percent(b.design.currentEfficiency)}.`,
    `Cells: ${b.cells} (${sig(b.cellsExact, 6)} needed at design), in ${b.electrolysers.count} electrolyser(s) of ${perElectrolyser} cells in series (rectifier allows up to ${b.maxInSeries}).`,
    `Operating point meeting the target exactly: ${kAm2(b.op.currentDensity)} kA/m², ${sig(b.op.cellVoltage)} V per cell, current efficiency ${percent(b.op.currentEfficiency)}.`,
    `Electrolyser: ${sig(b.electrolysers.current / 1e3)} kA at ${sig(b.electrolysers.voltage)} V (design point ${sig(b.electrolysers.voltageAtDesign)} V; ${percent(b.electrolysers.rectifierVoltageUse, 3)} of rectifier voltage, ${percent(b.electrolysers.rectifierCurrentUse, 3)} of rectifier current).`,
    `Power: ${sig(b.dc / 1e6)} MW DC, ${sig(b.ac / 1e6)} MW AC at ${percent(b.input.rectifier.efficiency, 3)} rectifier efficiency.`,
    `Specific energy of the ${b.targetName}: ${specific(b.specificDc)} ${unitsNote} DC, ${specific(b.specificAc)} ${unitsNote} AC.`,
    b.heatFromModel
      ? `Heat load: ${sig(b.heatLoad / 1e6)} MW (from the cell model; positive = cooling duty).`
      : `Heat load: ${sig(b.heatLoad / 1e6)} MW = (U − U_tn)·I with U_tn = ${sig(b.thermoneutralVoltage)} V [${b.thermoneutralSource}]; positive = cooling duty.`,
  ];
  for (const p of b.products) {
    const gas = p.normalCubicMetresPerHour === null ? '' : `, ${sig(p.normalCubicMetresPerHour, 5)} Nm³/h`;
    lines.push(`Product ${p.name}: ${tPerDay(p.massRate)} t/d${gas} at ${percent(p.currentEfficiency)} current efficiency.`);
  }
  for (const f of b.feeds) {
    lines.push(`Consumption, ${f.name}: ${tPerDay(f.massRate)} t/d (${f.note}).`);
  }
  lines.push(
    'Basis: Faraday’s law with IUPAC abridged atomic weights; one rectifier per electrolyser; Nm³ at 0 °C and 101.325 kPa, ideal gas; shunt-current losses not included.',
  );
  return lines;
}
