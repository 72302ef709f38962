/**
 * The fields of a project row: input names (also the CSV/worksheet header
 * names) and output columns. One row = one study.
 *
 * Inputs (a bare number takes the default unit; blank = default):
 *
 * | field            | meaning                                                        | bare number / default            |
 * |------------------|----------------------------------------------------------------|----------------------------------|
 * | study            | name of the study (text)                                       | —                                |
 * | dimensions       | 1, 2 or 3                                                      | 3                                |
 * | band_short       | one end of the band: vacuum wavelength or frequency (required) | nm                               |
 * | band_long        | the other end (order does not matter)                          | nm; default band_short           |
 * | index            | background refractive index at the absorber                   | 1                                |
 * | index_max        | index of the densest material (resolution check)               | default index                    |
 * | cell             | cell size Δ (required)                                         | nm                               |
 * | courant          | vacuum Courant number cΔt/Δ                                    | 0.99·(1/√dimensions)             |
 * | size_x/y/z       | structure region, physical size                                | nm                               |
 * | cells_x/y/z      | structure region in cells (instead of size_*)                  | cells                            |
 * | faces            | absorbing faces, e.g. "x-, x+, z+"                             | all faces not periodic           |
 * | periodic         | periodic axes, e.g. "x y" (no absorber there)                  | none                             |
 * | gap              | structure–absorber gap: cells, "0.5 wavelengths", or a length  | cells; blank: 0, size includes it |
 * | angle_max        | largest angle of incidence on the absorber                     | degrees; 0                       |
 * | intensity_error  | tolerated relative intensity error at the monitor (required)   | fraction (0.01); "1%" works      |
 * | coupling         | share of the echo amplitude that reaches the monitor, (0, 1]   | 1                                |
 * | faces_seen       | absorbing faces whose echoes reach the monitor                 | 1                                |
 * | phase            | worst or random (how echo phases combine)                      | worst                            |
 * | share            | share of the error budget given to the absorber, (0, 1]        | 1                                |
 * | duration         | simulated time (one of duration, passes, q)                    | fs                               |
 * | passes           | transits of the longest domain side at speed c/index           | —                                |
 * | q                | quality factor of the slowest resonance                        | —                                |
 * | ring_target      | amplitude the resonance must ring down to                      | 0.001                            |
 * | ring_frequency   | frequency of the resonance                                     | THz; default band centre         |
 * | throughput       | interior cell updates per second on one node                   | —                                |
 * | price_per_hour   | price of one node-hour, any currency ("$3/h")                  | —                                |
 * | precision        | single or double                                               | single                           |
 * | nodes            | number of nodes                                                | 1                                |
 * | efficiency       | parallel efficiency on those nodes, (0, 1]                     | — (or give bandwidth)            |
 * | decomposition    | slab or block (halo exchange)                                  | slab                             |
 * | bandwidth        | network bandwidth per node                                     | GB/s                             |
 * | latency          | latency per message                                            | us; 0                            |
 * | orders           | allowed grading orders                                         | 2, 3, 4                          |
 * | kappa_max        | κ_max of the absorber                                          | 1                                |
 * | alpha_max        | CFS shift α_max in S/m                                         | 0                                |
 * | absorber_factor  | cost of an absorber cell update relative to an interior one    | 1.5                              |
 * | fields_per_cell  | field values stored per cell                                   | 6 (3-D), 3 (2-D), 2 (1-D)        |
 * | material_per_cell| material values stored per cell                                | 3 (3-D), 1 (2-D, 1-D)            |
 *
 * A `remark` column (free text) and any other column are kept in the output
 * unchanged and never read by the planner.
 */

export interface InputField {
  name: string;
  /** Unit of a bare number, '' when none. */
  unit: string;
  description: string;
}

