import { afterEach, describe, expect, it, vi } from 'vitest';
import { workingNote } from '../../src/cli/progress.js';

// The note is for a coder watching a terminal: never in --json output, a pipe or a small study.
describe('workingNote', () => {
  const tty = process.stderr.isTTY;
  afterEach(() => {
    process.stderr.isTTY = tty;
    vi.restoreAllMocks();
  });

  function written(isTTY: boolean, opts: { json?: boolean; passages: number; from?: number }): string {
    process.stderr.isTTY = isTTY;
    let out = '';
    vi.spyOn(process.stderr, 'write').mockImplementation((s: string | Uint8Array) => {
      out += String(s);
      return true;
    });
    workingNote('Scoring 5,000 passages...', opts);
    vi.restoreAllMocks();
    return out;
  }

  it('prints the note on a terminal for a large study', () => {
    expect(written(true, { passages: 5000 })).toBe('Scoring 5,000 passages...\n');
  });

  it('is silent under --json, off a terminal and for small studies', () => {
    expect(written(true, { json: true, passages: 5000 })).toBe('');
    expect(written(false, { passages: 5000 })).toBe('');
    expect(written(true, { passages: 1999 })).toBe('');
    expect(written(true, { passages: 300, from: 200 })).not.toBe('');
  });
});
