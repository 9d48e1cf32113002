// Input that used to be misread with exit 0 (issue 16, item 9): each case now warns or is refused.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { freshStudy, snapshot, trellis, write } from './run.js';

const OUTLINE = 'Workload\n  Staffing levels\nPatient safety\n';

describe('--coder', () => {
  // Every command that takes --coder, with the arguments it needs besides.
  const commands: string[][] = [
    ['add', 'a.txt'],
    ['sheet', 'import', 'sheet.csv'],
    ['sheet', 'export', '--out', 'out.csv'],
    ['decide', '1', 'accept'],
    ['undo'],
    ['review'],
    ['promote', '1', '--name', 'New theme'],
    ['dismiss', '1', '--note', 'small talk'],
    ['template', 'set', 'template.txt'],
    ['template', 'rename', 'Workload', 'Load'],
    ['template', 'move', 'Patient safety', '--to', 'Workload'],
    ['template', 'merge', 'Workload > Staffing levels', 'Workload'],
    ['template', 'split', 'Workload', '--into', 'A; B'],
    ['template', 'retire', 'Workload'],
    ['template', 'add', 'Handover'],
  ];

  it('an empty or blank name is refused on every command, exit 1, study unchanged', () => {
    const dir = freshStudy();
    write(dir, 'a.txt', 'Nurse: the handover ran late.\n');
    write(dir, 'template.txt', OUTLINE);
    expect(trellis(['template', 'set', 'template.txt'], dir).status).toBe(0);
    const before = snapshot(dir);
    const cases = [...commands.map((args) => [args, ''] as const), [commands[0]!, '   '] as const, [commands[3]!, ' \t '] as const];
    for (const [args, name] of cases) {
      const r = trellis([...args, '--coder', name], dir);
      expect(r.status, `${args.join(' ')} --coder "${name}"`).toBe(1);
      expect(r.stderr).toContain("the coder's name is empty");
    }
    expect(snapshot(dir)).toBe(before);
  });

  it('a blank TRELLIS_CODER is no name either', () => {
    const dir = freshStudy();
    const r = trellis(['undo'], dir, { TRELLIS_CODER: '  ' });
    expect(r.status).toBe(1);
    expect(r.stderr).toContain('say who decides');
  });
});

describe('template set', () => {
  it('warns about a Windows-1252 outline as add does, naming the file', () => {
    const dir = freshStudy();
    // "Café breaks" with é as the Windows-1252 byte E9: not valid UTF-8.
    write(dir, 'outline.txt', Buffer.concat([Buffer.from('Workload\n  Caf'), Buffer.from([0xe9]), Buffer.from(' breaks\n')]));
    const r = trellis(['template', 'set', 'outline.txt'], dir);
    expect(r.status).toBe(0);
    expect(r.stderr).toContain('warning: outline.txt: not valid UTF-8; read as Windows-1252 — check accented characters');
    const add = trellis(['add', 'outline.txt'], dir);
    expect(add.stderr).toContain('outline.txt: not valid UTF-8; read as Windows-1252 — check accented characters');
  });
});

describe('file names in other scripts', () => {
  it('give distinct transcripts, named in their own script', () => {
    const dir = freshStudy();
    const files = ['中文.txt', 'Ελληνικά.txt', 'интервью.txt'];
    for (const f of files) write(dir, f, 'Nurse: the handover ran late.\nDoctor: it often does.\n');
    const r = trellis(['add', ...files, '--json'], dir);
    expect(r.status).toBe(0);
    const added = (JSON.parse(r.stdout) as { added: { name: string }[] }).added.map((a) => a.name);
    expect(added).toEqual(['中文', 'Ελληνικά', 'интервью']);
  });
});

