import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { CORPUS, freshStudy, trellis, write, onceStudy } from './run.js';

const FILES = ['t01-larch-staff-nurse.txt', 't04-orchard-staff-nurse.vtt'].map((f) => join(CORPUS, f));

const studyWithCorpus = onceStudy((): string => {
  const dir = freshStudy();
  expect(trellis(['template', 'set', join(CORPUS, 'template.txt')], dir).status).toBe(0);
  expect(trellis(['add', ...FILES], dir).status).toBe(0);
  return dir;
});

function readSheet(path: string): Record<string, string>[] {
  return parse(readFileSync(path, 'utf8'), { bom: true, columns: true });
}

describe('coding sheet round trip', () => {
  it('keeps the note column as passage memos, and exports the latest again: the column round-trips', () => {
    const dir = studyWithCorpus();
    expect(trellis(['sheet', 'export', '--transcript', 't01-larch-staff-nurse', '--coder', 'ana', '--out', 'a.csv'], dir).status).toBe(0);
    const rows = readSheet(join(dir, 'a.csv'));
    const [p, q] = rows.filter((r) => r.role === 'participant');
    p!.note = 'Compare with the night sister, "same gap", other side';
    q!.note = '=not a formula';
    const csv = (rs: Record<string, string>[]) => ['passage_id,transcript,speaker,role,time,text,themes,note', ...rs.map((r) => Object.values(r).map((v) => `"${v.replace(/"/g, '""')}"`).join(','))].join('\n');
    write(dir, 'noted.csv', csv(rows));
    const imp = JSON.parse(trellis(['sheet', 'import', 'noted.csv', '--coder', 'ana', '--json'], dir).stdout);
    expect(imp.memos).toBe(2);
    const memos = JSON.parse(trellis(['memo', 'list', '--passage', p!.passage_id, '--json'], dir).stdout).memos;
    expect(memos).toMatchObject([{ target_kind: 'passage', target: p!.passage_id, author: 'ana', text: p!.note }]);

    // Exported again, the notes come back as written; importing that export adds nothing.
    expect(trellis(['sheet', 'export', '--transcript', 't01-larch-staff-nurse', '--coder', 'ana', '--out', 'b.csv'], dir).status).toBe(0);
    const back = new Map(readSheet(join(dir, 'b.csv')).map((r) => [r.passage_id, r.note]));
    expect(back.get(p!.passage_id)).toBe(p!.note);
    expect(back.get(q!.passage_id)).toBe("'=not a formula"); // kept as text in a spreadsheet
    expect(JSON.parse(trellis(['sheet', 'import', 'b.csv', '--coder', 'ana', '--json'], dir).stdout).memos).toBe(0);
    expect(JSON.parse(trellis(['memo', 'list', '--passage', q!.passage_id, '--json'], dir).stdout).memos[0].text).toBe('=not a formula');
    // A changed note is a new memo; the first stays in the study.
    write(dir, 'changed.csv', `passage_id,themes,note\n${p!.passage_id},,Checked with Sam: same gap.\n`);
    expect(JSON.parse(trellis(['sheet', 'import', 'changed.csv', '--coder', 'ana', '--json'], dir).stdout).memos).toBe(1);
    expect(JSON.parse(trellis(['memo', 'list', '--passage', p!.passage_id, '--json'], dir).stdout).memos.map((m: { text: string }) => m.text)).toEqual([p!.note, 'Checked with Sam: same gap.']);
  });

  it('exports, takes codes from a spreadsheet, and exports them again for the coder', () => {
    const dir = studyWithCorpus();
    expect(trellis(['sheet', 'export', '--transcript', 't01-larch-staff-nurse', '--out', 'blank.csv'], dir).status).toBe(0);
    const rows = readSheet(join(dir, 'blank.csv'));
    expect(Object.keys(rows[0]!)).toEqual(['passage_id', 'transcript', 'speaker', 'role', 'time', 'text', 'themes', 'note']);
    expect(rows.every((r) => r.transcript === 't01-larch-staff-nurse')).toBe(true);

    // Code every third participant passage, some with two themes (parallel coding), one by bare name.
    const participant = rows.filter((r) => r.role === 'participant');
    const coded = participant.filter((_, i) => i % 3 === 0);
    coded.forEach((r, i) => {
      r.themes = i % 2 ? 'Workload > Time on the system > Logging in; Team communication' : 'Allergies';
    });
    const csv = ['passage_id,transcript,speaker,role,time,text,themes,note', ...rows.map((r) => Object.values(r).map((v) => `"${v.replace(/"/g, '""')}"`).join(','))].join('\n');
    write(dir, 'coded.csv', csv);
    const imp = trellis(['sheet', 'import', 'coded.csv', '--coder', 'ana', '--json'], dir);
    expect(imp.status, imp.stderr).toBe(0);
    const report = JSON.parse(imp.stdout);
    expect(report.coded).toBe(coded.length);
    expect(report.added).toBe(coded.reduce((n, r) => n + r.themes!.split(';').length, 0));

    trellis(['sheet', 'export', '--transcript', 't01-larch-staff-nurse', '--coder', 'ana', '--out', 'again.csv'], dir);
    const again = new Map(readSheet(join(dir, 'again.csv')).map((r) => [r.passage_id, r.themes]));
    for (const r of coded) {
      const want = r.themes!.split(';').map((p) => p.trim()).map((p) => (p === 'Allergies' ? 'Patient safety > Information at handover > Medication details > Allergies' : p));
      expect(again.get(r.passage_id)!.split('; ').sort()).toEqual(want.sort());
    }

    // Importing the sheet again changes nothing; blanking a row removes that coder's codings.
    const same = JSON.parse(trellis(['sheet', 'import', 'coded.csv', '--coder', 'ana', '--json'], dir).stdout);
    expect(same).toMatchObject({ added: 0, removed: 0 });
    write(dir, 'one.csv', `passage_id,themes\n${coded[0]!.passage_id},\n`);
    const cleared = JSON.parse(trellis(['sheet', 'import', 'one.csv', '--coder', 'ana', '--json'], dir).stdout);
    expect(cleared).toMatchObject({ added: 0, removed: 1 });

    // A sheet made in one study imports into a fresh study built from the same files.
    const other = studyWithCorpus();
    const fresh = JSON.parse(trellis(['sheet', 'import', join(dir, 'coded.csv'), '--coder', 'ana', '--json'], other).stdout);
    expect(fresh.added).toBe(report.added);
  });
});

