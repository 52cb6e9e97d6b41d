/**
 * Caution texts for the hazards of electrolysis plants, as data: each topic has a short text in
 * our own words and the figures it quotes, each with its source and how firmly it is known.
 * Figures are orientation values (check-values §10), never design rules.
 */

export interface CautionFigure {
  label: string;
  /** The figure with its unit, as shown to people. */
  value: string;
  source: string;
  /** 'source seen' | 'via secondary' | 'from memory' | 'derived' (check-values confidence marks). */
  confidence: 'source seen' | 'via secondary' | 'from memory' | 'derived';
}

export interface Caution {
  topic: 'chlorine' | 'hydrogen-chlorine' | 'hydrogen' | 'caustic' | 'dc-current-magnetic-field' | 'pressure';
  title: string;
  text: string;
  figures: CautionFigure[];
}

/** The statement shown wherever safety figures are shown. */
export const SAFETY_DISCLAIMER =
  'These figures and checks are estimates for design studies. Local codes, standards, permits and licensed engineering practice govern every safety setting and plant design limit; confirm each figure against the current edition of its source before relying on it.';

export const CAUTIONS: readonly Caution[] = [
  {
    topic: 'chlorine',
    title: 'Chlorine is a toxic gas',
    text:
      'Chlorine attacks the eyes and airways at low concentrations and is heavier than air, so leaks collect in pits, trenches and low rooms. People can smell it before the exposure limits are reached, but the nose tires quickly: rely on detectors, not smell. Plan for leak detection, ventilation, escape routes and emergency absorption from the start of the design.',
    figures: [
      { label: 'OSHA permissible exposure limit (ceiling)', value: '1 ppm (3 mg/m³)', source: 'OSHA 29 CFR 1910.1000 Table Z-1, via the OSHA Chemical Sampling Information page', confidence: 'source seen' },
      { label: 'ACGIH threshold limit value', value: '0.5 ppm TWA; 1 ppm STEL', source: 'ACGIH, as quoted on the OSHA Chemical Sampling Information page', confidence: 'source seen' },
      {
        label: 'NIOSH recommended exposure limit',
        value: '0.5 ppm 15-minute ceiling (Pocket Guide); 0.5 ppm TWA, 1 ppm STEL (OSHA page) — the two sources state the form differently',
        source: 'NIOSH Pocket Guide to Chemical Hazards; OSHA Chemical Sampling Information page',
        confidence: 'from memory',
      },
      { label: 'Immediately dangerous to life or health (IDLH)', value: '10 ppm', source: 'NIOSH, via the OSHA Chemical Sampling Information page', confidence: 'source seen' },
      { label: 'Odour threshold', value: 'about 0.2–0.4 ppm', source: 'ATSDR Toxicological Profile for Chlorine', confidence: 'from memory' },
    ],
  },
  {
    topic: 'hydrogen-chlorine',
    title: 'Hydrogen and chlorine form explosive mixtures',
    text:
      'A few per cent of hydrogen in chlorine is enough for an explosive mixture, and light (sunlight, ultraviolet), static discharge or a mechanical shock can set it off. The limit falls as the gas is compressed, so the tail gas of chlorine liquefaction, where hydrogen concentrates, needs the most care. Cell chlorine normally carries a small fraction of a per cent of hydrogen; keep it far below the limit with analysers, alarms and trips, and dilute tail gas with dry air or nitrogen.',
    figures: [
      { label: 'Explosive range of H₂ in Cl₂ near 20–25 °C, ≈ 1 bar', value: '3.0–92.5 vol % H₂', source: 'Euro Chlor GEST 91/168 ch. 9; Chlorine Institute Pamphlet 121 (2009)', confidence: 'via secondary' },
      { label: 'Lower explosion limit at 0 °C and at −60 °C', value: '3.5 vol % and 5.0 vol % H₂', source: 'Euro Chlor GEST 91/168 ch. 9', confidence: 'via secondary' },
      { label: 'Lower explosion limit at 13.5 bar(a)', value: '2.5–3 vol % H₂', source: 'Euro Chlor GEST 91/168 ch. 9', confidence: 'via secondary' },
      { label: 'Usual H₂ in cell chlorine', value: 'about 0.1–0.5 vol %', source: 'industry practice', confidence: 'from memory' },
      { label: 'Liquefaction tail gas practice', value: 'held at or below 4 vol % H₂ by dilution and by limiting the liquefaction ratio', source: 'Russian federal chlorine safety rules, items 66–67 (Euro Chlor practice similar: from memory)', confidence: 'source seen' },
    ],
  },
  {
    topic: 'hydrogen',
    title: 'Hydrogen is flammable over a wide range and easy to ignite',
    text:
      'Hydrogen burns in air and in oxygen from a few per cent upwards, and a tiny spark is enough to light it; its flame is nearly invisible in daylight. In water electrolysers, hydrogen crossing the separator into the oxygen is the main internal hazard: the share of hydrogen in the oxygen grows as the load falls, which sets the lowest safe part load. Oxygen leaking into stored hydrogen is the mirror hazard. Vent high points, avoid ignition sources, and analyse both gases continuously.',
    figures: [
      { label: 'Flammable range in air, 20–25 °C, 1 atm', value: '4.0–75 vol % H₂', source: 'Zabetakis, US Bureau of Mines Bull. 627 (1965); Euro Chlor GEST 91/168', confidence: 'via secondary' },
      { label: 'Flammable range in oxygen, 1 atm', value: '4.0–94 vol % (Zabetakis) or 4.0–96 vol % (GEST 91/168) H₂', source: 'Zabetakis (1965); Euro Chlor GEST 91/168', confidence: 'via secondary' },
      { label: 'Minimum ignition energy in air', value: 'about 0.017–0.02 mJ', source: 'various secondary sources', confidence: 'via secondary' },
      { label: 'Usual screens for H₂ in O₂ in water electrolysis', value: 'alarm about 1 vol %, trip about 2 vol % (half the lower limit)', source: 'common in the literature (e.g. Haug et al. 2017; Schalenbach et al. 2016); ISO 22734:2019 covers electrolyser safety', confidence: 'from memory' },
      { label: 'Reminder', value: '2019: a hydrogen storage tank fed by an alkaline electrolyser exploded after oxygen entered the stored hydrogen (2 dead, 6 injured)', source: 'hazard-analysis firm article (check-values §10)', confidence: 'source seen' },
    ],
  },
  {
    topic: 'caustic',
    title: 'Caustic soda and potash destroy tissue',
    text:
      'Sodium and potassium hydroxide solutions burn skin and eyes quickly and deeply, and hot, strong catholyte is worse. The eye is the most exposed organ: splash goggles and face shields where lines are opened, eyewash and showers close by. Diluting caustic releases a lot of heat: add caustic to cold water slowly, never water to caustic. Mists from degassers and vents carry the same hazard.',
    figures: [
      { label: 'NaOH exposure limits (aerosol)', value: 'NIOSH REL 2 mg/m³ ceiling; OSHA PEL 2 mg/m³ TWA; ACGIH 2 mg/m³ ceiling', source: 'NIOSH IDLH documentation (1994)', confidence: 'source seen' },
      { label: 'NaOH IDLH', value: '10 mg/m³ (revised from 250)', source: 'NIOSH IDLH documentation (1994)', confidence: 'source seen' },
      { label: 'KOH exposure limits', value: 'NIOSH REL ceiling 2 mg/m³; ACGIH ceiling 2 mg/m³; no specific OSHA PEL', source: 'NIOSH Pocket Guide', confidence: 'from memory' },
      { label: 'GHS classification of NaOH and KOH', value: 'Skin Corr. 1A (H314), Met. Corr. 1 (H290)', source: 'harmonised classification', confidence: 'from memory' },
    ],
  },
  {
    topic: 'dc-current-magnetic-field',
    title: 'High DC currents and their magnetic fields',
    text:
      'An electrolyser hall carries tens to hundreds of kiloamperes at hundreds of volts DC. Stacks and busbars are live, and a path to earth through a person, a tool or a wet floor can be lethal; DC arcs do not self-extinguish like AC arcs. The current sets up a strong static magnetic field near busbars and cell rows: it can upset pacemakers and other implants, pull loose steel tools, and disturb instruments. Mark the zones, keep insulated walkways and tools, and plan lock-out of the rectifiers.',
    figures: [
      { label: 'Field near a straight busbar', value: 'B = μ0·I/(2π·d): about 20 mT at 1 m from 100 kA', source: 'Ampère’s law', confidence: 'derived' },
      { label: 'ICNIRP static-field exposure limits', value: 'occupational 2 T (head and trunk), 8 T (limbs); general public 400 mT', source: 'ICNIRP, Health Phys. 96(4) (2009) 504–514', confidence: 'via secondary' },
      { label: 'People with implanted medical devices', value: 'keep below about 0.5 mT', source: 'ICNIRP 2009 advice', confidence: 'from memory' },
    ],
  },
  {
    topic: 'pressure',
    title: 'Pressurised gas and electrolyte',
    text:
      'Pressurised electrolysers store energy in their gas spaces, and a pressure difference across the membrane or diaphragm drives more gas through it, worsening gas purity. Balance the anode and cathode pressures, protect each side against overpressure, and consider what a membrane rupture would mix. Hot electrolyte near its boiling point flashes to vapour when pressure drops.',
    figures: [
      { label: 'Alkaline water electrolysis cell pressure', value: 'below 30 bar', source: 'IRENA (2020) Green hydrogen cost reduction, KPI table', confidence: 'source seen' },
      { label: 'PEM water electrolysis cell pressure', value: 'up to about 50 bar', source: 'IRENA (2020) Green hydrogen cost reduction, KPI table', confidence: 'source seen' },
    ],
  },
];
