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
  },
});