describe('sheet import', () => {
  it('reads a sheet re-saved with semicolons or as UTF-16 tab-separated text like the one written', () => {
    const dir = freshStudy();
    write(dir, 'template.txt', OUTLINE);
    expect(trellis(['template', 'set', 'template.txt'], dir).status).toBe(0);
    write(dir, 't01-mina.txt', 'Mina: We were two nurses short; again.\nOmar: The board said "=full".\nMina: Bed four needs a review.\n');
    expect(trellis(['add', 't01-mina.txt'], dir).status).toBe(0);
    expect(trellis(['sheet', 'export', '--out', 'blank.csv'], dir).status).toBe(0);
    const lines = readFileSync(join(dir, 'blank.csv'), 'utf8').replace(/^\ufeff/, '').trimEnd().split('\r\n');
    const rows = lines.slice(1).map((l) => (parse(l) as string[][])[0]!);
    rows[0]![6] = 'Workload > Staffing levels; Patient safety';
    rows[2]![6] = 'Patient safety';
    const save = (sep: string) => {
      const cell = (v: string) => (/["\r\n;,\t]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v);
      return [lines[0]!.split(',').join(sep), ...rows.map((r) => r.map(cell).join(sep))].join('\r\n') + '\r\n';
    };
    write(dir, 'semi.csv', save(';'));
    write(dir, 'unicode.txt', Buffer.from('\ufeff' + save('\t'), 'utf16le'));
    const semi = trellis(['sheet', 'import', 'semi.csv', '--coder', 'ana', '--json'], dir);
    expect(semi.status, semi.stderr).toBe(0);
    expect(JSON.parse(semi.stdout)).toMatchObject({ coded: 2, added: 3, removed: 0 });
    const tab = trellis(['sheet', 'import', 'unicode.txt', '--coder', 'ben', '--json'], dir);
    expect(tab.status, tab.stderr).toBe(0);
    expect(JSON.parse(tab.stdout)).toMatchObject({ coded: 2, added: 3, removed: 0 });
  });

  it('refuses a sheet whose header it cannot split, saying what it found and how to save it, study unchanged', () => {
    const dir = freshStudy();
    write(dir, 'pipe.csv', 'passage_id|themes\nt01:1|Workload\n');
    const before = snapshot(dir);
    const r = trellis(['sheet', 'import', 'pipe.csv', '--coder', 'ana'], dir);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain('pipe.csv:1: the coding sheet has no "passage_id" column: the header line, split at commas, gives "passage_id|themes"; save the sheet');
    expect(snapshot(dir)).toBe(before);
  });
});

describe('add', () => {
  it("prints the readers' warnings with file and line, and refuses a bad SRT cue number with the study unchanged", () => {
    const dir = freshStudy();
    write(dir, 'back.vtt', 'WEBVTT\n\n00:10.000 --> 00:12.000\n<v Mina>Handover starts.\n\n00:05.000 --> 00:07.000\n<v Omar Earlier?\n');
    write(dir, 'stamps.txt', '[00:01:00] Mina: Bed two is settled.\n[99:99:99] Omar: And bed three?\n');
    write(dir, 'odd.txt', Buffer.concat([Buffer.from('\ufeffMina: Bed two.\nOmar: Fine.\n', 'utf16le'), Buffer.from([0x41])]));
    const r = trellis(['add', 'back.vtt', 'stamps.txt', 'odd.txt'], dir);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).toContain('warning: back.vtt:6: cue timing runs backwards: it starts at 00:00:05.000, before a cue above it (00:00:10.000)');
    expect(r.stderr).toContain('warning: back.vtt:7: voice tag "<v Omar Earlier?" is not closed with ">"');
    expect(r.stderr).toContain('warning: stamps.txt:2: impossible timestamp "[99:99:99]"');
    expect(r.stderr).toContain('warning: odd.txt: UTF-16 text with an odd number of bytes');

    write(dir, 'num.srt', '1\n00:00:01,000 --> 00:00:02,000\nMINA: First\n\nII\n00:00:03,000 --> 00:00:04,000\nOMAR: Second\n');
    const before = snapshot(dir);
    const bad = trellis(['add', 'num.srt'], dir);
    expect(bad.status).toBe(1);
    expect(bad.stderr).toContain('num.srt:5: cue number "II" is not a number');
    expect(snapshot(dir)).toBe(before);
  });
});