describe('template revisions through the CLI', () => {
  it('renames keep codings; merges move them; history records every change with its reason', () => {
    const dir = studyWithCorpus();
    write(dir, 'c.csv', 'passage_id,themes\nt01-larch-staff-nurse#2,Interruptions\nt01-larch-staff-nurse#4,Staffing levels; Interruptions\n');
    expect(trellis(['sheet', 'import', 'c.csv', '--coder', 'ana'], dir).status).toBe(0);
    expect(trellis(['template', 'rename', 'Workload > Interruptions', 'Being interrupted', '--reason', 'clearer'], dir).status).toBe(0);
    let show = JSON.parse(trellis(['template', 'show', '--json'], dir).stdout);
    const workload = show.themes[0];
    expect(workload.children.map((c: { name: string }) => c.name)).toContain('Being interrupted');
    expect(workload.children.find((c: { name: string }) => c.name === 'Being interrupted').passages).toBe(2);

    // A merge changes what codings mean: it needs its reason for the audit trail.
    const bare = trellis(['template', 'merge', 'Being interrupted', 'Workload > Staffing levels'], dir);
    expect(bare.status).toBe(1);
    expect(bare.stderr).toMatch(/template merge needs --reason/);
    const m = trellis(['template', 'merge', 'Being interrupted', 'Workload > Staffing levels', '--reason', 'one theme'], dir);
    expect(m.status, m.stderr).toBe(0);
    show = JSON.parse(trellis(['template', 'show', '--json'], dir).stdout);
    const staffing = show.themes[0].children.find((c: { name: string }) => c.name === 'Staffing levels');
    expect(staffing.passages).toBe(2); // passage #4 had both: counted once
    expect(readFileSync(join(dir, 'template.txt'), 'utf8')).not.toContain('Being interrupted');

    const hist = JSON.parse(trellis(['template', 'history', '--json'], dir).stdout).revisions;
    expect(hist.map((r: { action: string }) => r.action.split(' ')[0])).toEqual(['set', 'rename', 'merge']);
    expect(hist[1].reason).toBe('clearer');
    expect(hist[1].changes[0]).toMatchObject({ kind: 'renamed', from: 'Workload > Interruptions', to: 'Workload > Being interrupted' });

    // The study's template.txt can be set again as it is: no change, no revision.
    const again = trellis(['template', 'set', 'template.txt'], dir);
    expect(again.stdout).toMatch(/unchanged/);
  });

  it('numbers the template as 1, 1.1, 1.1.1 with counts', () => {
    const dir = studyWithCorpus();
    const out = trellis(['template', 'show'], dir).stdout;
    expect(out).toMatch(/^ {6}2\.1\.2\.1 {2}Allergies {2}\(0\)$/m);
    expect(out).toMatch(/^1 {2}Workload {2}\[a priori\]/m);
  });
});
