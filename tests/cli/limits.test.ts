// Limits that keep a hostile or mistaken input from exhausting the machine, and depth that has
// none: an outline thousands of levels deep goes through every template command.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { expandedSize } from '../../src/ingest/docx.js';
import { makeDocx } from '../helpers/docx.js';
import { freshStudy, snapshot, trellis, write } from './run.js';

describe('input size limits', () => {
  it('reads the expanded size of a .docx from its zip directory, before expanding anything', () => {
    const paragraphs = Array.from({ length: 200 }, (_, i) => `Paragraph ${i} about the handover sheet and the tablets.`);
    const stored = makeDocx(paragraphs);
    const deflated = makeDocx(paragraphs, true);
    // Stored entries: the expanded size is the file less the zip's own headers (30 + 46 bytes an entry
    // plus the names twice, and the 22-byte end record).
    const names = ['[Content_Types].xml', '_rels/.rels', 'word/document.xml'].reduce((n, s) => n + 2 * Buffer.byteLength(s), 0);
    expect(expandedSize(stored)).toBe(stored.length - 3 * (30 + 46) - names - 22);
    expect(expandedSize(deflated)).toBe(expandedSize(stored));
    expect(deflated.length).toBeLessThan(stored.length / 5);
    expect(expandedSize(Buffer.from('PK\x03\x04 not really a zip'))).toBeNull();
  });

  it('refuses a small .docx that expands past the limit, and a file over it, naming the flag', () => {
    const dir = freshStudy();
    // 1.5 MB of text, deflated to a few kilobytes: the shape of a decompression bomb.
    write(dir, 'bomb.docx', makeDocx(Array.from({ length: 30_000 }, () => 'the same words again and again'), true));
    write(dir, 'long.txt', 'Nadia: ' + 'the tablets froze again. '.repeat(70_000));
    const before = snapshot(dir);
    const bomb = trellis(['add', 'bomb.docx', '--max-size', '1'], dir);
    expect(bomb.status).toBe(1);
    expect(bomb.stderr).toMatch(/bomb\.docx: the document, expanded, is \d+\.\d MB, over the 1\.0 MB limit: .*--max-size/);
    const long = trellis(['add', 'long.txt', '--max-size', '1'], dir);
    expect(long.status).toBe(1);
    expect(long.stderr).toMatch(/long\.txt: the file is 1\.\d MB, over the 1\.0 MB limit/);
    expect(snapshot(dir)).toBe(before);
    // The default limit (50 MB) takes both.
    const ok = trellis(['add', 'bomb.docx', 'long.txt'], dir);
    expect(ok.status, ok.stderr).toBe(0);
    expect(trellis(['add', 'x.txt', '--max-size', '0'], dir).status).toBe(1);
  });
});

describe('theme names and depth', () => {
  it('refuses a theme name made only of invisible characters or longer than 200 characters', () => {
    const dir = freshStudy();
    for (const [outline, message] of [
      ['Workload\n  \u200b\u2060\n', /outline\.txt:2: theme name has no visible characters/],
      [`Workload\n  ${'long '.repeat(60)}\n`, /outline\.txt:2: theme name "long long .*" is 299 characters long; keep it to 200/],
    ] as const) {
      write(dir, 'outline.txt', outline);
      const r = trellis(['template', 'set', 'outline.txt'], dir);
      expect(r.status).toBe(1);
      expect(r.stderr).toMatch(message);
    }
  });

  it('an outline 2,000 levels deep is recorded, shown, exported and read back unchanged', () => {
    const dir = freshStudy();
    const outline = Array.from({ length: 2000 }, (_, i) => `${'  '.repeat(i)}Level ${i}`).join('\n') + '\n';
    write(dir, 'deep.txt', outline);
    const set = trellis(['template', 'set', 'deep.txt'], dir);
    expect(set.status, set.stderr).toBe(0);
    const shown = trellis(['template', 'show'], dir);
    expect(shown.status, shown.stderr).toBe(0);
    const last = shown.stdout.trimEnd().split('\n').at(-1)!;
    expect(last.trim()).toBe(`${Array(2000).fill('1').join('.')}  Level 1999  (0)`);
    expect(trellis(['export', 'template', '--out', 'again.txt'], dir).status).toBe(0);
    expect(readFileSync(join(dir, 'again.txt'), 'utf8')).toBe(outline);
    const again = trellis(['template', 'set', 'again.txt'], dir);
    expect(again.stdout).toMatch(/unchanged/);
    expect(trellis(['status'], dir).status).toBe(0);
  });
});
