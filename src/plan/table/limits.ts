/**
 * Bounds of a project table. Every reader checks them while it reads, so the
 * work done on a table is proportional to what is really in it and stops at
 * the first cell beyond a bound.
 */

/** Most study rows below the header (a larger table is almost surely not a project table). */
export const MAX_TABLE_ROWS = 100_000;
/** Largest table file read, bytes. */
export const MAX_TABLE_BYTES = 64 * 1024 * 1024;
/** Most columns: the fields of a study (42) and the plan's outputs (35) leave room for many of the user's own. */
export const MAX_TABLE_COLUMNS = 1000;
/** Most non-empty cells of one table (100,000 studies of 100 cells). */
export const MAX_TABLE_CELLS = 10_000_000;
/** Most characters in one cell: what a spreadsheet cell holds (32,767, common practice of spreadsheet programs). */
export const MAX_CELL_CHARS = 32_767;
/** Most bytes an .xlsx may unpack to (its XML parts that are read). */
export const MAX_XLSX_UNPACKED_BYTES = 512 * 1024 * 1024;
/** The header row is looked for within this many first rows (title rows may sit above it). */
export const HEADER_SEARCH_ROWS = 20;
/** Most characters of a value of a plan field (other than `study`): error messages quote values whole, so this also bounds what they quote. */
export const MAX_FIELD_CHARS = 80;
/** Most characters of the input quoted in one message. */
export const MAX_QUOTE_CHARS = 80;
