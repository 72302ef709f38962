/**
 * Worksheet errors. The core throws HushInputError with a kind; Excel shows
 * kind 'value' as #VALUE! (wrong type of input) and kind 'number' as #NUM!
 * (a number outside what the model accepts), with the message in the cell's
 * error tooltip.
 */
import { isHushInputError } from '../plan/steps';

/** The CustomFunctions.Error that Excel should show for an exception thrown while computing. */
export function toWorksheetError(e: unknown): CustomFunctions.Error {
  if (isHushInputError(e)) {
    const code = e.kind === 'value' ? CustomFunctions.ErrorCode.invalidValue : CustomFunctions.ErrorCode.invalidNumber;
    return new CustomFunctions.Error(code, e.message);
  }
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
