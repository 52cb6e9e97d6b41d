/**
 * Chlor-alkali electrolysis in a membrane cell (NaCl brine anolyte, NaOH catholyte).
 *
 *   Overall  2 NaCl(aq) + 2 H₂O(l) → Cl₂(g) + H₂(g) + 2 NaOH(aq),  n = 2
 *   Anode    2 Cl⁻ → Cl₂ + 2 e⁻
 *   Cathode  2 H₂O + 2 e⁻ → H₂ + 2 OH⁻       (Na⁺ crosses the membrane to the catholyte)
 *
 * Reversible voltage (domain §4):
 *   E_rev = E°(T) + (RT/2F)·ln[ (p_Cl2/p°)(p_H2/p°)·a_NaOH² / (a_NaCl²·a_w,cath²) ]
 *   a_NaCl = (γ±,NaCl m_NaCl)² (anolyte),  a_NaOH = (γ±,NaOH m_NaOH)² (catholyte),
 *   a_w,cath = water activity of the catholyte (water is consumed at the cathode),
 *   p_Cl2 = p − a_w,an·p_sat(T),  p_H2 = p − a_w,cath·p_sat(T)  (gases saturated, one pressure).
 * This is the overall-cell thermodynamics: it includes the work of moving Na⁺ from anolyte
 * to catholyte for an ideally cation-selective membrane. Some voltage breakdowns book that
 * part (≈ (RT/F)·ln(a_Na,cath/a_Na,an)) as a "membrane potential" instead.
 *
 * Data: NBS-82 "ao" values for NaCl(aq) and NaOH(aq) (E° = 2.1880 V at 25 °C, check-values
 * §2b), Shomate for the gases and water, constant Cp° for the aqueous salts. Activities from
 * Pitzer (thermo/activity.ts). At plant strengths (depleted brine ≈ 3.5–4 mol/kg, domain.md §4,
 * i.e. 200–220 g/L, check-values §9a, from memory; 32 wt % NaOH ≈ 11.8 mol/kg, derived; 85–90 °C,
 * from memory) the NaOH activity coefficient is a far extrapolation of the
 * Pitzer fit: every result then carries warnings, and `details` gives the spread of the
 * Nernst term between temperature-expanded and 25 °C Pitzer parameters as a rough
 * indication of that uncertainty.
 *
 * U_tn = ΔH°(T)/(2F) uses standard-state (infinite dilution) enthalpies: heats of dilution at
 * plant strengths are not included.
 * Validity: 0–100 °C (constant-Cp approximation for the aqueous salts).
 */
import { MOLAR_MASS, GAS_CONSTANT, FARADAY, T_STANDARD } from '../constants.js';
import { InputError } from '../errors.js';
import { describeTemperature } from '../thermo/guards.js';
import { pitzerActivity, type ActivityResult } from '../thermo/activity.js';
import { reversibleVoltage, saturatedGasPartialPressure, lnRelativePressure } from '../thermo/reversible.js';
import type { Stoichiometry } from '../thermo/reaction.js';
import { HYDROGEN, idealGasWarning, reversibleDetails, validateConditions } from './common.js';
import type { Chemistry, OperatingConditions, Product, ReversibleResult } from './types.js';

/** 0–100 °C: the trusted range of the constant-Cp aqueous species (thermo/species.ts; our approximation window). */
const RANGE: [number, number] = [273.15, 373.15];
const ELECTRONS = 2;

/** 2 NaCl(aq) + 2 H₂O(l) → Cl₂(g) + H₂(g) + 2 NaOH(aq). */
export const CHLOR_ALKALI_REACTION: Stoichiometry = { 'NaCl(aq)': -2, 'H2O(l)': -2, 'Cl2(g)': 1, 'H2(g)': 1, 'NaOH(aq)': 2 };

const CHLORINE: Product = { id: 'Cl2', name: 'Chlorine', molarMass: MOLAR_MASS.Cl2, electronsPerMolecule: 2, electrode: 'anode', gas: true };
const CAUSTIC: Product = { id: 'NaOH', name: 'Caustic soda (NaOH, 100 % basis)', molarMass: MOLAR_MASS.NaOH, electronsPerMolecule: 1, electrode: 'cathode', gas: false };

/** Nernst-term difference above which the activity-model spread is worth a warning [V] (our choice). */
const SPREAD_WARNING = 0.005;
/** Molality above which heats of dilution are worth mentioning for U_tn [mol/kg] (our choice). */
const DILUTION_NOTE_MOLALITY = 0.5;
/** mV per V (exact), for messages only. */
const MV_PER_V = 1000;

/** ln Q of the salts and water: 2 ln a_NaOH − 2 ln a_NaCl − 2 ln a_w (a_salt = (γm)²). */
function lnActivityPart(nacl: ActivityResult, naoh: ActivityResult): number {
  const lnANaCl = 2 * (nacl.lnMeanActivityCoefficient + Math.log(nacl.molality));
  const lnANaOH = 2 * (naoh.lnMeanActivityCoefficient + Math.log(naoh.molality));
  return 2 * lnANaOH - 2 * lnANaCl - 2 * naoh.lnWaterActivity;
}

