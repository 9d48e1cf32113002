import Database from 'better-sqlite3';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { CORPUS, freshStudy, snapshot, trellis, write } from './run.js';

const TEMPLATE = `Workload [a priori]
  | seeds: busy, time
  Staffing levels
  Time on the system
Patient safety [a priori]
  Allergies
Team communication
`;

const INTERVIEW = `[00:00:05] Interviewer: How has the new handover been for you?

[00:00:12] Nadia: Honestly it's slower. We queue for the two tablets at half seven and the night staff are waiting to go home.

[00:01:02] Interviewer: And safety?

[00:01:09] Nadia: I worry about allergies. The banner doesn't show on the summary screen unless you scroll.
`;

/** A study with a template and one interview, so that "unchanged" has something to compare. */
function seededStudy(): string {
  const dir = freshStudy();
  write(dir, 'template.txt', TEMPLATE);
  expect(trellis(['template', 'set', 'template.txt'], dir).status).toBe(0);
  write(dir, 'nadia.txt', INTERVIEW);
  expect(trellis(['add', 'nadia.txt'], dir).status).toBe(0);
  return dir;
}

/** Runs a command that must fail as a user error: exit 1, the file named, the study unchanged. */
function expectRefused(dir: string, args: string[], mention: RegExp) {
  const before = snapshot(dir);
  const r = trellis(args, dir);
  expect(r.status, r.stderr).toBe(1);
  expect(r.stderr).toMatch(mention);
  expect(snapshot(dir)).toBe(before);
  return r;
}

