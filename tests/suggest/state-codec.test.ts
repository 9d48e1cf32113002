// The stored model state's bytes: plain data as JSON, typed arrays as their own bytes.
import { describe, expect, it } from 'vitest';
import { decodeState, encodeState } from '../../src/suggest/state-codec.js';

describe('the state codec', () => {
  it('gives back plain data and typed arrays exactly, of every kind, views included', () => {
    const big = new Float64Array(10);
    big.set([Math.PI, -0, Number.MIN_VALUE, Number.MAX_VALUE, 1e-300, NaN, Infinity, -Infinity, 0.1 + 0.2, -1 / 3]);
    const state = {
      version: 6,
      name: 'handover',
      list: [1, 2.5, null, 'x'],
      nested: { w: big, ids: ['a', 'b'], deeper: [{ at: Int32Array.of(-7, 0, 2 ** 31 - 1) }] },
      // A view on part of a larger buffer, of a length that leaves the next array unaligned.
      view: new Float64Array(big.buffer, 8, 3),
      bytes: Uint8Array.of(1, 2, 3),
      after: Float32Array.of(0.5, -2),
      counts: Uint32Array.of(4_000_000_000),
      empty: new Float64Array(0),
    };
    const back = decodeState<typeof state>(encodeState(state));
    expect(back.version).toBe(6);
    expect(back.list).toEqual([1, 2.5, null, 'x']);
    expect(back.nested.ids).toEqual(['a', 'b']);
    expect(back.nested.w).toBeInstanceOf(Float64Array);
    // Bit for bit (NaN and -0 included): compare the bytes.
    const bits = (a: ArrayBufferView) => Buffer.from(a.buffer, a.byteOffset, a.byteLength).toString('hex');
    expect(bits(back.nested.w)).toBe(bits(big));
    expect(Object.is(back.nested.w[1], -0)).toBe(true);
    expect([...back.nested.deeper[0]!.at]).toEqual([-7, 0, 2 ** 31 - 1]);
    expect([...back.view]).toEqual([-0, Number.MIN_VALUE, Number.MAX_VALUE]);
    expect(back.bytes).toBeInstanceOf(Uint8Array);
    expect([...back.bytes]).toEqual([1, 2, 3]);
    expect([...back.after]).toEqual([0.5, -2]);
    expect([...back.counts]).toEqual([4_000_000_000]);
    expect(back.empty).toBeInstanceOf(Float64Array);
    expect(back.empty.length).toBe(0);
  });

  it('reads the arrays from bytes that start at any offset', () => {
    const bytes = encodeState({ w: Float64Array.of(1.5, -2.25), i: Int32Array.of(7) });
    for (const shift of [0, 1, 3, 8]) {
      const moved = Buffer.alloc(bytes.length + shift);
      bytes.copy(moved, shift);
      const back = decodeState<{ w: Float64Array; i: Int32Array }>(moved.subarray(shift));
      expect([...back.w]).toEqual([1.5, -2.25]);
      expect([...back.i]).toEqual([7]);
    }
  });

  it('keeps the doubles as bytes, not as text', () => {
    const n = 10_000;
    const bytes = encodeState({ w: new Float64Array(n).map((_, i) => Math.sqrt(i)) });
    // 8 bytes a double and a short header; as decimals in JSON it would be about 18 a number.
    expect(bytes.length).toBeLessThan(8 * n + 100);
  });

  it('refuses bytes it did not write, and bytes cut short', () => {
    expect(() => decodeState(Buffer.from(JSON.stringify({ version: 5 })))).toThrow(/not a stored model state/);
    const bytes = encodeState({ w: Float64Array.of(1, 2, 3) });
    expect(() => decodeState(bytes.subarray(0, bytes.length - 8))).toThrow(/cut short/);
    expect(() => decodeState(bytes.subarray(0, 14))).toThrow(/cut short/);
  });
});
