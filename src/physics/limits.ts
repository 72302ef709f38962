/**
 * Limits and defaults of the model's inputs that more than one module (or a
 * front end's field registry) needs, named once. Each limit is a sanity bound
 * on what the model accepts, not a physical law; the reason stands beside it.
 */

/** Highest refractive index accepted (no optical or RF material used in FDTD is denser; larger values are unit slips). */
export const MAX_INDEX = 100;
/** Share of the Courant limit used by default: a small margin below the limit (common practice). */
export const DEFAULT_COURANT_FRACTION = 0.99;
/** Grading orders tried by default (Taflove & Hagness, 3rd ed., ch. 7, cite 3 ≤ m ≤ 4 as usual; 2 is often the cheapest on thin layers). */
export const DEFAULT_ORDERS: readonly number[] = [2, 3, 4];
/** Lowest grading order a design may use (order 0 is a step: it reflects at its front). */
export const MIN_DESIGN_ORDER = 1;
/** Most absorbing faces whose echoes can reach one monitor (the six faces of a 3-D domain). */
export const MAX_FACES_SEEN = 6;
/** Most transits of the domain a run may be planned for. */
export const MAX_PASSES = 1e6;
/** Most stored field (or material) values per cell accepted. */
export const MAX_VALUES_PER_CELL = 64;
/** Absorber update factor range: an absorber cell costs at least one interior update and at most a hundred. */
export const MIN_ABSORBER_FACTOR = 1;
export const MAX_ABSORBER_FACTOR = 100;
/** Throughput range, interior cell updates per second on one node. */
export const MIN_THROUGHPUT = 1;
export const MAX_THROUGHPUT = 1e16;
/** Highest price of one node-hour accepted (any currency). */
export const MAX_PRICE_PER_HOUR = 1e7;
/** Highest latency per message accepted, seconds. */
export const MAX_LATENCY_SECONDS = 1;
/** Network bandwidth range per node, bytes per second. */
export const MIN_BANDWIDTH = 1;
export const MAX_BANDWIDTH = 1e14;
/** Lowest parallel efficiency accepted. */
export const MIN_EFFICIENCY = 0.01;
/** Distance range of a ripple's reflecting pair, metres. */
export const MIN_RIPPLE_DISTANCE = 1e-12;
export const MAX_RIPPLE_DISTANCE = 1e6;
/** Ripple period range, Hz. */
export const MIN_RIPPLE_PERIOD = 1e-3;
export const MAX_RIPPLE_PERIOD = 1e18;
/** Largest relative peak-to-peak ripple: an echo of |r| < 1 swings the intensity by less than 4 (derived: (1+A)² − (1−A)² = 4A). */
export const MAX_RIPPLE_PEAK_TO_PEAK = 4;
