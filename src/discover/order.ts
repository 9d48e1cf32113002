/**
 * Natural order of ids and names ("t2#9" before "t2#10"), by code units and digit runs only, so
 * that it is the same on every machine (no locale).
 */
const CHUNK = /(\d+)|(\D+)/g;

function chunks(s: string): (string | number)[] {
  return [...s.matchAll(CHUNK)].map((m) => (m[1] !== undefined ? Number(m[1]) : m[2]!));
}

export function naturalCompare(a: string, b: string): number {
  if (a === b) return 0;
  const x = chunks(a);
  const y = chunks(b);
  for (let i = 0; i < Math.min(x.length, y.length); i++) {
    const p = x[i]!;
    const q = y[i]!;
    if (p === q) continue;
    if (typeof p === 'number' && typeof q === 'number') return p - q;
    if (typeof p === 'number') return -1;
    if (typeof q === 'number') return 1;
    return p < q ? -1 : 1;
  }
  if (x.length !== y.length) return x.length - y.length;
  return a < b ? -1 : 1; // equal numbers written differently ("01" and "1")
}
