/** Finishing touches every text-based reader applies to its turns. */
import { extractInlineCodes } from './codes.js';
import type { Turn } from './types.js';

/** A turn before its inline codes are taken out of the text. */
export interface RawTurn {
  speaker: string | null;
  text: string;
  start: number | null;
  end: number | null;
  offset: number;
  length: number;
}

/**
 * Extracts inline codes, then drops turns left with no words. A tag standing alone (a paragraph
 * or cue holding only `{theme: ...}`) codes the turn before it; at the very start, the turn after.
 */
export function finishTurns(raw: RawTurn[], warnings: string[], file: string): Turn[] {
  const turns: Turn[] = [];
  let pending: Turn['codes'] = [];
  for (const r of raw) {
    const { text, codes } = extractInlineCodes(r.text);
    if (text === '') {
      const prev = turns[turns.length - 1];
      if (prev) prev.codes.push(...codes.map((c) => ({ paths: c.paths, at: prev.text.length })));
      else pending.push(...codes);
      continue;
    }
    const turn: Turn = { speaker: r.speaker, text, start: r.start, end: r.end, offset: r.offset, length: r.length, codes };
    if (pending.length > 0) {
      turn.codes.unshift(...pending.map((c) => ({ paths: c.paths, at: 0 })));
      pending = [];
    }
    turns.push(turn);
  }
  if (pending.length > 0) warnings.push(`${file}: inline codes with no text to code were ignored`);
  return turns;
}
