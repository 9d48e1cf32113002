/**
 * Choosing the quotes a report or codebook shows for each theme. Pure: ranked candidates and the
 * researcher's pins and drops in, the chosen passages out.
 *
 * The rules, as the report states them (QUOTE_RULES):
 *  - pinned passages come first, in the order they were pinned, whatever the other rules say;
 *  - dropped passages are never shown for that theme;
 *  - the rest are the coded passages closest to the centre of the theme's coded material, at
 *    most one per participant (a speaker in a transcript) per theme;
 *  - no passage is shown twice on the page: sub-themes choose before their parents, and a
 *    passage already shown (or pinned anywhere) is skipped.
 */

import { plural } from './escape.js';
import type { ReportData } from './types.js';

export interface QuoteCandidate {
  passageId: string;
  /** Who spoke it: transcript and speaker label (the real ones; aliases are for display). */
  participant: string;
  /** Closeness to the theme's centre; higher is more representative. */
  score: number;
  /** Coded to the theme itself (not only to a sub-theme). */
  direct: boolean;
}

export interface QuoteTheme {
  id: string;
  depth: number;
  /** Every passage coded to the theme or a sub-theme. */
  candidates: QuoteCandidate[];
}

export interface QuoteChoice {
  themeId: string;
  passageId: string;
  choice: 'pin' | 'drop';
}

export interface ChosenQuote {
  passageId: string;
  pinned: boolean;
}

export const QUOTE_RULES =
  'Quotes are chosen for each theme as follows: passages a researcher pinned come first; the others are the coded passages closest to the centre of the theme\'s coded material (its own codings, or its sub-themes\' when it has none), at most one per participant per theme; a passage a researcher dropped is never shown for that theme; and no passage appears twice in the document, so sub-themes choose before their parents. Closeness to the centre is a measure of typicality, not of importance: read the quotes as examples, not as evidence of how often a view was held.';

export function chooseQuotes(themes: readonly QuoteTheme[], choices: readonly QuoteChoice[], perTheme: number): Map<string, ChosenQuote[]> {
  const key = (t: string, p: string) => `${t}\u0000${p}`;
  const dropped = new Set(choices.filter((c) => c.choice === 'drop').map((c) => key(c.themeId, c.passageId)));
  const out = new Map<string, ChosenQuote[]>();
  const used = new Set<string>();
  // Pins first, for every theme: a pinned passage is the researcher's choice and stays put.
  for (const t of themes) {
    const coded = new Set(t.candidates.map((c) => c.passageId));
    const pins = choices.filter((c) => c.choice === 'pin' && c.themeId === t.id && coded.has(c.passageId));
    out.set(t.id, pins.map((p) => ({ passageId: p.passageId, pinned: true })));
    for (const p of pins) used.add(p.passageId);
  }
  const order = themes.map((t, i) => ({ t, i })).sort((a, b) => b.t.depth - a.t.depth || a.i - b.i);
  for (const { t } of order) {
    const chosen = out.get(t.id)!;
    const byId = new Map(t.candidates.map((c) => [c.passageId, c]));
    const speakers = new Set(chosen.map((c) => byId.get(c.passageId)!.participant));
    const pool = t.candidates.some((c) => c.direct) ? t.candidates.filter((c) => c.direct) : t.candidates;
    const ranked = [...pool].sort((a, b) => b.score - a.score || (a.passageId < b.passageId ? -1 : a.passageId > b.passageId ? 1 : 0));
    for (const c of ranked) {
      if (chosen.length >= perTheme) break;
      if (used.has(c.passageId) || dropped.has(key(t.id, c.passageId)) || speakers.has(c.participant)) continue;
      chosen.push({ passageId: c.passageId, pinned: false });
      used.add(c.passageId);
      speakers.add(c.participant);
    }
  }
  return out;
}

/** How much of the choice was the researchers' own. */
export function choiceLine(d: ReportData): string {
  const c = d.quoteChoices ?? { pinned: 0, dropped: 0 };
  if (!c.pinned && !c.dropped) return 'No quote was pinned or dropped by a researcher: every quote here was chosen by these rules.';
  return `Researchers pinned ${plural(c.pinned, 'quote')} and dropped ${plural(c.dropped, 'quote')} (trellis quote list); pinned quotes are marked.`;
}
