/**
 * Cluster ids that stay the same across discovery runs when the members are the same: a short
 * hash of the sorted passage ids ("c" and six hex digits), and the label a researcher reads: the
 * cluster's top terms.
 */
import { createHash } from 'node:crypto';

export function clusterKey(passageIds: readonly string[], length = 6): string {
  const h = createHash('sha256').update([...passageIds].sort().join('\n')).digest('hex');
  return `c${h.slice(0, length)}`;
}

/** "paper · sheet · pocket": a cluster named by its first three terms. */
export function clusterLabel(terms: readonly string[], n = 3): string {
  return terms.length ? terms.slice(0, n).join(' · ') : '(no distinctive terms)';
}

/** A cluster id as printed ("c3f9a1"); anything else is not one. */
export const CLUSTER_KEY = /^c[0-9a-f]{6,}$/;
