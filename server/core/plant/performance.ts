/**
 * How a plant calculation gets the cell: from plant data (the linear U = U0 + K·j summary the
 * chlor-alkali trade calls the K-factor line) or from a cell model (any function of j).
 */
import { InputError, PhysicsError } from '../errors.js';

/** How a plant calculation gets the cell: from plant data (linear) or from a cell model. */
export type CellPerformance =
  | {
      kind: 'linear';
      /** U0, V: intercept of the linear cell-voltage line. */
      intercept: number;
      /** K, V per A/m² (= Ω·m²): slope of the line (K-factor in SI). */
      slope: number;
      /** Current efficiency of the product considered, 0–1, taken constant. */
      currentEfficiency: number;
    }
  | {
      kind: 'model';
      /** Cell at current density j [A/m²]: voltage [V], current efficiency [0–1], optional heat load [W/m²]. */
      evaluate: (currentDensity: number) => { cellVoltage: number; currentEfficiency: number; heatLoadPerArea?: number };
      /** U_tn, V, of the model's reaction at its temperature. */
      thermoneutralVoltage: number;
    };

/** The cell at one current density. */
export interface CellPoint {
  /** A/m². */
  currentDensity: number;
  /** V. */
  cellVoltage: number;
  /** 0–1. */
  currentEfficiency: number;
  /** W/m², when the cell model gives it. */
  heatLoadPerArea?: number;
}

/**
 * Check a CellPerformance's own numbers (linear kind). Returns a list of issues (path, message);
 * empty when valid. Model kinds are checked when evaluated.
 */
export function cellPerformanceIssues(cell: CellPerformance, path: string): { path: string; message: string }[] {
  const issues: { path: string; message: string }[] = [];
  if (cell.kind === 'linear') {
    if (!Number.isFinite(cell.intercept) || cell.intercept <= 0) issues.push({ path: `${path}.intercept`, message: 'must be a finite voltage > 0 V' });
    if (!Number.isFinite(cell.slope) || cell.slope < 0) issues.push({ path: `${path}.slope`, message: 'must be a finite slope ≥ 0 V per A/m²' });
    if (!Number.isFinite(cell.currentEfficiency) || cell.currentEfficiency <= 0 || cell.currentEfficiency > 1) {
      issues.push({ path: `${path}.currentEfficiency`, message: 'must be in (0, 1]' });
    }
  } else if (cell.kind === 'model') {
    if (typeof cell.evaluate !== 'function') issues.push({ path: `${path}.evaluate`, message: 'must be a function of current density' });
    if (!Number.isFinite(cell.thermoneutralVoltage) || cell.thermoneutralVoltage <= 0) {
      issues.push({ path: `${path}.thermoneutralVoltage`, message: 'must be a finite voltage > 0 V' });
    }
  } else {
    issues.push({ path: `${path}.kind`, message: "must be 'linear' or 'model'" });
  }
  return issues;
}

/**
 * Evaluate the cell at current density j [A/m²].
 * Linear: U = U0 + K·j, CE constant. Model: the model's own answer, checked for finite,
 * positive voltage and CE in (0, 1]; a bad answer is a PhysicsError at `path`, never NaN.
 */
export function evaluateCell(cell: CellPerformance, currentDensity: number, path = 'cell'): CellPoint {
  if (cell.kind === 'linear') {
    return {
      currentDensity,
      cellVoltage: cell.intercept + cell.slope * currentDensity,
      currentEfficiency: cell.currentEfficiency,
    };
  }
  const out = cell.evaluate(currentDensity);
  if (!out || !Number.isFinite(out.cellVoltage) || out.cellVoltage <= 0) {
    throw new PhysicsError(path, `cell model gave no finite positive voltage at ${currentDensity} A/m²`);
  }
  if (!Number.isFinite(out.currentEfficiency) || out.currentEfficiency <= 0 || out.currentEfficiency > 1) {
    throw new PhysicsError(path, `cell model gave a current efficiency outside (0, 1] at ${currentDensity} A/m²`);
  }
  if (out.heatLoadPerArea !== undefined && !Number.isFinite(out.heatLoadPerArea)) {
    throw new PhysicsError(path, `cell model gave a non-finite heat load at ${currentDensity} A/m²`);
  }
  const point: CellPoint = { currentDensity, cellVoltage: out.cellVoltage, currentEfficiency: out.currentEfficiency };
  if (out.heatLoadPerArea !== undefined) point.heatLoadPerArea = out.heatLoadPerArea;
  return point;
}

/** Throw one InputError listing every issue, or return quietly when there are none. */
export function throwIfIssues(message: string, issues: { path: string; message: string }[]): void {
  if (issues.length > 0) throw InputError.many(message, issues);
}

/** Push an issue when `value` is not a finite number > 0. */
export function requirePositive(issues: { path: string; message: string }[], path: string, value: unknown, unit: string): void {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
    issues.push({ path, message: `must be a finite number > 0 ${unit}`.trim() });
  }
}

/** Push an issue when `value` is not a finite number in (0, 1]. */
export function requireFraction(issues: { path: string; message: string }[], path: string, value: unknown): void {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0 || value > 1) {
    issues.push({ path, message: 'must be in (0, 1]' });
  }
}

/** Relative step of the central difference for dU/dj of a model cell (1e-4, our choice: well above rounding, well below curvature). */
const SLOPE_RELATIVE_STEP = 1e-4;

/**
 * Small-signal area resistance of the cell at current density j [A/m²]: dU/dj [Ω·m²].
 * Linear source: the slope K exactly. Model: central difference
 * (U(j(1+h)) − U(j(1−h)))/(2jh) with h = 1e-4 (truncation error O(h²·U‴) is negligible for
 * the smooth cell curve; rounding error ~ ε·U/(j·h) ≈ 1e-12·U/j). Divide by the cell area for
 * the cell resistance in Ω used by the shunt-current network. Source: standard numerical
 * differentiation.
 */
export function cellAreaResistanceAt(cell: CellPerformance, currentDensity: number, path = 'cell'): number {
  if (!(Number.isFinite(currentDensity) && currentDensity > 0)) {
    throw new InputError('currentDensity', 'must be a finite current density > 0 A/m²', currentDensity);
  }
  if (cell.kind === 'linear') return cell.slope;
  const h = SLOPE_RELATIVE_STEP * currentDensity;
  const up = cell.evaluate(currentDensity + h).cellVoltage;
  const down = cell.evaluate(currentDensity - h).cellVoltage;
  const slope = (up - down) / (2 * h);
  if (!(Number.isFinite(slope) && slope > 0)) {
    throw new PhysicsError(path, `the cell model gives no positive slope dU/dj at ${currentDensity} A/m²`);
  }
  return slope;
}
