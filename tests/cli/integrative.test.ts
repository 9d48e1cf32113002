// Integrative themes through the commands: set in the outline, coded alongside other themes,
// listed apart in template show, the codebook and the report, with their coverage across the
// top-level themes. Invented ward notes.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { freshStudy, trellis, write } from './run.js';

const OUTLINE = ['Workload', '  Staffing levels', 'Trust in the system [integrative]', '  | definition: Whether staff believe what the screens tell them.', 'Patient safety', ''].join('\n');

describe('integrative themes', () => {
  let dir: string;
  beforeAll(() => {
    dir = freshStudy();
    write(dir, 'template.txt', OUTLINE);
    expect(trellis(['template', 'set', 'template.txt'], dir).status).toBe(0);
    write(dir, 'notes.txt', Array.from({ length: 6 }, (_, i) => `Paragraph ${i + 1} about the night shift and the handover screens on the ward.`).join('\n\n'));
    expect(trellis(['add', 'notes.txt'], dir).status).toBe(0);
    const rows = [
      'notes#1,Trust in the system; Workload > Staffing levels',
      'notes#2,Trust in the system; Workload; Patient safety',
      'notes#3,Trust in the system',
      'notes#4,Patient safety',
      'notes#5,Workload',
      'notes#6,',
    ];
    write(dir, 'sheet.csv', `passage_id,themes\n${rows.join('\n')}\n`);
    const r = trellis(['sheet', 'import', 'sheet.csv', '--coder', 'ana'], dir);
    expect(r.status, r.stderr).toBe(0);
  });

  it('lists them apart in template show, numbered I1, with the top-level themes they touch', () => {
    const r = trellis(['template', 'show'], dir);
    expect(r.status, r.stderr).toBe(0);
    const [main, apart] = r.stdout.split('Integrative themes');
    expect(main).toMatch(/^1 {2}Workload/m);
    expect(main).toMatch(/^2 {2}Patient safety/m);
    expect(main).not.toContain('Trust in the system');
    expect(apart).toMatch(/^I1 {2}Trust in the system {2}\(3\)/m);
    // By hand: Trust is on notes#1-3; Workload's branch on 1, 2, 5; Patient safety on 2, 4.
    expect(apart).toContain('Trust in the system: touches 2 of 2 top-level themes (Workload 2, Patient safety 1)');
    const j = JSON.parse(trellis(['template', 'show', '--json'], dir).stdout);
    expect(j.themes.map((t: { name: string; integrative: boolean }) => [t.name, t.integrative])).toEqual([
      ['Workload', false],
      ['Trust in the system', true],
      ['Patient safety', false],
    ]);
    expect(j.integrative[0]).toMatchObject({ name: 'Trust in the system', passages: 3, touches: 2 });
  });

  it('keeps the mark when trellis rewrites template.txt', () => {
    expect(trellis(['template', 'add', 'Hope'], dir).status).toBe(0);
    expect(readFileSync(join(dir, 'template.txt'), 'utf8')).toMatch(/^Trust in the system \[integrative\]$/m);
  });

  it('gives them a part of their own in the codebook and the report', () => {
    expect(trellis(['codebook', '--out', 'cb.md'], dir).status).toBe(0);
    const md = readFileSync(join(dir, 'cb.md'), 'utf8');
    const at = md.indexOf('## Integrative themes');
    expect(at).toBeGreaterThan(md.indexOf('Patient safety')); // after the hierarchy
    expect(md.slice(at)).toMatch(/### I1 Trust in the system/);
    expect(md.slice(at)).toContain('**Runs across:** touches 2 of 3 top-level themes: Workload (2 passages), Patient safety (1 passage)');
    expect(trellis(['codebook', '--format', 'csv', '--out', 'cb.csv'], dir).status).toBe(0);
    expect(readFileSync(join(dir, 'cb.csv'), 'utf8')).toMatch(/^I1,Trust in the system,.*,yes\r$/m);
    expect(trellis(['report', '--out', 'r.html'], dir).status).toBe(0);
    const html = readFileSync(join(dir, 'r.html'), 'utf8');
    expect(html).toContain('<h3>Integrative themes</h3>');
    expect(html).toMatch(/<table class="tree integrative">.*<th scope="col" class="num">Workload<\/th><th scope="col" class="num">Patient safety<\/th>/s);
  });

  it('refuses an indented integrative theme, naming the line, and records nothing', () => {
    write(dir, 'bad.txt', 'Workload\n  Trust [integrative]\n');
    const r = trellis(['template', 'set', 'bad.txt'], dir);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/bad\.txt:2: an integrative theme runs across the other themes/);
  });
});
