/**
 * Cell definitions used by the cell-model tests. All parameter values are invented for the
 * tests (clearly fictional), chosen inside the orientation ranges of check-values.md §9.
 */
import type { CellDefinition, Electrode } from '../../server/core/cell/types.js';

/**
 * An electrode with a negligible activation overpotential: Butler–Volmer with j0 = 1e12 A/m²,
 * so |η| ≈ j/(j0·(α_a + α_c)·F/RT) < 1e-9 V for j ≤ 1e4 A/m². Used to build cells whose
 * voltage is set by E_rev and resistances alone.
 */
export function idealElectrode(): Electrode {
  return {
    kinetics: { model: 'butler-volmer', exchangeCurrentDensity: 1e12, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.5 },
  };
}

/** Upper bound of the ideal electrodes' combined |η| over the tests' current densities, V. */
export const IDEAL_ELECTRODE_ETA_BOUND = 1e-8;

/**
 * A "linear" cell: ideal electrodes, E_rev overridden to `reversible` [V], one hardware
 * resistance `resistance` [Ω·m²]: U = E_rev + R·j to within IDEAL_ELECTRODE_ETA_BOUND.
 */
export function linearCell(
  chemistry: CellDefinition['chemistry'],
  reversible: number,
  resistance: number,
  currentDensities: number[],
): CellDefinition {
  return {
    chemistry,
    temperature: 353.15,
    pressure: 1e5,
    composition: chemistry === 'chlor-alkali' ? { brineNaCl: 3.6, causticNaOH: 11.8 } : chemistry === 'alkaline-water' ? { koh: 7.639 } : {},
    reversiblePotential: reversible,
    anode: idealElectrode(),
    cathode: idealElectrode(),
    ohmic: { hardware: resistance },
    currentDensities,
  };
}

/**
 * A plausible modern chlor-alkali membrane cell at 88 °C (invented values within the ranges of
 * check-values.md §9a and §9d, which are "from memory, low confidence"):
 *  - anode (Ru/Ir mixed-oxide): Tafel α = 2 → ≈ 36 mV/dec at 88 °C, j0 = 100 A/m² (10 mA/cm²),
 *    ≈ 58 mV at 4 kA/m²;
 *  - cathode (activated Ni): Tafel α = 1.5 → ≈ 48 mV/dec, j0 = 20 A/m² (2 mA/cm²), ≈ 0.11 V;
 *  - membrane 0.75 Ω·cm² (≈ 0.3 V at 4 kA/m²); electrolyte film 0.8 mm of depleted brine
 *    with 30 % gas (≈ 0.11 V at 4 kA/m²); hardware 0.08 Ω·cm² (≈ 0.03 V);
 *  - depleted brine 3.6 mol/kg, caustic 32 wt % ≈ 11.8 mol/kg; 96 % current efficiency.
 */
export function chlorAlkaliCell(currentDensities: number[]): CellDefinition {
  return {
    chemistry: 'chlor-alkali',
    temperature: 361.15,
    pressure: 1.2e5,
    composition: { brineNaCl: 3.6, causticNaOH: 11.8 },
    anode: { kinetics: { model: 'tafel', exchangeCurrentDensity: 100, transferCoefficient: 2 } },
    cathode: { kinetics: { model: 'tafel', exchangeCurrentDensity: 20, transferCoefficient: 1.5 } },
    ohmic: {
      membrane: { areaResistance: 0.75e-4 },
      gaps: [{ thickness: 0.8e-3, electrolyte: 'NaCl', voidFraction: 0.3 }],
      hardware: 0.08e-4,
    },
    currentEfficiency: { model: 'constant', value: 0.96 },
    currentDensities,
    rectifierEfficiency: 0.97,
  };
}

/** An invented alkaline water cell at 80 °C with Butler–Volmer electrodes and every loss term. */
export function alkalineCell(currentDensities: number[]): CellDefinition {
  return {
    chemistry: 'alkaline-water',
    temperature: 353.15,
    pressure: 1.5e5,
    composition: { koh: 7.639 },
    anode: {
      kinetics: {
        model: 'butler-volmer', exchangeCurrentDensity: 1e-3, anodicTransferCoefficient: 1.2, cathodicTransferCoefficient: 0.8,
        referenceTemperature: 298.15, activationEnergy: 50e3,
      },
      limitingCurrentDensity: 8e4,
    },
    cathode: {
      kinetics: { model: 'butler-volmer', exchangeCurrentDensity: 0.5, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.6 },
      limitingCurrentDensity: 6e4,
    },
    ohmic: {
      membrane: { areaResistance: 0.2e-4, referenceTemperature: 298.15, activationEnergy: 15e3 },
      gaps: [
        { thickness: 1e-3, electrolyte: 'KOH', voidFraction: 0.2 },
        { thickness: 0.5e-3, conductivity: 100, voidFraction: 0.1, voidModel: 'maxwell' },
      ],
      hardware: 0.02e-4,
    },
    currentDensities,
  };
}

/** n evenly spaced values from lo to hi inclusive. */
export function linspace(lo: number, hi: number, n: number): number[] {
  return Array.from({ length: n }, (_, i) => lo + ((hi - lo) * i) / (n - 1));
}

/** Every number in a result tree is finite (no NaN/Infinity would leak into JSON). */
export function allFinite(value: unknown): boolean {
  if (typeof value === 'number') return Number.isFinite(value);
  if (Array.isArray(value)) return value.every(allFinite);
  if (value && typeof value === 'object') return Object.values(value).every(allFinite);
  return true;
}
