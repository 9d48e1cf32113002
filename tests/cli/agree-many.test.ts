import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { freshStudy, snapshot, trellis, write } from './run.js';

describe('trellis agree with three coders', () => {
  it("gives Fleiss' kappa, Krippendorff's alpha and every pair, in text, JSON and the report", () => {
    const dir = freshStudy();
    write(dir, 'template.txt', 'Queues\nBreaks\n');
    trellis(['template', 'set', 'template.txt'], dir);
    write(dir, 'notes.txt', Array.from({ length: 10 }, (_, i) => `Paragraph ${i + 1} about the morning queue for tablets.`).join('\n\n'));
    trellis(['add', 'notes.txt'], dir);
    const sheet = (present: number[]) =>
      'passage_id,themes\n' + Array.from({ length: 10 }, (_, i) => `notes#${i + 1},${present.includes(i + 1) ? 'Queues' : 'nothing to code'}`).join('\n') + '\n';
    write(dir, 'a.csv', sheet([1, 2, 3, 4, 5]));
    write(dir, 'b.csv', sheet([1, 2, 3, 4, 6]));
    write(dir, 'c.csv', sheet([1, 2, 3, 5, 6]));
    for (const [f, c] of [['a.csv', 'ann'], ['b.csv', 'ben'], ['c.csv', 'cal']]) expect(trellis(['sheet', 'import', f!, '--coder', c!], dir).status).toBe(0);
    const r = trellis(['agree', '--coders', 'ann,ben,cal', '--json'], dir);
    expect(r.status, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    const queues = j.themes.find((t: { present: number }) => t.present > 0);
    // Worked by hand (Fleiss 1971's formula): present counts per passage 3,3,3,2,2,2,0,0,0,0;
    // P_i = 1 for the seven unanimous passages and (4 + 1 - 3) / 6 = 1/3 for the others, so
    // P = (7 + 1) / 10 = 0.8; 15 of 30 ratings present, Pe = 0.5; kappa = 0.3 / 0.5 = 0.6.
    expect(queues.fleiss.value).toBeCloseTo(0.6, 10);
    expect(queues.fleiss.units).toBe(10);
    // Alpha on complete data: 1 - (1 - P)(n.. - 1) / (n.. (1 - Pe)) = 1 - 0.2 x 29 / 15.
    expect(queues.alpha.value).toBeCloseTo(1 - (0.2 * 29) / 15, 10);
    // Each pair agrees on 8 of 10 passages with both coders at 5 of 10 present: Queues' kappa is
    // 0.6 for each pair, and Breaks (absent everywhere) is undefined, so the mean of themes is 0.6
    // over one theme. Pooled over the 20 passage-theme pairs: p_o = 18/20, 5 of 20 present for
    // each coder, p_e = 0.25^2 + 0.75^2 = 0.625, kappa = 0.275 / 0.375 = 0.7333.
    expect(j.pairwise.map((p: { coders: string[] }) => p.coders.join('-'))).toEqual(['ann-ben', 'ann-cal', 'ben-cal']);
    for (const p of j.pairwise) {
      expect(p.passages).toBe(10);
      expect(p.mean_kappa).toBeCloseTo(0.6, 10);
      expect(p.themes_in_mean_kappa).toBe(1);
      expect(p.kappa.value).toBeCloseTo(0.275 / 0.375, 10);
    }
    const text = trellis(['agree', '--coders', 'ann,ben,cal'], dir).stdout;
    expect(text).toMatch(/Fleiss kappa/);
    expect(text).toMatch(/ann & ben +10/);
    expect(text).not.toMatch(/undefined|exactly two coders/);
    expect(trellis(['report', '--out', 'r.html'], dir).status).toBe(0);
    const html = readFileSync(join(dir, 'r.html'), 'utf8');
    expect(html).toMatch(/Fleiss' κ/);
    expect(html).toMatch(/Every pair of coders/);
    expect(html).toContain('ann &amp; cal');
    expect(html).not.toMatch(/Cohen's κ<\/th><th scope="col">Band of κ<\/th><th scope="col" class="num">Krippendorff's α<\/th><th scope="col">Guidance/);
  });

  it('refuses an unknown or repeated coder, leaving the study unchanged', () => {
    const dir = freshStudy();
    write(dir, 'template.txt', 'Queues\n');
    trellis(['template', 'set', 'template.txt'], dir);
    const before = snapshot(dir);
    const r = trellis(['agree', '--coders', 'ann,nobody'], dir);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/no coder named "ann", "nobody"/);
    const twice = trellis(['agree', '--coders', 'ann,ann'], dir);
    expect(twice.status).toBe(1);
    expect(twice.stderr).toMatch(/named twice/);
    expect(snapshot(dir)).toBe(before);
  });
});
