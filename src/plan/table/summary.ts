/**
 * Figures of a compute proposal, per study and in total: cells, peak memory,
 * steps, node-hours, runtime and cost, each with the absorber's share, and
 * the assumptions they rest on (throughput, price, precision). Runtime and
 * cost are planning estimates from the user's throughput and price.
 *
 * The absorber's part of each (derived from the cost model, physics/cost.ts):
 * cells: the absorber cells; memory: all ψ values (they exist only in the
 * absorber) plus the field and material values of the absorber cells;
 * runtime, node-hours and cost: the absorber work. Totals are sums over the
 * studies, except peak memory, which is the largest study's (each study is
 * its own run).
 */
import type { Plan } from '../index';
import { priceParts, type FieldValue } from '../units';

export interface StudyFigures {
  study: string;
  /** Row of the study in the table. */
  row: number;
  cells: number;
  cellsAbsorber: number;
  memoryBytes: number;
  memoryAbsorberBytes: number;
  steps: number | null;
  nodes: number;
  runtimeHours: number | null;
  runtimeAbsorberHours: number | null;
  nodeHours: number | null;
  nodeHoursAbsorber: number | null;
  cost: number | null;
  costAbsorber: number | null;
  throughput: number | null;
  /** The price as typed ('' when none), and its currency ('' when none typed). */
  price: string;
  currency: string;
  precision: string;
}

/** The figures of one planned study. `priceTyped` is the price_per_hour cell as typed. */
export function studyFigures(plan: Plan, row: number, label: string, priceTyped: FieldValue): StudyFigures {
  const c = plan.cost;
  const d = c.domain;
  const m = c.memory;
  const rt = c.runtime;
  const nodes = plan.inputs.nodes;
  const hours = rt ? rt.totalSeconds / 3600 : null;
  const absorberHours = rt ? rt.absorberSeconds / 3600 : null;
  const share = rt && rt.totalSeconds > 0 ? rt.absorberSeconds / rt.totalSeconds : 0;
  let currency = '';
  if (plan.inputs.pricePerHour !== null && priceTyped !== undefined && priceTyped !== null && priceTyped !== '') currency = priceParts('price_per_hour', priceTyped).currency;
  return {
    study: label,
    row,
    cells: d.cellsTotal,
    cellsAbsorber: d.cellsAbsorber,
    memoryBytes: m.totalBytes,
    memoryAbsorberBytes: m.psiBytes + (d.cellsTotal > 0 ? ((m.fieldBytes + m.materialBytes) * d.cellsAbsorber) / d.cellsTotal : 0),
    steps: c.time ? c.time.steps : null,
    nodes,
    runtimeHours: hours,
    runtimeAbsorberHours: absorberHours,
    nodeHours: hours === null ? null : hours * nodes,
    nodeHoursAbsorber: absorberHours === null ? null : absorberHours * nodes,
    cost: rt && rt.cost !== null ? rt.cost : null,
    costAbsorber: rt && rt.cost !== null ? rt.cost * share : null,
    throughput: plan.inputs.throughput,
    price: plan.inputs.pricePerHour === null ? '' : String(priceTyped ?? plan.inputs.pricePerHour),
    currency,
    precision: plan.inputs.precision,
  };
}

export interface PlanTotals {
  /** Studies planned, and rows that failed (not in the totals). */
  studies: number;
  failed: number;
  cells: number;
  cellsAbsorber: number;
  /** The largest study's memory, its absorber part, and that study's name. */
  peakMemoryBytes: number;
  peakMemoryAbsorberBytes: number;
  peakMemoryStudy: string;
  /** Sums over the studies that have a run length (`withSteps` of them). */
  steps: number;
  withSteps: number;
  /** Sums over the studies that have a runtime (`withRuntime` of them). */
  runtimeHours: number;
  runtimeAbsorberHours: number;
  nodeHours: number;
  nodeHoursAbsorber: number;
  withRuntime: number;
  /** Sum over the studies that have a cost, or null when they price in different currencies (listed in `currencies`). */
  cost: number | null;
  costAbsorber: number | null;
  withCost: number;
  /** Currencies typed with the prices (one: the cost total is in it; several: no cost total). */
  currencies: string[];
}

