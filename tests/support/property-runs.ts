/**
 * How many random cases the property tests (tests/properties-*.test.ts) run.
 *
 * They were written for 10,000 cases per property ("the full run"). A default
 * run takes fewer, chosen per property so that the whole suite stays within
 * its few minutes on a 2-core machine. The seed is fixed (HUSH_PROPERTY_SEED),
 * and fast-check draws case k from the seed and k alone, so a default run
 * checks exactly the first cases of the full run: same inputs, same checks,
 * fewer of them. HUSH_PROPERTY_RUNS=N runs N cases of every property
 * (HUSH_PROPERTY_RUNS=10000 is the full run; properties written for fewer
 * cases keep their proportion), and another HUSH_PROPERTY_SEED draws new cases.
 */

/** Cases of the full run, per property written for it. */
export const FULL_RUNS = 10_000;

function fromEnvironment(): number | undefined {
  const text = process.env.HUSH_PROPERTY_RUNS;
  if (text === undefined || text.trim() === '') return undefined;
  const n = Number(text);
  if (!Number.isInteger(n) || n < 1) throw new Error(`HUSH_PROPERTY_RUNS must be a whole number ≥ 1 (got ${JSON.stringify(text)})`);
  return n;
}

/**
 * Cases for one property: `defaultRuns`, or with HUSH_PROPERTY_RUNS=N set,
 * N × `share` (share: the property's count in the full run over FULL_RUNS,
 * e.g. 0.1 for one written for 1,000 cases), at least 1.
 */
export function propertyRuns(defaultRuns: number, share = 1): number {
  const n = fromEnvironment();
  return n === undefined ? defaultRuns : Math.max(1, Math.round(n * share));
}
