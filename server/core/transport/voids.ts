/**
 * Effective conductivity of an electrolyte holding a volume fraction ε of non-conducting gas
 * bubbles, and the resulting gap resistance (domain §5, check-values §7).
 *
 *   Bruggeman: σ_eff = σ·(1 − ε)^1.5
 *     D. A. G. Bruggeman, Ann. Phys. (Leipzig) 416 (1935) 636 (citation from memory; the
 *     formula is the standard differential effective-medium result for spheres).
 *   Maxwell:   σ_eff = σ·(1 − ε)/(1 + ε/2)
 *     J. C. Maxwell, A Treatise on Electricity and Magnetism (1873) — dilute non-conducting
 *     spheres (citation from memory).
 *   Gap:       R = d/σ_eff [Ω·m²]
 *
 * ε must lie in [0, 1): InputError otherwise. Validity: Maxwell is a dilute-limit result (ε
 * up to ≈ 0.1–0.2, from memory); Bruggeman is used to higher fractions (common practice).
 * Near-electrode gas fractions rarely exceed ≈ 0.65 (van der Does, Valle & Haverkort, Int. J.
 * Hydrogen Energy 102 (2025) 295–303, via check-values §7: source seen on the author's blog).
 */
import { InputError } from '../errors.js';
import { requireFinite, requireNonNegative, requirePositive } from '../thermo/guards.js';

export type VoidModel = 'bruggeman' | 'maxwell';

/** Bruggeman exponent 3/2 for spheres. */
const BRUGGEMAN_EXPONENT = 1.5;

function requireVoidFraction(voidFraction: number): void {
  requireFinite('voidFraction', voidFraction);
  if (voidFraction < 0 || voidFraction >= 1) {
    throw new InputError('voidFraction', 'gas void fraction must be in [0, 1)', voidFraction);
  }
}

/** σ_eff/σ for the chosen model [–]; ε ∈ [0, 1). */
export function voidConductivityFactor(voidFraction: number, model: VoidModel = 'bruggeman'): number {
  requireVoidFraction(voidFraction);
  switch (model) {
    case 'bruggeman':
      return (1 - voidFraction) ** BRUGGEMAN_EXPONENT;
    case 'maxwell':
      return (1 - voidFraction) / (1 + voidFraction / 2);
    default:
      throw new InputError('voidModel', `unknown void model "${String(model)}" (bruggeman or maxwell)`, model);
  }
}

/** Bruggeman σ_eff = σ(1 − ε)^1.5 [S/m]; σ [S/m] > 0, ε ∈ [0, 1). */
export function bruggemanConductivity(conductivity: number, voidFraction: number): number {
  requirePositive('conductivity', conductivity, 'S/m');
  return conductivity * voidConductivityFactor(voidFraction, 'bruggeman');
}

/** Maxwell σ_eff = σ(1 − ε)/(1 + ε/2) [S/m]; σ [S/m] > 0, ε ∈ [0, 1). */
export function maxwellConductivity(conductivity: number, voidFraction: number): number {
  requirePositive('conductivity', conductivity, 'S/m');
  return conductivity * voidConductivityFactor(voidFraction, 'maxwell');
}

/**
 * Gap (area) resistance R = d/σ_eff [Ω·m²] of an electrolyte layer of thickness d [m] ≥ 0
 * and void-free conductivity σ [S/m] > 0 holding gas fraction ε ∈ [0, 1).
 */
export function gapResistance(gap: number, conductivity: number, voidFraction: number, model: VoidModel = 'bruggeman'): number {
  requireNonNegative('gap', gap, 'm');
  requirePositive('conductivity', conductivity, 'S/m');
  return gap / (conductivity * voidConductivityFactor(voidFraction, model));
}
