/**
 * The cell model's window on the property modules (chemistry/thermodynamics and transport):
 * one place that calls them, re-labels their error paths with the cell definition's field
 * names and forwards their warnings. Called once per sweep, never per point.
 */
import { T_STANDARD } from '../constants.js';
import { InputError, PhysicsError } from '../errors.js';
import { getChemistry, type Product } from '../chemistry/index.js';
import { WATER_ELECTRONS, WATER_SPLITTING_LIQUID, WATER_SPLITTING_VAPOUR } from '../chemistry/common.js';
import { thermoneutralVoltage } from '../thermo/reversible.js';
import { electrolyteConductivity as correlationConductivity } from '../transport/conductivity.js';
import { asrArrhenius, springerConductivity as springerModel } from '../transport/membrane.js';
import { voidConductivityFactor } from '../transport/voids.js';
import type { CellDefinition, ChemistryId, GapElectrolyte, ProductId, VoidModel } from './types.js';

/** Product data the cell model needs (from the chemistry module). */
export interface ProductInfo {
  id: ProductId;
  /** kg/mol. */
  molarMass: number;
  /** z, electrons per molecule. */
  electronsPerMolecule: number;
}

/** Electrons per reaction and products of a chemistry. */
export function chemistryInfo(id: ChemistryId): { electrons: number; products: ProductInfo[] } {
  const c = getChemistry(id);
  return {
    electrons: c.electrons,
    products: c.products.map((p: Product) => ({ id: p.id, molarMass: p.molarMass, electronsPerMolecule: p.electronsPerMolecule })),
  };
}

/**
 * Re-throw an error of a property module with the cell definition's field path: the module's
 * own path is looked up in `paths` (its field name → ours), else `fallback` is used.
 */
function relabel(err: unknown, fallback: string, paths: Record<string, string> = {}): never {
  if (err instanceof InputError || err instanceof PhysicsError) {
    const issues = err.issues.map((i) => ({ path: paths[i.path] ?? fallback, message: i.message }));
    if (err instanceof PhysicsError) throw new PhysicsError(issues[0]?.path ?? fallback, issues[0]?.message ?? err.message);
    throw InputError.many(`${issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`, issues);
  }
  throw err;
}

/**
 * Reversible and thermoneutral voltages [V] of the cell's chemistry at its temperature,
 * pressure and composition (chemistry module: Gibbs–Helmholtz + Nernst with Pitzer
 * activities). Warnings are forwarded. Error paths are those of the cell definition
 * (temperature, pressure, composition.*), which the chemistry module already uses.
 */
export function reversibleVoltages(
  def: CellDefinition,
  warnings: string[],
): { reversiblePotential: number; thermoneutralVoltage: number; lhvThermoneutralVoltage?: number; hydrogenPartialPressure?: number } {
  const chem = getChemistry(def.chemistry);
  const r = chem.reversible({ temperature: def.temperature, pressure: def.pressure, composition: def.composition ?? {} });
  for (const w of r.warnings) warnings.push(`Reversible voltage: ${w}`);
  const out: { reversiblePotential: number; thermoneutralVoltage: number; lhvThermoneutralVoltage?: number; hydrogenPartialPressure?: number } = {
    reversiblePotential: r.reversiblePotential,
    thermoneutralVoltage: r.thermoneutralVoltage,
  };
  if (r.lhvThermoneutralVoltage !== undefined) out.lhvThermoneutralVoltage = r.lhvThermoneutralVoltage;
  const pH2 = r.details.partialPressureH2;
  if (pH2 !== undefined && Number.isFinite(pH2) && pH2 > 0) out.hydrogenPartialPressure = pH2;
  return out;
}

/**
 * Heating-value voltages of hydrogen, ΔH°/(2F) [V] at 298.15 K and 1 bar for
 * H2O(l) → H2 + ½O2 (HHV basis, ≈ 1.481 V) and H2O(g) → H2 + ½O2 (LHV basis, ≈ 1.253 V),
 * from the thermo module's species data (NBS-82 / CODATA). Used for voltage efficiency.
 */
