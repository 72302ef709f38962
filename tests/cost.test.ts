import { describe, expect, it } from 'vitest';
import {
  SPEED_OF_LIGHT,
  domainCounts,
  ringdownTime,
  runCost,
  stepCount,
  timeStep,
  type FaceKind,
} from '../src/physics';
import { blockSplit } from '../src/physics/internal';

/** Independent computation: visit every cell and count the axes whose absorber slab holds it. */
function bruteForce(dims: number, interior: number[], layers: number[], gap: number[]) {
  const lo = (a: number) => layers[2 * a];
  const hi = (a: number) => layers[2 * a + 1];
  const size = interior.map((n, a) => lo(a) + gap[2 * a] + n + gap[2 * a + 1] + hi(a));
  let total = 0;
  let absorber = 0;
  let stretched = 0;
  const idx = new Array(dims).fill(0);
  const visit = (a: number) => {
    if (a === dims) {
      total++;
      let k = 0;
      for (let b = 0; b < dims; b++) if (idx[b] < lo(b) || idx[b] >= size[b] - hi(b)) k++;
      if (k) absorber++;
      stretched += k;
      return;
    }
    for (let i = 0; i < size[a]; i++) {
      idx[a] = i;
      visit(a + 1);
    }
  };
  visit(0);
  return { total, absorber, stretched };
}

describe('domainCounts: cells and ψ against hand counts', () => {
  it('3-D cube, 2 layers on all six faces: faces, edges and corners counted by hand', () => {
    const d = domainCounts({ dimensions: 3, interior: [10, 10, 10], layers: 2 });
    // Hand count (derived): total (10+4)³ = 2744, interior 10³ = 1000.
    // Face slabs: 6 faces × 2 layers × 10×10 = 1200 cells, 4 ψ each (one stretched axis).
    // Edges: 12 edges × (2×2) × 10 = 480 cells, 8 ψ each. Corners: 8 × 2×2×2 = 64 cells, 12 ψ each.
    expect(d.cellsTotal).toBe(2744);
    expect(d.cellsInterior).toBe(1000);
    expect(d.cellsAbsorber).toBe(1200 + 480 + 64);
    expect(d.cellsByStretchedAxes).toEqual([1200, 480, 64]);
    expect(d.psiTotal).toBe(1200 * 4 + 480 * 8 + 64 * 12); // 9408
    expect(d.overheadPercent).toBe(174.4); // 100·1744/1000
  });

  it('2-D, absorber on x only (y periodic): one slab pair, 2 ψ per cell (derived)', () => {
    const faces: FaceKind[] = ['absorbing', 'absorbing', 'periodic', 'periodic'];
    const d = domainCounts({ dimensions: 2, interior: [100, 50], layers: 8, faces });
    // Hand count: (8+100+8)×50 = 5800 cells, 16×50 = 800 in the absorber, ψ = 2 × 800.
    expect(d.cellsTotal).toBe(5800);
    expect(d.cellsAbsorber).toBe(800);
    expect(d.psiTotal).toBe(1600);
    expect(d.axisCells).toEqual([116, 50]);
  });

  it('2-D, all faces with a gap of 3 cells: the gap is interior, corners carry two axes of ψ', () => {
    const d = domainCounts({ dimensions: 2, interior: [20, 30], layers: 5, gap: 3 });
    // Hand count: inner (20+6)×(30+6) = 936, total 36×46 = 1656, absorber 720.
    // Corner squares 4 × 5×5 = 100 (2 axes); face strips 2×5×36 + 2×5×26 = 620 (1 axis). ψ = 2·(620 + 2·100) = 1640.
    expect(d.cellsInterior).toBe(936);
    expect(d.cellsTotal).toBe(1656);
    expect(d.cellsAbsorber).toBe(720);
    expect(d.cellsByStretchedAxes).toEqual([620, 100, 0]);
    expect(d.psiTotal).toBe(1640);
  });

  it('1-D, 100 cells and 10 layers each side: 120 cells, 20 absorber cells, 40 ψ (hand count)', () => {
    const d = domainCounts({ dimensions: 1, interior: [100], layers: 10 });
    expect(d.cellsTotal).toBe(120);
    expect(d.cellsAbsorber).toBe(20);
    expect(d.psiTotal).toBe(40);
  });

  it('symmetric face and per-face layers agree with a cell-by-cell enumeration (independent computation)', () => {
    const faces: FaceKind[] = ['absorbing', 'absorbing', 'symmetric', 'absorbing', 'absorbing', 'absorbing'];
    const layers = [3, 4, 6, 5, 2, 7];
    const d = domainCounts({ dimensions: 3, interior: [9, 8, 7], layers, faces, gap: 2 });
    const eff = layers.map((L, i) => (faces[i] === 'absorbing' ? L : 0));
    const gap = faces.map((f) => (f === 'absorbing' ? 2 : 0));
    const b = bruteForce(3, [9, 8, 7], eff, gap);
    expect(d.cellsTotal).toBe(b.total);
    expect(d.cellsAbsorber).toBe(b.absorber);
    expect(d.psiTotal).toBe(4 * b.stretched);
    expect(d.faceLayers).toEqual([3, 4, 0, 5, 2, 7]);
  });

  it('rejects a periodic axis with one absorbing face, and layers outside 0..200', () => {
    expect(() => domainCounts({ dimensions: 2, interior: [10, 10], layers: 4, faces: ['periodic', 'absorbing', 'absorbing', 'absorbing'] })).toThrow(
      /axis x is periodic on one face only/,
    );
    expect(() => domainCounts({ dimensions: 1, interior: [10], layers: 201 })).toThrow('layers must be a whole number from 0 to 200 (got 201)');
    expect(() => domainCounts({ dimensions: 2, interior: [10], layers: 4 })).toThrow(/interior must give 2 cell counts/);
  });
});