export const INPUT_FIELDS: readonly InputField[] = [
  { name: 'study', unit: '', description: 'name of the study' },
  { name: 'dimensions', unit: '', description: '1, 2 or 3' },
  { name: 'band_short', unit: 'nm', description: 'one end of the band: vacuum wavelength or frequency' },
  { name: 'band_long', unit: 'nm', description: 'other end of the band (default band_short)' },
  { name: 'index', unit: '', description: 'background refractive index at the absorber' },
  { name: 'index_max', unit: '', description: 'index of the densest material' },
  { name: 'cell', unit: 'nm', description: 'cell size' },
  { name: 'courant', unit: '', description: 'vacuum Courant number' },
  { name: 'size_x', unit: 'nm', description: 'structure size along x' },
  { name: 'size_y', unit: 'nm', description: 'structure size along y' },
  { name: 'size_z', unit: 'nm', description: 'structure size along z' },
  { name: 'cells_x', unit: 'cells', description: 'structure cells along x' },
  { name: 'cells_y', unit: 'cells', description: 'structure cells along y' },
  { name: 'cells_z', unit: 'cells', description: 'structure cells along z' },
  { name: 'faces', unit: '', description: 'absorbing faces, e.g. x-, x+, z+' },
  { name: 'periodic', unit: '', description: 'periodic axes, e.g. x y' },
  { name: 'gap', unit: 'cells', description: 'gap between structure and absorber' },
  { name: 'angle_max', unit: 'deg', description: 'largest angle of incidence' },
  { name: 'intensity_error', unit: '', description: 'tolerated relative intensity error' },
  { name: 'coupling', unit: '', description: 'echo coupling to the monitor' },
  { name: 'faces_seen', unit: '', description: 'absorbing faces seen by the monitor' },
  { name: 'phase', unit: '', description: 'worst or random' },
  { name: 'share', unit: '', description: 'share of the error budget for the absorber' },
  { name: 'duration', unit: 'fs', description: 'simulated time' },
  { name: 'passes', unit: '', description: 'transits across the longest side' },
  { name: 'q', unit: '', description: 'quality factor of the slowest resonance' },
  { name: 'ring_target', unit: '', description: 'ring-down target amplitude' },
  { name: 'ring_frequency', unit: 'THz', description: 'frequency of the resonance' },
  { name: 'throughput', unit: 'cell updates/s', description: 'interior cell updates per second per node' },
  { name: 'price_per_hour', unit: 'per node-hour', description: 'price of one node-hour' },
  { name: 'precision', unit: '', description: 'single or double' },
  { name: 'nodes', unit: '', description: 'number of nodes' },
  { name: 'efficiency', unit: '', description: 'parallel efficiency' },
  { name: 'decomposition', unit: '', description: 'slab or block' },
  { name: 'bandwidth', unit: 'GB/s', description: 'network bandwidth per node' },
  { name: 'latency', unit: 'us', description: 'latency per message' },
  { name: 'orders', unit: '', description: 'allowed grading orders' },
  { name: 'kappa_max', unit: '', description: 'kappa max' },
  { name: 'alpha_max', unit: 'S/m', description: 'CFS alpha max' },
  { name: 'absorber_factor', unit: '', description: 'absorber cell update cost / interior' },
  { name: 'fields_per_cell', unit: '', description: 'field values stored per cell' },
  { name: 'material_per_cell', unit: '', description: 'material values stored per cell' },
];

/** The per-cell constants of the cost model (physics/cost.ts), stated wherever costs are shown. */
export const COST_CONSTANTS: readonly { name: string; value: string; field: string }[] = [
  { name: 'field values per cell', value: '6 in 3-D, 3 in 2-D (one polarisation), 2 in 1-D', field: 'fields_per_cell' },
  { name: 'material values per cell', value: 'one coefficient per E component: 3 in 3-D, 1 in 2-D and 1-D', field: 'material_per_cell' },
  { name: 'CPML ψ per cell', value: '4 per stretched axis in 3-D (4 face, 8 edge, 12 corner), 2 in 2-D and 1-D', field: '' },
  { name: 'bytes per value', value: '4 single, 8 double', field: 'precision' },
  { name: 'absorber update factor', value: '1.5 interior updates per absorber cell (memory traffic 23/15)', field: 'absorber_factor' },
  { name: 'halo exchange', value: '4 values per cut cell per step in 3-D, 2 in 2-D and 1-D; 2 messages per neighbour', field: 'bandwidth, latency' },
];

export const INPUT_NAMES: readonly string[] = INPUT_FIELDS.map((f) => f.name);

/** One output column. `format` is an Excel number format for writers that have them. */
export interface OutputColumn {
  name: string;
  unit: string;
  description: string;
  format: string;
}

const SCI = '0.00E+00';
const INT = '#,##0';
const FIX2 = '0.00';
const FIX1 = '0.0';

