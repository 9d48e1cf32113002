/** A short hash of a learned state, so two fits can be compared for determinism at a glance. */
import { createHash } from 'node:crypto';

/** A part given piece by piece (hashed as the pieces' bytes one after another, as one array would be). */
export interface Pieces {
  pieces: Iterable<ArrayBufferView>;
}

export function fingerprint(parts: (string | ArrayBufferView | Pieces)[]): string {
  const h = createHash('sha256');
  const bytes = (p: ArrayBufferView) => h.update(new Uint8Array(p.buffer, p.byteOffset, p.byteLength));
  for (const p of parts) {
    if (typeof p === 'string') h.update(p);
    else if ('pieces' in p) for (const q of p.pieces) bytes(q);
    else bytes(p);
    h.update('\u0000');
  }
  return h.digest('hex').slice(0, 16);
}
