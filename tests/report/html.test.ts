import { describe, expect, it } from 'vitest';
import { renderReport } from '../../src/report/html.js';
import type { ReportData } from '../../src/report/types.js';
import { emptyReport, sampleReport } from './sample.js';

const HOSTILE = 'She said "stop" & then <script>alert(1)</script> <img src=x onerror=alert(2)> it\'s fine';

/** The sample, with hostile text in every place that carries words from the study. */
function hostile(): ReportData {
  const d = sampleReport();
  d.title = `Ward <b>9</b> & "friends"`;
  d.themes[0]!.name = 'Work<load> & "stress"';
  d.themes[0]!.definition = HOSTILE;
  d.themes[1]!.quotes[0]!.text = HOSTILE;
  d.themes[1]!.quotes[0]!.speaker = '<i>Nell</i>';
  d.revisions[0]!.reason = HOSTILE;
  d.revisions[0]!.changes[0] = HOSTILE;
  d.unclaimed.clusters[0]!.examples[0]!.text = HOSTILE;
  d.unclaimed.clusters[0]!.terms[0] = '<script>';
  d.heatmap.transcripts[0] = 't01 <script>x</script>';
  d.cautions.push(HOSTILE);
  return d;
}

/** Every element's text and attributes, with tags removed: what a reader would see. */
function visibleText(html: string): string {
  return html
    .replace(/<style>[\s\S]*?<\/style>/g, '')
    .replace(/<[^>]+>/g, ' ')
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/&amp;/g, '&')
    .replace(/\s+/g, ' ');
}

