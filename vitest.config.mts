import { availableParallelism } from 'os';
import { defineConfig } from 'vitest/config';

/**
 * Tests bound their work, not their time (DEVELOPERS.md): no test relies on a
 * per-test timeout. These are only a safety net that ends a hung test, set far
 * above what any test takes on a loaded 2-core machine (the slowest file costs
 * under 30 s of CPU there when quiet).
 */
const SAFETY_NET_MS = 20 * 60_000;

export default defineConfig({
  test: {
    include: ['tests/**/*.test.ts'],
    environment: 'node',
    testTimeout: SAFETY_NET_MS,
    hookTimeout: SAFETY_NET_MS,
    pool: 'forks',
    // One test file per core: vitest's default leaves one core for itself (one worker on 2 cores), but the
    // main process only collects results, so on a 2-core machine two files run at once.
    maxWorkers: availableParallelism(),
  },
});
