/**
 * Dismissed clusters stay dismissed unless new material joins them.
 *
 * Discovery clusters the whole pool, previously dismissed passages included, so that new passages
 * like them can gather around them. A cluster of the new run that holds dismissed passages is
 * shown only when enough of it is new (never dismissed): at least `minNew` passages and at least
 * `minNewShare` of its size. It is then flagged with the passages dismissed before. Otherwise it
 * is suppressed: its dismissed passages are dropped from view and its few new passages stay in the
 * unclaimed list without a cluster. A cluster with no dismissed passage is always shown.
 */
import type { Dismissal } from './types.js';

export interface DismissalRule {
  /** Share of a cluster that must be new to bring dismissed passages back (default 0.3). */
  minNewShare?: number;
  /** Number of new passages that must join (default 3). */
  minNew?: number;
}

export interface ClusterVerdict {
  show: boolean;
  /** Members dismissed in an earlier run. */
  dismissedBefore: string[];
  /** Members never dismissed. */
  newIds: string[];
  /** The dismissals the dismissed members came from (by their first member). */
  dismissalIds: string[];
}

/** Every dismissed passage with the dismissals that named it. */
export function dismissedIndex(dismissals: readonly Dismissal[]): Map<string, string[]> {
  const out = new Map<string, string[]>();
  for (const d of dismissals) for (const p of d.passageIds) (out.get(p) ?? out.set(p, []).get(p)!).push(d.id);
  return out;
}

/** Whether a cluster of the new run is shown, given what was dismissed before. */
export function judgeCluster(memberIds: readonly string[], dismissed: ReadonlyMap<string, readonly string[]>, rule: DismissalRule = {}): ClusterVerdict {
  const minNewShare = rule.minNewShare ?? 0.3;
  const minNew = rule.minNew ?? 3;
  const dismissedBefore = memberIds.filter((id) => dismissed.has(id));
  const newIds = memberIds.filter((id) => !dismissed.has(id));
  const ids = new Set<string>();
  for (const id of dismissedBefore) for (const d of dismissed.get(id)!) ids.add(d);
  const show = dismissedBefore.length === 0 || (newIds.length >= minNew && newIds.length >= minNewShare * memberIds.length);
  return { show, dismissedBefore, newIds, dismissalIds: [...ids] };
}
