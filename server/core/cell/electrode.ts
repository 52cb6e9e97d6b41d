/**
 * Electrode kinetics inside the cell model: parameters moved to the cell temperature once per
 * sweep, and the activation overpotential of each electrode on its working branch (anode
 * anodic, cathode cathodic), reported as a magnitude. SI: A/m², V, K, J/mol.
 *
 * The Butler–Volmer inversion is the kinetics module's (server/core/kinetics/models.ts); the
 * Tafel line and the Arrhenius law are the usual closed forms.
 */
import { faradayOverRT } from '../constants.js';
import { PhysicsError } from '../errors.js';
import {
  butlerVolmerOverpotential,
  exchangeCurrentAtTemperature,
  type ButlerVolmerParams,
} from '../kinetics/models.js';
import type { ElectrodeKinetics } from './types.js';

export type ElectrodeRole = 'anode' | 'cathode';

/**
 * Below this multiple of j0 a Tafel line is outside its usual range (the back reaction is no
 * longer negligible): one decade above j0, i.e. |η| below one Tafel slope per decade (project
 * choice, in line with the common-practice Tafel window of domain.md §3).
 */
export const TAFEL_MIN_RATIO_TO_J0 = 10;

/** Kinetics moved to the cell temperature (trusting kernel input; see prepareKinetics). */
export type PreparedKinetics =
  | {
      model: 'tafel';
      /** j0 at the cell temperature, A/m². */
      exchangeCurrentDensity: number;
      transferCoefficient: number;
      /** ln[j0(T)/j0(T_ref)] from the Arrhenius law (0 without activation energy). */
      lnArrheniusFactor: number;
    }
  | {
      model: 'butler-volmer';
      exchangeCurrentDensity: number;
      anodicTransferCoefficient: number;
      cathodicTransferCoefficient: number;
      lnArrheniusFactor: number;
    };

/**
 * Move kinetic parameters to the cell temperature T [K]:
 *   j0(T) = j0(T_ref)·exp[−(E_a/R)(1/T − 1/T_ref)]   (Arrhenius; domain.md §3),
 * applied when both `referenceTemperature` and `activationEnergy` are given. Without E_a the
 * reference j0 is used unchanged, and a warning is added when T_ref differs from T by more
 * than 1 K. Transfer coefficients are taken as temperature-independent (an assumption; some
 * reactions show temperature-independent Tafel slopes instead, e.g. Bao & Macdonald, ECS
 * Trans. 11(27) (2008) 1 for HER on Ni). `path` names the kinetics object in messages.
 */
export function prepareKinetics(
  kinetics: ElectrodeKinetics,
  temperatureK: number,
  path: string,
  warnings: string[],
): PreparedKinetics {
  let j0 = kinetics.exchangeCurrentDensity;
  let lnArrheniusFactor = 0;
  const tRef = kinetics.referenceTemperature;
  if (tRef !== undefined && kinetics.activationEnergy !== undefined) {
    try {
      j0 = exchangeCurrentAtTemperature(kinetics.exchangeCurrentDensity, tRef, kinetics.activationEnergy, temperatureK);
    } catch (err) {
      if (err instanceof PhysicsError) {
        throw new PhysicsError(`${path}.activationEnergy`, err.issues[0]?.message ?? err.message);
      }
      throw err;
    }
    lnArrheniusFactor = Math.log(j0 / kinetics.exchangeCurrentDensity);
  } else if (tRef !== undefined && Math.abs(tRef - temperatureK) > 1) {
    // 1 K: warning threshold, project choice.
    warnings.push(
      `${path}: exchange current density given at ${tRef.toFixed(2)} K but no activation energy; ` +
        `it is used unchanged at the cell temperature ${temperatureK.toFixed(2)} K`,
    );
  }
  if (kinetics.model === 'tafel') {
    return { model: 'tafel', exchangeCurrentDensity: j0, transferCoefficient: kinetics.transferCoefficient, lnArrheniusFactor };
  }
  return {
    model: 'butler-volmer',
    exchangeCurrentDensity: j0,
    anodicTransferCoefficient: kinetics.anodicTransferCoefficient,
    cathodicTransferCoefficient: kinetics.cathodicTransferCoefficient,
    lnArrheniusFactor,
  };
}

