/**
 * The 2-D grid's WebAssembly step (src/physics/fdtd/wasm/tmz-step.c) does the
 * same arithmetic as its TypeScript step: bit-identical fields after a pulse
 * has crossed both absorbers (independent computation: the two builds of one update).
 */
import { describe, expect, it } from 'vitest';
import { TmzGrid2D, cpmlCoefficients, resolveDesign } from '../src/physics';
import { wasmSwitch } from '../src/physics/fdtd/wasm/runtime';

function run(webAssembly: boolean, left: boolean, right: boolean) {
  wasmSwitch.enabled = webAssembly;
  try {
    const dt = 0.69;
    const coef = cpmlCoefficients(resolveDesign({ layers: 7, order: 3, kappaMax: 2, alphaMaxNorm: 0.1 }), dt);
    const g = new TmzGrid2D({ cells: 120, transverseCells: 12, courantMedium: dt, left: left ? coef : null, right: right ? coef : null });
    const src = (g.leftInterface + 10) * 12;
    for (let n = 0; n < 500; n++) {
      g.step();
      const t = n - 60;
      for (let j = 0; j < 12; j++) g.ez[src + j] += Math.sin(0.3 * t) * Math.exp(-((t / 15) ** 2)) * Math.cos((2 * Math.PI * j) / 12);
    }
    return { used: g.usesWebAssembly, ez: Array.from(g.ez), hx: Array.from(g.hx), hy: Array.from(g.hy) };
  } finally {
    wasmSwitch.enabled = true;
  }
}

describe('2-D step: WebAssembly and TypeScript builds', () => {
  for (const [left, right] of [[true, true], [true, false], [false, true], [false, false]] as const) {
    it(`agree bit for bit (absorber left: ${left}, right: ${right})`, () => {
      const a = run(true, left, right);
      const b = run(false, left, right);
      expect(a.used).toBe(true); // Node 20 runs WebAssembly with SIMD
      expect(b.used).toBe(false);
      for (const f of ['ez', 'hx', 'hy'] as const) {
        expect(a[f].length).toBe(b[f].length);
        expect(a[f].every((v, k) => Object.is(v, b[f][k]))).toBe(true);
      }
      expect(a.ez.some((v) => v !== 0)).toBe(true);
    });
  }
});
