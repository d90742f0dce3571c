// Relative-tolerance comparison that prints inputs, expected, actual and tolerance on failure.
import { expect } from 'vitest';

export function expectClose(actual: number, expected: number, relTol: number, what: string, absTol = 0): void {
  const diff = Math.abs(actual - expected);
  const ok = diff <= Math.max(absTol, relTol * Math.abs(expected)) || (actual === expected);
  expect(ok, `${what}: expected ${expected}, actual ${actual}, |diff| ${diff}, tolerance rel ${relTol} abs ${absTol}`).toBe(true);
}
