/**
 * Every worksheet function documents a worked example in its JSDoc, as
 *   Example: =HUSH.NAME(arg, , "text") → 0.00498756211208903
 * (a number to 15 significant digits, "text", or an Excel array {a, b; c, d}).
 * This test reads src/functions/functions.ts, finds every example, evaluates
 * it by calling the function the way Excel would (an omitted argument is null),
 * and checks the printed result digit for digit: the documentation cannot drift
 * from the code. Functions that return a Promise (the heavy ones, which run in
 * the scheduler) are awaited.
 */
import { readFileSync } from 'fs';
import path from 'path';
import { beforeAll, describe, expect, it } from 'vitest';
import * as functions from '../src/functions/functions';
import { collectExamples } from '../scripts/lib/examples';

const source = readFileSync(path.join(__dirname, '../src/functions/functions.ts'), 'utf8');
const { examples, functionIds, misplaced } = collectExamples(source);

/** Compares a computed value with the printed one: strings exactly, numbers to 15 significant digits. */
function expectAsPrinted(actual: unknown, expected: unknown): void {
  if (Array.isArray(expected)) {
    expect(Array.isArray(actual)).toBe(true);
    const a = actual as unknown[][];
    const e = expected as unknown[][];
    expect(a.length).toBe(e.length);
    e.forEach((row, i) => {
      expect(a[i].length).toBe(row.length);
      row.forEach((cell, j) => expectAsPrinted(a[i][j], cell));
    });
    return;
  }
  if (typeof expected === 'number') {
    expect(typeof actual).toBe('number');
    // The printed value is the result rounded to 15 significant digits (trailing zeros dropped),
    // so a short print such as 0.004 passes only if the result is 0.004 to 15 digits.
    expect(Number((actual as number).toPrecision(15))).toBe(expected);
    return;
  }
  expect(actual).toBe(expected);
}

describe('worked examples in the worksheet functions’ JSDoc', () => {
  beforeAll(() => {
    // Examples never raise worksheet errors; a stub keeps a failing one readable.
    (globalThis as Record<string, unknown>).CustomFunctions ??= {
      Error: class extends Error {
        constructor(
          public code: string,
          message?: string,
        ) {
          super(`${code} ${message ?? ''}`);
        }
      },
      ErrorCode: { invalidValue: '#VALUE!', invalidNumber: '#NUM!' },
    };
  });

  it('every HUSH function has at least one example, on its own JSDoc', () => {
    expect(misplaced).toEqual([]);
    expect(functionIds.length).toBeGreaterThanOrEqual(16);
    for (const id of functionIds) {
      expect(examples.filter((e) => e.id === id).length, `HUSH.${id} has an Example: line`).toBeGreaterThan(0);
    }
  });

  it.each(examples.map((e) => [e.formula, e] as const))('%s', async (_formula, e) => {
    const fn = (functions as Record<string, unknown>)[e.exportName] as (...args: unknown[]) => unknown;
    expect(typeof fn).toBe('function');
    expectAsPrinted(await fn(...e.args), e.expected);
  });
});
