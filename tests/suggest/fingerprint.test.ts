import { describe, expect, it } from 'vitest';
import { fingerprint } from '../../src/suggest/fingerprint.js';

describe('fingerprint', () => {
  const a = Float64Array.from({ length: 1000 }, (_, i) => Math.sin(i));
  it('hashes a part given in pieces as the one array they make', () => {
    const pieces = [a.subarray(0, 300), a.subarray(300, 301), a.subarray(301)];
    expect(fingerprint(['x', { pieces }, 'y'])).toBe(fingerprint(['x', a, 'y']));
  });
  it('tells parts apart, and a changed bit (the check can fail)', () => {
    expect(fingerprint([a.subarray(0, 500), a.subarray(500)])).not.toBe(fingerprint([a]));
    const b = a.slice();
    b[999] = -b[999]!;
    expect(fingerprint([b])).not.toBe(fingerprint([a]));
  });
});
