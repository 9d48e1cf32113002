/**
 * The review queue's items and their order: pure, above storage. src/jobs/review.ts gathers the
 * items from the study; src/review/session.ts and the front ends show them in this order.
 */
import type { Reason } from '../suggest/types.js';

export const ORDERS = ['transcript', 'uncertain', 'theme', 'confidence'] as const;
export type ReviewOrder = (typeof ORDERS)[number];

/** Used when a theme has no threshold of its own (no report for it). */
export const FALLBACK_THRESHOLD = 0.5;

export interface ReviewCandidate {
  suggestionId: number;
  themeId: string;
  path: string;
  confidence: number;
  above: boolean;
  /** The theme's threshold (or FALLBACK_THRESHOLD): the uncertain order measures from it. */
  threshold: number;
  reasons: Reason[];
}

export interface ReviewItem {
  passageId: string;
  transcript: string;
  /** Import order of the transcript, then the passage's place in it: the default order. */
  transcriptIndex: number;
  ordinal: number;
  /** Best first. */
  candidates: ReviewCandidate[];
}

export interface ReviewSetup {
  transcripts?: string[];
  /** Only passages with a candidate of this theme or one of its sub-themes. */
  theme?: string;
  order?: ReviewOrder;
  top?: number;
  /**
   * Score the first transcripts first (transcript order, a stored model state): the session can
   * be shown while `ReviewStart.rest` scores the others. Without it the whole run comes first.
   */
  phased?: boolean;
}

export interface ReviewStart {
  runId: number;
  items: ReviewItem[];
  /** Passages of the run left out: already decided, or (with --theme) without that theme. */
  left: number;
  /**
   * Set when transcripts are still to be scored (a phased start): scores them into the same run
   * (slow) and gives their items, which go after `items`, and the run's `left` now. Call once.
   */
  rest?: () => { items: ReviewItem[]; left: number };
}

/**
 * How far the top candidate's confidence is from its theme's threshold: near 0 the model is
 * least sure whether the theme applies, so a decision there teaches it the most.
 */
export function uncertainty(item: ReviewItem): number {
  const top = item.candidates[0];
  return top ? Math.abs(top.confidence - top.threshold) : Infinity;
}

const byPlace = (a: ReviewItem, b: ReviewItem) => a.transcriptIndex - b.transcriptIndex || a.ordinal - b.ordinal;

/**
 * Orders the queue (pure). transcript: transcript, then position. uncertain: smallest
 * uncertainty() first. theme: grouped by the top candidate's theme in template order.
 * confidence: top candidate's confidence, highest first. Ties keep transcript order.
 */
export function orderQueue(items: ReviewItem[], order: ReviewOrder, themeRank: Map<string, number> = new Map()): ReviewItem[] {
  const top = (i: ReviewItem) => i.candidates[0];
  const rank = (i: ReviewItem) => themeRank.get(top(i)?.themeId ?? '') ?? Number.MAX_SAFE_INTEGER;
  const cmp: Record<ReviewOrder, (a: ReviewItem, b: ReviewItem) => number> = {
    transcript: byPlace,
    uncertain: (a, b) => uncertainty(a) - uncertainty(b) || byPlace(a, b),
    theme: (a, b) => rank(a) - rank(b) || (top(a)?.path ?? '').localeCompare(top(b)?.path ?? '') || byPlace(a, b),
    confidence: (a, b) => (top(b)?.confidence ?? 0) - (top(a)?.confidence ?? 0) || byPlace(a, b),
  };
  return [...items].sort(cmp[order]);
}
