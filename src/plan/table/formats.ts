/**
 * Number formats of .xlsx cells: the built-in formats by id (ECMA-376 Part 1,
 * §18.8.30 numFmt; ids and codes recalled from memory of that table) and
 * whether a format shows a date or time.
 */

/** Built-in number formats that have a fixed code (ids 0–49 of ECMA-376 §18.8.30). */
export const BUILTIN_FORMATS: Readonly<Record<number, string>> = {
  0: 'General',
  1: '0',
  2: '0.00',
  3: '#,##0',
  4: '#,##0.00',
  9: '0%',
  10: '0.00%',
  11: '0.00E+00',
  12: '# ?/?',
  13: '# ??/??',
  14: 'mm-dd-yy',
  15: 'd-mmm-yy',
  16: 'd-mmm',
  17: 'mmm-yy',
  18: 'h:mm AM/PM',
  19: 'h:mm:ss AM/PM',
  20: 'h:mm',
  21: 'h:mm:ss',
  22: 'm/d/yy h:mm',
  37: '#,##0 ;(#,##0)',
  38: '#,##0 ;[Red](#,##0)',
  39: '#,##0.00;(#,##0.00)',
  40: '#,##0.00;[Red](#,##0.00)',
  45: 'mm:ss',
  46: '[h]:mm:ss',
  47: 'mmss.0',
  48: '##0.0E+0',
  49: '@',
};

/** Ids of built-in formats that are dates or times, including the locale-dependent ones (27–36, 50–58) that have no fixed code. */
const BUILTIN_DATE_IDS = new Set([14, 15, 16, 17, 18, 19, 20, 21, 22, 27, 28, 29, 30, 31, 32, 33, 34, 35, 36, 45, 46, 47, 50, 51, 52, 53, 54, 55, 56, 57, 58]);

/** Code of a built-in format id, or a stand-in date code for a locale-dependent date id; undefined for an unknown id. */
export function builtinFormat(id: number): string | undefined {
  return BUILTIN_FORMATS[id] ?? (BUILTIN_DATE_IDS.has(id) ? 'yyyy-mm-dd' : undefined);
}

/** True when a number format shows a date or a time: it has d, m, y, h or s outside quoted text, escapes and colour or condition brackets. */
export function isDateFormat(code: string): boolean {
  const bare = code
    .replace(/"[^"]*"/g, '')
    .replace(/\\./g, '')
    .replace(/\[(?![hms]+\])[^\]]*\]/gi, '')
    .replace(/_.|\*./g, '');
  return /[dmyhs]/i.test(bare) && !/^general$/i.test(bare.trim());
}

/**
 * ISO 8601 text of a spreadsheet date serial as a spreadsheet shows it: days
 * since 1899-12-30 in the 1900 date system (since 1904-01-01 in a 1904
 * workbook), the time only when there is one. The 1900 system counts a
 * 29 February 1900 that did not exist (common practice of spreadsheet
 * programs, kept for compatibility): serial 60 is shown as that day and
 * serials below it one day later than the plain count gives.
 */
export function serialDateText(serial: number, date1904: boolean): string {
  if (!date1904 && serial >= 60 && serial < 61) return '1900-02-29';
  const epoch = date1904 ? Date.UTC(1904, 0, 1) : serial < 60 ? Date.UTC(1899, 11, 31) : Date.UTC(1899, 11, 30);
  const ms = Math.round(serial * 86400000);
  const iso = new Date(epoch + ms).toISOString();
  return ms % 86400000 === 0 ? iso.slice(0, 10) : iso.slice(0, 19);
}
