/**
 * The codebook: the numbered template with each theme's definition, inclusion and exclusion
 * notes, a priori mark, seed terms, counts and example quotes, ready for a thesis appendix or a
 * second coder's briefing. Markdown, self-contained HTML, or CSV for a spreadsheet.
 */

import { writeCsv } from '../sheet/csv.js';
import { DATA_CAUTION } from './cautions.js';
import { BASE_CSS, htmlDocument } from './document.js';
import { esc, int, oneLine, plural, when } from './escape.js';
import { QUOTE_RULES, choiceLine } from './quotes.js';
import type { ReportData, ReportMemo, ReportTheme } from './types.js';

export type CodebookFormat = 'md' | 'html' | 'csv';

export interface CodebookOptions {
  /** Example quotes per theme (default 2). */
  examples?: number;
}

const level = (t: ReportTheme) => t.number.split('.').length - 1;

function source(q: ReportTheme['quotes'][number]): string {
  return [q.transcript, q.speaker, q.time].filter(Boolean).join(', ');
}

function intro(d: ReportData): string {
  const apriori = d.themes.filter((t) => t.apriori).length;
  return (
    `${plural(d.themes.length, 'theme')} (${apriori} a priori)` +
    (d.counts.revision === null ? '' : `, template revision ${d.counts.revision}`) +
    `; ${codedAcross(d)}. Generated ${when(d.generatedAt)}.`
  );
}

/** "codings in 8 of 23 transcripts": only transcripts that carry codings count as coded. */
function codedAcross(d: ReportData): string {
  const coded = d.counts.codedTranscripts ?? 0;
  if (!d.counts.transcripts) return 'no transcripts imported yet';
  if (!coded) return `no passages coded yet in ${plural(d.counts.transcripts, 'transcript')}`;
  return `codings in ${coded} of ${plural(d.counts.transcripts, 'transcript')} (${plural(d.counts.coded, 'participant passage')} coded)`;
}

/** How the example quotes were chosen, and how their sources are named. */
function quoteNote(d: ReportData): string {
  return `Examples: ${QUOTE_RULES.replace(/^Quotes are/, 'quotes are')} ${choiceLine(d)} ${d.pseudonyms ?? 'Sources are named as stored, not pseudonymised.'}`;
}

function counts(t: ReportTheme): string {
  return t.total === t.direct ? plural(t.direct, 'passage') : `${plural(t.direct, 'passage')} coded to it; ${int(t.total)} with its sub-themes`;
}

// ---------------------------------------------------------------------------------------------
// Markdown

/**
 * Backslash-escapes the characters Markdown would read as markup, so that a definition or quote
 * prints as written (CommonMark lets any ASCII punctuation be escaped this way).
 */
