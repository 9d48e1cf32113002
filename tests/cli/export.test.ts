import { parse } from 'csv-parse/sync';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { CORPUS, freshStudy, trellis, onceStudy } from './run.js';

const studyWithCodings = onceStudy((): string => {
  const dir = freshStudy();
  expect(trellis(['template', 'set', join(CORPUS, 'template.txt')], dir).status).toBe(0);
  const files = ['t01-larch-staff-nurse.txt', 't02-kestrel-fy1.txt', 't03-harbour-hca.md', 't04-orchard-staff-nurse.vtt'];
  expect(trellis(['add', ...files.map((f) => join(CORPUS, f))], dir).status).toBe(0);
  expect(trellis(['sheet', 'import', join(CORPUS, 'initial-coding.csv'), '--coder', 'priya'], dir).status).toBe(0);
  return dir;
});

describe('trellis export', () => {
  it('writes the template as an outline that template set accepts again unchanged', () => {
    const dir = studyWithCodings();
    expect(trellis(['template', 'rename', 'Interruptions', 'Being interrupted', '--reason', 'clearer'], dir).status).toBe(0);
    expect(trellis(['export', 'template', '--out', 'again.txt'], dir).status).toBe(0);
    const shown = trellis(['template', 'show', '--json'], dir).stdout;
    const r = trellis(['template', 'set', 'again.txt'], dir);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/unchanged/);
    expect(trellis(['template', 'show', '--json'], dir).stdout).toBe(shown);
    expect(readFileSync(join(dir, 'again.txt'), 'utf8')).toMatch(/^ {2}\| seeds: busy, time/m);
  });

  it('exports every coding with its passage, and the theme x transcript matrix rolled up', () => {
    const dir = studyWithCodings();
    expect(trellis(['export', 'codings', '--out', 'c.csv'], dir).status).toBe(0);
    const rows = parse(readFileSync(join(dir, 'c.csv'), 'utf8'), { bom: true, columns: true, comment: '#', comment_no_infix: true }) as Record<string, string>[];
    expect(rows).toHaveLength(86); // the demo sheet's codings
    expect(Object.keys(rows[0]!)).toEqual(['passage_id', 'transcript', 'speaker', 'time', 'theme', 'coder', 'origin', 'coded_at', 'text']);
    expect(new Set(rows.map((r) => r.origin))).toEqual(new Set(['sheet']));
    const json = JSON.parse((trellis(['export', 'codings', '--format', 'json', '--out', 'c.json'], dir), readFileSync(join(dir, 'c.json'), 'utf8')));
    expect(json.codings).toHaveLength(86);

    expect(trellis(['export', 'matrix', '--out', 'm.csv'], dir).status).toBe(0);
    const m = parse(readFileSync(join(dir, 'm.csv'), 'utf8'), { bom: true, columns: true, comment: '#', comment_no_infix: true }) as Record<string, string>[];
    const show = JSON.parse(trellis(['template', 'show', '--json'], dir).stdout);
    const total = (name: string) => {
      const row = m.find((r) => r.theme === name)!;
      return Object.entries(row).filter(([k]) => k.startsWith('t0')).reduce((n, [, v]) => n + Number(v), 0);
    };
    // Each row's total equals the passage count with sub-themes that template show reports.
    expect(total('Workload')).toBe(show.themes[0].passages_with_subthemes);
    expect(total('Patient safety')).toBe(show.themes[1].passages_with_subthemes);
    expect(trellis(['export', 'nothing', '--out', 'x'], dir).status).toBe(1);
  });

  it('writes the HTML report and the codebook from the study', () => {
    const dir = studyWithCodings();
    const r = trellis(['report', '--out', 'r.html', '--title', 'Handover study'], dir);
    expect(r.status, r.stderr).toBe(0);
    const html = readFileSync(join(dir, 'r.html'), 'utf8');
    expect(html).toContain('Handover study');
    expect(html).not.toMatch(/<script|https?:\/\//);
    expect(html).toContain('Deterioration and escalation');
    for (const f of ['md', 'csv', 'html']) expect(trellis(['codebook', '--format', f, '--out', `cb.${f}`], dir).status).toBe(0);
    const md = readFileSync(join(dir, 'cb.md'), 'utf8');
    expect(md).toMatch(/^#+ 2\.1\.2\.1 Allergies/m);
    expect(trellis(['codebook', '--format', 'pdf', '--out', 'x'], dir).status).toBe(1);
  });
});
