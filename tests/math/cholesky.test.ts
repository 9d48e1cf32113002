import { describe, expect, it } from 'vitest';
import { solveSpd, symmetrise } from '../../src/math/cholesky.js';
import { seededRandom } from '../../src/math/random.js';

describe('Cholesky solve', () => {
  it('solves a symmetric positive definite system (A x reproduces b)', () => {
    // A = M^T M + I for a seeded random M is positive definite.
    const n = 5;
    const rand = seededRandom(7);
    const m = Array.from({ length: n * n }, () => rand() - 0.5);
    const a = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) {
      let s = i === j ? 1 : 0;
      for (let r = 0; r < n; r++) s += m[r * n + i]! * m[r * n + j]!;
      a[i * n + j] = s;
    }
    const b = Float64Array.from({ length: n }, (_, i) => i - 2);
    const x = solveSpd(a, b, n);
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let j = 0; j < n; j++) s += a[i * n + j]! * x[j]!;
      expect(s).toBeCloseTo(b[i]!, 10);
    }
  });

  it('copies the lower triangle to the upper one', () => {
    const m = Float64Array.of(1, 0, 2, 3);
    expect([...symmetrise(m, 2)]).toEqual([1, 2, 2, 3]);
  });
});
