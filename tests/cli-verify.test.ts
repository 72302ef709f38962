/**
 * `hush verify`: the time-domain check of a design from the command line.
 * The expected agreement is an independent computation: a 1-D CPML line or
 * the one-mode chain of a periodic 2-D grid (src/physics/fdtd) run step by
 * step, set beside the exact discrete reflection (physics.md §3). Every case
 * is small: a few 1e5–1e7 cell updates (well under a second of CPU each).
 */
import { describe, expect, it } from 'vitest';
import { main } from '../src/cli/main';
import type { CommandIO } from '../src/cli/io';
import { VERIFY_MAX_CELL_UPDATES } from '../src/cli/verify';
import { AGREEMENT, compareMeasurement, type MeasuredPoint } from '../src/plan/verify';

async function run(argv: string[], isTTY = false) {
  const out: string[] = [];
  const err: string[] = [];
  const io: CommandIO = { out: (t) => out.push(t), err: (t) => err.push(t), isTTY };
  const code = await main(argv, io);
  return { code, out: out.join('\n'), err: err.join('\n') };
}

/** A 1-D study: band 10–20 cells per wavelength, |r| ≤ 1e-3 (the design search gives 5 layers). */
const SMALL = ['--target', '1e-3', '--ppw-min', '10', '--ppw-max', '20', '--dimensions', '1'];

