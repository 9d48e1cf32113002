// Defects that could destroy or corrupt a study: outputs over the study, formulas in CSV cells,
// an empty outline, a full disk, damaged study files. Each refusal: exit 1, a clear message,
// the study exactly as it was.
import { parse } from 'csv-parse/sync';
import { execFileSync, spawnSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, statSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { CORPUS, freshStudy, snapshot, trellis, write, onceStudy } from './run.js';

const OUTLINE = `Workload [a priori]
  | seeds: busy, time
  Staffing levels
  +Risk
Patient safety [a priori]
  Allergies
@Later
`;

const INTERVIEW = `Interviewer: How has the new handover been for you?

Nadia: =HYPERLINK("http://example.invalid","click") it's slower. We queue for the two tablets and the night staff are waiting.

Interviewer: And safety?

Nadia: @risk I worry about allergies. The banner doesn't show on the summary screen unless you scroll.

Nadia: -10 minutes, every shift, just for the log-in.
`;

const codedStudy = onceStudy((): string => {
  const dir = freshStudy();
  write(dir, 'outline.txt', OUTLINE);
  expect(trellis(['template', 'set', 'outline.txt'], dir).status).toBe(0);
  write(dir, 'nadia.txt', INTERVIEW);
  expect(trellis(['add', 'nadia.txt'], dir).status).toBe(0);
  const sheet = [
    'passage_id,themes',
    'nadia#2,Workload > Staffing levels; Workload > +Risk',
    'nadia#4,Patient safety > Allergies',
    'nadia#5,Workload',
  ].join('\n');
  write(dir, 'codes.csv', sheet);
  const r = trellis(['sheet', 'import', 'codes.csv', '--coder', '=evil()'], dir);
  expect(r.status, r.stderr).toBe(0);
  return dir;
});

function bytes(path: string): string {
  return readFileSync(path).toString('hex');
}

describe('--out never overwrites the study', () => {
  const dir = codedStudy();
  const outputs: string[][] = [
    ['report'],
    ['sheet', 'export'],
    ['codebook'],
    ['log', '--format', 'csv'],
    ['export', 'codings'],
    ['export', 'template'],
  ];

  it.each(outputs)('%s refuses study.db, template.txt and a link to either, and leaves them as they were', (...cmd) => {
    const before = snapshot(dir);
    const db = bytes(join(dir, 'study.db'));
    const tpl = bytes(join(dir, 'template.txt'));
    const elsewhere = mkdtempSync(join(tmpdir(), 'trellis-out-'));
    symlinkSync(join(dir, 'study.db'), join(elsewhere, 'alias.db'));
    for (const target of ['study.db', 'template.txt', join(dir, 'study.db'), join(elsewhere, 'alias.db')]) {
      for (const force of [[], ['--force']]) {
        const r = trellis([...cmd, '--out', target, ...force], dir);
        expect(r.status, `${cmd.join(' ')} --out ${target}`).toBe(1);
        expect(r.stderr).toMatch(/refusing to write over the study's own (study\.db|template\.txt)/);
      }
    }
    // From outside the study folder, with --study.
    const r = trellis([...cmd, '--study', dir, '--out', join(dir, 'study.db')], elsewhere);
    expect(r.status).toBe(1);
    expect(bytes(join(dir, 'study.db'))).toBe(db);
    expect(bytes(join(dir, 'template.txt'))).toBe(tpl);
    expect(snapshot(dir)).toBe(before);
  });

  it.each(outputs)('%s refuses an existing file unless --force, a missing folder and a folder, with exit 1', (...cmd) => {
    const out = join(dir, `out-${cmd.join('-')}.txt`);
    writeFileSync(out, 'keep me');
    const kept = trellis([...cmd, '--out', out], dir);
    expect(kept.status).toBe(1);
    expect(kept.stderr).toMatch(/the file exists: pass --force/);
    expect(readFileSync(out, 'utf8')).toBe('keep me');
    const forced = trellis([...cmd, '--out', out, '--force'], dir);
    expect(forced.status, forced.stderr).toBe(0);
    expect(readFileSync(out, 'utf8')).not.toBe('keep me');
    // Owner-only, whatever the umask.
    expect(statSync(out).mode & 0o777).toBe(0o600);

    const missing = trellis([...cmd, '--out', join(dir, 'no-such-folder', 'x.csv')], dir);
    expect(missing.status).toBe(1);
    expect(missing.stderr).toMatch(/does not exist/);
    expect(missing.stderr).not.toMatch(/internal error/);
    const folder = trellis([...cmd, '--out', tmpdir()], dir);
    expect(folder.status).toBe(1);
    expect(folder.stderr).toMatch(/is a folder/);
  });

  it('creates the study folder and its files owner-only, whatever the umask', () => {
    const parent = mkdtempSync(join(tmpdir(), 'trellis-mode-'));
    const r = spawnSync('sh', ['-c', `umask 000 && "${process.execPath}" "${join(import.meta.dirname, '../../bin/trellis')}" init s`], { cwd: parent, encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    expect(statSync(join(parent, 's')).mode & 0o777).toBe(0o700);
    expect(statSync(join(parent, 's', 'study.db')).mode & 0o777).toBe(0o600);
    expect(statSync(join(parent, 's', 'template.txt')).mode & 0o777).toBe(0o600);
  });
});

describe('CSV outputs neutralise spreadsheet formulas', () => {
  const dir = codedStudy();
  const FORMULA = /^[=+\-@\t\r]/;
  const cells = (file: string) => (parse(readFileSync(join(dir, file), 'utf8'), { bom: true, comment: '#', comment_no_infix: true }) as string[][]).flat();

  it('no cell of any CSV export starts with = + - @ (theme names, coder, text, speaker)', () => {
    const files: [string[], string][] = [
      [['export', 'codings'], 'codings.csv'],
      [['export', 'matrix'], 'matrix.csv'],
      [['export', 'log'], 'log.csv'],
      [['log', '--format', 'csv'], 'log2.csv'],
      [['sheet', 'export', '--coder', '=evil()'], 'sheet.csv'],
      [['codebook', '--format', 'csv'], 'codebook.csv'],
    ];
    for (const [cmd, file] of files) {
      const r = trellis([...cmd, '--out', file], dir);
      expect(r.status, r.stderr).toBe(0);
      const all = cells(file);
      expect(all.filter((c) => FORMULA.test(c)), file).toEqual([]);
    }
    const codings = parse(readFileSync(join(dir, 'codings.csv'), 'utf8'), { bom: true, columns: true, comment: '#', comment_no_infix: true }) as Record<string, string>[];
    expect(codings.map((c) => c.coder)).toContain("'=evil()");
    expect(codings.map((c) => c.theme)).toContain('Workload > +Risk');
    expect(cells('matrix.csv')).toContain("'@Later");
    expect(codings.some((c) => c.text.startsWith("'=HYPERLINK"))).toBe(true);
  });

  it('the guard comes off again when a sheet is imported: the codings are the same', () => {
    const codings = () => JSON.stringify(JSON.parse(snapshot(dir)).codings);
    const before = codings();
    expect(trellis(['sheet', 'export', '--coder', '=evil()', '--out', 'round.csv'], dir).status).toBe(0);
    expect(readFileSync(join(dir, 'round.csv'), 'utf8')).toContain("'=HYPERLINK");
    const r = trellis(['sheet', 'import', 'round.csv', '--coder', '=evil()'], dir);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/0 codings added, 0 removed/);
    expect(codings()).toBe(before);
  });
});

describe('template set', () => {
  it('refuses an outline with no themes, and the study keeps every coding', () => {
    const dir = codedStudy();
    const before = snapshot(dir);
    const tpl = readFileSync(join(dir, 'template.txt'), 'utf8');
    write(dir, 'starter.txt', '# only comments\n\n# nothing else\n');
    const r = trellis(['template', 'set', 'starter.txt'], dir);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/starter\.txt: the outline has no themes/);
    expect(snapshot(dir)).toBe(before);
    expect(readFileSync(join(dir, 'template.txt'), 'utf8')).toBe(tpl);
  });

  it('revives a retired theme when its path comes back, with its codings', () => {
    const dir = codedStudy();
    const counts = () => JSON.parse(trellis(['template', 'show', '--json'], dir).stdout);
    const before = counts();
    write(dir, 'less.txt', OUTLINE.replace('  Allergies\n', ''));
    expect(trellis(['template', 'set', 'less.txt', '--retire', 'Patient safety > Allergies'], dir).status).toBe(0);
    expect(counts().themes[1].children).toHaveLength(0);
    const r = trellis(['template', 'set', 'outline.txt', '--json'], dir);
    expect(r.status, r.stderr).toBe(0);
    const changes = JSON.parse(r.stdout).changes as { kind: string; path: string; id: string }[];
    const allergies = before.themes[1].children[0];
    expect(changes).toEqual([{ kind: 'revived', id: allergies.id, path: 'Patient safety > Allergies' }]);
    expect(counts().themes).toEqual(before.themes);
    expect(trellis(['template', 'history'], dir).stdout).toMatch(/revived +Patient safety > Allergies/);
  });
});

// A small file system of its own to fill up: root can mount one (CI runs as root).
function mountSmall(): string | null {
  const at = mkdtempSync(join(tmpdir(), 'trellis-full-'));
  try {
    execFileSync('mount', ['-t', 'tmpfs', '-o', 'size=3m', 'tmpfs', at], { stdio: 'ignore' });
    return at;
  } catch {
    return null;
  }
}

describe('a full disk', () => {
  const at = mountSmall();
  afterAll(() => {
    if (at) spawnSync('umount', [at]);
  });
  if (!at && process.env.CI) throw new Error('CI must be able to mount a small tmpfs (run as root) for the full-disk checks');

  it.runIf(at)('gives a clear message, exit 1, and leaves study.db and template.txt whole', () => {
    const dir = join(at!, 's');
    mkdirSync(dir);
    expect(trellis(['init', '.'], dir).status).toBe(0);
    write(dir, 'outline.txt', OUTLINE);
    expect(trellis(['template', 'set', 'outline.txt'], dir).status).toBe(0);
    copyFileSync(join(CORPUS, 't01-larch-staff-nurse.txt'), join(dir, 't01.txt'));
    expect(trellis(['add', 't01.txt'], dir).status).toBe(0);
    const before = snapshot(dir);
    const tpl = readFileSync(join(dir, 'template.txt'), 'utf8');
    // Fill the disk to the last byte (again before each command: a failed write may free some).
    let n = 0;
    const fill = () => {
      for (const size of [64 * 1024, 512]) {
        for (;;) {
          try {
            writeFileSync(join(at!, `filler-${n++}`), Buffer.alloc(size, 1));
          } catch {
            break;
          }
        }
      }
    };
    fill();
    const bigger = OUTLINE + Array.from({ length: 400 }, (_, i) => `Emergent theme number ${i}\n  | definition: ${'words '.repeat(20)}\n`).join('');
    // The outline lives off the full disk: only the study's own writes meet it.
    const outline = join(mkdtempSync(join(tmpdir(), 'trellis-big-')), 'bigger.txt');
    writeFileSync(outline, bigger);
    fill();
    const setBig = trellis(['template', 'set', outline], dir);
    expect(setBig.status, setBig.stderr).toBe(1);
    expect(setBig.stderr).toMatch(/disk is full|disk may be full/);
    expect(setBig.stderr).not.toMatch(/internal error|    at /);
    expect(readFileSync(join(dir, 'template.txt'), 'utf8')).toBe(tpl);

    copyFileSync(join(CORPUS, 't02-kestrel-fy1.txt'), join(tmpdir(), 'trellis-t02.txt'));
    fill();
    const add = trellis(['add', join(tmpdir(), 'trellis-t02.txt')], dir);
    expect(add.status, add.stderr).toBe(1);
    expect(add.stderr).toMatch(/disk is full|disk may be full/);
    expect(add.stderr).not.toMatch(/internal error|    at /);

    fill();
    const report = trellis(['report', '--out', 'r.html'], dir);
    expect(report.status).toBe(1);
    expect(report.stderr).toMatch(/disk is full|disk may be full/);
    expect(existsSync(join(dir, 'r.html'))).toBe(false);

    for (let i = 0; i < n; i++) rmSync(join(at!, `filler-${i}`), { force: true });
    expect(snapshot(dir)).toBe(before);
    expect(trellis(['check'], dir).status).toBe(0);
  });
});

describe('damaged study files', () => {
  const cases: [string, (file: string) => void, RegExp][] = [
    ['a zero-byte study.db', (f) => writeFileSync(f, ''), /study\.db is empty \(0 bytes\)/],
    ['a file of random bytes', (f) => writeFileSync(f, Buffer.from(Array.from({ length: 8192 }, (_, i) => (i * 7919) % 251))), /not a trellis study/],
    ['a truncated study.db', (f) => writeFileSync(f, readFileSync(f).subarray(0, 6000)), /study\.db is truncated/],
  ];

  it.each(cases)('%s is refused by every command and left untouched', (_name, damage, message) => {
    const dir = codedStudy();
    expect(trellis(['check'], dir).status).toBe(0); // also checkpoints the WAL into study.db
    rmSync(join(dir, 'study.db-wal'), { force: true });
    rmSync(join(dir, 'study.db-shm'), { force: true });
    const file = join(dir, 'study.db');
    damage(file);
    const was = bytes(file);
    for (const cmd of [['status'], ['suggest'], ['add', 'nadia.txt'], ['template', 'set', 'outline.txt'], ['check']]) {
      const r = trellis(cmd, dir);
      expect(r.status, `${cmd.join(' ')}: ${r.stderr}`).toBe(1);
      expect(r.stderr).toMatch(message);
      expect(r.stderr).not.toMatch(/internal error/);
    }
    expect(bytes(file)).toBe(was);
    expect(existsSync(join(dir, 'study.db-wal'))).toBe(false);
  });

  it('check reports damage inside an otherwise readable file', () => {
    const dir = codedStudy();
    expect(trellis(['check'], dir).status).toBe(0);
    const file = join(dir, 'study.db');
    const buf = readFileSync(file);
    // Scribble over the middle of a page past the first: the header stays valid.
    const page = buf.readUInt16BE(16);
    for (let i = page * 3 + 8; i < page * 3 + 600; i++) buf[i] = 0xa5;
    writeFileSync(file, buf);
    const r = trellis(['check', '--json'], dir);
    expect(r.status).toBe(1);
    const out = JSON.parse(r.stdout);
    expect(out.ok).toBe(false);
    expect(out.problems.length).toBeGreaterThan(0);
    expect(r.stderr).toMatch(/the study is damaged/);
  });
});

describe('coded themes never vanish silently from an outline', () => {
  const EDITED = OUTLINE.replace('  Staffing levels\n', '').replace('  Allergies\n', '  Allergies\n  Staff on shift\n');
  it('template set stops, lists the coded themes that disappeared with their counts, and changes nothing', () => {
    const dir = codedStudy();
    const before = snapshot(dir);
    // "Staffing levels" renamed and moved in one edit: no rule can tell it from a new theme.
    write(dir, 'edited.txt', EDITED);
    const r = trellis(['template', 'set', 'edited.txt'], dir);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/these coded themes are gone from the outline/);
    expect(r.stderr).toMatch(/Workload > Staffing levels: 1 coded passage\n/);
    expect(r.stderr).toMatch(/--renamed "OLD PATH; NEW PATH"/);
    expect(snapshot(dir)).toBe(before);
  });

  it('--renamed keeps the codings with the theme (rename and move by hand), --retire retires it', () => {
    const dir = codedStudy();
    const ids = JSON.parse(trellis(['template', 'show', '--json'], dir).stdout);
    const staffing = ids.themes[0].children[0];
    write(dir, 'edited.txt', EDITED);
    const r = trellis(['template', 'set', 'edited.txt', '--renamed', 'Workload > Staffing levels; Staff on shift', '--json'], dir);
    expect(r.status, r.stderr).toBe(0);
    const kinds = JSON.parse(r.stdout).changes.map((c: { kind: string; id: string }) => `${c.kind} ${c.id}`);
    expect(kinds).toEqual([`moved ${staffing.id}`]);
    const after = JSON.parse(trellis(['template', 'show', '--json'], dir).stdout);
    expect(after.themes[1].children[1]).toMatchObject({ id: staffing.id, name: 'Staff on shift', passages: 1 });

    write(dir, 'fewer.txt', EDITED.replace('  Staff on shift\n', ''));
    const refused = trellis(['template', 'set', 'fewer.txt', '--retire', 'Patient safety'], dir);
    expect(refused.status).toBe(1);
    expect(refused.stderr).toMatch(/--retire "Patient safety": that theme is still in the outline/);
    const retired = trellis(['template', 'set', 'fewer.txt', '--retire', 'Patient safety > Staff on shift', '--reason', 'folded into workload'], dir);
    expect(retired.status, retired.stderr).toBe(0);
    expect(retired.stdout).toMatch(/removed +Patient safety > Staff on shift/);
  });

  it('move, merge, split and retire need a reason', () => {
    const dir = codedStudy();
    const before = snapshot(dir);
    for (const cmd of [
      ['move', 'Patient safety > Allergies', '--top'],
      ['merge', 'Workload > +Risk', 'Workload > Staffing levels'],
      ['split', 'Workload > +Risk', '--into', 'A; B'],
      ['retire', 'Workload > +Risk'],
    ]) {
      const r = trellis(['template', ...cmd], dir);
      expect(r.status).toBe(1);
      expect(r.stderr).toMatch(new RegExp(`template ${cmd[0]} needs --reason`));
    }
    expect(snapshot(dir)).toBe(before);
  });
});

describe('who is recorded', () => {
  const anon = { TRELLIS_CODER: '' };

  it('the study remembers its coder (init --coder, or the first --coder) and never records the login name', () => {
    const named = freshStudy(['--coder', 'priya']);
    write(named, 'outline.txt', OUTLINE);
    expect(trellis(['template', 'set', 'outline.txt'], named, anon).status).toBe(0);
    const history = () => JSON.parse(trellis(['template', 'history', '--json'], named, anon).stdout).revisions;
    expect(history()[0].author).toBe('priya');

    const dir = freshStudy();
    write(dir, 'outline.txt', OUTLINE);
    const first = trellis(['template', 'set', 'outline.txt'], dir, anon);
    expect(first.status, first.stderr).toBe(0);
    expect(first.stderr).toMatch(/recorded as "researcher"; give your name once with --coder NAME/);
    write(dir, 'more.txt', OUTLINE + 'Training\n');
    expect(trellis(['template', 'set', 'more.txt', '--coder', 'sam'], dir, anon).status).toBe(0);
    write(dir, 'most.txt', OUTLINE + 'Training\nLeadership\n');
    expect(trellis(['template', 'set', 'most.txt'], dir, anon).status).toBe(0);
    const authors = JSON.parse(trellis(['template', 'history', '--json'], dir, anon).stdout).revisions.map((r: { author: string }) => r.author);
    expect(authors).toEqual(['researcher', 'sam', 'sam']);
    const login = spawnSync('id', ['-un'], { encoding: 'utf8' }).stdout.trim();
    if (login && !['researcher', 'sam', 'priya'].includes(login)) {
      for (const d of [named, dir]) expect(trellis(['template', 'history'], d, anon).stdout).not.toContain(login);
      expect(trellis(['template', 'set', '--help'], dir, anon).stdout).not.toContain(`"${login}"`);
    }
  });
});

describe('comments in template.txt', () => {
  it('survive template rename, move and retire, and export template', () => {
    const dir = freshStudy();
    write(dir, 'outline.txt', `# our template\n${OUTLINE.replace('  Staffing levels\n', '  # agency staff too\n  Staffing levels  # check with the team\n')}`);
    expect(trellis(['template', 'set', 'outline.txt'], dir).status).toBe(0);
    expect(trellis(['template', 'rename', 'Staffing levels', 'Staff on shift'], dir).status).toBe(0);
    expect(trellis(['template', 'move', 'Allergies', '--top', '--reason', 'its own theme'], dir).status).toBe(0);
    const text = readFileSync(join(dir, 'template.txt'), 'utf8');
    expect(text).toMatch(/^# our template\n/);
    expect(text).toContain('  # agency staff too\n  Staff on shift  # check with the team\n');
    expect(trellis(['export', 'template', '--out', 'again.txt'], dir).status).toBe(0);
    expect(readFileSync(join(dir, 'again.txt'), 'utf8')).toBe(text);
  });
});
