/**
 * Which transcript to read next: the ones the template claims least of come first. A transcript
 * counts by its uncoded part: passages already coded, or judged "nothing to code", are left out
 * of both shares, so a partly coded transcript is ranked by what is left to code in it, and a
 * transcript with nothing left is not ranked.
 *
 * A transcript's unclaimed share is the words of its pool passages over the words of its
 * substantive participant passages (the passages that could be in the pool), so small talk and
 * the interviewer's questions neither dilute nor inflate it. Ties: more unclaimed words first,
 * then natural name order.
 */
import type { ThemeScores } from '../suggest/types.js';
import { naturalCompare } from './order.js';
import { isSubstantive, type PoolOptions } from './pool.js';
import type { PoolCandidate } from './types.js';

export interface TriageInput {
  /** Every passage of the study (or at least of the transcripts to rank). */
  passages: readonly PoolCandidate[];
  /** Passages coded, or judged nothing to code: not part of any transcript's uncoded part. */
  done: Iterable<string>;
  /** The model's scores of the uncoded passages (their chosen themes). */
  scores: ThemeScores;
  /** The unclaimed pool (ids of PoolResult.pool). */
  unclaimed: Iterable<string>;
  /** The open clusters (shown, not dismissed, not yet promoted). */
  clusters: readonly { id: string; passageIds: readonly string[] }[];
}

export interface TranscriptTriage {
  transcript: string;
  /** Unclaimed words over substantive participant words (0 when it has none). */
  unclaimedShare: number;
  unclaimedWords: number;
  substantiveWords: number;
  unclaimedPassages: number;
  substantivePassages: number;
  /** Substantive participant passages already coded or judged nothing to code (not in the shares). */
  coded_passages: number;
  /** Some of its passages are done, so the shares are of its uncoded part. */
  partly_coded: boolean;
  /** Chosen themes of its passages with how many passages each, most first (at most `top`). */
  themes: { themeId: string; passages: number }[];
  /** For every open cluster holding some of its passages: how many, their share of the cluster and of the transcript's substantive words. */
  clusters: { clusterId: string; passages: number; shareOfCluster: number; shareOfTranscript: number }[];
}

export function triage(input: TriageInput, opts: PoolOptions & { top?: number } = {}): TranscriptTriage[] {
  const top = opts.top ?? 3;
  const done = new Set(input.done);
  const unclaimed = new Set(input.unclaimed);
  const { themeIds } = input.scores;
  const sugg = new Map(input.scores.passages.map((s) => [s.passageId, s]));
  const clusterOf = new Map<string, string>();
  const sizes = new Map<string, number>();
  for (const c of input.clusters) {
    sizes.set(c.id, c.passageIds.length);
    for (const p of c.passageIds) clusterOf.set(p, c.id);
  }
  const by = new Map<string, PoolCandidate[]>();
  for (const p of input.passages) (by.get(p.transcript) ?? by.set(p.transcript, []).get(p.transcript)!).push(p);

  const out: TranscriptTriage[] = [];
  for (const [transcript, ps] of by) {
    let sw = 0;
    let uw = 0;
    let sp = 0;
    let up = 0;
    let dp = 0;
    const themes = new Map<string, number>();
    const inCluster = new Map<string, { passages: number; words: number }>();
    for (const p of ps) {
      const words = p.words ?? p.terms.length;
      if (done.has(p.id)) {
        if (isSubstantive(p, opts)) dp++;
        continue;
      }
      for (const t of sugg.get(p.id)?.chosen ?? []) themes.set(themeIds[t]!, (themes.get(themeIds[t]!) ?? 0) + 1);
      if (!isSubstantive(p, opts)) continue;
      sw += words;
      sp++;
      if (unclaimed.has(p.id)) {
        uw += words;
        up++;
      }
      const c = clusterOf.get(p.id);
      if (c) {
        const e = inCluster.get(c) ?? inCluster.set(c, { passages: 0, words: 0 }).get(c)!;
        e.passages++;
        e.words += words;
      }
    }
    if (sp === 0) continue; // nothing left to code in it
    out.push({
      transcript,
      coded_passages: dp,
      partly_coded: dp > 0,
      unclaimedShare: sw > 0 ? uw / sw : 0,
      unclaimedWords: uw,
      substantiveWords: sw,
      unclaimedPassages: up,
      substantivePassages: sp,
      themes: [...themes]
        .map(([themeId, passages]) => ({ themeId, passages }))
        .sort((a, b) => b.passages - a.passages || naturalCompare(a.themeId, b.themeId))
        .slice(0, top),
      clusters: [...inCluster]
        .map(([clusterId, e]) => ({ clusterId, passages: e.passages, shareOfCluster: e.passages / sizes.get(clusterId)!, shareOfTranscript: sw > 0 ? e.words / sw : 0 }))
        .sort((a, b) => b.passages - a.passages || naturalCompare(a.clusterId, b.clusterId)),
    });
  }
  return out.sort((a, b) => b.unclaimedShare - a.unclaimedShare || b.unclaimedWords - a.unclaimedWords || naturalCompare(a.transcript, b.transcript));
}