describe('hush verify: agreement', () => {
  it('verifies the design hush design finds: exit 0, every frequency within the 1 % tolerance (time-domain run vs exact model)', async () => {
    const r = await run(['verify', ...SMALL, '--json']);
    expect(r.code, r.err).toBe(0);
    const j = JSON.parse(r.out);
    const d = JSON.parse((await run(['design', ...SMALL, '--json'])).out);
    // The absorber verified is the one `hush design` prints for the same options.
    expect(j.design).toEqual({ layers: d.layers, order: d.order, strength: d.strength, kappa_max: d.kappa_max, alpha_max_norm: d.alpha_max_norm, alpha_order: d.alpha_order });
    expect(j.agree).toBe(true);
    expect(j.tolerance).toBe(AGREEMENT);
    expect(j.relative_difference).toBeLessThanOrEqual(AGREEMENT);
    expect(j.sampling).toBe('node');
    expect(j.grid_sampling).toBe('node');
    expect(j.exact_for).toMatch(/node convention/);
    // 5 frequencies of the 1-D run from 10 to 20 cells per wavelength; no 2-D run for a 1-D study.
    expect(j.runs.map((p: { ppw: number }) => p.ppw)[0]).toBe(10);
    expect(j.runs.length).toBe(5);
    for (const p of j.runs) {
      expect(p.check).toBe('1-D');
      expect(p.agree).toBe(true);
      expect(Math.abs(p.measured - p.predicted) / p.predicted).toBeCloseTo(p.relative_difference, 15);
    }
    // The top-level figures are those of the worst frequency.
    const worst = j.runs.reduce((a: { relative_difference: number }, b: { relative_difference: number }) => (b.relative_difference > a.relative_difference ? b : a));
    expect([j.predicted, j.measured, j.relative_difference]).toEqual([worst.predicted, worst.measured, worst.relative_difference]);
    expect(j.notes).toEqual(['2-D run not made: a 1-D study has no oblique incidence']);
    expect(j.cell_updates).toBeGreaterThan(0);
    expect(j.cell_updates).toBeLessThan(1e6);
  });

  it('an explicit absorber (--layers, --order, --strength) gives the same measurement as the design it names', async () => {
    const d = JSON.parse((await run(['design', ...SMALL, '--json'])).out);
    const a = JSON.parse((await run(['verify', ...SMALL, '--json'])).out);
    const b = JSON.parse((await run(['verify', '--layers', String(d.layers), '--order', String(d.order), '--strength', String(d.strength), '--ppw-min', '10', '--ppw-max', '20', '--dimensions', '1', '--json'])).out);
    expect(b.runs.map((p: { measured: number }) => p.measured)).toEqual(a.runs.map((p: { measured: number }) => p.measured));
  });

  it('a 2-D study adds the oblique run at --angle-max; the text report names each frequency, the convention and the verdict', async () => {
    const r = await run(['verify', '--layers', '8', '--order', '3', '--ppw-min', '15', '--ppw-max', '20', '--angle-max', '30', '--dimensions', '2']);
    expect(r.code, r.err).toBe(0);
    const rows = r.out.split('\n').filter((l) => /^(1-D|2-D) /.test(l));
    expect(rows.some((l) => l.startsWith('2-D'))).toBe(true);
    for (const l of rows) expect(l).toMatch(/agrees$/);
    expect(r.out).toMatch(/The prediction is the exact discrete reflection for the node convention \(σ, κ, α sampled at each node's own depth\); the time-domain grid uses the same convention\./);
    expect(r.out).toMatch(/tolerance 1 %.*the measurement agrees with the prediction/);
  });
});

describe('hush verify: disagreement', () => {
  // A prediction for the node convention does not hold on a grid that samples the
  // profiles another way: with one profile array for E and H ('lagged') the 5-layer
  // design reflects ~0.07–0.13 instead of ~6e-4. The measured values are those of the
  // exact model for the lagged convention (hush reflect --sampling lagged), so the
  // disagreement is the convention's, not the engine's.
  it('--grid-sampling lagged against a node prediction: exit 1, agree false, each measurement equal to the lagged exact model', async () => {
    const r = await run(['verify', ...SMALL, '--grid-sampling', 'lagged', '--json']);
    expect(r.code, r.err).toBe(1);
    const j = JSON.parse(r.out);
    expect(j.agree).toBe(false);
    expect(j.relative_difference).toBeGreaterThan(10);
    expect(j.grid_sampling).toBe('lagged');
    for (const p of j.runs) {
      expect(p.agree).toBe(false);
      const lagged = JSON.parse(
        (await run(['reflect', '--layers', String(j.design.layers), '--order', String(j.design.order), '--strength', String(j.design.strength), '--ppw', String(p.ppw), '--courant', String(j.courant), '--dimensions', '1', '--sampling', 'lagged', '--json'])).out,
      );
      expect(Math.abs(p.measured - lagged.amplitude) / lagged.amplitude).toBeLessThan(1e-6);
    }
    const text = await run(['verify', ...SMALL, '--grid-sampling', 'lagged']);
    expect(text.code).toBe(1);
    expect(text.out).toMatch(/DISAGREES$/m);
    expect(text.out).toMatch(/samples the profiles by the lagged convention instead/);
    expect(text.out).toMatch(/the measurement DISAGREES with the prediction/);
  });

  it('the comparison: every point within the tolerance agrees; one beyond it, a NaN or no point at all does not (derived)', () => {
    const p = (measured: number, predicted = 1e-3): MeasuredPoint => ({ run: '1-D', ppw: 20, angleDeg: 0, measured, predicted });
    expect(compareMeasurement([p(1.005e-3), p(0.996e-3)]).agree).toBe(true);
    const c = compareMeasurement([p(1.005e-3), p(1.02e-3)]);
    expect(c.agree).toBe(false);
    expect(c.largestDifference).toBeCloseTo(0.02, 12);
    expect(c.worst?.measured).toBe(1.02e-3);
    expect(compareMeasurement([p(1e-3), p(NaN)]).agree).toBe(false);
    expect(compareMeasurement([]).agree).toBe(false);
  });
});

describe('hush verify: bad input and bounded work (exit 2, one line)', () => {
  for (const [name, argv, msg] of [
    ['no target and no absorber', ['--ppw-min', '10'], /option --target is required/],
    ['a design-search option with --layers', ['--layers', '5', '--order', '3', '--target', '1e-3', '--ppw-min', '10'], /--target belongs to a design search; with --layers the absorber is given/],
    ['--strength without --layers', ['--target', '1e-3', '--ppw-min', '10', '--strength', '1'], /--strength needs --layers/],
    ['an unknown grid convention', [...SMALL, '--grid-sampling', 'staggered'], /--grid-sampling must be one of node, average, offset, lagged \(got "staggered"\)/],
    ['a band the runs cannot measure', ['--layers', '8', '--order', '3', '--ppw-min', '20', '--ppw-max', '400', '--angle-max', '80', '--dimensions', '2'], /the 2-D run cannot be made: .*too close to a cut-off/],
    ['more work than --max-work', [...SMALL, '--max-work', '1e4'], /the 1-D run cannot be made: it would need 1\.6e\+5 cell updates \(at most 1\.0e\+4 are run\)/],
    ['a --max-work above the bound', [...SMALL, '--max-work', '1e12'], /--max-work must be a number of cell updates from 1 to 4e\+9/],
  ] as [string, string[], RegExp][]) {
    it(name, async () => {
      const r = await run(['verify', ...argv]);
      expect(r.code).toBe(2);
      expect(r.err).toMatch(msg);
      expect(r.err.split('\n').length).toBe(1);
      expect(r.out).toBe('');
    });
  }

  it(`refuses a verification beyond ${VERIFY_MAX_CELL_UPDATES.toExponential(0)} cell updates before taking a step`, async () => {
    // 150 layers with κ_max 10 at 200–400 cells per wavelength and 70°, under three conventions: about 7e9 cell updates.
    const r = await run(['verify', '--layers', '150', '--order', '3', '--kappa-max', '10', '--ppw-min', '200', '--ppw-max', '400', '--angle-max', '70', '--dimensions', '2', '--sampling', 'all']);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^hush verify: this verification would need [\d.]+e\+9 cell updates \(at most 4\.0e\+9 are run\)/);
  });
});

describe('hush verify: help and progress', () => {
  it('--help lists the design and absorber options from the field registry and its own switches', async () => {
    const r = await run(['verify', '--help']);
    expect(r.code).toBe(0);
    for (const flag of ['--target', '--ppw-min', '--angle-max', '--sampling', '--layers', '--order', '--strength', '--grid-sampling', '--max-work', '--json']) expect(r.out).toContain(flag);
    expect(r.out).toMatch(/^usage: hush verify /);
    expect((await run(['--help'])).out).toMatch(/^ {2}verify {5}time-domain check/m);
  });

  it('draws a progress bar on standard error only on a terminal', async () => {
    const tty = await run(['verify', ...SMALL], true);
    expect(tty.code).toBe(0);
    expect(tty.err).toMatch(/\r\[#{30}\] 100 % of [\d.]+e\+5 cell updates\n$/);
    const piped = await run(['verify', ...SMALL], false);
    expect(piped.err).toBe('');
    expect(piped.out).not.toContain('\r');
  });
});
