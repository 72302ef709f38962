/**
 * Direct discrete-time Fourier transform X(ω) = Σₙ x[n]·e^{−jωΔt·n} of a
 * finite record at chosen phase steps ωΔt (no FFT grid, no window): for a
 * record that contains the whole response, the ratio of two such sums is the
 * exact discrete transfer function (Oppenheim & Schafer, Discrete-Time Signal
 * Processing, ch. 2: the DTFT of a convolution is the product of the DTFTs).
 */

/** Writes [Re X, Im X] of x[0…length−1] at phase step `omegaDt` into out[0], out[1]. */
export function dtftAt(x: Float64Array, length: number, omegaDt: number, out: Float64Array): Float64Array {
  let re = 0;
  let im = 0;
  for (let n = 0; n < length; n++) {
    const v = x[n];
    if (v === 0) continue;
    const ph = omegaDt * n;
    re += v * Math.cos(ph);
    im -= v * Math.sin(ph);
  }
  out[0] = re;
  out[1] = im;
  return out;
}
