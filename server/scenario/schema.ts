/**
 * The study file format (`*.study.json`), version 1. A study holds one engineering case:
 * its chemistry, operating conditions, named polarization datasets, saved kinetic fits and
 * (optionally) the cell, plant, coating and cost definitions. All numbers are SI coherent
 * (A/m², V, Ω·m², K, Pa, mol/kg). Money fields say their unit in their names.
 */
import { z } from 'zod';
import { sectionSchemas } from './sections.js';
import { finite, positive } from './numbers.js';

export const STUDY_FORMAT = 'electrolysis-study';
export const STUDY_VERSION = 1;


export const chemistryIdSchema = z.enum(['chlor-alkali', 'alkaline-water', 'pem-water']);
export const referenceElectrodeIdSchema = z.enum(['SHE', 'RHE', 'SCE', 'AgAgCl-satKCl', 'HgHgO-1MNaOH']);

export const pointSchema = z.object({
  /** Current density, A/m², anodic positive. */
  currentDensity: finite,
  /** Overpotential (potentialKind "overpotential") or electrode potential vs `reference` (V). */
  potential: finite,
});

export const datasetSchema = z.object({
  id: z.string().regex(/^[A-Za-z0-9_-]{1,64}$/, 'letters, digits, _ or -, at most 64'),
  name: z.string().min(1).max(200),
  electrode: z.enum(['anode', 'cathode']),
  coating: z.string().max(200).default(''),
  /** Measurement temperature, K. */
  temperature: positive,
  /** Electrons in the overall electrode reaction (for the single-step reading). */
  electrons: z.number().int().min(1).max(8).optional(),
  potentialKind: z.enum(['overpotential', 'electrode']).default('overpotential'),
  reference: referenceElectrodeIdSchema.optional(),
  /** Equilibrium potential vs the same reference, V (when potentialKind is "electrode"). */
  equilibriumPotential: finite.optional(),
  /** pH, for the RHE scale. */
  pH: finite.optional(),
  /** Known uncompensated resistance, Ω·m² (not yet subtracted from the potentials). */
  uncompensatedResistance: finite.refine((v) => v >= 0, 'must be ≥ 0').optional(),
  notes: z.string().max(4000).default(''),
  points: z.array(pointSchema).min(1).max(100_000),
});

const parameterSchema = z.object({
  value: finite,
  standardError: finite.optional(),
  ci95: z.tuple([finite, finite]).optional(),
  unit: z.string().optional(),
});

/** A kinetic fit saved into the study, so the cell model can pick it up. */
export const savedFitSchema = z.object({
  id: z.string().regex(/^[A-Za-z0-9_-]{1,64}$/),
  name: z.string().min(1).max(200),
  datasetId: z.string().optional(),
  electrode: z.enum(['anode', 'cathode']),
  model: z.enum(['tafel', 'butler-volmer']),
  /** Temperature of the fit, K. */
  temperature: positive,
  parameters: z.record(z.string(), parameterSchema),
  /** Correlation between ln j0 and the transfer coefficient, for uncertainty propagation. */
  correlation: z.object({ names: z.array(z.string()), matrix: z.array(z.array(finite)) }).optional(),
  createdAt: z.string().optional(),
});

export const operatingSchema = z.object({
  temperature: positive,
  pressure: positive,
  composition: z
    .object({ brineNaCl: positive.optional(), causticNaOH: positive.optional(), koh: positive.optional() })
    .default({}),
});

export const studySchema = z.object({
  format: z.literal(STUDY_FORMAT),
  version: z.literal(STUDY_VERSION),
  name: z.string().min(1).max(200),
  description: z.string().max(20_000).default(''),
  /** True when the data are invented (examples). Shown on every page. */
  synthetic: z.boolean().default(false),
  chemistry: chemistryIdSchema,
  operating: operatingSchema,
  datasets: z.array(datasetSchema).max(200).default([]),
  fits: z.array(savedFitSchema).max(500).default([]),
  cell: sectionSchemas.cell.optional(),
  plant: sectionSchemas.plant.optional(),
  coatings: sectionSchemas.coatings.optional(),
  costs: sectionSchemas.costs.optional(),
});

export type Study = z.infer<typeof studySchema>;
export type Dataset = z.infer<typeof datasetSchema>;
export type SavedFit = z.infer<typeof savedFitSchema>;