/** Output columns in order (the worksheet's spilled row and the CLI's added columns). */
export const OUTPUT_COLUMNS: readonly OutputColumn[] = [
  { name: 'required_reflection', unit: '|r|', description: 'amplitude reflection allowed per absorbing face', format: SCI },
  { name: 'layers', unit: 'cells', description: 'absorber thickness', format: '0' },
  { name: 'order', unit: '', description: 'polynomial grading order', format: '0' },
  { name: 'strength', unit: 'σmax/σopt', description: 'conductivity relative to the usual optimum', format: '0.000' },
  { name: 'worst_reflection', unit: '|r|', description: 'worst discrete reflection over band and angles', format: SCI },
  { name: 'continuous_reflection', unit: '|r|', description: 'continuous-theory reflection of the same design', format: SCI },
  { name: 'absorber_thickness', unit: 'm', description: 'layers × cell', format: SCI },
  { name: 'ppw_short', unit: 'cells/λ', description: 'cells per wavelength in the background, short end', format: FIX1 },
  { name: 'ppw_long', unit: 'cells/λ', description: 'cells per wavelength in the background, long end', format: FIX1 },
  { name: 'ppw_densest', unit: 'cells/λ', description: 'cells per wavelength in the densest material, short end', format: FIX1 },
  { name: 'grid', unit: 'cells', description: 'whole grid per axis, absorber included', format: '@' },
  { name: 'cells_total', unit: 'cells', description: 'all cells', format: INT },
  { name: 'cells_absorber', unit: 'cells', description: 'cells inside the absorber', format: INT },
  { name: 'overhead_percent', unit: '%', description: 'absorber cells / interior cells', format: FIX1 },
  { name: 'psi_total', unit: 'values', description: 'CPML auxiliary ψ values', format: INT },
  { name: 'memory', unit: 'GB', description: 'fields + material + ψ', format: '0.000' },
  { name: 'memory_psi', unit: 'GB', description: 'ψ storage', format: '0.000' },
  { name: 'memory_fields', unit: 'GB', description: 'field arrays', format: '0.000' },
  { name: 'memory_material', unit: 'GB', description: 'material storage', format: '0.000' },
  { name: 'field_values_per_cell', unit: 'values', description: 'field values stored per cell (adjust with the fields_per_cell input)', format: INT },
  { name: 'material_values_per_cell', unit: 'values', description: 'material values stored per cell (adjust with the material_per_cell input)', format: INT },
  { name: 'bytes_per_value', unit: 'B', description: 'bytes per stored value (4 single, 8 double; the precision input)', format: INT },
  { name: 'time_step', unit: 's', description: 'Δt = S·Δ/c', format: SCI },
  { name: 'simulated_time', unit: 's', description: 'run length', format: SCI },
  { name: 'steps', unit: '', description: 'time steps', format: INT },
  { name: 'runtime', unit: 'h', description: 'estimated wall time', format: '0.00' },
  { name: 'runtime_interior', unit: 'h', description: 'of which interior work', format: '0.00' },
  { name: 'runtime_absorber', unit: 'h', description: 'of which absorber work', format: '0.00' },
  { name: 'runtime_exchange', unit: 'h', description: 'of which halo exchange', format: '0.00' },
  { name: 'absorber_share', unit: '%', description: 'share of runtime spent in the absorber', format: FIX1 },
  { name: 'cost', unit: 'currency', description: 'runtime × nodes × price per node-hour', format: FIX2 },
  { name: 'halo_per_step', unit: 'MB', description: 'bytes crossing all cuts per step', format: '0.000' },
  { name: 'parallel_efficiency', unit: '', description: 'efficiency used or derived', format: '0.00' },
  { name: 'notes', unit: '', description: 'warnings, or the error that stopped the row', format: '@' },
  { name: 'model_version', unit: '', description: 'version of the physical model', format: '@' },
];

export const OUTPUT_NAMES: readonly string[] = OUTPUT_COLUMNS.map((c) => c.name);

/** "runtime [h]" → "runtime": header cells compare without units, case or surrounding spaces. */
export function headerName(text: unknown): string {
  return String(text ?? '')
    .replace(/\s*[[(][^\])]*[\])]\s*$/, '')
    .trim()
    .toLowerCase();
}

/** Header text of an output column: name with its unit in brackets. */
export function outputHeaderText(c: OutputColumn): string {
  return c.unit ? `${c.name} [${c.unit}]` : c.name;
}
