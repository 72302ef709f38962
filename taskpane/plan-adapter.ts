/**
 * Everything the pane takes from the plan API (src/plan), in one place: the
 * table schema, the study's plan for a row, one plan per absorber option, and
 * the output values to write back. The pane computes no budget, design or cost
 * of its own: each option is the plan of the same inputs restricted to one
 * grading order (and one CFS α), so an option's numbers are exactly what the
 * worksheet and the command line give for that choice.
 */
import {
  INPUT_FIELDS,
  INPUT_NAMES,
  OUTPUT_COLUMNS,
  OUTPUT_NAMES,
  headerName,
  planFromInputs,
  planInputs,
  planRecord,
  rowFromTable,
  type Plan,
  type PlanInputs,
  type ProjectRow,
} from '../src/plan';
import { conductivityFromNorm } from '../src/plan/steps';
import type { RowValues, TableSchema } from '../src/workbook/types';

export type { Plan, PlanInputs, ProjectRow };
export { INPUT_FIELDS, OUTPUT_COLUMNS };

/** The inputs the plan cannot do without: a block of cells is a project table when its header names them. */
export const REQUIRED_INPUTS = ['band_short', 'cell', 'intensity_error'] as const;

export const TABLE_SCHEMA: TableSchema = {
  inputs: INPUT_NAMES,
  required: REQUIRED_INPUTS,
  outputs: OUTPUT_NAMES,
  normalise: headerName,
};

/** The plan's project row from the values read from the workbook (header names as written, units in brackets allowed). */
export function projectRow(values: RowValues): ProjectRow {
  const header = Object.keys(values);
  return rowFromTable(header, header.map((h) => values[h]));
}

/** The study's plan (what `planRow` gives for this row). */
export function studyPlan(values: RowValues): Plan {
  return planFromInputs(planInputs(projectRow(values)));
}

/**
 * When the pane offers a CFS option: a CFS shift α helps where slowly varying
 * and evanescent fields reach the absorber (Roden & Gedney 2000), i.e. when the
 * band's long end spans many cells. The threshold of 40 cells per wavelength is
 * this planner's own default, an assumption rather than a published value.
 */
export const CFS_RELEVANT_PPW = 40;

/**
 * α_max suggested for the CFS option: the shift frequency α/(2πε₀) at half the
 * band's lowest frequency, so that α/ω ≤ ½ across the band (the shift sits
 * below the band, as the CFS is meant to; the factor ½ is this planner's own default). In normalised form α_norm = α·η₀·Δ·n and
 * ω_norm = 2π/ppw (physics.md §3), so α_norm = π/ppw_long.
 */
export function suggestedAlphaMax(plan: Plan): number {
  return conductivityFromNorm(Math.PI / plan.grid.ppwLong, plan.inputs.cell, plan.inputs.index);
}

/** The CFS α values (S/m) to compare for this study: the study's own, and the other choice when it matters. */
/** The CFS α (S/m) of a plan's design: typed by the user, or chosen by the design for a near field. */
export function designAlphaMax(plan: Plan): number {
  return conductivityFromNorm(plan.design.alphaMaxNorm, plan.accuracy.cell, plan.inputs.index);
}

export function alphaChoices(plan: Plan): number[] {
  const own = designAlphaMax(plan);
  if (own > 0) return [own, 0];
  return plan.grid.ppwLong >= CFS_RELEVANT_PPW ? [0, suggestedAlphaMax(plan)] : [0];
}

export interface OptionPlan {
  order: number;
  alphaMax: number;
  /** The plan with this option's design, or why there is none. */
  plan: Plan | null;
  error: string | null;
  /** True for the study's own plan (what planRow recommends). */
  recommended: boolean;
}

/**
 * One plan per allowed grading order and per α choice. The recommended option
 * is the study's plan itself (its design is the thinnest over all orders at
 * the study's own α).
 */
export function optionPlans(study: Plan): OptionPlan[] {
  const out: OptionPlan[] = [];
  for (const alphaMax of alphaChoices(study)) {
    for (const order of study.inputs.orders) {
      const inputs: PlanInputs = { ...study.inputs, orders: [order], alphaMax, alphaMaxGiven: true };
      let plan: Plan | null = null;
      let error: string | null = null;
      try {
        plan = planFromInputs(inputs);
      } catch (e) {
        error = e instanceof Error ? e.message : String(e);
      }
      const recommended = alphaMax === designAlphaMax(study) && order === study.design.order;
      out.push({ order, alphaMax, plan: recommended ? study : plan, error: recommended ? null : error, recommended });
    }
  }
  return out;
}

/** The output values of a plan by column name; blanks where the plan has no value (so stale values are cleared). */
export function outputValues(plan: Plan): RowValues {
  const record = planRecord(plan);
  const out: RowValues = {};
  for (const n of OUTPUT_NAMES) out[n] = record[n] ?? '';
  return out;
}

/** Unit of an input field for display ('' when none). */
export function inputUnit(name: string): string {
  return INPUT_FIELDS.find((f) => f.name === headerName(name))?.unit ?? '';
}

/** True for a plan input column (header text compared as the plan compares it). */
export function isInputField(name: string): boolean {
  return INPUT_NAMES.includes(headerName(name));
}

export { starterTable, type StarterTable } from '../src/plan/starter';
