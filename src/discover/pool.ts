/**
 * The unclaimed pool: substantive participant passages that no coding and no theme's profile
 * claims. Each keeps the theme that came nearest, so "almost Workload" is visible.
 *
 * Substantive: a participant passage with at least `minTerms` topic lemmas (content lemmas less
 * the small-talk words below) whose content lemmas are less than `maxSmallTalkShare` small talk.
 * 7 was read off the demo transcripts (corpora/handover, 180 participant passages): every passage
 * with 7 or more topic lemmas carries content; 6 is the first count with small talk ("No problem.
 * It's been a busy week, so it's nice to sit down"). See docs/discovery.md.
 *
 * Unclaimed: the chance that no theme of the template applies, from the calibrated confidences
 * of every theme (parents and every ancestor included, so a passage that a parent claims is not
 * unclaimed), is at least `noneFitsAt`: one minus the best confidence. A theme the coder rejected
 * for the passage does not count. (The older rules, "no theme at its coded level clears its own
 * threshold" and the noisy-OR of the confidences, were measured against this one in
 * docs/discovery.md and removed.)
 *
 * Each pooled passage keeps the nearest theme at the level coders code at (a leaf, or a theme
 * coders applied directly), and the parents that cleared their thresholds only through their
 * sub-themes' evidence: the passage may be a new sub-theme, which is what discovery is for.
 */
import type { Coding, ThemeScores } from '../suggest/types.js';
import type { NearestTheme, PoolCandidate, PoolEntry, PoolExclusion, PoolResult } from './types.js';

/**
 * Politeness, agreement, laughter and transcription marks: content lemmas by the general stop
 * list, but small talk in an interview. They do not count towards a passage's topic lemmas.
 */
export const SMALL_TALK: ReadonlySet<string> = new Set([
  'thank', 'thanks', 'welcome', 'hello', 'hi', 'hiya', 'bye', 'goodbye', 'cheers', 'sorry', 'please',
  'pleasure', 'fine', 'alright', 'sure', 'course', 'exactly', 'absolutely', 'definitely', 'totally',
  'true', 'indeed', 'aye', 'cool', 'brilliant', 'lovely', 'great', 'love',
  'laugh', 'laughs', 'laughter', 'laughing', 'chuckle', 'sigh', 'sighs', 'pause', 'inaudible', 'crosstalk',
]);

