/** The little of Markdown a transcript uses: headings, rules, list bullets, quotes, emphasis. */

export type MarkdownLineKind = 'heading' | 'rule' | 'text';

export interface MarkdownLine {
  kind: MarkdownLineKind;
  /** Index where the line's text begins after bullets or quote markers. */
  contentStart: number;
}

const HEADING = /^ {0,3}#{1,6}(?:[ \t]|$)/;
const RULE = /^ {0,3}(?:(?:\*[ \t]*){3,}|(?:-[ \t]*){3,}|(?:_[ \t]*){3,}|=+)[ \t]*$/;
const PREFIX = /^[ \t]*(?:>[ \t]?)*(?:(?:[-*+]|\d{1,3}[.)])[ \t]+)?/;

export function classifyMarkdownLine(line: string): MarkdownLine {
  if (HEADING.test(line)) return { kind: 'heading', contentStart: line.length };
  if (RULE.test(line)) return { kind: 'rule', contentStart: line.length };
  const m = PREFIX.exec(line);
  return { kind: 'text', contentStart: m ? m[0].length : 0 };
}

const CODE_TAG = /(\{[ \t]*theme[ \t]*:[^}\n]*\})/i;

/**
 * Removes "*" and "**" emphasis, and "_" / "__" at word edges (snake_case words keep theirs).
 * Inline code tags are left as written, so theme names keep their characters.
 */
export function stripEmphasis(text: string): string {
  if (!text.includes('{')) return stripPlain(text);
  return text
    .split(CODE_TAG)
    .map((part, k) => (k % 2 === 1 ? part : stripPlain(part)))
    .join('');
}

function stripPlain(text: string): string {
  let t = text.includes('*') ? text.replace(/\*+/g, '') : text;
  if (t.includes('_')) t = t.replace(/(^|[^\p{L}\p{N}_])_+|_+(?=[^\p{L}\p{N}_]|$)/gu, '$1');
  return t;
}
