/**
 * The plan's notes on its accuracy split: where the tolerance went and why,
 * in one sentence each, so that a user sees what the planner chose for them.
 */
import type { AccuracyPlan } from './accuracy';
import type { PlanInputs } from './row';

/** A resonance shift above this many linewidths is noted when it is not budgeted (resonance = ringdown). */
export const SHIFT_NOTE_LINEWIDTHS = 0.1;

const pct = (x: number) => `${Number((100 * x).toPrecision(3))} %`;
const nm = (m: number) => `${Number((m * 1e9).toPrecision(4))} nm`;

/** Fewer layers than this is thinner than common practice (about 8–10 layers, Taflove & Hagness 3rd ed. ch. 7 use 10). */
export const COMMON_PRACTICE_LAYERS = 8;

/** Notes on the design itself: thinner than common practice, the medium that limits it, the near field, κ/α chosen. */
export function designNotes(i: PlanInputs, a: AccuracyPlan): string[] {
  const d = a.design;
  const notes: string[] = [];
  const g = (x: number) => Number(x.toPrecision(3));
  if (d.layers < COMMON_PRACTICE_LAYERS) {
    notes.push(
      `thin absorber: ${d.layers} layers, fewer than the ${COMMON_PRACTICE_LAYERS}–10 of common practice; on this grid it reflects at most ${g(d.worstAmplitude)} (continuous theory would say ${g(d.continuousAmplitude)}), which meets the target; keep a thicker one if your solver's convention is not ${d.samplingChecked === 'all' ? 'among node, average and offset' : d.samplingChecked}`,
    );
  }
  if (d.mediumWorst.length > 1) notes.push(`media crossing the absorber: the design is limited by index ${d.limitingIndex} (worst |r| ${g(d.mediumWorst.find((m) => m.index === d.limitingIndex)?.worstAmplitude ?? d.worstAmplitude)})`);
  if (d.worstEvanescent !== null) {
    notes.push(
      `near field: decay lengths from ${g(d.decayMinCells ?? 0)} cells${i.decayMinDerived ? ' (from index_max and index)' : ''}; worst evanescent reflection back at the structure ${g(d.worstEvanescent)} (${g(d.worstEvanescentBare ?? 0)} at the interface, across a gap of ${d.gapCells} cells)`,
    );
  }
  if (d.kappaChosen || d.alphaChosen) notes.push(`κ_max ${g(d.kappaMax)}${d.kappaChosen ? ' (chosen)' : ''}; ${d.alphaReason}`);
  return notes;
}

export function accuracyNotes(i: PlanInputs, a: AccuracyPlan): string[] {
  const notes: string[] = [];
  const e = a.errors;
  const parts = [`absorber ${pct(e.absorber)}`, `dispersion ${pct(e.dispersion)}`, `run ${pct(e.run)}`].join(', ');
  const how = i.phase === 'worst' ? 'added' : 'in quadrature';
  if (a.shareOverride) {
    notes.push(`accuracy: share ${i.share} gives the absorber ${pct((i.share as number) * i.intensityError)} of intensity error; with ${parts} the errors come to ${pct(e.combined)} (${how}) against ${pct(i.intensityError)}`);
    if (e.combined > i.intensityError) notes.push(`accuracy: the errors exceed the tolerance: clear share to let the planner split it, or refine the cell or lengthen the run`);
  } else {
    notes.push(`accuracy split: ${parts} (${how}: ${pct(e.combined)} of ${pct(i.intensityError)})`);
  }
  if (a.cell < i.cell) {
    notes.push(`cell refined to ${nm(a.cell)} (from ${nm(i.cell)}) to keep the grid's dispersion within its share${a.ppwMin !== null ? ` (at least ${Math.ceil(a.ppwMin)} cells per wavelength in the densest material)` : ''}`);
  }
  if (a.saving !== null && a.baselineCost !== null && a.saving > 0 && a.baselineCost > 0) {
    notes.push(`the split is ${pct(a.saving / a.baselineCost)} cheaper (in ${a.measure}) than giving the absorber all the rest at your cell and run length`);
  } else if (!a.shareOverride && a.baselineNote) {
    notes.push(`at your cell and run length: ${a.baselineNote}`);
  }
  if (a.resonanceShift !== null && i.resonance === 'ringdown' && a.resonanceShift > SHIFT_NOTE_LINEWIDTHS) {
    notes.push(
      `the grid shifts the resonance by ${Number(a.resonanceShift.toPrecision(3))} linewidths (q ${i.q}); not counted as error because resonance is ringdown: set resonance to line if the study measures the line`,
    );
  }
  if (a.truncated) notes.push('accuracy: the search stopped at its bound on design searches; a cheaper split may exist');
  return notes;
}
