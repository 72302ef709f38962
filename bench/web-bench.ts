/**
 * Benchmark: the JavaScript the add-in's page (taskpane.html, the shared
 * runtime) loads from its own origin, gzipped, from a fresh production build
 * into a temporary folder. Goal (BENCHMARKS.md, issue 13): ≤ 80 KB. Measured
 * with `gzip -9` where it exists, else zlib at level 9 (0.2–0.6 % larger).
 * The Verify worker's chunk loads only when a verification starts; it is
 * shown but not counted.
 */
import { spawnSync } from 'child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync } from 'fs';
import { join } from 'path';
import { tmpdir } from 'os';
import { gzipSync } from 'zlib';
import type { Row } from './measure';

function gzipped(file: string): { bytes: number; tool: string } {
  const g = spawnSync('gzip', ['-9', '-n', '-c', file], { maxBuffer: 1 << 26 });
  if (g.status === 0 && g.stdout) return { bytes: g.stdout.length, tool: 'gzip -9' };
  return { bytes: gzipSync(readFileSync(file), { level: 9 }).length, tool: 'zlib level 9' };
}

export function webBench(): { lines: string[]; rows: Row[] } {
  const out = mkdtempSync(join(tmpdir(), 'hush-bench-web-'));
  try {
    const cli = join(process.cwd(), 'node_modules', 'webpack-cli', 'bin', 'cli.js');
    const r = spawnSync(process.execPath, [cli, '--mode', 'production', '--output-path', out], { encoding: 'utf8', env: { ...process.env, NO_COLOR: '1' } });
    if (r.status !== 0) return { lines: [`web bundles: webpack failed (${r.status}): ${r.stderr.slice(0, 300)}`], rows: [] };
    const html = readFileSync(join(out, 'taskpane.html'), 'utf8');
    const scripts = [...html.matchAll(/<script\b[^>]*\bsrc="?([^"\s>]+)"?[^>]*>/g)].map((m) => m[1]).filter((s) => !/^[a-z]+:\/\//i.test(s));
    const sizes = scripts.map((s) => ({ file: s, ...gzipped(join(out, s)) }));
    const total = sizes.reduce((a, s) => a + s.bytes, 0);
    const others = readdirSync(out).filter((f) => f.endsWith('.js') && !scripts.includes(f));
    const otherSizes = others.map((f) => `${f} ${(gzipped(join(out, f)).bytes / 1000).toFixed(1)} KB`);
    const kb = (b: number) => `${(b / 1000).toFixed(1)} KB`;
    return {
      lines: [
        `web bundles, the page's own JavaScript (${sizes[0]?.tool ?? 'gzip'}): ${sizes.map((s) => `${s.file} ${kb(s.bytes)}`).join(' + ')} = ${kb(total)}; loaded later: ${otherSizes.join(', ') || 'nothing'}`,
      ],
      rows: [{ goal: 'web: pane page JavaScript ≤ 80 KB gzipped', figure: kb(total), spread: sizes.map((s) => `${s.file} ${kb(s.bytes)}`).join(', '), ratio: '—', pass: total <= 80_000 }],
    };
  } finally {
    rmSync(out, { recursive: true, force: true });
  }
}
