import { sliceAnalysis, type TextAnalysis } from '../text/analysis.js';
import type { Role } from './roles.js';
import type { Transcript, Turn } from './types.js';

export type { Role };

/** The unit that is coded and scored. */
export interface Passage {
  /** Deterministic: transcript name and position, so sheets carry over between studies. */
  id: string;
  transcript: string;
  /** 1-based position of the passage within the transcript. */
  ordinal: number;
  /** 0-based index of the turn it comes from. */
  turn: number;
  speaker: string | null;
  role: Role;
  question: string | null;
  start: number | null;
  end: number | null;
  /** Character span in Transcript.source (approximate where a reader cleaned the turn text). */
  offset: number;
  length: number;
  text: string;
  words: number;
  /** Analysis of `text`, offsets relative to it. */
  analysis: TextAnalysis;
  /** Theme paths written inline in the transcript for this passage. */
  codes: string[];
}

export interface SegmentOptions {
  /** Longest passage in words before a turn is split at sentence boundaries. */
  window: number;
  roleOf: (speaker: string | null) => Role;
}

export function passageId(transcript: string, ordinal: number): string {
  return `${transcript}#${ordinal}`;
}

/**
 * Splits each turn into passages: a turn is one passage unless it has more words than the
 * window; then it becomes windows of whole sentences of about equal size. A sentence longer
 * than the window (text with no punctuation) is cut at word boundaries.
 */
export function segment(t: Transcript, analyses: TextAnalysis[], opts: SegmentOptions): Passage[] {
  const out: Passage[] = [];
  t.turns.forEach((turn, ti) => {
    const a = analyses[ti]!;
    if (!turn.text.trim()) return;
    for (const [from, to] of windows(a, turn.text.length, opts.window)) {
      const raw = turn.text.slice(from, to);
      const lead = raw.length - raw.trimStart().length;
      const text = raw.trim();
      if (!text) continue;
      const s = from + lead;
      const e = s + text.length;
      const analysis = sliceAnalysis(a, s, e);
      const ordinal = out.length + 1;
      out.push({
        id: passageId(t.name, ordinal),
        transcript: t.name,
        ordinal,
        turn: ti,
        speaker: turn.speaker,
        role: opts.roleOf(turn.speaker),
        question: turn.question ?? null,
        start: turn.start,
        end: turn.end,
        offset: turn.offset + Math.min(s, turn.length),
        length: Math.min(text.length, Math.max(0, turn.length - s)),
        text,
        words: analysis.lemmas.length,
        analysis,
        codes: codesIn(turn, from, to, to >= turn.text.length),
      });
    }
  });
  return out;
}

/** Character ranges [from, to) of the windows of one turn. */
function windows(a: TextAnalysis, length: number, window: number): [number, number][] {
  const words = a.lemmas.length;
  if (words <= window) return [[0, length]];
  // Units: sentences, with over-long sentences cut into window-sized runs of words.
  const units: { from: number; to: number; words: number }[] = [];
  let w = 0;
  for (let k = 0; k < a.sentences.length; k += 2) {
    const from = a.sentences[k]!;
    const to = a.sentences[k + 1]!;
    let first = w;
    while (w < words && a.ends[w]! <= to) w++;
    const n = w - first;
    if (n <= window) {
      units.push({ from, to, words: n });
      continue;
    }
    let cut = from;
    while (first < w) {
      const last = Math.min(first + window, w) - 1;
      const end = last === w - 1 ? to : a.ends[last]!;
      units.push({ from: cut, to: end, words: last - first + 1 });
      cut = end;
      first = last + 1;
    }
  }
  if (!units.length) return [[0, length]];
  const target = words / Math.ceil(words / window);
  const out: [number, number][] = [];
  let start = 0;
  let acc = 0;
  units.forEach((u, i) => {
    const isLast = i === units.length - 1;
    acc += u.words;
    const next = units[i + 1];
    if (isLast || acc >= target || acc + next!.words > window) {
      out.push([start, isLast ? length : next!.from]);
      start = isLast ? length : next!.from;
      acc = 0;
    }
  });
  return out;
}

/** Inline codes whose tag stood within [from, to) of the turn (the last window takes the tail). */
function codesIn(turn: Turn, from: number, to: number, last: boolean): string[] {
  const paths: string[] = [];
  for (const c of turn.codes) if ((c.at >= from && c.at < to) || (last && c.at >= to)) paths.push(...c.paths);
  return paths;
}
