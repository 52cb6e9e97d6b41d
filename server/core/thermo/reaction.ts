/**
 * Reaction thermodynamics ΔH(T), ΔS(T), ΔG(T) from the species table by Kirchhoff and
 * Gibbs–Helmholtz integration from 298.15 K.
 *
 *   ΔH(T) = Σν ΔfH°(298.15) + Σν ∫_{298.15}^{T} Cp dT
 *   ΔS(T) = ΔS°(298.15)     + Σν ∫_{298.15}^{T} Cp/T dT
 *   ΔG(T) = ΔH(T) − T·ΔS(T)
 *
 * with ν > 0 for products and ν < 0 for reactants. Cp from Shomate fits where available,
 * constant Cp° otherwise (see species.ts).
 *
 * Choice of ΔS°(298.15): the standard-state tables are not perfectly self-consistent
 * (ΔfG ≠ ΔfH − T·ΔfS by up to ~0.2 kJ/mol after rounding of S°). We anchor
 * ΔS°(298.15) = (Σν ΔfH° − Σν ΔfG°)/298.15 K, so that ΔG°(298.15) equals the tabulated
 * Σν ΔfG° exactly (hence E° is the table value) and ΔG = ΔH − TΔS holds at every T. The
 * third-law sum Σν S° is reported beside it (`tableEntropyChange`) with the mismatch.
 * Source: method as in any thermodynamics text (Kirchhoff's law; Gibbs–Helmholtz); data
 * NBS-82 and NIST WebBook (species.ts).
 *
 * Units: T [K]; ΔH, ΔG [J/mol of reaction as written]; ΔS, ΔCp [J/(mol·K)].
 * Validity: the union of the species' trusted temperature ranges; outside, a warning.
 */
import { T_STANDARD } from '../constants.js';
import { InputError } from '../errors.js';
import { requireTemperature, describeTemperature } from './guards.js';
import { SPECIES, enthalpyIncrement, entropyIncrement, heatCapacity, type SpeciesId } from './species.js';

/** Stoichiometric coefficients ν: products > 0, reactants < 0, per reaction as written. */
export type Stoichiometry = Readonly<Partial<Record<SpeciesId, number>>>;

export interface ReactionThermo {
  /** T [K]. */
  temperature: number;
  /** ΔH(T) [J/mol]. */
  deltaH: number;
  /** ΔS(T) [J/(mol·K)] (Gibbs-consistent anchor, see module doc). */
  deltaS: number;
  /** ΔG(T) = ΔH − TΔS [J/mol]. */
  deltaG: number;
  /** ΔCp(T) [J/(mol·K)]. */
  deltaCp: number;
  /** Σν ΔfH°(298.15) [J/mol]. */
  standardDeltaH: number;
  /** Σν ΔfG°(298.15) [J/mol]. */
  standardDeltaG: number;
  /** ΔS°(298.15) = (ΔH° − ΔG°)/298.15 [J/(mol·K)]. */
  standardDeltaS: number;
  /** Σν S°(298.15) from the tables [J/(mol·K)], for comparison. */
  tableEntropyChange: number;
  warnings: string[];
}

function entries(stoichiometry: Stoichiometry): Array<[SpeciesId, number]> {
  const out: Array<[SpeciesId, number]> = [];
  for (const [id, nu] of Object.entries(stoichiometry) as Array<[SpeciesId, number | undefined]>) {
    if (nu === undefined || nu === 0) continue;
    if (!(id in SPECIES)) throw new InputError(`stoichiometry.${id}`, 'unknown species');
    if (!Number.isFinite(nu)) throw new InputError(`stoichiometry.${id}`, 'stoichiometric coefficient must be finite', nu);
    out.push([id, nu]);
  }
  if (out.length === 0) throw new InputError('stoichiometry', 'reaction has no species');
  return out;
}

/**
 * ΔH, ΔS, ΔG, ΔCp of a reaction at temperature T [K]; see module doc for formulas,
 * units and the ΔS° anchor. Throws InputError for T ≤ 0 or an unknown species.
 */
export function reactionThermo(stoichiometry: Stoichiometry, temperature: number): ReactionThermo {
  requireTemperature('temperature', temperature);
  const t0 = T_STANDARD.value;
  const warnings: string[] = [];
  let dH0 = 0;
  let dG0 = 0;
  let dStable = 0;
  let dHinc = 0;
  let dSinc = 0;
  let dCp = 0;
  for (const [id, nu] of entries(stoichiometry)) {
    const sp = SPECIES[id];
    dH0 += nu * sp.formationEnthalpy;
    dG0 += nu * sp.formationGibbsEnergy;
    dStable += nu * sp.entropy;
    dHinc += nu * enthalpyIncrement(sp, temperature);
    dSinc += nu * entropyIncrement(sp, temperature);
    dCp += nu * heatCapacity(sp, temperature);
    const [lo, hi] = sp.temperatureRange;
    if (temperature < lo || temperature > hi) {
      warnings.push(
        `${sp.formula}: ${describeTemperature(temperature)} is outside the ${lo}–${hi} K range of its heat-capacity data; values are extrapolated.`,
      );
    }
  }
  const dS0 = (dH0 - dG0) / t0;
  const deltaH = dH0 + dHinc;
  const deltaS = dS0 + dSinc;
  return {
    temperature,
    deltaH,
    deltaS,
    deltaG: deltaH - temperature * deltaS,
    deltaCp: dCp,
    standardDeltaH: dH0,
    standardDeltaG: dG0,
    standardDeltaS: dS0,
    tableEntropyChange: dStable,
    warnings,
  };
}
