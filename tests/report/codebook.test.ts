import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { DATA_CAUTION } from '../../src/report/cautions.js';
import { CODEBOOK_COLUMNS, mdEscape, renderCodebook } from '../../src/report/codebook.js';
import type { ReportData, ReportTheme } from '../../src/report/types.js';
import { emptyReport, sampleReport } from './sample.js';

const HOSTILE = '=cmd|"/c calc"!A1 <script>alert(1)</script> & *bold* _x_ [link](#) `code`';

function withHostile(): ReportData {
  const d = sampleReport();
  d.themes[0]!.definition = HOSTILE;
  d.themes[1]!.quotes[0]!.text = `- looks like a list, "quoted", with a comma\nand a newline`;
  d.themes[2]!.name = 'Log<in> & out';
  return d;
}

/** A template of seven levels, deeper than Markdown's six heading levels. */
function deep(): ReportData {
  const d = sampleReport();
  const themes: ReportTheme[] = [];
  let number = '';
  let path = '';
  for (let i = 0; i < 7; i++) {
    number = number ? `${number}.1` : '1';
    path = path ? `${path} > Level ${i + 1}` : 'Level 1';
    themes.push({ ...d.themes[0]!, id: `d${i}`, number, name: `Level ${i + 1}`, path, depth: i, quotes: [] });
  }
  return { ...d, themes };
}

