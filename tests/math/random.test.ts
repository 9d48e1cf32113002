import { describe, expect, it } from 'vitest';
import { sampleIndices, seededRandom } from '../../src/math/random.js';

describe('seeded random numbers', () => {
  it('repeat for a seed, differ across seeds, and sample distinct indices', () => {
    const a = seededRandom(3);
    const b = seededRandom(3);
    const xs = Array.from({ length: 20 }, () => a());
    expect(Array.from({ length: 20 }, () => b())).toEqual(xs);
    expect(xs.every((x) => x >= 0 && x < 1)).toBe(true);
    expect(seededRandom(4)()).not.toBe(xs[0]);
    const idx = sampleIndices(50, 10, 1);
    expect(new Set(idx).size).toBe(10);
    expect(idx.every((i) => i >= 0 && i < 50)).toBe(true);
    expect(sampleIndices(50, 10, 1)).toEqual(idx);
  });
});
