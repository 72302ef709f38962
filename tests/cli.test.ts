import { describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'child_process';
import { existsSync } from 'fs';
import { main } from '../src/cli/main';
import type { CommandIO } from '../src/cli/io';

async function run(argv: string[]) {
  const out: string[] = [];
  const err: string[] = [];
  const io: CommandIO = { out: (t) => out.push(t), err: (t) => err.push(t), isTTY: false };
  const code = await main(argv, io);
  return { code, out: out.join('\n'), err: err.join('\n') };
}

describe('hush reflect', () => {
  it('--json prints amplitude, phase_deg and continuous (worked example: 12 layers, m = 3, 20 cells/λ)', async () => {
    const r = await run(['reflect', '--layers', '12', '--order', '3', '--ppw', '20', '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.amplitude).toBeCloseTo(1.612019089787947e-5, 15); // rounding-level, see tests/reflection.test.ts
    expect(typeof j.phase_deg).toBe('number');
    expect(j.continuous).toBeCloseTo(Math.exp(-1.6 * 12), 15);
  });
  it('normalises --alpha-max (S/m) with --cell: α_norm = α·η₀·Δ·n (physics.md §3)', async () => {
    const r = await run(['reflect', '--layers', '8', '--order', '3', '--alpha-max', '10', '--cell', '1e-4 m', '--ppw', '30', '--index', '2', '--json']);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.out).alpha_max_norm).toBeCloseTo(10 * 376.730313668 * 1e-4 * 2, 6);
  });
  for (const [name, argv, msg] of [
    ['missing --ppw', ['reflect', '--layers', '8', '--order', '3'], /--ppw is required/],
    ['unknown option', ['reflect', '--layers', '8', '--order', '3', '--ppw', '20', '--colour', 'red'], /unknown option --colour/],
    ['not a number', ['reflect', '--layers', 'ten', '--order', '3', '--ppw', '20'], /layers must be a whole number \(got "ten"\)/],
    ['N < 1', ['reflect', '--layers', '0', '--order', '3', '--ppw', '20'], /layers must be a whole number from 1 to 200/],
    ['alpha without cell', ['reflect', '--layers', '8', '--order', '3', '--ppw', '20', '--alpha-max', '5'], /needs --cell/],
    ['angle 90', ['reflect', '--layers', '8', '--order', '3', '--ppw', '20', '--angle', '90'], /angle must be at least 0° and less than 90° \(got 90\)/],
  ] as [string, string[], RegExp][]) {
    it(`bad arguments (${name}): one-line message, exit code 2`, async () => {
      const r = await run(argv);
      expect(r.code).toBe(2);
      expect(r.err).toMatch(msg);
      expect(r.err.split('\n')).toHaveLength(1);
    });
  }
});

describe('hush budget', () => {
  it('1 % → amplitude √1.01 − 1 (derived, physics.md §1) and back', async () => {
    const a = await run(['budget', '--intensity-error', '0.01', '--json']);
    expect(JSON.parse(a.out).amplitude).toBeCloseTo(4.987562112089027e-3, 17);
    const b = await run(['budget', '--amplitude', String(JSON.parse(a.out).amplitude), '--json']);
    expect(JSON.parse(b.out).intensity_error).toBeCloseTo(0.01, 15);
  });
  it('bad input exits 2', async () => {
    expect((await run(['budget', '--intensity-error', '0.01', '--share', '0'])).code).toBe(2);
    expect((await run(['budget'])).code).toBe(2);
    expect((await run(['budget', '--intensity-error', '0.01', '--phase', 'lucky'])).err).toMatch(/phase must be one of worst, random \(got "lucky"\)/);
  });
});

describe('hush design', () => {
  it('--json has the documented keys and meets the target', async () => {
    const r = await run(['design', '--target', '1e-3', '--ppw-min', '20', '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    for (const k of ['layers', 'order', 'strength', 'kappa_max', 'alpha_max_norm', 'alpha_order', 'worst_amplitude', 'worst_ppw', 'worst_angle_deg', 'continuous_amplitude']) {
      expect(j).toHaveProperty(k);
    }
    expect(j.layers).toBe(4);
    expect(j.worst_amplitude).toBeLessThanOrEqual(1e-3);
  });
  it('--orders restricts the gradings searched', async () => {
    const j = JSON.parse((await run(['design', '--target', '1e-3', '--ppw-min', '20', '--orders', '3', '--json'])).out);
    expect(j.order).toBe(3);
    expect((await run(['design', '--target', '1e-3', '--ppw-min', '20', '--orders', '3,x'])).code).toBe(2);
  });
  it('grazing angles get the explanation, exit 2', async () => {
    const r = await run(['design', '--target', '1e-3', '--ppw-min', '20', '--angle-max', '88']);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/grazing/);
  });
});

describe('hush ripple', () => {
  it('forward and inverse (physics.md §1)', async () => {
    const f = JSON.parse((await run(['ripple', '--amplitude', '1e-3', '--distance', '1e-5', '--group-index', '4.2', '--json'])).out);
    expect(f.peak_to_peak).toBeCloseTo(4e-3, 15);
    const i = JSON.parse((await run(['ripple', '--peak-to-peak', String(f.peak_to_peak), '--period', String(f.period_hz), '--group-index', '4.2', '--json'])).out);
    expect(i.amplitude).toBeCloseTo(1e-3, 15);
    expect(i.distance_m).toBeCloseTo(1e-5, 15);
  });
});

describe('the built command line', () => {
  const bin = 'bin/hush.js';
  const built = existsSync('dist/node/cli/index.js');
  it('runs as a process after npm run build (exit codes 0 and 2)', () => {
    if (!built) execFileSync('npx', ['tsc', '-p', 'tsconfig.cli.json']);
    const ok = spawnSync('node', [bin, 'reflect', '--layers', '12', '--order', '3', '--ppw', '20', '--json'], { encoding: 'utf8' });
    expect(ok.status).toBe(0);
    expect(JSON.parse(ok.stdout).amplitude).toBeCloseTo(1.612019089787947e-5, 15);
    const bad = spawnSync('node', [bin, 'reflect', '--layers', '-1', '--order', '3', '--ppw', '20'], { encoding: 'utf8' });
    expect(bad.status).toBe(2);
    expect(bad.stderr.trim().split('\n')).toHaveLength(1);
  });
});