describe('time step and step count', () => {
  it('Δt = S·Δ/c and steps = ⌈T/Δt⌉ (physics.md §5)', () => {
    const dt = timeStep(20e-9, 0.5, 3);
    expect(dt).toBe((0.5 * 20e-9) / SPEED_OF_LIGHT);
    // Hand count: T/Δt = 1e-12 · 299792458 / (0.5·20e-9) = 29979.2458 → 29980 steps.
    expect(stepCount(1e-12, dt)).toBe(29980);
    // A duration of exactly 1000 steps is 1000, not 1001 from rounding noise.
    expect(stepCount(1000 * dt, dt)).toBe(1000);
    expect(() => timeStep(20e-9, 0.6, 3)).toThrow(/above the 3-D stability limit/);
  });

  it('passes: T = passes·L·n/c across the longest side of the whole domain (derived)', () => {
    const r = runCost({ domain: { dimensions: 1, interior: [100], layers: 10 }, time: { cellMetres: 10e-9, courant: 0.99, passes: 2, index: 1.5 } });
    // T/Δt = passes·L·n/(S·Δ) = 2·120·1.5/0.99 = 363.6… → 364.
    expect(r.time!.steps).toBe(364);
    expect(r.time!.source).toBe('passes');
  });

  it('needs exactly one of duration, passes, q', () => {
    expect(() => runCost({ domain: { dimensions: 1, interior: [10], layers: 2 }, time: { cellMetres: 1e-8, courant: 0.5, duration: 1e-12, passes: 2 } })).toThrow(
      'give exactly one of duration, passes or q (got 2)',
    );
  });
});

describe('ring-down time t = 2Q·ln(1/δ)/ω', () => {
  it('matches the documented example', () => {
    // Derived: 2·1000·ln(1000)/(2π·10⁹).
    expect(ringdownTime(1000, 1e9, 1e-3)).toBeCloseTo((2 * 1000 * Math.log(1000)) / (2 * Math.PI * 1e9), 20);
  });

  it('agrees with a simulated damped oscillator x″ + (ω/Q)x′ + ω²x = 0 (independent computation)', () => {
    const omega = 2 * Math.PI; // f = 1 Hz
    const Q = 40;
    const delta = 1e-3;
    // RK4 integration from x = 1, x′ = 0; record the peaks (x′ changes sign from + to −).
    const h = 1 / 4000;
    let x = 1;
    let v = 0;
    let t = 0;
    const acc = (xx: number, vv: number) => -(omega / Q) * vv - omega * omega * xx;
    const peaksT: number[] = [];
    const peaksX: number[] = [];
    for (let n = 0; n < 4000 * 120; n++) {
      const k1x = v;
      const k1v = acc(x, v);
      const k2x = v + (h / 2) * k1v;
      const k2v = acc(x + (h / 2) * k1x, v + (h / 2) * k1v);
      const k3x = v + (h / 2) * k2v;
      const k3v = acc(x + (h / 2) * k2x, v + (h / 2) * k2v);
      const k4x = v + h * k3v;
      const k4v = acc(x + h * k3x, v + h * k3v);
      const nx = x + (h / 6) * (k1x + 2 * k2x + 2 * k3x + k4x);
      const nv = v + (h / 6) * (k1v + 2 * k2v + 2 * k3v + k4v);
      if (v > 0 && nv <= 0) {
        // Peak between the two samples: interpolate where x′ = 0 (peak value to second order).
        const s = v / (v - nv);
        peaksT.push(t + s * h);
        peaksX.push(x + (nx - x) * s);
      }
      x = nx;
      v = nv;
      t += h;
    }
    // The peaks of a damped cosine lie exactly on its envelope's exponential: fit ln(peak) = c − γt.
    const n = peaksT.length;
    const mt = peaksT.reduce((a, b) => a + b, 0) / n;
    const ml = peaksX.reduce((a, b) => a + Math.log(b), 0) / n;
    let num = 0;
    let den = 0;
    for (let i = 0; i < n; i++) {
      num += (peaksT[i] - mt) * (Math.log(peaksX[i]) - ml);
      den += (peaksT[i] - mt) ** 2;
    }
    const gamma = -num / den;
    const c0 = ml + gamma * mt;
    // Envelope e^{c0 − γt} falls to δ of its t = 0 value e^{c0} at t = ln(1/δ)/γ.
    const simulated = Math.log(1 / delta) / gamma;
    void c0;
    expect(Math.abs(simulated / ringdownTime(Q, 1, delta) - 1)).toBeLessThan(1e-4);
    // And the last recorded peaks really are below δ after that time.
    const after = peaksX.filter((_, i) => peaksT[i] > simulated * 1.02);
    expect(after.length).toBeGreaterThan(0);
    expect(Math.max(...after)).toBeLessThan(delta);
  });

  it('q in a run spec uses the ring-down time', () => {
    const r = runCost({ domain: { dimensions: 1, interior: [10], layers: 2 }, time: { cellMetres: 1e-3, courant: 0.5, q: 1000, ringFrequencyHz: 1e9, ringTarget: 1e-3 } });
    expect(r.time!.duration).toBe(ringdownTime(1000, 1e9, 1e-3));
    expect(r.time!.steps).toBe(Math.ceil(ringdownTime(1000, 1e9, 1e-3) / timeStep(1e-3, 0.5, 1)));
  });
});