export const CHLOR_ALKALI: Chemistry = {
  id: 'chlor-alkali',
  name: 'Chlor-alkali (membrane cell, NaCl brine)',
  electrons: ELECTRONS,
  overallReaction: '2 NaCl(aq) + 2 H₂O(l) → Cl₂(g) + H₂(g) + 2 NaOH(aq)',
  anodeReaction: '2 Cl⁻ → Cl₂ + 2 e⁻',
  cathodeReaction: '2 H₂O + 2 e⁻ → H₂ + 2 OH⁻',
  products: [CHLORINE, CAUSTIC, HYDROGEN],
  mainProduct: 'Cl2',
  requiredComposition: ['brineNaCl', 'causticNaOH'],
  temperatureRange: RANGE,
  reversible(c: OperatingConditions): ReversibleResult {
    validateConditions(c, RANGE, ['brineNaCl', 'causticNaOH'], 'chlor-alkali');
    const mNaCl = c.composition.brineNaCl as number;
    const mNaOH = c.composition.causticNaOH as number;
    if (mNaCl <= 0) throw new InputError('composition.brineNaCl', 'must be > 0 mol/kg (chloride is the anode reactant)', mNaCl);
    if (mNaOH <= 0) throw new InputError('composition.causticNaOH', 'must be > 0 mol/kg (the Nernst term needs a finite NaOH activity)', mNaOH);
    const T = c.temperature;
    const nacl = pitzerActivity('NaCl', mNaCl, T);
    const naoh = pitzerActivity('NaOH', mNaOH, T);
    const anodeGas = saturatedGasPartialPressure(c.pressure, T, nacl.waterActivity);
    const cathodeGas = saturatedGasPartialPressure(c.pressure, T, naoh.waterActivity);

    const lnSalt = lnActivityPart(nacl, naoh);
    const lnA = {
      'Cl2(g)': lnRelativePressure(anodeGas.partialPressure),
      'H2(g)': lnRelativePressure(cathodeGas.partialPressure),
      'NaCl(aq)': 2 * (nacl.lnMeanActivityCoefficient + Math.log(mNaCl)),
      'NaOH(aq)': 2 * (naoh.lnMeanActivityCoefficient + Math.log(mNaOH)),
      'H2O(l)': naoh.lnWaterActivity,
    } as const;
    const rev = reversibleVoltage(CHLOR_ALKALI_REACTION, ELECTRONS, T, lnA);

    const warnings = [...rev.warnings, ...nacl.warnings, ...naoh.warnings, ...idealGasWarning(c.pressure)];
    const rtOverNF = (GAS_CONSTANT.value * T) / (ELECTRONS * FARADAY.value);
    let spread = 0;
    if (!nacl.withinValidity || !naoh.withinValidity) {
      if (T !== T_STANDARD.value) {
        const nacl25 = pitzerActivity('NaCl', mNaCl, T_STANDARD.value);
        const naoh25 = pitzerActivity('NaOH', mNaOH, T_STANDARD.value);
        spread = rtOverNF * (lnActivityPart(nacl25, naoh25) - lnSalt);
      }
      if (Math.abs(spread) > SPREAD_WARNING) {
        warnings.push(
          `Chlor-alkali E_rev: the activity part of the Nernst term changes by ${(spread * MV_PER_V).toFixed(0)} mV if the Pitzer parameters are held at 25 °C instead of extrapolated to ${describeTemperature(T)} — a rough indication of its uncertainty at these strengths.`,
        );
      }
    }
    if (mNaCl > DILUTION_NOTE_MOLALITY || mNaOH > DILUTION_NOTE_MOLALITY) {
      warnings.push('Thermoneutral voltage uses standard-state (infinite-dilution) enthalpies; heats of dilution at the given brine and caustic strengths are not included.');
    }
    return {
      reversiblePotential: rev.reversiblePotential,
      thermoneutralVoltage: rev.thermoneutralVoltage,
      warnings,
      details: {
        ...reversibleDetails(rev),
        gasNernstTerm: rtOverNF * (lnA['Cl2(g)'] + lnA['H2(g)']),
        activityNernstTerm: rtOverNF * lnSalt,
        activityNernstSpread: spread,
        partialPressureCl2: anodeGas.partialPressure,
        partialPressureH2: cathodeGas.partialPressure,
        saturationPressure: anodeGas.saturationPressure,
        anolyteWaterVapourPressure: anodeGas.waterVapourPressure,
        catholyteWaterVapourPressure: cathodeGas.waterVapourPressure,
        brineMolality: mNaCl,
        causticMolality: mNaOH,
        gammaNaCl: nacl.meanActivityCoefficient,
        gammaNaOH: naoh.meanActivityCoefficient,
        activityNaCl: (nacl.meanActivityCoefficient * mNaCl) ** 2,
        activityNaOH: (naoh.meanActivityCoefficient * mNaOH) ** 2,
        waterActivityAnolyte: nacl.waterActivity,
        waterActivityCatholyte: naoh.waterActivity,
      },
    };
  },
};