/** A pronoun with its auxiliary ("i'm", "that's") or a bare clitic ("'s"), which the lemmatiser can leave. */
const CONTRACTION = /^(i|you|we|they|he|she|it|that|there|here|what|who|where|let)?['\u2019](m|re|s|ve|ll|d)$/;

export interface PoolOptions {
  /** Fewest topic lemmas for a substantive passage (default 7). */
  minTerms?: number;
  /** Share of content lemmas that are small talk at which a passage is small talk (default 0.5). */
  maxSmallTalkShare?: number;
  /** Pool a passage when noneFits is at or above this (default NONE_FITS_AT). */
  noneFitsAt?: number;
}

/**
 * The default cut of the none-fits rule, measured on the survey protocol of
 * bench/fewshot.py leaving out Game, seed 1: cuts 0.45 / 0.5 / 0.6 gave pool recall 0.47 / 0.44 /
 * 0.38 at a pool false share of 0.29 / 0.25 / 0.20 (docs/discovery.md, "The pool rule").
 */
export const NONE_FITS_AT = 0.5;

/** The chance that no theme applies: 1 - the best of the themes' calibrated confidences. */
export function noneFits(confidences: readonly number[]): number {
  return 1 - confidences.reduce((m, c) => Math.max(m, c), 0);
}

export interface PoolInput {
  /** The passages to sort (usually every passage of the study). */
  passages: readonly PoolCandidate[];
  /** The model's scores of (some of) them; a passage without is 'not-scored'. */
  scores: ThemeScores;
  /** The template: theme ids with their parents (leaves are themes no other theme names). */
  themes: readonly { id: string; parentId: string | null }[];
  /** Human codings, accepted suggestions included: a coded passage is claimed by its coder. */
  codings: readonly Coding[];
  /** Rejected suggestions: a theme the coder rejected for a passage does not claim it. */
  rejected?: readonly Coding[];
  /** Passages a coder marked "reviewed, nothing to code": judged, so not material for a new theme. */
  nothingToCode?: Iterable<string>;
  /** Each theme's threshold (ThemeReport.threshold), shown beside the nearest theme's confidence. */
  thresholds?: Readonly<Record<string, number>>;
}

/** The topic lemmas of a passage: content lemmas less small talk and pronoun contractions. */
export function topicTerms(terms: readonly string[]): string[] {
  return terms.filter((t) => !SMALL_TALK.has(t) && !CONTRACTION.test(t));
}

/** Why a passage is not substantive, or null when it is. */
export function substantiveCheck(p: Pick<PoolCandidate, 'role' | 'terms'>, opts: PoolOptions = {}): 'interviewer' | 'short' | 'small-talk' | null {
  if (p.role !== 'participant') return 'interviewer';
  const minTerms = opts.minTerms ?? 7;
  const maxShare = opts.maxSmallTalkShare ?? 0.5;
  const talk = p.terms.filter((t) => SMALL_TALK.has(t)).length;
  if (p.terms.length > 0 && talk / p.terms.length >= maxShare) return 'small-talk';
  if (topicTerms(p.terms).length < minTerms) return 'short';
  return null;
}

export function isSubstantive(p: Pick<PoolCandidate, 'role' | 'terms'>, opts: PoolOptions = {}): boolean {
  return substantiveCheck(p, opts) === null;
}

/** The themes that claim at their level: leaves, and themes coders applied directly. */
export function claimingThemes(themes: PoolInput['themes'], codings: readonly Coding[]): Set<string> {
  const parents = new Set(themes.map((t) => t.parentId).filter((p): p is string => p !== null));
  const out = new Set(themes.filter((t) => !parents.has(t.id)).map((t) => t.id));
  const known = new Set(themes.map((t) => t.id));
  for (const c of codings) if (known.has(c.themeId)) out.add(c.themeId);
  return out;
}

/** Sorts passages into the unclaimed pool and the rest (with the rule that kept each out). */
export function unclaimedPool(input: PoolInput, opts: PoolOptions = {}): PoolResult {
  const claiming = claimingThemes(input.themes, input.codings);
  const coded = new Set(input.codings.map((c) => c.passageId));
  const judged = new Set(input.nothingToCode ?? []);
  const rejected = new Map<string, Set<string>>();
  for (const c of input.rejected ?? []) (rejected.get(c.passageId) ?? rejected.set(c.passageId, new Set()).get(c.passageId)!).add(c.themeId);
  const { themeIds, scored, thresholds } = input.scores;
  const claims = themeIds.map((id) => claiming.has(id));
  const byId = new Map(input.scores.passages.map((s) => [s.passageId, s]));
  /** A passage's confidences of the themes not rejected for it (one list, reused). */
  const live: number[] = [];
  const pool: PoolEntry[] = [];
  const excluded: PoolResult['excluded'] = [];
  const counts: PoolResult['counts'] = { interviewer: 0, short: 0, 'small-talk': 0, coded: 0, 'nothing-to-code': 0, claimed: 0, 'not-scored': 0, unclaimed: 0 };
  const out = (id: string, reason: PoolExclusion) => {
    excluded.push({ id, reason });
    counts[reason]++;
  };
  for (const p of input.passages) {
    const why = substantiveCheck(p, opts);
    if (why) {
      out(p.id, why);
      continue;
    }
    if (coded.has(p.id)) {
      out(p.id, 'coded');
      continue;
    }
    if (judged.has(p.id)) {
      out(p.id, 'nothing-to-code');
      continue;
    }
    const s = byId.get(p.id);
    if (!s) {
      out(p.id, 'not-scored');
      continue;
    }
    const conf = s.confidence;
    const gone = rejected.get(p.id);
    // Every theme counts, parents too: a rejected sub-theme must not hide a parent that fits.
    // The nearest is the best theme at a coded level (ties: the first theme, as candidates rank).
    let near = -1;
    const cleared: number[] = [];
    live.length = 0;
    for (const t of scored) {
      if (gone?.has(themeIds[t]!)) continue;
      const c = conf[t]!;
      live.push(c);
      if (claims[t]) {
        if (near < 0 || c > conf[near]!) near = t;
      } else if (c >= thresholds[t]!) cleared.push(t);
    }
    const none = noneFits(live);
    if (none < (opts.noneFitsAt ?? NONE_FITS_AT)) {
      out(p.id, 'claimed');
      continue;
    }
    const nearId = near < 0 ? null : themeIds[near]!;
    const threshold = nearId === null ? undefined : input.thresholds?.[nearId];
    const nearest: NearestTheme | null = nearId === null ? null : { themeId: nearId, confidence: conf[near]!, ...(threshold === undefined ? {} : { threshold }) };
    const clearedParents = cleared.sort((a, b) => conf[b]! - conf[a]! || a - b).map((t) => themeIds[t]!);
    // Small talk and clitics would only add noise to the clusters' vectors and terms.
    pool.push({ id: p.id, transcript: p.transcript, speaker: p.speaker, terms: topicTerms(p.terms), words: p.words ?? p.terms.length, nearest, clearedParents, noneFits: none });
    counts.unclaimed++;
  }
  return { pool, excluded, counts };
}