describe('renderCodebook: Markdown', () => {
  const md = renderCodebook(sampleReport(), 'md');

  it('gives every theme a heading numbered like the template, one level deeper per level', () => {
    const themes = sampleReport().themes;
    const headings = [...md.matchAll(/^(#{3,6}) (\d+(?:\.\d+)*) (.+)$/gm)];
    expect(headings.map((h) => h[2])).toEqual(themes.map((t) => t.number));
    headings.forEach((h, i) => {
      const level = themes[i]!.number.split('.').length;
      expect(h[1]!.length).toBe(2 + level);
      expect(h[3]!.startsWith(mdEscape(themes[i]!.name))).toBe(true);
    });
    expect(md).toContain('### 1 Workload (a priori)');
    expect(md).toContain('###### 2.1.2.1 Allergies');
  });

  it('stops at six heading levels but keeps numbering deeper themes', () => {
    const out = renderCodebook(deep(), 'md');
    expect(out).toContain('###### 1.1.1.1 Level 4');
    expect(out).toContain('###### 1.1.1.1.1.1.1 Level 7');
    expect(out).not.toMatch(/^#{7}/m);
  });

  it('carries definitions, inclusion and exclusion notes, seeds, counts and up to two quotes', () => {
    const t = sampleReport().themes[0]!;
    expect(md).toContain(`- **Definition:** ${t.definition}`);
    expect(md).toContain(`- **Include:** ${t.include}`);
    expect(md).toContain(`- **Exclude:** ${t.exclude}`);
    expect(md).toContain(`- **Seed terms:** ${t.seeds.join(', ')}`);
    expect(md).toContain(`- **Passages:** ${t.direct} passages coded to it; ${t.total} with its sub-themes`);
    expect(md).toContain(`> — ${t.quotes[0]!.transcript}, ${t.quotes[0]!.speaker}, ${t.quotes[0]!.time}`);
    // A theme with more quotes than asked for shows only the first two (the most representative).
    const many = sampleReport();
    many.themes[1]!.quotes.push({ ...many.themes[1]!.quotes[0]!, text: 'A third quote, not wanted.' });
    expect(renderCodebook(many, 'md')).not.toContain('A third quote');
    expect(renderCodebook(many, 'md', { examples: 3 })).toContain('A third quote');
  });

  it('escapes Markdown so study text prints as written', () => {
    const out = renderCodebook(withHostile(), 'md');
    // Every < is backslash-escaped, so no tag reaches a Markdown renderer's HTML pass.
    expect(out).not.toMatch(/(?<!\\)</);
    expect(out).toContain('\\<script>alert(1)\\</script>');
    expect(out).toContain('\\*bold\\*');
    expect(out).toContain('\\[link\\](\\#)');
    expect(out).toContain('\\`code\\`');
    // A quote that begins like a list item stays a quote; its newline does not end the quote.
    expect(out).toContain('> \\- looks like a list, "quoted", with a comma and a newline\\');
    expect(out).toContain('#### 1.1.1 Log\\<in> & out');
  });

  it('says so when the template is empty', () => {
    const d = emptyReport();
    d.themes = [];
    expect(renderCodebook(d, 'md')).toContain('_The template has no themes yet._');
  });
});

describe('renderCodebook: CSV', () => {
  const csv = renderCodebook(sampleReport(), 'csv');

  it('is UTF-8 with a byte-order mark and CRLF line ends', () => {
    expect(csv.charCodeAt(0)).toBe(0xfeff);
    // The caution line, the header and one line per theme, each ended by CRLF; no bare LF or CR.
    expect(csv.split('\r\n')).toHaveLength(sampleReport().themes.length + 3);
    expect(csv.split('\r\n')[0]).toBe(`\ufeff# ${DATA_CAUTION}`);
    expect(csv.replace(/\r\n/g, '')).not.toMatch(/[\r\n]/);
  });

  it('parses back to one row per theme with every field', () => {
    const d = sampleReport();
    const rows = parse(csv, { bom: true, columns: true, comment: '#', comment_no_infix: true }) as Record<string, string>[];
    expect(Object.keys(rows[0]!)).toEqual([...CODEBOOK_COLUMNS]);
    expect(rows).toHaveLength(d.themes.length);
    rows.forEach((r, i) => {
      const t = d.themes[i]!;
      expect(r.number).toBe(t.number);
      expect(r.theme).toBe(t.name);
      expect(r.path).toBe(t.path);
      expect(Number(r.level)).toBe(t.number.split('.').length);
      expect(r.a_priori).toBe(t.apriori ? 'yes' : 'no');
      expect(r.definition).toBe(t.definition);
      expect(r.include).toBe(t.include);
      expect(r.exclude).toBe(t.exclude);
      expect(r.seed_terms).toBe(t.seeds.join('; '));
      expect(Number(r.passages_direct)).toBe(t.direct);
      expect(Number(r.passages_total)).toBe(t.total);
      expect(r.example_1).toBe(t.quotes[0]?.text ?? '');
      expect(r.example_2).toBe(t.quotes[1]?.text ?? '');
      expect(r.integrative).toBe(t.integrative ? 'yes' : 'no');
    });
  });

  it('keeps quotes, commas and newlines intact, and defuses spreadsheet formulas', () => {
    const rows = parse(renderCodebook(withHostile(), 'csv'), { bom: true, columns: true, comment: '#', comment_no_infix: true }) as Record<string, string>[];
    // A leading apostrophe keeps a spreadsheet from running the cell as a formula.
    expect(rows[0]!.definition).toBe(`'${HOSTILE}`);
    expect(rows[1]!.example_1).toBe(`'- looks like a list, "quoted", with a comma and a newline`);
    expect(rows[2]!.theme).toBe('Log<in> & out');
  });

  it('writes only the header for an empty template', () => {
    const d = emptyReport();
    d.themes = [];
    const rows = parse(renderCodebook(d, 'csv'), { bom: true, columns: true, comment: '#', comment_no_infix: true });
    expect(rows).toEqual([]);
    expect(renderCodebook(d, 'csv')).toContain('number,theme,path');
  });
});

describe('renderCodebook: HTML', () => {
  const html = renderCodebook(sampleReport(), 'html');

  it('is a self-contained document that fetches and runs nothing', () => {
    expect(html.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/https?:\/\//i);
    expect(html).not.toMatch(/<(?:link|img|iframe)\b|\bsrc\s*=|@import/i);
  });

  it('numbers every theme, with its heading level following the template', () => {
    for (const t of sampleReport().themes) {
      const h = Math.min(6, 2 + t.number.split('.').length);
      expect(html).toContain(`<h${h} class="entry-h">${t.number} `);
    }
    expect(html.match(/<span class="tag">a priori<\/span>/g)).toHaveLength(3);
  });

  it('escapes study text', () => {
    const out = renderCodebook(withHostile(), 'html');
    expect(out).not.toMatch(/<script/i);
    expect(out).toContain('&lt;script&gt;alert(1)&lt;/script&gt; &amp; *bold*');
    expect(out).toContain('Log&lt;in&gt; &amp; out');
  });

  it('rejects an unknown format', () => {
    expect(() => renderCodebook(sampleReport(), 'pdf' as never)).toThrow(/unknown codebook format/);
  });
});
