import { describe, expect, it } from 'vitest';
import { cosine, dot, fromEntries, norm } from '../../src/math/sparse.js';

describe('sparse vectors', () => {
  it('sorts entries and computes dot, norm and cosine', () => {
    const a = fromEntries([[5, 2], [1, 1], [3, 0]]);
    const b = fromEntries([[1, 3], [5, 4], [7, 1]]);
    expect([...a.indices]).toEqual([1, 5]);
    expect(dot(a, b)).toBe(1 * 3 + 2 * 4);
    expect(norm(a)).toBeCloseTo(Math.sqrt(5), 12);
    expect(cosine(a, b)).toBeCloseTo(11 / (Math.sqrt(5) * Math.sqrt(26)), 12);
  });
});
