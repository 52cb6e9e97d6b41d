/**
 * Plain-language warnings of the kinetics fits. Thresholds: the common-practice rules of
 * thumb in domain.md §3 (Tafel window): R² ≥ 0.99, at least one decade of current, |η| above
 * the low-field region; and two project choices not in domain.md: at least five points and
 * the 20 % limit on the slope rise (MAX_SLOPE_RISE).
 */

/** R² below which a Tafel line is "not linear enough" (common practice, domain.md §3). */
export const MIN_R_SQUARED = 0.99;
/** Minimum span of a Tafel window in decades of current (common practice, domain.md §3). */
export const MIN_DECADES = 1;
/** Minimum number of points for a defensible Tafel fit (common practice; our choice of 5). */
export const MIN_POINTS = 5;
/**
 * Largest tolerated rise of the local Tafel slope across a window, as a fraction of the
 * slope (project choice). For Tafel kinetics with a mass-transport limit the local slope is
 * b/(1 − j/j_lim), so 20 % is reached at the top point when j ≈ 0.17·j_lim (the half-decade segment slope
 * used by the automatic window reaches 20 % near j ≈ 0.25·j_lim).
 */
export const MAX_SLOPE_RISE = 0.2;

const mV = (v: number) => `${(v * 1000).toFixed(0)} mV`;

export function narrowWindowWarning(decades: number): string {
  return `The fitted window spans only ${decades.toFixed(2)} decade(s) of current; a Tafel slope is usually trusted only over at least ${MIN_DECADES} decade (common practice). Extend the measurement or treat the slope as indicative.`;
}

export function lowFieldWarning(count: number, lowFieldLimit: number): string {
  return `${count} fitted point(s) have |η| below ${mV(lowFieldLimit)}, where the reverse reaction still carries a noticeable share of the current; the Tafel line bends there and the slope and j0 are biased. Raise the lower bound of the window or fit Butler–Volmer.`;
}

export function curvatureWarning(rise: number, where: 'window' | 'top'): string {
  const pct = (rise * 100).toFixed(0);
  if (rise > 0) {
    return `The local Tafel slope ${where === 'top' ? 'at the high-current end' : 'across the window'} is ${pct} % steeper than the main trend: the curve bends upward, which points to mass-transport limitation or an uncorrected ohmic (iR) drop. Lower the upper bound, correct or fit R_u, or fit Butler–Volmer with a limiting current.`;
  }
  return `The local Tafel slope ${where === 'top' ? 'at the high-current end' : 'across the window'} is ${(-rise * 100).toFixed(0)} % shallower than the main trend: the data bend downward (a change of mechanism, surface changes or over-corrected iR). One straight line may not describe this window.`;
}

/**
 * R² of the fitted window (the statistics' R²) below the rule of thumb. `iRCorrected`: a
 * known j·R_u was subtracted, and R² is that of the corrected overpotential.
 */
export function rSquaredWarning(r2: number, iRCorrected = false): string {
  return `R² = ${r2.toFixed(4)}${iRCorrected ? ' (of the overpotential after subtracting the known j·R_u)' : ''} is below ${MIN_R_SQUARED} (common rule of thumb for a straight Tafel line): the data scatter or bend within the window.`;
}

export function fewPointsWarning(n: number): string {
  return `Only ${n} point(s) were fitted; with fewer than ${MIN_POINTS} the slope and its uncertainty rest on very little data.`;
}

export function bothBranchesWarning(chosen: 'anodic' | 'cathodic', anodic: number, cathodic: number, given: boolean): string {
  return `The data contain both anodic (${anodic}) and cathodic (${cathodic}) points; a Tafel line describes one branch, so only the ${chosen} branch was fitted${given ? ' (as requested)' : ' (the one with more points)'}.`;
}
