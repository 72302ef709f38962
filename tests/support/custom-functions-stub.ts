/**
 * A stand-in for Excel's `CustomFunctions` global, so worksheet functions can
 * be called in node as Excel would call them: `CustomFunctions.Error` carries
 * the error code (#VALUE!, #NUM!) and the message shown in the cell's tooltip.
 */
export class StubWorksheetError extends Error {
  constructor(
    public readonly code: string,
    message?: string,
  ) {
    super(message);
  }
}

/** Installs the stub on globalThis (call in beforeAll). */
export function installCustomFunctionsStub(): void {
  (globalThis as Record<string, unknown>).CustomFunctions = {
    Error: StubWorksheetError,
    ErrorCode: { invalidValue: '#VALUE!', invalidNumber: '#NUM!' },
  };
}