describe('trellis add', () => {
  it('imports labelled turns with roles, timestamps and deterministic passage ids', () => {
    const dir = seededStudy();
    const s = JSON.parse(trellis(['status', '--json'], dir).stdout);
    expect(s.transcripts).toBe(1);
    expect(s.passages).toEqual({ total: 4, participant: 2, interviewer: 2 });
    const sheet = trellis(['sheet', 'export', '--out', 'all.csv'], dir);
    expect(sheet.status).toBe(0);
    const csv = readFileSync(join(dir, 'all.csv'), 'utf8');
    expect(csv.charCodeAt(0)).toBe(0xfeff);
    expect(csv).toContain('nadia#2,nadia,Nadia,participant,0:00:12,');
    expect(csv).toContain('nadia#3,nadia,Interviewer,interviewer,0:01:02,And safety?');
  });

  it('treats re-adding an identical file as a no-op and refuses a changed one without --replace', () => {
    const dir = seededStudy();
    const before = snapshot(dir);
    const again = trellis(['add', 'nadia.txt'], dir);
    expect(again.status).toBe(0);
    expect(again.stdout).toMatch(/already in the study, unchanged/);
    expect(snapshot(dir)).toBe(before);

    write(dir, 'nadia.txt', INTERVIEW + '\n[00:02:00] Nadia: One more thing about the night staff.\n');
    expectRefused(dir, ['add', 'nadia.txt'], /nadia\.txt.*--replace/);
    const replaced = trellis(['add', 'nadia.txt', '--replace', '--json'], dir);
    expect(replaced.status).toBe(0);
    expect(JSON.parse(replaced.stdout).added[0]).toMatchObject({ name: 'nadia', passages: 5, replaced: true });
  });

  it('re-anchors codings across --replace: same text kept, edited text moved, the rest listed and kept apart', () => {
    const dir = seededStudy();
    write(dir, 'codes.csv', 'passage_id,themes\nnadia#2,Workload > Time on the system\nnadia#4,Allergies\n');
    expect(trellis(['sheet', 'import', 'codes.csv', '--coder', 'ana'], dir).status).toBe(0);
    // An edit that keeps most words, and a new turn inserted before both: ids shift by one.
    const edited = INTERVIEW.replace('I worry about allergies.', 'I worry about allergy banners.').replace(
      '[00:00:12] Nadia:',
      '[00:00:08] Interviewer: Take your time.\n\n[00:00:12] Nadia:',
    );
    write(dir, 'nadia.txt', edited);
    const r = JSON.parse(trellis(['add', 'nadia.txt', '--replace', '--json'], dir).stdout);
    expect(r.kept_codings).toBe(1);
    expect(r.moved_codings).toBe(1);
    expect(r.unplaced).toEqual([]);
    expect(trellis(['export', 'codings', '--format', 'json', '--out', 'c.json'], dir).status).toBe(0);
    const codings = JSON.parse(readFileSync(join(dir, 'c.json'), 'utf8')).codings as { passage_id: string; theme: string }[];
    expect(codings.map((c) => `${c.passage_id} ${c.theme}`).sort()).toEqual(['nadia#3 Workload > Time on the system', 'nadia#5 Patient safety > Allergies']);

    // Rewritten beyond recognition: listed, kept apart, never dropped.
    write(dir, 'nadia.txt', INTERVIEW.replace(/\[00:01:09\] Nadia: .*/, '[00:01:09] Nadia: Nothing else comes to mind really.'));
    const gone = trellis(['add', 'nadia.txt', '--replace'], dir);
    expect(gone.status, gone.stderr).toBe(0);
    expect(gone.stdout).toMatch(/1 could not be placed/);
    expect(gone.stdout).toMatch(/nadia +nadia#5 +Patient safety > Allergies +ana/);
    const db = new Database(join(dir, 'study.db'), { readonly: true });
    expect(db.prepare('SELECT transcript, passage_id, coder FROM unplaced_codings').all()).toEqual([{ transcript: 'nadia', passage_id: 'nadia#5', coder: 'ana' }]);
    db.close();
  });

  it('splits a plain text file without labels on blank lines, as participant passages', () => {
    const dir = freshStudy();
    write(dir, 'notes.txt', 'First paragraph about the tablets.\n\nSecond paragraph about the allergy banner.\n\n\nThird one.\n');
    const r = JSON.parse(trellis(['add', 'notes.txt', '--json'], dir).stdout);
    expect(r.added[0]).toMatchObject({ passages: 3, participant: 3, interviewer: 0 });
  });

  it('splits a turn longer than the window at sentence boundaries', () => {
    const dir = freshStudy(['--window', '20']);
    const long = Array.from({ length: 12 }, (_, i) => `Sentence number ${i + 1} has exactly seven words.`).join(' ');
    write(dir, 'long.txt', `Interviewer: Tell me more.\n\nSam: ${long}\n`);
    const r = JSON.parse(trellis(['add', 'long.txt', '--json'], dir).stdout);
    // 12 sentences of 6 word tokens (the digit is a number, not a word): 72 words, window 20,
    // so four windows of three whole sentences each.
    expect(r.added[0].passages).toBe(1 + 4);
    trellis(['sheet', 'export', '--out', 's.csv'], dir);
    const rows = readFileSync(join(dir, 's.csv'), 'utf8').split('\r\n').filter((l) => l.startsWith('long#'));
    expect(rows).toHaveLength(5);
    for (const row of rows.slice(1)) expect(row).toMatch(/,Sentence number \d+ has[^,]* words\.,,$/); // whole sentences only
  });

  it('imports all files or none', () => {
    const dir = seededStudy();
    write(dir, 'good.txt', 'Interviewer: Hi.\n\nJo: Hello there.\n');
    write(dir, 'bad.txt', Buffer.from([0x00, 0x01, 0x02, 0xff, 0x00, 0x10, 0x00, 0x00, 0x7f, 0x00]));
    expectRefused(dir, ['add', 'good.txt', 'bad.txt'], /bad\.txt/);
  });

  it('reads the demo corpus in all its formats', () => {
    const dir = freshStudy();
    const files = ['t01-larch-staff-nurse.txt', 't03-harbour-hca.md', 't04-orchard-staff-nurse.vtt', 't07-larch-ward-manager.docx'];
    const r = trellis(['add', '--json', ...files.map((f) => join(CORPUS, f))], dir);
    expect(r.status, r.stderr).toBe(0);
    const added = JSON.parse(r.stdout).added as { name: string; participant: number; interviewer: number; words: number }[];
    expect(added.map((a) => a.name)).toEqual(files.map((f) => f.replace(/\.\w+$/, '')));
    for (const a of added) {
      expect(a.participant).toBeGreaterThan(3);
      expect(a.interviewer).toBeGreaterThan(3);
      expect(a.words).toBeGreaterThan(700);
    }
  });
});

describe('inline codes', () => {
  it('codes the passage a {theme: ...} tag stands in, and refuses an unknown theme', () => {
    const dir = seededStudy();
    write(dir, 'coded.txt', 'Interviewer: Go on.\n\nLee: We never have enough staff on nights. {theme: Workload > Staffing levels; Team communication}\n');
    const r = JSON.parse(trellis(['add', 'coded.txt', '--coder', 'lee-coder', '--json'], dir).stdout);
    expect(r.inline_codings).toBe(2);
    const s = JSON.parse(trellis(['status', '--json'], dir).stdout);
    expect(s.per_coder).toContainEqual({ coder: 'lee-coder', codings: 2, passages: 1 });
    write(dir, 'typo.txt', 'Interviewer: Go on.\n\nLee: Short again.\n{theme: Workload > Stafing}\n');
    expectRefused(dir, ['add', 'typo.txt'], /typo\.txt:3: .*Stafing/);
  });
});

describe('bad input: exit 1, the file named, the study unchanged', () => {
  let dir: string;
  beforeAll(() => {
    dir = seededStudy();
  });

  it('a binary file', () => {
    write(dir, 'photo.txt', Buffer.from(Array.from({ length: 400 }, (_, i) => (i * 37) % 256)));
    expectRefused(dir, ['add', 'photo.txt'], /photo\.txt: .*binary/);
  });
  it('an empty file and a whitespace-only file', () => {
    write(dir, 'empty.txt', '');
    write(dir, 'blank.md', ' \n\t\n  \n');
    expectRefused(dir, ['add', 'empty.txt'], /empty\.txt: .*empty/);
    expectRefused(dir, ['add', 'blank.md'], /blank\.md: .*empty/);
  });
  it('a .docx that is not a zip, and a truncated one', () => {
    write(dir, 'fake.docx', 'this is plain text pretending to be a document');
    expectRefused(dir, ['add', 'fake.docx'], /fake\.docx: .*docx/);
    const real = readFileSync(join(CORPUS, 't07-larch-ward-manager.docx'));
    write(dir, 'cut.docx', real.subarray(0, Math.floor(real.length / 2)));
    expectRefused(dir, ['add', 'cut.docx'], /cut\.docx: .*docx/);
  });
  it('a .vtt with no header, and one with a broken timing line', () => {
    write(dir, 'nohead.vtt', '00:00:01.000 --> 00:00:02.000\n<v Ana>Hello.\n');
    expectRefused(dir, ['add', 'nohead.vtt'], /nohead\.vtt:1: .*WEBVTT/);
    write(dir, 'broken.vtt', 'WEBVTT\n\n00:00:01.000 --> 00:00:02.000\n<v Ana>Hello.\n\n00:00:03.000 -> 00:0x:04.000\n<v Ana>Again.\n');
    expectRefused(dir, ['add', 'broken.vtt'], /broken\.vtt:6: /);
  });
  it('a CSV with an unterminated quote', () => {
    write(dir, 'survey.csv', 'respondent_id,answer\nR1,"The tablets are slow\nR2,fine\n');
    expectRefused(dir, ['add', 'survey.csv'], /survey\.csv(:\d+)?: .*quote/i);
  });
  it('a template with duplicate siblings, three-space or tab indentation, or an indented first line', () => {
    write(dir, 'dup.txt', 'Workload\n  Staffing\n  staffing\n');
    expectRefused(dir, ['template', 'set', 'dup.txt'], /dup\.txt:3: .*[Dd]uplicate|dup\.txt:3: .*already/);
    write(dir, 'three.txt', 'Workload\n   Staffing\n');
    expectRefused(dir, ['template', 'set', 'three.txt'], /three\.txt:2: /);
    write(dir, 'tab.txt', 'Workload\n\tStaffing\n');
    expectRefused(dir, ['template', 'set', 'tab.txt'], /tab\.txt:2: .*[Tt]ab/);
    write(dir, 'indent.txt', '  Workload\n  Staffing\n');
    expectRefused(dir, ['template', 'set', 'indent.txt'], /indent\.txt:1: /);
  });
  it('a coding sheet naming an unknown theme or an unknown passage', () => {
    write(dir, 'theme.csv', 'passage_id,themes\nnadia#2,Workload\nnadia#4,Workload > Stafing levels\n');
    expectRefused(dir, ['sheet', 'import', 'theme.csv', '--coder', 'ana'], /theme\.csv: .*row 3: .*Stafing/s);
    write(dir, 'passage.csv', 'passage_id,themes\nnadia#2,Workload\nnobody#9,Workload\n');
    expectRefused(dir, ['sheet', 'import', 'passage.csv', '--coder', 'ana'], /passage\.csv: .*row 3: .*nobody#9/s);
  });
  it('a coding sheet whose text no longer matches the passage', () => {
    write(dir, 'edited.csv', 'passage_id,text,themes\nnadia#4,Something else entirely,Allergies\n');
    expectRefused(dir, ['sheet', 'import', 'edited.csv', '--coder', 'ana'], /edited\.csv: .*row 2: .*no longer matches/s);
  });
});

describe('accepted with a warning', () => {
  it('UTF-16 with BOM, LE and BE, reads as the UTF-8 text does', () => {
    const dir = freshStudy();
    const le = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(INTERVIEW, 'utf16le')]);
    const be = Buffer.from(le);
    be.swap16();
    write(dir, 'le.txt', le);
    write(dir, 'be.txt', be);
    write(dir, 'utf8.txt', INTERVIEW);
    const r = JSON.parse(trellis(['add', 'le.txt', 'be.txt', 'utf8.txt', '--json'], dir).stdout);
    expect(r.added.map((a: { words: number }) => a.words)).toEqual(Array(3).fill(r.added[2].words));
  });
  it('Windows-1252 text, with a warning naming the file', () => {
    const dir = freshStudy();
    write(dir, 'cafe.txt', Buffer.from('Interviewer: And the caf\xe9?\n\nJo: The caf\xe9 is where we hand over now \x96 no tablets there.\n', 'latin1'));
    const r = trellis(['add', 'cafe.txt'], dir);
    expect(r.status).toBe(0);
    expect(r.stderr).toMatch(/cafe\.txt.*Windows-1252/);
    trellis(['sheet', 'export', '--out', 's.csv'], dir);
    expect(readFileSync(join(dir, 's.csv'), 'utf8')).toContain('The café is where we hand over now – no tablets there.');
  });
  it('a 5 MB file on a single line, split into passages', () => {
    const dir = freshStudy();
    const words = 'handovers tablets nursing shiftwork wardrobes allergies queueing nightshift mornings screening'.split(' ');
    const text = Array.from({ length: 560_000 }, (_, i) => words[(i * 7) % 10]).join(' ');
    expect(text.length).toBeGreaterThan(5_000_000);
    write(dir, 'oneline.txt', text);
    const r = trellis(['add', 'oneline.txt', '--json'], dir);
    expect(r.status, r.stderr).toBe(0);
    const added = JSON.parse(r.stdout).added[0];
    expect(added.words).toBe(560_000);
    expect(added.passages).toBe(Math.ceil(560_000 / 120));
  });
});