describe('memory, runtime and price', () => {
  it('memory of the documented 1-D example: 1600 bytes (hand count)', () => {
    const r = runCost({ domain: { dimensions: 1, interior: [100], layers: 10 } });
    // 120 cells × (2 field + 1 material) × 4 bytes = 1440, plus 40 ψ × 4 bytes = 160.
    expect(r.memory.fieldBytes).toBe(960);
    expect(r.memory.materialBytes).toBe(480);
    expect(r.memory.psiBytes).toBe(160);
    expect(r.memory.totalBytes).toBe(1600);
  });

  it('3-D double precision: 8 bytes per value, 6 + 3 values per cell', () => {
    const r = runCost({ domain: { dimensions: 3, interior: [10, 10, 10], layers: 2 }, precision: 'double' });
    expect(r.memory.totalBytes).toBe(2744 * 9 * 8 + 9408 * 8);
  });

  it('runtime split into interior and absorber work, cost = hours × price × nodes (derived)', () => {
    const r = runCost({
      domain: { dimensions: 3, interior: [10, 10, 10], layers: 2 },
      time: { cellMetres: 1e-8, courant: 0.5, duration: 1000 * timeStep(1e-8, 0.5, 3) },
      throughput: 1e6,
      pricePerHour: 3.6,
      absorberFactor: 2,
    });
    const rt = r.runtime!;
    expect(rt.interiorUpdates).toBe(1000 * 1000);
    expect(rt.absorberUpdates).toBe(1744 * 1000);
    expect(rt.interiorSeconds).toBe(1);
    expect(rt.absorberSeconds).toBe(3.488); // 1744·1000·2/1e6
    expect(rt.totalSeconds).toBeCloseTo(4.488, 12);
    expect(rt.cost).toBeCloseTo((4.488 / 3600) * 3.6, 15);
  });

  it('several nodes with a stated efficiency: runtime/(N·e)', () => {
    const base = { domain: { dimensions: 3, interior: [40, 40, 40], layers: 4 }, time: { cellMetres: 1e-8, courant: 0.5, duration: 1e-13 }, throughput: 1e7 };
    const one = runCost(base).runtime!.totalSeconds;
    const four = runCost({ ...base, nodes: 4, efficiency: 0.8 }).runtime!.totalSeconds;
    expect(four).toBeCloseTo(one / (4 * 0.8), 12);
    expect(() => runCost({ ...base, nodes: 4 })).toThrow(/need a parallel efficiency/);
  });

  it('halo exchange of a slab cut: 4 values per interface cell per step in 3-D (hand count)', () => {
    const r = runCost({
      domain: { dimensions: 3, interior: [10, 10, 10], layers: 2 },
      time: { cellMetres: 1e-8, courant: 0.5, duration: 100 * timeStep(1e-8, 0.5, 3) },
      throughput: 1e6,
      nodes: 2,
      bandwidth: 1e6,
      latency: 1e-6,
    });
    const p = r.parallel;
    // One cut through a 14×14×14 grid: 196 cells × 4 values × 4 bytes = 3136 bytes; each node sends half: 1568.
    expect(p.split).toEqual([2, 1, 1]);
    expect(p.haloBytesPerStep).toBe(3136);
    expect(p.haloBytesPerNodePerStep).toBe(1568);
    expect(p.messagesPerNodePerStep).toBe(2);
    // Exchange time per step = 2 × 1 µs + 1568 B / 1 MB/s.
    expect(r.runtime!.exchangeSeconds).toBeCloseTo(100 * (2e-6 + 1568e-6), 12);
    expect(p.model).toBe('halo exchange');
    expect(p.efficiency).toBeCloseTo((r.runtime!.totalSeconds - r.runtime!.exchangeSeconds) / r.runtime!.totalSeconds, 14);
  });

  it('block decomposition of a cube on 8 nodes is 2×2×2 (least cut area)', () => {
    expect(blockSplit([100, 100, 100], 8)).toEqual([2, 2, 2]);
    expect(blockSplit([400, 100, 100], 4)).toEqual([4, 1, 1]);
  });
});
