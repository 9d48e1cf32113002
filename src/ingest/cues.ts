/**
 * Timed cues (WebVTT, SubRip) to turns: find each cue's speaker, then merge consecutive cues of
 * the same speaker into one turn (start of the first, end of the last).
 */
import { parseLabel } from './labels.js';
import type { RawTurn } from './turns.js';
import type { Turn } from './types.js';

/** What the cue readers return. */
export interface CueParse {
  turns: Turn[];
  labelled: boolean;
  warnings: string[];
}

/** One line of cue text after markup removal, with the span of its source line. */
export interface CueLine {
  text: string;
  from: number;
  to: number;
}

/** Part of a cue with one voice; voice is null when the markup names none. */
export interface CueSegment {
  voice: string | null;
  lines: CueLine[];
}

export interface Cue {
  start: number;
  end: number;
  segments: CueSegment[];
  /** Line number of the cue's timing line, for warnings. */
  line: number;
}

/** More warnings of one kind than this in a file are counted, not listed. */
const LISTED = 5;

/**
 * Timings that run backwards are kept in the order written (the words are what matter), but the
 * user is told, file and line: the W3C WebVTT specification's cue timing rules say a cue's end time
 * must be greater than its start time, and a cue's start time greater than or equal to the start
 * times of all cues before it. SubRip cues follow the same order by common practice.
 */
export function checkCueTimes(cues: Cue[], file: string, warnings: string[]): void {
  const backwards: string[] = [];
  let latest = -Infinity;
  for (const c of cues) {
    if (c.end < c.start) {
      backwards.push(`${file}:${c.line}: cue timing runs backwards: it ends (${clockText(c.end)}) before it starts (${clockText(c.start)})`);
    }
    if (c.start < latest) {
      backwards.push(`${file}:${c.line}: cue timing runs backwards: it starts at ${clockText(c.start)}, before a cue above it (${clockText(latest)}); kept in the order written`);
    }
    latest = Math.max(latest, c.start);
  }
  warnings.push(...backwards.slice(0, LISTED));
  if (backwards.length > LISTED) warnings.push(`${file}: ${backwards.length - LISTED} more cue timings run backwards`);
}

/** Seconds as hh:mm:ss.ttt. */
function clockText(seconds: number): string {
  const ms = Math.round(seconds * 1000);
  const h = Math.floor(ms / 3_600_000);
  const m = Math.floor((ms % 3_600_000) / 60_000);
  const s = Math.floor((ms % 60_000) / 1000);
  return `${String(h).padStart(2, '0')}:${String(m).padStart(2, '0')}:${String(s).padStart(2, '0')}.${String(ms % 1000).padStart(3, '0')}`;
}

interface Piece {
  speaker: string | null;
  /** Opened by a dialogue dash: a new, unnamed speaker. */
  dash: boolean;
  texts: string[];
  from: number;
  to: number;
}

const DASH = /^[-–—](?![-–—\d])[ \t]*/;

/** Splits a cue into speaker pieces: voice spans, then "Name:" or dialogue dashes at line starts. */
function piecesOf(cue: Cue): Piece[] {
  const out: Piece[] = [];
  for (const seg of cue.segments) {
    if (seg.lines.length === 0) continue;
    if (seg.voice !== null) {
      out.push({ speaker: seg.voice, dash: false, texts: seg.lines.map((l) => l.text), from: seg.lines[0]!.from, to: seg.lines[seg.lines.length - 1]!.to });
      continue;
    }
    let cur: Piece | null = null;
    for (const line of seg.lines) {
      const t = line.text.trim();
      const dash = DASH.exec(t);
      const label = dash ? null : parseLabel(t);
      if (dash) {
        cur = { speaker: null, dash: true, texts: [t.slice(dash[0].length)], from: line.from, to: line.to };
        out.push(cur);
      } else if (label && label.speaker !== null) {
        cur = { speaker: label.speaker, dash: false, texts: [t.slice(label.contentStart)], from: line.from, to: line.to };
        out.push(cur);
      } else if (cur) {
        cur.texts.push(t);
        cur.to = line.to;
      } else {
        cur = { speaker: null, dash: false, texts: [t], from: line.from, to: line.to };
        out.push(cur);
      }
    }
  }
  return out;
}

interface Open {
  speaker: string | null;
  dash: boolean;
  texts: string[];
  start: number;
  end: number;
  from: number;
  to: number;
}

/**
 * Merge rule: a named speaker continues the turn only when it is the same speaker; a piece with
 * no speaker continues the turn before it (captions name a speaker only when it changes) unless
 * that turn came from a dialogue dash; a dash always opens a new, unnamed turn.
 */
export function cuesToTurns(cues: Cue[]): RawTurn[] {
  const turns: Open[] = [];
  let cur: Open | null = null;
  for (const cue of cues) {
    for (const p of piecesOf(cue)) {
      const continues =
        cur !== null && !p.dash && (p.speaker === null ? !cur.dash : !cur.dash && cur.speaker === p.speaker);
      if (continues && cur) {
        cur.texts.push(...p.texts);
        cur.end = Math.max(cur.end, cue.end);
        cur.to = Math.max(cur.to, p.to);
      } else {
        cur = { speaker: p.speaker, dash: p.dash, texts: [...p.texts], start: cue.start, end: cue.end, from: p.from, to: p.to };
        turns.push(cur);
      }
    }
  }
  return turns.map((t) => ({
    speaker: t.speaker,
    text: t.texts.join(' ').replace(/\s+/g, ' ').trim(),
    start: t.start,
    end: t.end,
    offset: t.from,
    length: t.to - t.from,
  }));
}

/** True when a block's line was probably meant as a timing line (so a parse failure is an error). */
export function looksLikeTiming(line: string): boolean {
  return line.includes('-->') || /^\s*\d{1,3}:\d/.test(line) || /\d\s*-+\s*>?\s*\d{1,3}:\d/.test(line);
}
