/**
 * Drawing the review screen: one string per step, the whole screen each time. Plain text first;
 * colour (bold, dim, reverse) only adds emphasis, so nothing is lost without it.
 */
import { clock } from '../sheet/sheet.js';
import type { PassageView } from '../study/review.js';
import type { ReviewItem } from '../review/order.js';
import { markTerms, wrap } from './marks.js';
import { markedTerms, reasonText, type Snippets } from './reasons.js';
import type { ThemeEntry } from './review-search.js';

export interface Style {
  colour: boolean;
  /** TERM=dumb: ASCII rules, and no cursor movement. */
  dumb: boolean;
  width: number;
  /** Terminal height when known; the passage is cut to fit it. */
  rows?: number;
}

export interface Showing {
  item: ReviewItem;
  view: PassageView;
  rejected: ReadonlySet<number>;
  /** Candidates accepted (or re-coded to another theme) on this passage: it stays on screen for more. */
  accepted: ReadonlySet<number>;
  /** 1-based place in the queue; null for a passage brought back from outside it. */
  position: number | null;
}

export type Mode =
  | { kind: 'main' }
  | { kind: 'reject' }
  | { kind: 'note'; text: string }
  | { kind: 'search'; purpose: 'recode' | 'parent'; query: string; sel: number; entries: ThemeEntry[]; preset?: string }
  | { kind: 'name'; parentId: string | null; parentPath: string | null; text: string }
  | { kind: 'help' };

export interface ScreenModel {
  coder: string;
  order: string;
  /** "transcript t05", "theme Workload": what the queue is narrowed to. */
  filters: string[];
  showing: Showing | undefined;
  total: number;
  remaining: number;
  /** The other transcripts are still being scored: the queue has only its first passages. */
  scoring?: boolean;
  accepted: number;
  decided: number;
  deferred: number;
  message: string;
  note: string | undefined;
  mode: Mode;
  /** The search results on screen (computed by the session, which also acts on them). */
  matches: ThemeEntry[];
  snippets: Snippets;
  /** Lines of the passage scrolled past (up and down arrows), when it does not fit the screen. */
  scroll?: number;
}

export const MAX_MATCHES = 9;

