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
 * Pure: the model's scores and pool entries in, numbers out.
 */
import type { PassageScores, ThemeScores } from '../suggest/types.js';

export interface NearnessInput {
  /** The members' scores (calibrated confidence of every theme), by passage id. */
  scores: ReadonlyMap<string, PassageScores>;
  /** The theme ids and the scored themes the confidences refer to. */
  themes: Pick<ThemeScores, 'themeIds' | 'scored'>;
  /** Each member's chance that no theme applies. */
  noneFits: ReadonlyMap<string, number>;
}

export interface ClusterNearness {
  /** The nearest existing theme, or null when no member has a scored theme. */
  themeId: string | null;
  closeness: number;
  topShare: number;
  novelty: number;
}

export function clusterNearness(members: readonly string[], input: NearnessInput): ClusterNearness {
  const { themeIds, scored } = input.themes;
  const sum = new Float64Array(themeIds.length);
  const top = new Float64Array(themeIds.length);
  // Themes are weighed in the first scored member's ranking (best first, ties by theme), so
  // near-equal sums (within 1e-12) are settled as they always were.
  let order: number[] | null = null;
  let novelty = 0;
  for (const id of members) {
    const s = input.scores.get(id);
    if (s) {
      const conf = s.confidence;
      order ??= scored.slice().sort((a, b) => conf[b]! - conf[a]! || a - b);
      let best = -1;
      for (const t of scored) {
        sum[t] += conf[t]!;
        if (best < 0 || conf[t]! > conf[best]! || (conf[t] === conf[best] && themeIds[t]! < themeIds[best]!)) best = t;
      }
      if (best >= 0) top[best]++;
    }
    novelty += input.noneFits.get(id) ?? 1;
  }
  const n = Math.max(members.length, 1);
  let themeId = -1;
  let closeness = 0;
  for (const t of order ?? []) {
    const s = sum[t]!;
    const better = themeId < 0 || s > closeness * n + 1e-12 || (Math.abs(s - closeness * n) <= 1e-12 && (top[t]! > top[themeId]! || (top[t] === top[themeId] && themeIds[t]! < themeIds[themeId]!)));
    if (better) {
      themeId = t;
      closeness = s / n;
    }
  }
  return { themeId: themeId < 0 ? null : themeIds[themeId]!, closeness, topShare: themeId < 0 ? 0 : top[themeId]! / n, novelty: members.length ? novelty / members.length : 0 };
}

/** Most novel first; ties by size (larger first), then by the given order. */
export function byNovelty<T extends { novelty: number; size: number }>(items: readonly T[]): T[] {
  return items
    .map((x, i) => ({ x, i }))
    .sort((a, b) => b.x.novelty - a.x.novelty || b.x.size - a.x.size || a.i - b.i)
    .map((e) => e.x);
}
