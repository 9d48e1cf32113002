// Input that used to be misread with exit 0 (issue 16, item 9): each case now warns or is refused.
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
