/**
 * Inline codes, trellis's own markup: `{theme: Workload > Staffing; Patient safety}` anywhere in
 * a turn. A tag must open and close on one line; it is removed from the turn's text and recorded.
 */
import { UserError } from '../errors.js';
import type { InlineCode } from './types.js';

const OPEN = /\{[ \t]*theme[ \t]*:/gi;

/**
 * Checks every tag in the source closes on its own line and names at least one theme, so that
 * later extraction (on turn text built from whole lines) cannot meet a broken tag.
 */
export function assertCodesClosed(source: string, file: string): void {
  if (!source.includes('{')) return;
  OPEN.lastIndex = 0;
  let line = 1;
  let counted = 0;
  for (let m = OPEN.exec(source); m; m = OPEN.exec(source)) {
    line += countNewlines(source, counted, m.index);
    counted = m.index;
    const lineEnd = endOfLine(source, m.index);
    const close = source.indexOf('}', m.index);
    if (close === -1 || close > lineEnd || source.lastIndexOf('{', close) !== m.index) {
      throw new UserError('an inline code "{theme: ..." is not closed with "}" on the same line', file, line);
    }
    if (parsePaths(source.slice(m.index + m[0].length, close)).length === 0) {
      throw new UserError('an inline code names no theme: write "{theme: Theme > Sub-theme}"', file, line);
    }
    OPEN.lastIndex = close + 1;
  }
}

/**
 * Removes the tags from `text`, collapsing the double space a tag leaves, and returns where each
 * stood in the cleaned text. Assumes assertCodesClosed has passed on the source.
 */
export function extractInlineCodes(text: string): { text: string; codes: InlineCode[] } {
  if (!text.includes('{')) return { text, codes: [] };
  const codes: InlineCode[] = [];
  let out = '';
  let from = 0;
  const re = new RegExp(OPEN.source, 'gi');
  for (let m = re.exec(text); m; m = re.exec(text)) {
    const close = text.indexOf('}', m.index);
    if (close === -1) break;
    out += text.slice(from, m.index);
    const next = text[close + 1];
    // Drop the space before the tag when what follows is a space, a line end, punctuation or the end.
    if (/[ \t]$/.test(out) && (next === undefined || /[\s.,;:!?)\]]/.test(next))) out = out.replace(/[ \t]+$/, '');
    from = close + 1;
    // At the start of the text or a line, drop the space after the tag instead.
    if (out === '' || out.endsWith('\n')) while (text[from] === ' ' || text[from] === '\t') from++;
    codes.push({ paths: parsePaths(text.slice(m.index + m[0].length, close)), at: out.length });
    re.lastIndex = from;
  }
  out += text.slice(from);
  const trimmed = out.trimEnd();
  const lead = out.length - out.trimStart().length;
  const clean = trimmed.trimStart();
  for (const c of codes) c.at = Math.max(0, Math.min(c.at - lead, clean.length));
  return { text: clean, codes };
}

/** "A > B; C" -> ["A > B", "C"], spacing around ">" normalised, empty parts dropped. */
export function parsePaths(inner: string): string[] {
  return inner
    .split(';')
    .map((p) =>
      p
        .split('>')
        .map((level) => level.trim().replace(/\s+/g, ' '))
        .filter((level) => level !== '')
        .join(' > '),
    )
    .filter((p) => p !== '');
}

function endOfLine(s: string, i: number): number {
  const nl = s.indexOf('\n', i);
  return nl === -1 ? s.length : nl;
}

function countNewlines(s: string, from: number, to: number): number {
  let n = 0;
  for (let i = s.indexOf('\n', from); i !== -1 && i < to; i = s.indexOf('\n', i + 1)) n++;
  return n;
}
