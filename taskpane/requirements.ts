/**
 * The Excel JavaScript API versions the pane calls, checked with
 * Office.context.requirements.isSetSupported before anything is read or
 * written, so an older host gets a clear message instead of a failing call.
 * Versions from the Excel JavaScript API reference (requirement set named on
 * each method's page).
 */

export interface ApiNeed {
  version: string;
  /** What needs it, for the message. */
  use: string;
  /** A missing optional set only drops a feature; a missing required set disables the pane's Excel work. */
  optional?: boolean;
}

export const EXCEL_API_NEEDS: readonly ApiNeed[] = [
  { version: '1.4', use: 'the used range of the target area (Range.getUsedRangeOrNullObject, Insert project table)' },
  { version: '1.7', use: 'reading and writing a row by position (Range.getSurroundingRegion, Worksheet.getRangeByIndexes)' },
  { version: '1.8', use: 'the choice lists of Insert project table (Range.dataValidation)' },
  { version: '1.9', use: 'finding the Excel table around the selection (Range.getTables, TableScopedCollection.getFirst)' },
  { version: '1.18', use: 'header notes of Insert project table (Worksheet.notes)', optional: true },
];

export interface ApiCheck {
  /** Required sets the host lacks (the pane cannot read rows or insert a table). */
  missing: ApiNeed[];
  /** Optional sets the host lacks (a feature is skipped). */
  skipped: ApiNeed[];
  /** Text for the pane, '' when everything is there. */
  message: string;
}

/** Which of EXCEL_API_NEEDS the host lacks, and what the pane says about it. */
export function checkExcelApi(isSetSupported: (name: string, version: string) => boolean): ApiCheck {
  const lacking = EXCEL_API_NEEDS.filter((n) => !isSetSupported('ExcelApi', n.version));
  const missing = lacking.filter((n) => !n.optional);
  const skipped = lacking.filter((n) => n.optional);
  const parts: string[] = [];
  if (missing.length) {
    const top = missing[missing.length - 1].version;
    parts.push(
      `This Excel is older than the pane needs: it lacks ExcelApi ${missing.map((n) => n.version).join(', ')} ` +
        `(${missing.map((n) => n.use).join('; ')}). Update Excel (ExcelApi ${top} or later) to read rows and insert tables here; ` +
        'the HUSH.* worksheet functions work without it.',
    );
  }
  if (skipped.length) parts.push(`No ExcelApi ${skipped.map((n) => n.version).join(', ')} in this Excel: ${skipped.map((n) => n.use).join('; ')} are left out.`);
  return { missing, skipped, message: parts.join(' ') };
}
