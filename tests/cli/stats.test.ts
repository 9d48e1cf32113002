import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { CORPUS, freshStudy, trellis, write } from './run.js';

const json = (dir: string, args: string[]) => {
  const r = trellis([...args, '--json'], dir);
  expect(r.status, r.stderr).toBe(0);
  return JSON.parse(r.stdout);
};

describe('trellis agree', () => {
  it("computes per-theme Cohen's kappa and Krippendorff's alpha from two coders' sheets", () => {
    const dir = freshStudy();
    write(dir, 'template.txt', 'Queues\nBreaks\n');
    trellis(['template', 'set', 'template.txt'], dir);
    write(dir, 'notes.txt', Array.from({ length: 12 }, (_, i) => `Paragraph ${i + 1} about the morning queue for tablets.`).join('\n\n'));
    trellis(['add', 'notes.txt'], dir);
    // Rows 1-10 reviewed by both ("nothing to code" where no theme applies); rows 11-12 left
    // empty by ben: not reviewed by him, so not units.
    const sheet = (present: number[], rows = 10) =>
      'passage_id,themes\n' + Array.from({ length: rows }, (_, i) => `notes#${i + 1},${present.includes(i + 1) ? 'Queues' : i < 10 ? 'nothing to code' : ''}`).join('\n') + '\n';
    write(dir, 'a.csv', sheet([1, 2, 3, 4, 5, 11, 12], 12));
    write(dir, 'b.csv', sheet([1, 2, 3, 4, 6], 12));
    expect(trellis(['sheet', 'import', 'a.csv', '--coder', 'ann'], dir).status).toBe(0);
    expect(trellis(['sheet', 'import', 'b.csv', '--coder', 'ben'], dir).status).toBe(0);
    const r = json(dir, ['agree', '--coders', 'ann,ben']);
    const queues = r.themes.find((t: { units: number; present: number }) => t.present > 0);
    // Worked by hand (the standard formula): both present 4, one each alone, both absent 4:
    // p_o = 0.8, p_e = 0.5 x 0.5 + 0.5 x 0.5 = 0.5, kappa = (0.8 - 0.5) / (1 - 0.5) = 0.6.
    expect(queues.units).toBe(10);
    expect(queues.percent_agreement).toBeCloseTo(0.8, 10);
    expect(queues.kappa.value).toBeCloseTo(0.6, 10);
    expect(queues.kappa.band).toBe('moderate');
    // Alpha, nominal, worked by hand with Krippendorff's coincidence matrix: n = 20 values,
    // o(P,P) = 8, o(A,A) = 8, o(P,A) = o(A,P) = 2, n_P = n_A = 10; D_o = 4/20 = 0.2,
    // D_e = 2 x 10 x 10 / (20 x 19) = 0.5263; alpha = 1 - 0.2 / 0.5263 = 0.62.
    expect(queues.alpha.value).toBeCloseTo(0.62, 10);
    // Krippendorff's guidance: 0.62 is below his 0.667 for tentative conclusions.
    expect(queues.alpha.guidance).toBe('unreliable');
    expect(r.pairable_passages).toBe(10);
    expect(r.bands_source).toMatch(/Landis.*Koch.*1977/);
    expect(r.guidance_source).toMatch(/Krippendorff.*\.800.*\.667/);
    // The two passages the coders differ on, by theme.
    expect(r.disagreements).toEqual([
      { theme_id: queues.theme_id, passage_id: 'notes#5', applied_by: ['ann'], not_by: ['ben'] },
      { theme_id: queues.theme_id, passage_id: 'notes#6', applied_by: ['ben'], not_by: ['ann'] },
    ]);
    expect(r.circularity).toBeNull(); // no coding came from an accepted suggestion
    const text = trellis(['agree', '--coders', 'ann,ben'], dir).stdout;
    expect(text).toMatch(/Units: 10 participant passages reviewed by two or more/);
    expect(text).toMatch(/support, but do not replace/);
    expect(text).not.toMatch(/notes#5/);
    const listed = trellis(['agree', '--coders', 'ann,ben', '--list'], dir).stdout;
    expect(listed).toMatch(/Passages where the coders differ \(2 passage-theme pairs\)/);
    expect(listed).toMatch(/notes#5 {2}applied by ann; not by ben/);
    expect(listed).toMatch(/notes#6 {2}applied by ben; not by ann/);
    // The sheet's "nothing to code" rows are logged as decisions and go back out on export.
    expect(json(dir, ['stats']).nothing_to_code.decisions).toBe(10 - 5 + 10 - 5);
    expect(trellis(['sheet', 'export', '--coder', 'ben', '--out', 'ben.csv'], dir).status).toBe(0);
    expect(readFileSync(join(dir, 'ben.csv'), 'utf8')).toMatch(/notes#5,.*,nothing to code,\r\n/);
    expect(trellis(['agree', '--coders', 'ann'], dir).status).toBe(1);
  });
});

describe('trellis stats', () => {
  it('counts acceptance overall, by confidence band and by theme, with coverage and template growth', () => {
    const dir = freshStudy();
    expect(trellis(['template', 'set', join(CORPUS, 'template.txt')], dir).status).toBe(0);
    const files = ['t01-larch-staff-nurse.txt', 't02-kestrel-fy1.txt', 't03-harbour-hca.md', 't04-orchard-staff-nurse.vtt', 't05-ward9-fy2.txt'];
    expect(trellis(['add', ...files.map((f) => join(CORPUS, f))], dir).status).toBe(0);
    expect(trellis(['sheet', 'import', join(CORPUS, 'initial-coding.csv'), '--coder', 'priya'], dir).status).toBe(0);
    const sug = json(dir, ['suggest', '--transcript', 't05-ward9-fy2', '--top', '2']);
    const tops = sug.passages.map((p: { candidates: { suggestion_id: number; confidence: number; theme: string }[] }) => p.candidates[0]);
    const other = tops[4].theme === 'Team communication' ? 'Training and support' : 'Team communication';
    json(dir, ['decide', String(tops[0].suggestion_id), 'accept', '--coder', 'tom']);
    json(dir, ['decide', String(tops[1].suggestion_id), 'accept', '--coder', 'tom']);
    json(dir, ['decide', String(tops[2].suggestion_id), 'reject', '--coder', 'tom']);
    json(dir, ['decide', String(tops[3].suggestion_id), 'defer', '--coder', 'tom']);
    json(dir, ['decide', String(tops[4].suggestion_id), 'reject', '--theme', other, '--coder', 'tom']);
    // A new theme added while coding t05 shows on the growth curve.
    expect(trellis(['template', 'add', 'Paper workarounds'], dir).status).toBe(0);
    const s = json(dir, ['stats']);
    expect(s.acceptance.overall).toMatchObject({ decided: 4, accepted: 2, rejected: 1, recoded: 1, deferred: 1, rate: 0.5 });
    const bands = s.acceptance.calibration.filter((b: { count: number }) => b.count);
    expect(bands.reduce((n: number, b: { count: number }) => n + b.count, 0)).toBe(4);
    const inBand = (c: number) => bands.find((b: { lower: number; upper: number }) => c >= b.lower && c < b.upper + 1e-9);
    // the accepted top candidate is counted in the band its confidence falls in
    expect(inBand(tops[0].confidence)?.count).toBeGreaterThanOrEqual(1);
    expect(s.coverage.coded).toBe(52 + 3);
    expect(s.acceptance.recodes).toHaveLength(1);
    // Template growth: t05 (coded last) brings the theme added while it was coded; the first
    // batch introduces the initial template's themes; every theme is on the curve or not coded yet.
    const g = s.template_growth;
    const last = g.curve.at(-1);
    expect(last.transcript).toBe('t05-ward9-fy2');
    expect(last.entered).toContainEqual({ id: expect.any(String), path: 'Paper workarounds', top_level: true, how: 'added' });
    expect(g.curve.slice(0, 4).map((p: { transcript: string }) => p.transcript)).toEqual(files.slice(0, 4).map((f) => f.replace(/\.\w+$/, '')));
    expect(g.curve[0].entered.length).toBeGreaterThan(0);
    expect(g.curve[0].entered.every((e: { how: string }) => e.how === 'coded')).toBe(true);
    const size = json(dir, ['status']).themes;
    expect(last.cumulative + g.not_yet_coded.length).toBe(size);
    expect(g.note).toMatch(/not proof that the template is complete/);
    expect(trellis(['stats'], dir).stdout).toMatch(/Template growth: themes first coded or added in each transcript/);

    // A deferred suggestion decided later counts once, as decided, no longer as deferred.
    json(dir, ['decide', String(tops[3].suggestion_id), 'accept', '--coder', 'tom']);
    expect(json(dir, ['stats']).acceptance.overall).toMatchObject({ decided: 5, accepted: 3, rejected: 1, recoded: 1, deferred: 0, rate: 0.6 });
  });
});
