/** Speed of light in vacuum, m/s (exact, SI 2019). */
export const SPEED_OF_LIGHT = 299_792_458;
/** Vacuum permeability, H/m (CODATA 2018 value). */
export const MU0 = 1.25663706212e-6;
/** Vacuum permittivity, F/m, from ε₀ = 1/(μ₀c²). */
export const EPS0 = 1 / (MU0 * SPEED_OF_LIGHT * SPEED_OF_LIGHT);
/** Impedance of free space η₀ = μ₀c, Ω. */
export const ETA0 = MU0 * SPEED_OF_LIGHT;

/** Smallest cell size accepted, m (a femtometre: no electromagnetic grid is finer; smaller values are unit mistakes and underflow the time step). */
export const MIN_CELL_METRES = 1e-15;
/** Largest absorber the planner accepts, in cells. Thicker absorbers are never needed in practice and would only hide a wrong input. */
export const MAX_LAYERS = 200;
/** Largest polynomial grading order accepted (Taflove & Hagness cite 3 ≤ m ≤ 4 as usual; higher orders are allowed for study). */
export const MAX_ORDER = 10;
/** Largest κ_max accepted. */
export const MAX_KAPPA = 100;
/** Largest strength σ_max/σ_opt accepted. */
export const MAX_STRENGTH = 20;
/** Largest normalised α_max = α·η₀·Δ·n accepted. */
export const MAX_ALPHA_NORM = 10;
/** Version of the physical model; results are stable within one model version. */
export const MODEL_VERSION = '2.0.0';
