/** The per-cell constants of the cost model (physics/cost.ts), stated wherever costs are shown. */
export const COST_CONSTANTS: readonly { name: string; value: string; field: string }[] = [
  { name: 'field values per cell', value: '6 in 3-D, 3 in 2-D (one polarisation), 2 in 1-D', field: 'fields_per_cell' },
  { name: 'material values per cell', value: 'one coefficient per E component: 3 in 3-D, 1 in 2-D and 1-D', field: 'material_per_cell' },
  { name: 'CPML ψ per cell', value: '4 per stretched axis in 3-D (4 face, 8 edge, 12 corner), 2 in 2-D and 1-D', field: '' },
  { name: 'bytes per value', value: '4 single, 8 double', field: 'precision' },
  { name: 'absorber update factor', value: '1.5 interior updates per absorber cell (memory traffic 23/15)', field: 'absorber_factor' },
  { name: 'halo exchange', value: '4 values per cut cell per step in 3-D, 2 in 2-D and 1-D; 2 messages per neighbour', field: 'bandwidth, latency' },
];
