/**
 * Plausibility bounds of the cell definition (regression: pressure 1e308 Pa, reference
 * temperature 1e308 K and exchange current density 1e308 A/m² were accepted and carried into
 * the model). The bounds are our own (schema.ts PLAUSIBILITY_BOUNDS); each refusal names the
 * field path and the unit. Cell data are invented (./cells.ts).
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../server/core/errors.js';
import { parseCellDefinition, PLAUSIBILITY_BOUNDS } from '../../server/core/cell/schema.js';
import { sweepCell } from '../../server/core/cell/sweep.js';
import type { CellDefinition } from '../../server/core/cell/types.js';
import { alkalineCell, allFinite, chlorAlkaliCell } from './cells.js';

/** Set a dotted path (numeric parts index arrays) in a copy of `def`. */
function withValue(def: CellDefinition, path: string, value: unknown): unknown {
  const copy = structuredClone(def) as unknown as Record<string, unknown>;
  const keys = path.split('.');
  let node: Record<string, unknown> = copy;
  for (const k of keys.slice(0, -1)) node = node[k] as Record<string, unknown>;
  node[keys[keys.length - 1]] = value;
  return copy;
}

/** The issues of the InputError that parsing `raw` throws. */
function issuesOf(raw: unknown): { path: string; message: string }[] {
  try {
    parseCellDefinition(raw);
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as InputError).issues;
  }
  throw new Error('expected an InputError');
}

const chlor = () => chlorAlkaliCell([1000, 4000, 6000]);
const alkaline = () => alkalineCell([1000, 4000, 6000]);

describe('cell definition plausibility bounds', () => {
  it.each([
    // [base, dotted path in the definition, issue path, value, unit named in the message]
    ['chlor', 'pressure', 'pressure', 1e308, 'Pa'],
    ['alkaline', 'anode.kinetics.referenceTemperature', 'anode.kinetics.referenceTemperature', 1e308, 'K'],
    ['chlor', 'anode.kinetics.exchangeCurrentDensity', 'anode.kinetics.exchangeCurrentDensity', 1e308, 'A/m²'],
    ['chlor', 'temperature', 'temperature', 1e308, 'K'],
    ['alkaline', 'anode.kinetics.activationEnergy', 'anode.kinetics.activationEnergy', 1e308, 'J/mol'],
    ['alkaline', 'anode.kinetics.activationEnergy', 'anode.kinetics.activationEnergy', -1e308, 'J/mol'],
    ['alkaline', 'anode.limitingCurrentDensity', 'anode.limitingCurrentDensity', 1e308, 'A/m²'],
    ['chlor', 'ohmic.gaps.0.thickness', 'ohmic.gaps[0].thickness', 1e308, 'm'],
    ['alkaline', 'ohmic.gaps.1.conductivity', 'ohmic.gaps[1].conductivity', 1e308, 'S/m'],
    ['alkaline', 'ohmic.gaps.1.conductivity', 'ohmic.gaps[1].conductivity', 1e-300, 'S/m'],
    ['chlor', 'ohmic.membrane.areaResistance', 'ohmic.membrane.areaResistance', 1e308, 'Ω·m²'],
    ['chlor', 'ohmic.hardware', 'ohmic.hardware', 1e308, 'Ω·m²'],
    ['alkaline', 'composition.koh', 'composition.koh', 1e308, 'mol/kg'],
    ['chlor', 'reversiblePotential', 'reversiblePotential', 1e308, 'V'],
    ['chlor', 'currentDensities.1', 'currentDensities[1]', 1e308, 'A/m²'],
    ['alkaline', 'anode.kinetics.anodicTransferCoefficient', 'anode.kinetics.anodicTransferCoefficient', 1e-300, 'dimensionless'],
  ] as const)('%s: %s = %s is refused at %s naming %s', (base, setPath, issuePath, value, unit) => {
    const issues = issuesOf(withValue(base === 'chlor' ? chlor() : alkaline(), setPath, value));
    const issue = issues.find((i) => i.path === issuePath);
    expect(issue, JSON.stringify(issues)).toBeDefined();
    expect(issue!.message).toContain(unit);
    expect(issue!.message).toContain('our plausibility bound');
  });

  it('the reviewer’s three values together give three issues, one per field', () => {
    let raw = withValue(alkaline(), 'pressure', 1e308) as CellDefinition;
    raw = withValue(raw, 'anode.kinetics.referenceTemperature', 1e308) as CellDefinition;
    raw = withValue(raw, 'anode.kinetics.exchangeCurrentDensity', 1e308) as CellDefinition;
    expect(issuesOf(raw).map((i) => i.path).sort()).toEqual(['anode.kinetics.exchangeCurrentDensity', 'anode.kinetics.referenceTemperature', 'pressure']);
  });

  it('values at the bounds are accepted and the model stays finite there', () => {
    const B = PLAUSIBILITY_BOUNDS;
    let def = withValue(alkalineCell([1000, 5000]), 'pressure', B.pressure.max) as CellDefinition;
    def = withValue(def, 'ohmic.gaps.1.conductivity', B.conductivity.min) as CellDefinition;
    def = withValue(def, 'ohmic.gaps.1.thickness', B.thickness.max) as CellDefinition;
    def = withValue(def, 'ohmic.hardware', B.areaResistance.max) as CellDefinition;
    def = withValue(def, 'cathode.kinetics.exchangeCurrentDensity', B.exchangeCurrentDensity.max) as CellDefinition;
    expect(() => parseCellDefinition(def)).not.toThrow();
    expect(allFinite(sweepCell(def))).toBe(true);
  });

  it('the invented test cells lie inside every bound', () => {
    expect(() => parseCellDefinition(chlor())).not.toThrow();
    expect(() => parseCellDefinition(alkaline())).not.toThrow();
  });
});
