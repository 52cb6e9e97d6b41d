/**
 * Shared result types of the kinetics fits. All quantities SI: A/m², V, Ω·m², K, J/mol.
 */

/** One polarization point: current density j [A/m²] (anodic > 0) and overpotential η [V]. */
export interface PolarizationPoint {
  currentDensity: number;
  overpotential: number;
}

/**
 * A fitted or derived parameter. `standardError` and `ci95` are null when the data do not
 * determine the parameter (aliased / not identifiable); a warning then says so.
 * Fixed (user-given) parameters carry `fixed: true`, standardError 0 and ci95 [v, v].
 */
export interface FittedParameter {
  value: number;
  standardError: number | null;
  ci95: [number, number] | null;
  unit: string;
  fixed?: boolean;
  note?: string;
}

export type Branch = 'anodic' | 'cathodic';

/** Per-point record of a fit. `fitted`/`residual` are null for points the model does not describe (other branch). */
export interface ResidualRecord {
  currentDensity: number;
  overpotential: number;
  /** Model overpotential at this current density [V] (includes a known or fitted j·R_u). */
  fitted: number | null;
  /** overpotential − fitted [V]. */
  residual: number | null;
  used: boolean;
}

export interface FitStatistics {
  points: number;
  degreesOfFreedom: number;
  /**
   * R² = 1 − RSS/TSS, TSS of the overpotential over the fitted points after subtracting a
   * KNOWN j·R_u (the iR-corrected η of domain.md §2, the variable the kinetic law describes);
   * with R_u fitted or zero, of η as given. The same R² is quoted by the warnings.
   */
  rSquared: number;
  /** s = √(RSS/dof) [V]. */
  residualStandardDeviation: number;
  /** Residual sum of squares [V²]. */
  rss: number;
  /** Gaussian AIC with σ² = RSS/n, counting σ as a parameter (see statistics.ts). */
  aic: number;
  bic: number;
  /** Number of free parameters (σ not counted). */
  parameters: number;
}
