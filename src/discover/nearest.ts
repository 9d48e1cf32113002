/**
 * How near a cluster is to the template: for each cluster, the existing theme its passages come
 * closest to, and how novel the cluster is, so that a cluster of an existing sub-theme reads as
 * "close to Workload > Staffing levels" rather than as a new theme.
 *
 *  - nearest theme: the theme with the highest mean calibrated confidence over the members (a
 *    member without a given theme counts 0 for it); ties by the share of members whose best
 *    theme it is, then by theme id;
 *  - closeness: that mean confidence (the expected share of members a coder would give it);
 *  - top share: the share of members whose best candidate is that theme;
 *  - novelty: the mean over the members of their chance that no theme applies (pool.ts, noneFits).
 *
 * Pure: suggestions and pool entries in, numbers out.
 */
export interface NearnessInput {
  /** Each member's candidates (theme and calibrated confidence). */
  candidates: ReadonlyMap<string, readonly { themeId: string; confidence: number }[]>;
  /** Each member's chance that no theme applies. */
  noneFits: ReadonlyMap<string, number>;
}

export interface ClusterNearness {
  /** The nearest existing theme, or null when no member has a candidate. */
  themeId: string | null;
  closeness: number;
  topShare: number;
  novelty: number;
}

export function clusterNearness(members: readonly string[], input: NearnessInput): ClusterNearness {
  const sum = new Map<string, number>();
  const top = new Map<string, number>();
  let novelty = 0;
  for (const id of members) {
    const cands = input.candidates.get(id) ?? [];
    let best: { themeId: string; confidence: number } | null = null;
    for (const c of cands) {
      sum.set(c.themeId, (sum.get(c.themeId) ?? 0) + c.confidence);
      if (!best || c.confidence > best.confidence || (c.confidence === best.confidence && c.themeId < best.themeId)) best = c;
    }
    if (best) top.set(best.themeId, (top.get(best.themeId) ?? 0) + 1);
    novelty += input.noneFits.get(id) ?? 1;
  }
  const n = Math.max(members.length, 1);
  let themeId: string | null = null;
  let closeness = 0;
  for (const [t, s] of sum) {
    const better = themeId === null || s > closeness * n + 1e-12 || (Math.abs(s - closeness * n) <= 1e-12 && ((top.get(t) ?? 0) > (top.get(themeId) ?? 0) || ((top.get(t) ?? 0) === (top.get(themeId) ?? 0) && t < themeId)));
    if (better) {
      themeId = t;
      closeness = s / n;
    }
  }
  return { themeId, closeness, topShare: themeId === null ? 0 : (top.get(themeId) ?? 0) / n, novelty: members.length ? novelty / members.length : 0 };
}

/** Most novel first; ties by size (larger first), then by the given order. */
export function byNovelty<T extends { novelty: number; size: number }>(items: readonly T[]): T[] {
  return items
    .map((x, i) => ({ x, i }))
    .sort((a, b) => b.x.novelty - a.x.novelty || b.x.size - a.x.size || a.i - b.i)
    .map((e) => e.x);
}
