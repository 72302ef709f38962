/**
 * The core's normalised units (physics.md §3): cell Δ = 1, the background
 * medium's wave speed v = 1, so Δt = S_m = S/n; conductivities normalised by
 * η₀·Δ·n so that σΔt/ε₀ = σ_norm·S_m. Each conversion is written once here.
 */
import { ETA0 } from './constants';

/** σ_norm = σ·η₀·Δ·n for a conductivity σ (S/m, also the CFS shift α), cell Δ (m) and background index n. */
export function conductivityNorm(sigma: number, cellMetres: number, index: number): number {
  return sigma * ETA0 * cellMetres * index;
}

/** σ (S/m) from its normalised value: the inverse of conductivityNorm. */
export function conductivityFromNorm(norm: number, cellMetres: number, index: number): number {
  return norm / (ETA0 * cellMetres * index);
}

/** Phase advance per time step ωΔt = 2π·S_m/ppw for a wave of ppw cells per wavelength in the medium. */
export function phaseStep(ppw: number, courantMedium: number): number {
  return (2 * Math.PI * courantMedium) / ppw;
}
