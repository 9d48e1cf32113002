import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { CORPUS, freshStudy, snapshot, trellis } from './run.js';

const json = (dir: string, args: string[]) => {
  const r = trellis([...args, '--json'], dir);
  expect(r.status, r.stderr).toBe(0);
  return JSON.parse(r.stdout);
};
const FILES = ['t01-larch-staff-nurse.txt', 't02-kestrel-fy1.txt', 't03-harbour-hca.md', 't04-orchard-staff-nurse.vtt'];

describe('pseudonyms', () => {
  let dir: string;
  let addWarning: string;
  let speakers: string[];
  beforeAll(() => {
    dir = freshStudy();
    expect(trellis(['template', 'set', join(CORPUS, 'template.txt')], dir).status).toBe(0);
    const add = trellis(['add', ...FILES.map((f) => join(CORPUS, f))], dir);
    expect(add.status, add.stderr).toBe(0);
    addWarning = add.stderr;
    expect(trellis(['sheet', 'import', join(CORPUS, 'initial-coding.csv'), '--coder', 'priya'], dir).status).toBe(0);
    speakers = json(dir, ['alias', 'list', '--all']).names.filter((n: any) => n.kind === 'speaker' && n.looks_like_name).map((n: any) => n.name);
  }, 240_000);

  it('add warns when speaker labels look like personal names, and not for role labels', () => {
    expect(speakers).toContain('Bronwen');
    expect(speakers).not.toContain('Interviewer');
    expect(addWarning).toMatch(/look like personal names: .*"Bronwen"/);
    expect(addWarning).not.toMatch(/"Interviewer"/);
  });

  it('credits quotes to aliases in the codebook by default, the report and exports on request', () => {
    speakers.forEach((s, i) => json(dir, ['alias', s, `P${String(i + 1).padStart(2, '0')}`]));
    json(dir, ['alias', 't01-larch-staff-nurse', 'Ward A, interview 1']);
    const aliases = json(dir, ['alias', 'list']).aliases;
    expect(aliases.length).toBe(speakers.length + 1);

    const leaks = (text: string) => [...speakers, 't01-larch-staff-nurse', 't02-kestrel-fy1'].filter((n) => new RegExp(`(?<![\\p{L}])${n}(?![\\p{L}])`, 'u').test(text));
    expect(trellis(['codebook', '--out', 'cb.md'], dir).status).toBe(0);
    const md = readFileSync(join(dir, 'cb.md'), 'utf8');
    expect(md).toMatch(/— [^\n]*, P\d\d, \d/);
    expect(md).toMatch(/— T02, /); // the second transcript, without an alias
    expect(md).toMatch(/Pseudonymised/);
    expect(leaks(md)).toEqual([]);
    expect(trellis(['codebook', '--format', 'html', '--out', 'cb.html'], dir).status).toBe(0);
    expect(leaks(readFileSync(join(dir, 'cb.html'), 'utf8'))).toEqual([]);
    expect(trellis(['codebook', '--out', 'real.md', '--no-pseudonymise'], dir).status).toBe(0);
    expect(leaks(readFileSync(join(dir, 'real.md'), 'utf8')).length).toBeGreaterThan(0);

    expect(trellis(['report', '--out', 'r.html', '--pseudonymise'], dir).status).toBe(0);
    const html = readFileSync(join(dir, 'r.html'), 'utf8');
    expect(html).toContain('Ward A, interview 1');
    expect(html).toMatch(/T0\d/); // a transcript without an alias gets a code
    expect(leaks(html)).toEqual([]);
    expect(trellis(['report', '--out', 'plain.html'], dir).status).toBe(0);
    expect(leaks(readFileSync(join(dir, 'plain.html'), 'utf8'))).toContain('Bronwen');

    for (const what of ['codings', 'log', 'matrix']) {
      expect(trellis(['export', what, '--pseudonymise', '--out', `${what}.csv`], dir).status).toBe(0);
      expect(leaks(readFileSync(join(dir, `${what}.csv`), 'utf8')), what).toEqual([]);
    }
    expect(trellis(['export', 'codings', '--pseudonymise', '--format', 'json', '--out', 'codings.json'], dir).status).toBe(0);
    const cj = JSON.parse(readFileSync(join(dir, 'codings.json'), 'utf8'));
    expect(cj.pseudonymised).toBe(true);
    expect(cj.codings[0].passage_id).toMatch(/^(Ward A, interview 1|T\d\d)#\d+$/);

    // The coding sheet keeps real ids and text (it must read back) but aliases the speakers.
    expect(trellis(['sheet', 'export', '--pseudonymise', '--out', 'sheet.csv'], dir).status).toBe(0);
    const sheet = readFileSync(join(dir, 'sheet.csv'), 'utf8');
    expect(sheet).toContain('t01-larch-staff-nurse#2,t01-larch-staff-nurse,P');
    expect(sheet).not.toMatch(/,Bronwen,/);
    expect(trellis(['sheet', 'import', 'sheet.csv', '--coder', 'priya'], dir).status).toBe(0);
  });

  it('refuses unknown names, clashing aliases and missing arguments, leaving the study unchanged', () => {
    json(dir, ['alias', 'Bronwen', 'P01']);
    const before = snapshot(dir);
    const cases: [string[], RegExp][] = [
      [['alias', 'Nobody', 'P99'], /no speaker or transcript named "Nobody"/],
      [['alias', speakers[1]!, 'P01'], /already given to speaker "Bronwen"/],
      [['alias', 'Bronwen', speakers[1]!], /real name of another speaker/],
      [['alias', 'Bronwen'], /usage: trellis alias/],
      [['alias', 'Bronwen', '  '], /alias is empty/],
      [['alias', 'remove', 'Nobody'], /"Nobody" has no alias/],
      [['alias', 'Bronwen', 'P02', '--transcript'], /no transcript named "Bronwen"/],
    ];
    for (const [args, message] of cases) {
      const r = trellis(args, dir);
      expect(r.status, args.join(' ')).toBe(1);
      expect(r.stderr).toMatch(message);
    }
    expect(snapshot(dir)).toBe(before);
    expect(json(dir, ['alias', 'remove', 'Bronwen']).removed).toMatchObject({ kind: 'speaker', name: 'Bronwen', alias: 'P01' });
    expect(json(dir, ['alias', 'list']).aliases.some((a: any) => a.name === 'Bronwen')).toBe(false);
  });
});