// eslint-disable-next-line no-control-regex
const ANSI = /\x1b\[[0-9;]*m/g;
const visible = (s: string) => s.replace(ANSI, '').length;

function styler(st: Style) {
  const sgr = (on: string, off: string) => (s: string) => (st.colour ? `\x1b[${on}m${s}\x1b[${off}m` : s);
  return { bold: sgr('1', '22'), dim: sgr('2', '22'), rev: sgr('7', '27') };
}

/** Cuts plain text to n characters, with an ellipsis where it was cut. */
export function clip(text: string, n: number): string {
  const flat = text.replace(/\s+/g, ' ').trim();
  return flat.length > n ? flat.slice(0, Math.max(0, n - 1)).trimEnd() + '…' : flat;
}

/** The end of a text, cut at the front: the end of the previous turn leads into the passage. */
function clipFront(text: string, n: number): string {
  const flat = text.replace(/\s+/g, ' ').trim();
  return flat.length > n ? '…' + flat.slice(flat.length - (n - 1)).trimStart() : flat;
}

const pct = (a: number, b: number) => (b ? ` (${Math.round((100 * a) / b)}%)` : '');

export function statusLine(m: Pick<ScreenModel, 'showing' | 'total' | 'remaining' | 'scoring' | 'accepted' | 'decided' | 'deferred'>): string {
  const pos = m.showing ? (m.showing.position === null ? `back from the log (queue of ${m.total})` : `${m.showing.position} / ${m.total}`) : `done (${m.total})`;
  const parts = [`queue ${pos}${m.scoring ? ' so far' : ''}`, `${m.remaining} left`];
  // Before the counts, which a narrow screen cuts first (and which are 0 while this shows).
  if (m.scoring) parts.push('other transcripts still being scored');
  parts.push(`accepted ${m.accepted} of ${m.decided} decided${pct(m.accepted, m.decided)}`);
  if (m.deferred) parts.push(`${m.deferred} deferred`);
  return parts.join(' · ');
}

function keyHints(m: ScreenModel): string {
  switch (m.mode.kind) {
    case 'reject':
      return 'reject which candidate?  1-5 that one · x or Enter the top one · Esc cancel';
    case 'note':
      return 'Enter keeps the note for the next decision · Esc cancels';
    case 'search':
      return 'type to narrow · up/down or 1-9 choose · + ' + (m.mode.purpose === 'recode' ? 'new sub-theme' : 'top level') + ' · Enter confirm · Esc cancel';
    case 'name':
      return 'Enter creates the theme and codes the passage to it · Esc cancels';
    case 'help':
      return 'any key returns to the passage';
    case 'main':
      if (!m.showing) return 'u undo the last decision · ? keys · q quit';
      return '1-5 accept · x reject · r re-code · d defer · 0 nothing to code · n note · u undo · ? keys · q quit';
  }
}

function candidateLines(s: Showing, st: Style, snippets: Snippets): string[] {
  const { bold, dim } = styler(st);
  const out: string[] = [];
  s.item.candidates.forEach((c, i) => {
    const rejected = s.rejected.has(c.suggestionId);
    const accepted = s.accepted.has(c.suggestionId);
    const mark = c.above ? '*' : ' ';
    const head = `  ${i + 1}  ${c.confidence.toFixed(2)} ${mark}  `;
    const room = st.width - head.length;
    const path = clip(c.path, room - (rejected ? 22 : accepted ? 14 : 0)) + (rejected ? '   (rejected: not offered)' : accepted ? '   (accepted)' : '');
    out.push(rejected ? dim(head + path) : head.replace(/^( {2}\d)/, (d) => bold(d)) + (i === 0 ? bold(path) : path));
    // The stored run keeps reasons for the best three; a later candidate goes without.
    if (!rejected && c.reasons.length) out.push(dim(' '.repeat(head.length) + clip(reasonText(c.reasons[0]!, snippets), st.width - head.length)));
  });
  return out;
}

/** Where the passage is, and the turns around it; the passage itself comes between them. */
function passageParts(s: Showing, st: Style): { head: string[]; body: string[]; foot: string[] } {
  const { bold, dim } = styler(st);
  const p = s.view.passage;
  const marks = new Set(s.item.candidates.filter((c) => !s.rejected.has(c.suggestionId)).flatMap((c) => markedTerms(c.reasons)));
  const width = st.width;
  const where = [p.id, p.speaker ?? 'participant', p.start !== null ? clock(p.start) : null].filter(Boolean).join('  ·  ');
  const turn = (label: string, t: PassageView['before'], front: boolean) => {
    if (!t) return dim(`  ${label}  (none)`);
    const who = `${t.speaker ?? 'participant'}${t.start !== null ? ` (${clock(t.start)})` : ''}: `;
    const lead = `  ${label}  ${who}`;
    const room = width - lead.length;
    return dim(lead + (front ? clipFront(t.text, room) : clip(t.text, room)));
  };
  const body = wrap(markTerms(s.view.tokens.text, s.view.tokens.lemmas, s.view.tokens.spans, marks, st.colour), width - 4, '    ').split('\n');
  return {
    head: [bold(where) + dim(`  ·  passage ${p.ordinal} of ${s.view.passages} in the transcript`), turn('before', s.view.before, true), ''],
    body,
    foot: ['', turn('after ', s.view.after, false)],
  };
}

/**
 * Fits the passage into the rows left: the blank lines around it go first, and only then is
 * the passage itself cut, with a line saying how much is hidden.
 */
function fitPassage(parts: { head: string[]; body: string[]; foot: string[] }, room: number | undefined, st: Style, scroll = 0): { lines: string[]; maxScroll: number; scroll: number } {
  const { dim } = styler(st);
  let { head, body, foot } = parts;
  if (room === undefined || head.length + body.length + foot.length <= room) return { lines: [...head, ...body, ...foot], maxScroll: 0, scroll: 0 };
  head = head.filter((l) => l !== '');
  foot = foot.filter((l) => l !== '');
  const left = Math.max(3, room - head.length - foot.length);
  if (body.length <= left) return { lines: [...head, ...body, ...foot], maxScroll: 0, scroll: 0 };
  // A window of the passage, with a line above and below saying what is out of view. The window
  // holds left - 2 lines; the last window reaches the passage's end.
  const shown = Math.max(1, left - 2);
  const maxScroll = body.length - shown;
  const at = Math.max(0, Math.min(scroll, maxScroll));
  const above = at;
  const below = body.length - at - shown;
  const plural = (n: number) => `${n} line${n === 1 ? '' : 's'}`;
  body = [
    dim(above ? `    ↑ ${plural(above)} above (up arrow)` : '    (start of the passage)'),
    ...body.slice(at, at + shown),
    dim(below ? `    ↓ ${plural(below)} more (down arrow scrolls)` : '    (end of the passage)'),
  ];
  return { lines: [...head, ...body, ...foot], maxScroll, scroll: at };
}

function searchLines(m: ScreenModel, st: Style): string[] {
  const { bold, rev } = styler(st);
  const mode = m.mode as Extract<Mode, { kind: 'search' }>;
  const title =
    mode.purpose === 'recode'
      ? `Re-code ${m.showing?.item.passageId ?? ''} to:  `
      : 'New sub-theme: which theme is its parent?  ';
  const out = [bold(title) + mode.query + '_'];
  const rows: string[] = m.matches.map((e, i) => `${i + 1}  ${e.path}`);
  rows.push(mode.purpose === 'recode' ? '+  create a new sub-theme here…' : '+  none: a new top-level theme');
  if (m.matches.length === 0) out.push('   (no theme matches; Backspace widens the search)');
  rows.forEach((r, i) => {
    const line = r.length > st.width - 6 ? r.slice(0, st.width - 7) + '…' : r;
    // The marker shows the choice without colour; reverse video only adds to it.
    out.push(i === mode.sel ? '> ' + rev(` ${line} `) : `   ${line}`);
  });
  return out;
}

const HELP = [
  ['1-5', 'accept that candidate theme for the passage (it becomes your coding)'],
  ['x', 'reject a candidate: then 1-5 for that one, or x / Enter for the top one'],
  ['r', 're-code: search the template for another theme, or create a new sub-theme'],
  ['d', 'defer: leave the passage for later (skipped for the rest of this session)'],
  ['0', 'reviewed, nothing to code: no theme applies (it leaves the queue and the unclaimed pool)'],
  ['n', 'write a note that is kept with your next decision'],
  ['u', 'undo your latest decision that still stands, and go back to its passage'],
  ['Enter', 'after a reject: go on to the next passage'],
  ['↑ ↓', 'scroll a passage longer than the screen'],
  ['?', 'this list'],
  ['q', 'quit (Ctrl-C too); every decision is already saved'],
];

function helpLines(st: Style): string[] {
  const { bold } = styler(st);
  return [
    bold('Keys'),
    '',
    ...HELP.map(([k, v]) => `  ${k!.padEnd(6)} ${v}`),
    '',
    'Each decision is written to the study before the next passage is shown, and the screen',
    'says "saved" when it is. A * marks a candidate at or above its theme\'s threshold.',
    'Suggestions are aids: you decide what each passage is about.',
  ];
}

/** The whole screen as text (no clearing codes: the caller adds those). */
export function renderScreen(m: ScreenModel, st: Style): string {
  return layoutScreen(m, st).screen;
}

/** The screen, and how far the passage can scroll on it (0 when it fits). */
export function layoutScreen(m: ScreenModel, st: Style): { screen: string; maxScroll: number } {
  const { bold, dim } = styler(st);
  const rule = (st.dumb ? '-' : '─').repeat(st.width);
  const lines: string[] = [];
  const title = [`trellis review`, `coder ${m.coder}`, `order: ${m.order}`, ...m.filters].join(' · ');
  lines.push(bold(clip(title, st.width)));
  lines.push(dim(rule));
  if (m.mode.kind === 'help') {
    lines.push(...helpLines(st));
  } else if (!m.showing) {
    lines.push('');
    lines.push(bold('Nothing left to review in this queue.'));
    lines.push('');
    lines.push(`Decided this session: ${m.decided} suggestions, ${m.accepted} of them accepted; deferred: ${m.deferred}.`);
    lines.push('Deferred passages come back in the next session. Press u to undo your latest decision,');
    lines.push('or q to quit.');
  } else {
    const parts = passageParts(m.showing, st);
    const below: string[] = [dim(rule)];
    if (m.mode.kind === 'search') below.push(...searchLines(m, st));
    else {
      below.push(`${bold('Candidate themes')}  ${dim("(confidence; * at or above the theme's threshold)")}`);
      below.push(...candidateLines(m.showing, st, m.snippets));
      below.push(dim('Suggestions are aids: you decide what each passage is about.'));
    }
    if (m.mode.kind === 'name') {
      below.push('');
      below.push(bold(`Name of the new theme ${m.mode.parentPath ? `under ${m.mode.parentPath}` : 'at the top level'}: `) + m.mode.text + '_');
    }
    const footer = footerLines(m, st);
    const room = st.rows ? st.rows - lines.length - below.length - footer.length : undefined;
    const fitted = fitPassage(parts, room, st, m.scroll ?? 0);
    lines.push(...fitted.lines, ...below, ...footer);
    return { screen: finish(lines, st), maxScroll: fitted.maxScroll };
  }
  lines.push(...footerLines(m, st));
  return { screen: finish(lines, st), maxScroll: 0 };
}

/** The rule, the status line, a pending note, the last outcome and the keys. */
function footerLines(m: ScreenModel, st: Style): string[] {
  const { bold, dim } = styler(st);
  const out = [dim((st.dumb ? '-' : '─').repeat(st.width)), statusLine(m)];
  if (m.mode.kind === 'note') out.push(bold('note: ') + m.mode.text + '_');
  else if (m.note) out.push(dim(clip(`note for the next decision: ${m.note}`, st.width)));
  if (m.message) out.push(...wrap(m.message, st.width, '').split('\n').slice(0, 3));
  out.push(dim(keyHints(m)));
  return out;
}

/** Keeps every plain line within the width, so that nothing wraps and shifts the screen. */
function finish(lines: string[], st: Style): string {
  return lines.map((l) => (visible(l) > st.width && !l.includes('\x1b') ? clip(l, st.width) : l)).join('\n');
}
