/**
 * Plain and labelled text (.txt, .md, and the text of a .docx): speaker turns when labels are
 * found, otherwise one turn per paragraph.
 */
import { assertCodesClosed } from './codes.js';
import { parseLabel, type LabelMatch } from './labels.js';
import { isBlank, splitLines, type SourceLine } from './lines.js';
import { classifyMarkdownLine, stripEmphasis } from './markdown.js';
import { finishTurns, type RawTurn } from './turns.js';
import type { Turn } from './types.js';

export type TextFormat = 'txt' | 'md' | 'docx';

export interface TextParse {
  turns: Turn[];
  labelled: boolean;
  warnings: string[];
}

interface Row {
  line: SourceLine;
  kind: 'blank' | 'skip' | 'text';
  /** Absolute offset where the line's text starts (after Markdown bullets). */
  from: number;
  /** Absolute offset just past the last non-space character. */
  to: number;
  label: LabelMatch | null;
}

interface Part {
  from: number;
  to: number;
  /** A blank line came before this part within the same turn. */
  afterBreak: boolean;
}

interface Draft {
  speaker: string | null;
  start: number | null;
  parts: Part[];
}

export function parseText(source: string, format: TextFormat, file: string): TextParse {
  assertCodesClosed(source, file);
  const rows = splitLines(source).map((line) => classify(line, format === 'md'));
  const labelled = looksLabelled(rows);
  const warnings: string[] = [];
  badStamps(rows, file, warnings);
  const drafts = labelled ? labelledDrafts(rows, speakerCount(rows) >= 2, warnings, file) : plainDrafts(rows);
  const raw = drafts.filter((d) => d.parts.length > 0).map((d) => toRawTurn(d, source, format === 'md'));
  return { turns: finishTurns(raw, warnings, file), labelled, warnings };
}

/** More impossible timestamps than this in a file are counted, not listed. */
const LISTED = 5;

/** "[99:99:99]" is no time: the turn is still told apart, without a time, and the user is told where. */
function badStamps(rows: Row[], file: string, warnings: string[]): void {
  const bad = rows.filter((r) => r.label?.badStamp !== undefined);
  for (const r of bad.slice(0, LISTED)) {
    warnings.push(`${file}:${r.line.no}: impossible timestamp "${r.label!.badStamp}" (minutes and seconds run 00 to 59): ignored, so this turn has no time`);
  }
  if (bad.length > LISTED) warnings.push(`${file}: ${bad.length - LISTED} more impossible timestamps ignored`);
}

function classify(line: SourceLine, markdown: boolean): Row {
  const text = line.text;
  if (isBlank(text)) return { line, kind: 'blank', from: line.start, to: line.start, label: null };
  let prefix = 0;
  if (markdown) {
    const md = classifyMarkdownLine(text);
    if (md.kind !== 'text') return { line, kind: 'skip', from: line.start, to: line.start, label: null };
    prefix = md.contentStart;
  } else {
    while (text[prefix] === ' ' || text[prefix] === '\t') prefix++;
  }
  let to = text.length;
  while (to > prefix && /\s/.test(text[to - 1]!)) to--;
  const label = parseLabel(prefix === 0 ? text : text.slice(prefix));
  if (label) label.contentStart += prefix;
  return { line, kind: 'text', from: line.start + prefix, to: line.start + to, label };
}

/** Labels must start at least two turns and most paragraphs (or most lines, for unspaced files). */
function looksLabelled(rows: Row[]): boolean {
  let paragraphs = 0;
  let labelledParagraphs = 0;
  let lines = 0;
  let labelLines = 0;
  let inParagraph = false;
  for (const r of rows) {
    if (r.kind !== 'text') {
      inParagraph = false;
      continue;
    }
    const hasSpeaker = r.label?.speaker != null;
    lines++;
    if (hasSpeaker) labelLines++;
    if (!inParagraph) {
      paragraphs++;
      if (hasSpeaker) labelledParagraphs++;
      inParagraph = true;
    }
  }
  return labelLines >= 2 && (labelledParagraphs * 2 >= paragraphs || labelLines * 2 >= lines);
}

/** One draft per paragraph; a leading "[00:03:41]" gives its start time. */
function plainDrafts(rows: Row[]): Draft[] {
  const drafts: Draft[] = [];
  let cur: Draft | null = null;
  for (const r of rows) {
    if (r.kind !== 'text') {
      cur = null;
      continue;
    }
    if (!cur) {
      const stamp = r.label && r.label.speaker === null ? r.label : null;
      cur = { speaker: null, start: stamp?.start ?? null, parts: [] };
      drafts.push(cur);
      addPart(cur, stamp ? r.line.start + stamp.contentStart : r.from, r.to, false);
    } else addPart(cur, r.from, r.to, false);
  }
  return drafts;
}

function speakerCount(rows: Row[]): number {
  const names = new Set<string>();
  for (const r of rows) if (r.label?.speaker) names.add(r.label.speaker);
  return names.size;
}

/**
 * A label starts a turn; lines without one continue it, and so do later paragraphs when the file
 * names two or more speakers. When it names only one ("Q:" before each question, answers
 * unmarked), an unlabelled paragraph is someone else speaking: a turn without a speaker.
 * Paragraphs before the first label become turns without a speaker (title, date, notes), which the
 * user is told about.
 */
function labelledDrafts(rows: Row[], paragraphsContinue: boolean, warnings: string[], file: string): Draft[] {
  const drafts: Draft[] = [];
  let cur: Draft | null = null;
  let gap = false;
  let preamble = 0;
  let seenLabel = false;
  for (const r of rows) {
    if (r.kind === 'blank') {
      gap = true;
      continue;
    }
    if (r.kind === 'skip') {
      cur = null;
      continue;
    }
    const label = r.label;
    if (label && label.speaker !== null) {
      seenLabel = true;
      cur = { speaker: label.speaker, start: label.start, parts: [] };
      drafts.push(cur);
      addPart(cur, r.line.start + label.contentStart, r.to, false);
    } else if (cur && (!gap || (cur.speaker !== null && paragraphsContinue))) {
      addPart(cur, r.from, r.to, gap);
    } else {
      cur = { speaker: null, start: label?.start ?? null, parts: [] };
      drafts.push(cur);
      if (!seenLabel) preamble++;
      addPart(cur, label ? r.line.start + label.contentStart : r.from, r.to, false);
    }
    gap = false;
  }
  if (preamble > 0) {
    warnings.push(`${file}: ${preamble} paragraph(s) before the first speaker label were kept as turns without a speaker`);
  }
  return drafts;
}

function addPart(d: Draft, from: number, to: number, afterBreak: boolean): void {
  if (to <= from) return; // a label alone on its line: the words follow on the next lines
  d.parts.push({ from, to, afterBreak: afterBreak && d.parts.length > 0 });
}

/**
 * Plain text keeps the exact source span, so the turn is always a slice of the source. Markdown
 * joins the lines with their markers and emphasis removed; offset/length still cover the span.
 */
function toRawTurn(d: Draft, source: string, markdown: boolean): RawTurn {
  const first = d.parts[0]!;
  const last = d.parts[d.parts.length - 1]!;
  let text: string;
  if (markdown) {
    text = d.parts.map((p, k) => (k === 0 ? '' : p.afterBreak ? '\n\n' : '\n') + stripEmphasis(source.slice(p.from, p.to)).trim()).join('');
  } else {
    text = source.slice(first.from, last.to);
  }
  return { speaker: d.speaker, text, start: d.start, end: null, offset: first.from, length: last.to - first.from };
}