/** Result of an activation overpotential evaluation. */
export interface ActivationResult {
  /** |η| [V], ≥ 0. */
  overpotential: number;
  /** True when a Tafel line was used below j0 and |η| was set to 0 (caller warns). */
  tafelBelowExchange: boolean;
}

/**
 * Activation overpotential magnitude |η| [V] of an electrode carrying current density
 * j [A/m²] (> 0) on its working branch at temperature T [K]:
 *  - Tafel: |η| = (RT/(αF))·ln(j/j0), valid for j ≫ j0; for j ≤ j0 the line gives |η| ≤ 0,
 *    which has no meaning, so |η| = 0 is returned with `tafelBelowExchange` set;
 *  - Butler–Volmer: the root of j0[exp(α_a f η) − exp(−α_c f η)] = ±j (anode +j, cathode −j),
 *    by the kinetics module's bracketed Newton solve (exact to ~1e-14 relative).
 * Source: Tafel and Butler–Volmer equations (domain.md §3).
 */
export function activationOverpotential(
  k: PreparedKinetics,
  role: ElectrodeRole,
  currentDensity: number,
  temperatureK: number,
): ActivationResult {
  if (k.model === 'tafel') {
    const ratio = currentDensity / k.exchangeCurrentDensity;
    if (ratio <= 1) return { overpotential: 0, tafelBelowExchange: true };
    return {
      overpotential: Math.log(ratio) / (k.transferCoefficient * faradayOverRT(temperatureK)),
      tafelBelowExchange: false,
    };
  }
  const params: ButlerVolmerParams = {
    exchangeCurrentDensity: k.exchangeCurrentDensity,
    anodicTransferCoefficient: k.anodicTransferCoefficient,
    cathodicTransferCoefficient: k.cathodicTransferCoefficient,
  };
  const eta = butlerVolmerOverpotential(role === 'anode' ? currentDensity : -currentDensity, params, temperatureK);
  return { overpotential: Math.abs(eta), tafelBelowExchange: false };
}

/**
 * Current density [A/m²] of an anodic reaction at overpotential η [V] and its derivative
 * dj/dη [A/(m²·V)], for the coupled solve of competing anode reactions:
 *  - Tafel: j = j0·exp(α f η)  (the anodic term alone, defined for any η);
 *  - Butler–Volmer: j = j0[exp(α_a f η) − exp(−α_c f η)].
 * f = F/(RT) [1/V] is passed in (computed once per sweep). Throws PhysicsError when the
 * exponentials overflow (η far outside any physical range).
 * Source: Tafel and Butler–Volmer equations (domain.md §3).
 */
export function anodicCurrent(k: PreparedKinetics, eta: number, f: number): { j: number; dj: number } {
  let j: number;
  let dj: number;
  if (k.model === 'tafel') {
    const a = k.transferCoefficient * f;
    j = k.exchangeCurrentDensity * Math.exp(a * eta);
    dj = a * j;
  } else {
    const a = k.anodicTransferCoefficient * f;
    const c = k.cathodicTransferCoefficient * f;
    const ea = Math.exp(a * eta);
    const ec = Math.exp(-c * eta);
    j = k.exchangeCurrentDensity * (ea - ec);
    dj = k.exchangeCurrentDensity * (a * ea + c * ec);
  }
  if (!Number.isFinite(j) || !Number.isFinite(dj)) {
    throw new PhysicsError('anode', `anode current at η = ${eta} V overflows; the kinetic parameters are outside any physical range`);
  }
  return { j, dj };
}

/**
 * Inverse of `anodicCurrent` for j > 0: the overpotential [V] at which the reaction carries j.
 * Tafel: η = ln(j/j0)/(α f) (may be negative for j < j0: the Tafel current form is used as a
 * model of the anodic term alone). Butler–Volmer: the kinetics module's inversion.
 */
export function anodicOverpotentialFor(k: PreparedKinetics, currentDensity: number, temperatureK: number): number {
  if (k.model === 'tafel') {
    return Math.log(currentDensity / k.exchangeCurrentDensity) / (k.transferCoefficient * faradayOverRT(temperatureK));
  }
  return butlerVolmerOverpotential(
    currentDensity,
    {
      exchangeCurrentDensity: k.exchangeCurrentDensity,
      anodicTransferCoefficient: k.anodicTransferCoefficient,
      cathodicTransferCoefficient: k.cathodicTransferCoefficient,
    },
    temperatureK,
  );
}
