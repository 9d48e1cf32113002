/**
 * Where a coding goes when its transcript is replaced by an edited version (de-identification
 * after coding is common). The rule, for each coded passage of the old version:
 *   1. a new passage with the same text (ignoring case and spacing) holds it: the coding follows;
 *      among several, the one at the nearest position;
 *   2. otherwise the new passage that shares the most of its words (counted with repeats, case
 *      ignored) holds it, provided at least half of the old passage's words are there; ties go to
 *      the nearest position;
 *   3. otherwise it cannot be placed, and the caller keeps it apart (never dropped silently).
 */

export interface AnchorPassage {
  id: string;
  /** Position in the transcript (1-based), for ties. */
  ordinal: number;
  text: string;
}

export type Placement = { to: string; how: 'same text' | 'overlap'; share: number } | null;

/** Share of the old passage's words a new passage must hold for a coding to move there. */
export const MIN_OVERLAP = 0.5;

const words = (text: string): string[] => text.toLowerCase().match(/[\p{L}\p{N}]+(?:['’][\p{L}]+)*/gu) ?? [];
const flat = (text: string): string => words(text).join(' ');

function bag(ws: string[]): Map<string, number> {
  const m = new Map<string, number>();
  for (const w of ws) m.set(w, (m.get(w) ?? 0) + 1);
  return m;
}

function common(a: Map<string, number>, b: Map<string, number>): number {
  let n = 0;
  for (const [w, k] of a) n += Math.min(k, b.get(w) ?? 0);
  return n;
}

/** Where each old passage's codings go in the new version; null where they cannot be placed. */
export function reanchor(old: readonly AnchorPassage[], fresh: readonly AnchorPassage[]): Map<string, Placement> {
  const freshFlat = fresh.map((p) => flat(p.text));
  const freshBags = fresh.map((p) => bag(words(p.text)));
  const nearest = (o: AnchorPassage, candidates: number[]) =>
    candidates.reduce((best, i) => (Math.abs(fresh[i]!.ordinal - o.ordinal) < Math.abs(fresh[best]!.ordinal - o.ordinal) ? i : best));
  const out = new Map<string, Placement>();
  for (const o of old) {
    const key = flat(o.text);
    const same = freshFlat.flatMap((f, i) => (f === key ? [i] : []));
    if (same.length) {
      out.set(o.id, { to: fresh[nearest(o, same)]!.id, how: 'same text', share: 1 });
      continue;
    }
    const mine = bag(words(o.text));
    const total = [...mine.values()].reduce((a, b) => a + b, 0);
    let best = -1;
    let tied: number[] = [];
    freshBags.forEach((b, i) => {
      const n = common(mine, b);
      if (n > best) [best, tied] = [n, [i]];
      else if (n === best) tied.push(i);
    });
    const share = total ? best / total : 0;
    out.set(o.id, share >= MIN_OVERLAP && tied.length ? { to: fresh[nearest(o, tied)]!.id, how: 'overlap', share } : null);
  }
  return out;
}
