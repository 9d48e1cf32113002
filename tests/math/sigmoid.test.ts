import { describe, expect, it } from 'vitest';
import { sigmoid, softplus } from '../../src/math/sigmoid.js';

describe('sigmoid and softplus', () => {
  it('are finite far out and keep their symmetries', () => {
    expect(sigmoid(0)).toBe(0.5);
    expect(sigmoid(800)).toBe(1);
    expect(sigmoid(-800)).toBeGreaterThanOrEqual(0);
    expect(sigmoid(2.5) + sigmoid(-2.5)).toBeCloseTo(1, 15);
    expect(softplus(800)).toBe(800);
    expect(softplus(1.3) - softplus(-1.3)).toBeCloseTo(1.3, 12);
  });
});