/** Totals of the planned studies; `failed` rows are counted but not summed. */
export function planTotals(studies: readonly StudyFigures[], failed: number): PlanTotals {
  const t: PlanTotals = {
    studies: studies.length,
    failed,
    cells: 0,
    cellsAbsorber: 0,
    peakMemoryBytes: 0,
    peakMemoryAbsorberBytes: 0,
    peakMemoryStudy: '',
    steps: 0,
    withSteps: 0,
    runtimeHours: 0,
    runtimeAbsorberHours: 0,
    nodeHours: 0,
    nodeHoursAbsorber: 0,
    withRuntime: 0,
    cost: 0,
    costAbsorber: 0,
    withCost: 0,
    currencies: [],
  };
  const currencies = new Set<string>();
  let cost = 0;
  let costAbsorber = 0;
  for (const s of studies) {
    t.cells += s.cells;
    t.cellsAbsorber += s.cellsAbsorber;
    if (s.memoryBytes > t.peakMemoryBytes || t.peakMemoryStudy === '') {
      t.peakMemoryBytes = s.memoryBytes;
      t.peakMemoryAbsorberBytes = s.memoryAbsorberBytes;
      t.peakMemoryStudy = s.study;
    }
    if (s.steps !== null) {
      t.steps += s.steps;
      t.withSteps++;
    }
    if (s.runtimeHours !== null) {
      t.runtimeHours += s.runtimeHours;
      t.runtimeAbsorberHours += s.runtimeAbsorberHours ?? 0;
      t.nodeHours += s.nodeHours ?? 0;
      t.nodeHoursAbsorber += s.nodeHoursAbsorber ?? 0;
      t.withRuntime++;
    }
    if (s.cost !== null) {
      cost += s.cost;
      costAbsorber += s.costAbsorber ?? 0;
      t.withCost++;
      if (s.currency) currencies.add(s.currency);
    }
  }
  t.currencies = [...currencies].sort();
  t.cost = currencies.size > 1 ? null : cost;
  t.costAbsorber = currencies.size > 1 ? null : costAbsorber;
  return t;
}

/** part/whole, or null when the whole is 0. */
export function share(part: number, whole: number): number | null {
  return whole > 0 ? part / whole : null;
}

/** The totals as the JSON plan carries them (shares as fractions; null where there is nothing to sum). */
export function totalsRecord(t: PlanTotals): Record<string, unknown> {
  return {
    studies: t.studies,
    failed: t.failed,
    cells_total: t.cells,
    cells_absorber_share: share(t.cellsAbsorber, t.cells),
    peak_memory_gb: t.studies ? t.peakMemoryBytes / 1e9 : null,
    peak_memory_absorber_share: share(t.peakMemoryAbsorberBytes, t.peakMemoryBytes),
    peak_memory_study: t.studies ? t.peakMemoryStudy : null,
    steps: t.withSteps ? t.steps : null,
    studies_with_steps: t.withSteps,
    node_hours: t.withRuntime ? t.nodeHours : null,
    node_hours_absorber_share: share(t.nodeHoursAbsorber, t.nodeHours),
    runtime_hours: t.withRuntime ? t.runtimeHours : null,
    runtime_absorber_share: share(t.runtimeAbsorberHours, t.runtimeHours),
    studies_with_runtime: t.withRuntime,
    cost: t.withCost ? t.cost : null,
    cost_absorber_share: t.cost === null || t.costAbsorber === null ? null : share(t.costAbsorber, t.cost),
    studies_with_cost: t.withCost,
    currencies: t.currencies,
    note:
      'Sums over the planned studies; peak memory is the largest study (each study is its own run). Runtime, node-hours and cost are planning estimates ' +
      'from the throughput and price given per study.' +
      (t.cost === null ? ' No cost total: the studies price in different currencies.' : ''),
  };
}
