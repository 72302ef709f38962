/**
 * Bundles a TypeScript entry of the tests into one CommonJS file with
 * esbuild (packages stay external, so exceljs, mathjs and saxes load as they
 * do in the built CLI), for child processes whose memory and work a test
 * measures: a fresh bundle of the current sources, without a full build.
 */
import { buildSync } from 'esbuild';
import { mkdirSync, mkdtempSync } from 'fs';
import { join } from 'path';

/** Bundles `entry` into node_modules/.cache/hush-tests/ (inside the checkout, so the bundle finds the packages). */
export function bundle(entry: string): string {
  const cache = join(__dirname, '..', '..', 'node_modules', '.cache', 'hush-tests');
  mkdirSync(cache, { recursive: true });
  const outfile = join(mkdtempSync(join(cache, 'bundle-')), 'child.js');
  buildSync({ entryPoints: [entry], bundle: true, platform: 'node', format: 'cjs', target: 'node20', packages: 'external', outfile, logLevel: 'error' });
  return outfile;
}
