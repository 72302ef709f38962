/**
 * Worksheet errors. The core throws HushInputError with a kind; Excel shows
 * kind 'value' as #VALUE! (wrong type of input) and kind 'number' as #NUM!
 * (a number outside what the model accepts), with the message in the cell's
 * error tooltip. Two outcomes come from the machinery rather than the inputs:
 * a cancelled calculation (JobCancelled: Excel recalculated or removed the
 * cells waiting for it, so nobody sees it) and a worker that stopped while
 * computing (WorkerFailed); neither is memoised (plans.ts).
 */
import { isHushInputError } from '../plan/steps';

/** A calculation was cancelled before it settled (nobody is waiting for it any more). */
export class JobCancelled extends Error {
  constructor() {
    super('the calculation was cancelled: Excel recalculated or removed the cells waiting for it');
    this.name = 'JobCancelled';
  }
}

/** The worker stopped while it ran a calculation (which may succeed if run again). */
export class WorkerFailed extends Error {
  constructor(message: string) {
    super(`the worksheet functions' worker stopped: ${message}`);
    this.name = 'WorkerFailed';
  }
}

/** True for the outcomes that say nothing about the inputs (not to be memoised). */
export function isTransient(e: unknown): boolean {
  return e instanceof JobCancelled || e instanceof WorkerFailed;
}

/** The CustomFunctions.Error that Excel should show for an exception thrown while computing. */
export function toWorksheetError(e: unknown): CustomFunctions.Error {
  if (isHushInputError(e)) {
    const code = e.kind === 'value' ? CustomFunctions.ErrorCode.invalidValue : CustomFunctions.ErrorCode.invalidNumber;
    return new CustomFunctions.Error(code, e.message);
  }
  if (e instanceof JobCancelled) return new CustomFunctions.Error(CustomFunctions.ErrorCode.invalidValue, e.message);
  const message = e instanceof Error ? e.message : String(e);
  return new CustomFunctions.Error(CustomFunctions.ErrorCode.invalidValue, `internal error: ${message}`);
}

/** Runs a computation and turns any exception into the worksheet error Excel should show. */
export function worksheet<T>(compute: () => T): T {
  try {
    return compute();
  } catch (e) {
    throw toWorksheetError(e);
  }
}
