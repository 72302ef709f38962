/**
 * Which time-domain runs the pane makes for a design: the plan API's choice
 * (src/plan/verify.ts) within the pane's budget, re-exported here for the pane.
 */
export {
  PANE_BUDGET_1D,
  PANE_BUDGET_2D,
  MEASURED_FREQUENCIES,
  chooseRuns,
  measuredPpw,
  widenedBand,
  type PreparedRun,
  type RunChoice,
  type SkippedRun,
} from '../src/plan/verify';