export function mdEscape(text: string): string {
  return (
    oneLine(text)
      .replace(/[\\`*_[\]<|~#]/g, (c) => `\\${c}`)
      .replace(/&(?=#?[a-zA-Z0-9]+;)/g, '\\&')
      // At the start of a line, these would open a quote, a list or a heading underline.
      .replace(/^>/, '\\>')
      .replace(/^([+\-=]|\d+[.)])(?=\s|$)/, (m) => m.replace(/([+\-=.)])$/, '\\$1'))
  );
}

/** The hierarchy first, then the integrative themes, which run across it. */
function ordered(d: ReportData): ReportTheme[] {
  return [...d.themes.filter((t) => !t.integrative), ...d.themes.filter((t) => t.integrative)];
}

/** "Workload 4, Patient safety 2": the top-level themes an integrative theme touches. */
export function acrossText(d: ReportData, themeId: string): string | null {
  const x = d.integrative?.find((i) => i.themeId === themeId);
  if (!x) return null;
  if (!x.passages) return 'not coded yet';
  const touched = x.across.filter((a) => a.passages > 0);
  return `touches ${touched.length} of ${x.across.length} top-level themes` + (touched.length ? `: ${touched.map((a) => `${a.name} (${plural(a.passages, 'passage')})`).join(', ')}` : '');
}

export const INTEGRATIVE_INTRO = 'Integrative themes run across the themes of the hierarchy rather than sitting under one; a passage carries them alongside any other theme.';

/** Memos on the study as a whole: the codebook's preface. */
function studyMemos(d: ReportData): ReportMemo[] {
  return (d.memos ?? []).filter((m) => m.kind === 'study');
}

function markdown(d: ReportData, examples: number): string {
  const out: string[] = [`# Codebook: ${mdEscape(d.title)}`, '', mdEscape(intro(d)), '', `> ${mdEscape(DATA_CAUTION)}`, '', mdEscape(quoteNote(d)), ''];
  const notes = studyMemos(d);
  if (notes.length) out.push('## Memos on the study', '', ...notes.map((m) => `- ${mdEscape(m.text)} _(${mdEscape(m.author)}, ${when(m.at)})_`), '');
  if (!d.themes.length) return [...out, '_The template has no themes yet._', ''].join('\n');

  out.push('## Overview', '', '| No. | Theme | A priori | Passages (with sub-themes) |', '| --- | --- | --- | ---: |');
  let apart = false;
  for (const t of ordered(d)) {
    if (t.integrative && !apart) {
      apart = true;
      out.push('| | **Integrative themes** | | |');
    }
    // Non-breaking spaces indent the overview, as a table cell would drop ordinary ones.
    out.push(`| ${t.number} | ${'\u00a0\u00a0'.repeat(level(t))}${mdEscape(t.name)} | ${t.apriori ? 'yes' : ''} | ${int(t.total)} |`);
  }
  out.push('', '## Themes', '');
  apart = false;
  for (const t of ordered(d)) {
    if (t.integrative && !apart) {
      apart = true;
      out.push('## Integrative themes', '', mdEscape(INTEGRATIVE_INTRO), '');
    }
    // Headings go one level deeper per template level; Markdown stops at six, the number does not.
    const hashes = '#'.repeat(Math.min(6, 3 + level(t)));
    out.push(`${hashes} ${t.number} ${mdEscape(t.name)}${t.apriori ? ' (a priori)' : ''}`, '');
    const field = (name: string, value: string) => out.push(`- **${name}:** ${value}`);
    if (level(t) > 0) field('Path', mdEscape(t.path));
    field('Definition', t.definition ? mdEscape(t.definition) : '_not yet written_');
    if (t.include) field('Include', mdEscape(t.include));
    if (t.exclude) field('Exclude', mdEscape(t.exclude));
    field('A priori', t.apriori ? 'yes, defined before coding began' : 'no');
    if (t.seeds.length) field('Seed terms', t.seeds.map(mdEscape).join(', '));
    field('Passages', mdEscape(counts(t)));
    const runs = acrossText(d, t.id);
    if (runs) field('Runs across', mdEscape(runs));
    for (const m of t.memos ?? []) field('Memo', `${mdEscape(m.text)} _(${mdEscape(m.author)}, ${when(m.at)})_`);
    const qs = t.quotes.slice(0, examples);
    if (qs.length) {
      out.push('', qs.length === 1 ? 'Example:' : 'Examples:', '');
      // A backslash at the end of a line is a hard line break: the source goes on its own line.
      for (const q of qs) out.push(`> ${mdEscape(q.text)}\\`, `> — ${mdEscape(source(q))}${q.pinned ? ' (pinned)' : ''}`, '');
    } else out.push('');
  }
  return out.join('\n').replace(/\n{3,}/g, '\n\n').trimEnd() + '\n';
}

// ---------------------------------------------------------------------------------------------
// HTML

const CODEBOOK_CSS = `
.overview td.theme { padding-left: var(--indent, 8px); }
.overview tr.top td { font-weight: 600; }
h2 + .entry.top { border-top: 0; margin-top: 0; }
.entry { border-top: 1px solid var(--rule); padding: 4px 0 8px; break-inside: avoid-page; }
.entry.top { border-top: 2px solid var(--ink); margin-top: 24px; }
.entry dl { display: grid; grid-template-columns: 9em 1fr; gap: 4px 14px; margin: 6px 0 10px; }
.entry dt { color: var(--muted); font-size: 0.88rem; }
.entry dd { margin: 0; }
.entry .path { color: var(--muted); font-size: 0.85rem; margin: -4px 0 4px; }
h2.entry-h, h3.entry-h, h4.entry-h, h5.entry-h, h6.entry-h { margin: 14px 0 4px; border: 0; padding: 0; font-size: 1.05rem; }
h2.entry-h { font-size: 1.25rem; }
`;

function html(d: ReportData, examples: number): string {
  const parts: string[] = [`<header><p class="meta">Codebook</p><h1>${esc(d.title)}</h1><p class="meta">${esc(intro(d))}</p><p class="caution">${esc(DATA_CAUTION)}</p><p class="note">${esc(quoteNote(d))}</p></header>`];
  const notes = studyMemos(d);
  if (notes.length) parts.push(`<h2>Memos on the study</h2><ul>${notes.map((m) => `<li>${esc(oneLine(m.text))} <span class="note">(${esc(m.author)}, ${esc(when(m.at))})</span></li>`).join('')}</ul>`);
  if (!d.themes.length) {
    parts.push('<p class="empty">The template has no themes yet.</p>');
    return htmlDocument(`Codebook: ${d.title}`, BASE_CSS + CODEBOOK_CSS, parts.join('\n'));
  }
  parts.push(
    '<h2>Overview</h2><table class="overview"><thead><tr><th scope="col">No.</th><th scope="col">Theme</th><th scope="col">A priori</th><th scope="col" class="num">Passages (with sub-themes)</th></tr></thead><tbody>' +
      ordered(d)
        .map((t, i, all) => (t.integrative && !all[i - 1]?.integrative ? '<tr class="top"><td></td><td colspan="3">Integrative themes</td></tr>' : '') + `<tr${level(t) === 0 ? ' class="top"' : ''}><td class="nowrap">${esc(t.number)}</td><td class="theme" style="--indent:${8 + level(t) * 20}px">${esc(t.name)}</td><td>${t.apriori ? 'a priori' : ''}</td><td class="num">${int(t.total)}</td></tr>`)
        .join('') +
      '</tbody></table>',
  );
  parts.push('<h2>Themes</h2>');
  for (const t of ordered(d)) {
    if (t.integrative && t.number === 'I1') parts.push(`<h2>Integrative themes</h2><p>${esc(INTEGRATIVE_INTRO)}</p>`);
    const h = Math.min(6, 3 + level(t));
    const rows: [string, string][] = [['Definition', t.definition ? esc(oneLine(t.definition)) : '<span class="note">not yet written</span>']];
    if (t.include) rows.push(['Include', esc(oneLine(t.include))]);
    if (t.exclude) rows.push(['Exclude', esc(oneLine(t.exclude))]);
    rows.push(['A priori', t.apriori ? 'yes, defined before coding began' : 'no']);
    if (t.seeds.length) rows.push(['Seed terms', esc(t.seeds.join(', '))]);
    rows.push(['Passages', esc(counts(t))]);
    const runs = acrossText(d, t.id);
    if (runs) rows.push(['Runs across', esc(runs)]);
    for (const m of t.memos ?? []) rows.push(['Memo', `${esc(oneLine(m.text))} <span class="note">(${esc(m.author)}, ${esc(when(m.at))})</span>`]);
    const qs = t.quotes.slice(0, examples);
    parts.push(
      `<section class="entry${level(t) === 0 ? ' top' : ''}"><h${h} class="entry-h">${esc(`${t.number} ${t.name}`)}${t.apriori ? '<span class="tag">a priori</span>' : ''}</h${h}>` +
        (level(t) > 0 ? `<p class="path">${esc(t.path)}</p>` : '') +
        `<dl>${rows.map(([k, v]) => `<dt>${k}</dt><dd>${v}</dd>`).join('')}</dl>` +
        qs.map((q) => `<blockquote><p>${esc(oneLine(q.text))}</p><footer>${esc(source(q))}${q.pinned ? ' (pinned)' : ''}</footer></blockquote>`).join('') +
        `</section>`,
    );
  }
  return htmlDocument(`Codebook: ${d.title}`, BASE_CSS + CODEBOOK_CSS, parts.join('\n'));
}

// ---------------------------------------------------------------------------------------------
// CSV

export const CODEBOOK_COLUMNS = [
  'number',
  'theme',
  'path',
  'level',
  'a_priori',
  'definition',
  'include',
  'exclude',
  'seed_terms',
  'passages_direct',
  'passages_total',
  'example_1',
  'example_1_source',
  'example_2',
  'example_2_source',
  'integrative',
] as const;

function csv(d: ReportData, examples: number): string {
  const n = Math.max(0, examples);
  const columns: string[] = [...CODEBOOK_COLUMNS.slice(0, 11)];
  for (let i = 1; i <= n; i++) columns.push(`example_${i}`, `example_${i}_source`);
  columns.push('integrative');
  const rows = ordered(d).map((t) => {
    const row: (string | number)[] = [
      t.number,
      t.name,
      t.path,
      level(t) + 1,
      t.apriori ? 'yes' : 'no',
      oneLine(t.definition),
      oneLine(t.include),
      oneLine(t.exclude),
      t.seeds.join('; '),
      t.direct,
      t.total,
    ];
    for (let i = 0; i < n; i++) {
      const q = t.quotes[i];
      row.push(q ? oneLine(q.text) : '', q ? source(q) : '');
    }
    row.push(t.integrative ? 'yes' : 'no');
    return row;
  });
  return writeCsv(columns, rows, d.pseudonyms ? `${DATA_CAUTION} ${d.pseudonyms}` : DATA_CAUTION);
}

/** The codebook in one of three formats; `examples` quotes per theme (default 2). */
export function renderCodebook(data: ReportData, format: CodebookFormat, options: CodebookOptions = {}): string {
  const examples = options.examples ?? 2;
  switch (format) {
    case 'md':
      return markdown(data, examples);
    case 'html':
      return html(data, examples);
    case 'csv':
      return csv(data, examples);
    default:
      throw new RangeError(`unknown codebook format: ${String(format)} (use md, html or csv)`);
  }
}
