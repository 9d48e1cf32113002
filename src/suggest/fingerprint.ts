/** A short hash of a learned state, so two fits can be compared for determinism at a glance. */
import { createHash } from 'node:crypto';

export function fingerprint(parts: (string | ArrayBufferView)[]): string {
  const h = createHash('sha256');
  for (const p of parts) {
    if (typeof p === 'string') h.update(p);
    else h.update(new Uint8Array(p.buffer, p.byteOffset, p.byteLength));
    h.update('\u0000');
  }
  return h.digest('hex').slice(0, 16);
}