export function standardHeatingValueVoltages(): { hhv: number; lhv: number } {
  return {
    hhv: thermoneutralVoltage(WATER_SPLITTING_LIQUID, WATER_ELECTRONS, T_STANDARD.value),
    lhv: thermoneutralVoltage(WATER_SPLITTING_VAPOUR, WATER_ELECTRONS, T_STANDARD.value),
  };
}

/** Conductivity σ [S/m] of a gap electrolyte from its published correlation (transport module). */
export function electrolyteConductivity(
  electrolyte: GapElectrolyte,
  molality: number,
  temperatureK: number,
  path: string,
  warnings: string[],
): number {
  try {
    const r = correlationConductivity(electrolyte, molality, temperatureK);
    for (const w of r.warnings) warnings.push(`${path}: ${w}`);
    return r.value;
  } catch (err) {
    relabel(err, path, { molality: `${path}.concentration`, temperature: 'temperature' });
  }
}

/** Void fraction above which the Maxwell (dilute) relation is stretched (0.2: project choice; Maxwell's dilute range ≈ 0.1–0.2 is from memory, transport/voids.ts). */
export const MAXWELL_DILUTE_LIMIT = 0.2;
/** Practical maximum gas fraction near zero-gap electrodes, ≈ 0.65 (van der Does, Valle & Haverkort, Int. J. Hydrogen Energy 102 (2025) 295–303; check-values §7, source seen on the author's blog). */
export const PRACTICAL_MAX_VOID_FRACTION = 0.65;

/**
 * Effective conductivity [S/m] of an electrolyte with gas void fraction ε: Bruggeman
 * σ(1 − ε)^1.5 or Maxwell σ(1 − ε)/(1 + ε/2) (transport module; check-values §7).
 */
export function effectiveConductivity(sigma: number, voidFraction: number, model: VoidModel, path: string, warnings: string[]): number {
  if (model === 'maxwell' && voidFraction > MAXWELL_DILUTE_LIMIT) {
    warnings.push(`${path}: the Maxwell relation is a dilute-suspension result; ε = ${voidFraction} is above about ${MAXWELL_DILUTE_LIMIT} (common practice: use Bruggeman)`);
  }
  if (voidFraction > PRACTICAL_MAX_VOID_FRACTION) {
    warnings.push(`${path}: ε = ${voidFraction} is above the ≈ ${PRACTICAL_MAX_VOID_FRACTION} gas fraction seen near zero-gap electrodes (van der Does, Valle & Haverkort, Int. J. Hydrogen Energy 102 (2025) 295)`);
  }
  try {
    return sigma * voidConductivityFactor(voidFraction, model);
  } catch (err) {
    relabel(err, path, { voidFraction: `${path}.voidFraction`, voidModel: `${path}.voidModel` });
  }
}

/** Springer et al. (1991) PFSA conductivity [S/m] at water content λ and T [K] (transport module). */
export function springerConductivity(waterContent: number, temperatureK: number, path: string, warnings: string[]): number {
  try {
    const r = springerModel(waterContent, temperatureK);
    for (const w of r.warnings) warnings.push(`${path}: ${w}`);
    return r.value;
  } catch (err) {
    relabel(err, path, { 'membrane.waterContent': `${path}.waterContent`, temperature: 'temperature' });
  }
}

/**
 * Membrane area resistance [Ω·m²] at T from R_ref at T_ref with an apparent activation energy
 * E_a [J/mol]: R(T) = R_ref·exp[(E_a/R)(1/T − 1/T_ref)] (transport module).
 */
export function membraneAreaResistanceAt(
  areaResistance: number,
  referenceTemperature: number,
  activationEnergy: number,
  temperatureK: number,
  path: string,
): number {
  if (areaResistance === 0) return 0;
  try {
    return asrArrhenius(areaResistance, referenceTemperature, activationEnergy, temperatureK);
  } catch (err) {
    relabel(err, path, {
      'membrane.areaResistance': `${path}.areaResistance`,
      'membrane.referenceTemperature': `${path}.referenceTemperature`,
      'membrane.activationEnergy': `${path}.activationEnergy`,
      temperature: 'temperature',
    });
  }
}