describe('renderReport', () => {
  const html = renderReport(sampleReport());

  it('is one HTML document with every section, each with a heading', () => {
    expect(html.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(html.match(/<html\b/g)).toHaveLength(1);
    for (const [id, heading] of [
      ['summary', 'Summary'],
      ['template', 'The template and its revisions'],
      ['coverage', 'Themes across transcripts'],
      ['acceptance', 'Acceptance of suggestions'],
      ['growth', 'Template growth'],
      ['unclaimed', 'Unclaimed passages and clusters'],
      ['agreement', 'Inter-coder agreement'],
      ['memos', 'Memos'],
      ['quotes', 'Representative quotes'],
      ['cautions', 'Cautions'],
    ]) {
      expect(html).toContain(`<section id="${id}">\n<h2>${heading}</h2>`);
      // The contents list links to it, inside the document only.
      expect(html).toContain(`<a href="#${id}">`);
    }
  });

  it('draws every chart, each with an accessible name and description and a visible heading', () => {
    const ids = [...html.matchAll(/<svg class="chart" id="([\w-]+)" role="img" aria-labelledby="([\w-]+)-t \1-d"/g)].map((m) => m[1]);
    expect(ids).toEqual(['chart-heatmap', 'chart-acceptance', 'chart-calibration', 'chart-overtime', 'chart-growth', 'chart-unclaimed']);
    for (const id of ids) {
      expect(html).toMatch(new RegExp(`<title id="${id}-t">[^<]+</title><desc id="${id}-d">[^<]{40,}</desc>`));
    }
    // Each figure follows its own h3, so no chart stands without a visible heading.
    expect(html.match(/<h3>[^<]+<\/h3>\n<(?:figure|div class="pair"><figure)>/g)!.length).toBe(ids.length);
  });

  it('numbers the template as a tree, with counts and a priori in words', () => {
    const d = sampleReport();
    for (const t of d.themes) {
      expect(html).toContain(`<td class="nowrap">${t.number}</td>`);
    }
    const staffing = d.themes.find((t) => t.name === 'Staffing levels')!;
    expect(html).toMatch(new RegExp(`<span class="name">Staffing levels</span>.*?</td><td class="num">${staffing.direct}</td><td class="num">${staffing.total}</td>`));
    const apriori = d.themes.filter((t) => t.apriori).length;
    expect(html.match(/<span class="tag">a priori<\/span>/g)!.length).toBeGreaterThanOrEqual(apriori);
    // A sub-theme sits deeper than its parent.
    expect(html).toMatch(/padding-left:8px"><span class="name">Workload<\/span>/);
    expect(html).toMatch(/padding-left:74px"><span class="name">Allergies<\/span>/);
  });

  it('lists every revision with what, when, who and why', () => {
    for (const r of sampleReport().revisions) {
      expect(html).toContain(`<tr><td class="num">${r.rev}</td>`);
      expect(html).toContain(r.author);
      for (const c of r.changes) expect(html).toContain(`<li>${c.replace(/ -> /g, ' → ').replace(/&/g, '&amp;').replace(/>/g, '&gt;')}</li>`);
    }
    expect(html).toContain('<span class="nowrap">2025-02-10</span> <span class="nowrap">09:15 UTC</span>');
    expect(html).toContain('no reason given');
  });

  it('writes the count in every heat-map cell', () => {
    const d = sampleReport();
    const cells = html.slice(html.indexOf('id="chart-heatmap"'), html.indexOf('</svg>', html.indexOf('id="chart-heatmap"')));
    const titles = cells.match(/ in t\d\d-[\w-]+: \d+ passages?<\/title>/g)!;
    expect(titles).toHaveLength(d.heatmap.themes.length * d.heatmap.transcripts.length);
    // The first row's first cell, by value.
    const v = d.heatmap.counts[0]![0]!;
    expect(cells).toContain(`in ${d.heatmap.transcripts[0]}: ${v} passage`);
  });

  it('labels every acceptance bar and calibration point with its value', () => {
    const d = sampleReport();
    const bars = d.acceptance.perTheme.filter((r) => r.decided > 0);
    for (const r of bars) expect(html).toContain(`· ${r.accepted} of ${r.decided}`);
    for (const c of d.acceptance.calibration.filter((c) => c.count > 0)) {
      expect(html).toContain(`· n=${c.count}</text>`);
    }
    // The diagonal is drawn and named.
    expect(html).toContain('perfect calibration');
  });

  it('shows the agreement table with its bands source and caution', () => {
    const d = sampleReport();
    expect(html).toContain(d.agreement!.bandsSource.replace(/&/g, '&amp;'));
    expect(html).toContain(d.agreement!.caution.replace(/'/g, '&#39;'));
    expect(html).toContain('<tr class="pooled"><td>all themes, pooled</td><td class="num">708</td>');
    expect(html).toContain('substantial');
  });

  it('quotes passages with transcript and speaker', () => {
    const q = sampleReport().themes.find((t) => t.name === 'Lost information')!.quotes[0]!;
    expect(html).toContain(`<footer>${q.transcript} · ${q.speaker} · ${q.time} <span class="id">${q.passageId}</span></footer>`);
  });

  it('shows the clusters with terms, size and examples', () => {
    expect(html).toContain('Cluster c4e1d2: discharge · pharmacy · TTOs');
    expect(html).toContain('17 passages from 6 transcripts');
    expect(html).toContain('<li>TTOs</li>');
    expect(html).toContain('promoted into the template');
  });

  it('fetches nothing and runs nothing', () => {
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/https?:\/\//i);
    expect(html).not.toMatch(/\bsrc\s*=/i);
    expect(html).not.toMatch(/@import|@font-face/i);
    expect(html).not.toMatch(/<(?:link|iframe|object|embed|img|base)\b/i);
    // Every href is an anchor in the document and every url() a pattern in it.
    for (const m of html.matchAll(/href="([^"]*)"/g)) expect(m[1]).toMatch(/^#[\w-]+$/);
    for (const m of html.matchAll(/url\(([^)]*)\)/g)) expect(m[1]).toMatch(/^#[\w-]+$/);
    // The document forbids loading anything, as a second line of defence.
    expect(html).toContain("default-src 'none'");
  });

  it('is the same for the same data', () => {
    expect(renderReport(sampleReport())).toBe(html);
  });
});

describe('renderReport with hostile text', () => {
  const html = renderReport(hostile());

  it('escapes every piece of study text', () => {
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toContain('<img');
    expect(html).not.toContain('<b>9</b>');
    expect(html).not.toContain('<i>Nell</i>');
    expect(html).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(html).toContain('She said &quot;stop&quot; &amp; then');
    expect(html).toContain('Work&lt;load&gt; &amp; &quot;stress&quot;');
    // No raw ampersand that is not an entity.
    expect(html.replace(/<style>[\s\S]*?<\/style>/, '')).not.toMatch(/&(?!(?:amp|lt|gt|quot|#39);)/);
  });

  it('still shows the text as written', () => {
    const text = visibleText(html);
    expect(text).toContain(HOSTILE);
    expect(text).toContain('Ward <b>9</b> & "friends"');
  });
});

describe('renderReport for a study just begun', () => {
  const html = renderReport(emptyReport());

  it('says in words what is not there yet instead of drawing empty charts', () => {
    expect(html).not.toContain('<svg');
    for (const sentence of [
      'No template revisions have been recorded yet.',
      'No transcripts have been coded yet, so there is nothing to map.',
      'No suggestions have been decided on yet, so acceptance and calibration cannot be measured.',
      'No transcript has been coded yet, so the template has not grown yet.',
      'The unclaimed share has not been measured yet',
      'No clusters have been formed from the unclaimed passages yet.',
      'No two coders have reviewed the same passages yet, so inter-coder agreement cannot be reported.',
      'No passages have been coded yet, so there are no quotes to show.',
      'No memos have been written yet',
      'No cautions were recorded with this report.',
    ]) {
      expect(html).toContain(`<p class="empty">${sentence}`);
    }
    // Every section is still there, so the report's shape does not depend on progress.
    expect(html.match(/<section id=/g)).toHaveLength(10);
  });

  it('handles a template with no themes', () => {
    const d = emptyReport();
    d.themes = [];
    d.counts.themes = 0;
    expect(renderReport(d)).toContain('<p class="empty">The template has no themes yet.</p>');
  });

  it('draws the charts that have data and describes the rest', () => {
    // Decisions but none in a drawable band; growth but no decisions over time.
    const d = sampleReport();
    d.acceptance.calibration = d.acceptance.calibration.map((c) => ({ ...c, count: 0, acceptance: null, meanConfidence: null }));
    d.acceptance.overTime = [];
    const out = renderReport(d);
    expect(out).toContain('No confidence band holds a decided suggestion yet.');
    expect(out).toContain('No decisions with a time have been recorded yet.');
    expect(out).toContain('id="chart-acceptance"');
    expect(out).not.toContain('id="chart-calibration"');
  });
});
