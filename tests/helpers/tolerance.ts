/**
 * The one float-comparison helper for tests. Exact values use `toBe`; computed values use these,
 * with the tolerance the source states (e.g. check-values.md's "±0.01" or "1e-4 relative").
 */
import { expect } from 'vitest';

/** |actual − expected| ≤ abs. */
export function expectClose(actual: number, expected: number, abs: number): void {
  const ok = Number.isFinite(actual) && Math.abs(actual - expected) <= abs;
  expect(ok, `expected ${actual} to be within ±${abs} of ${expected}`).toBe(true);
}

/** |actual − expected| ≤ rel·|expected|. */
export function expectRelClose(actual: number, expected: number, rel: number): void {
  const ok = Number.isFinite(actual) && Math.abs(actual - expected) <= rel * Math.abs(expected);
  expect(ok, `expected ${actual} to be within ${rel} (relative) of ${expected}`).toBe(true);
}

/** Boolean form for property tests: |a − b| ≤ rel·max(|a|, |b|) + abs. */
export function isClose(a: number, b: number, rel: number, abs = 0): boolean {
  return Math.abs(a - b) <= rel * Math.max(Math.abs(a), Math.abs(b)) + abs;
}
