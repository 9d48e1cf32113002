// Text from transcripts is shown on the terminal, never obeyed: escape sequences that clear the
// screen, plant hyperlinks (OSC 8) or ring the bell are replaced before printing, review included.
import { describe, expect, it } from 'vitest';
import { plain, plainDeep } from '../../src/cli/output.js';
import { ReviewTerminal } from './review-pty.js';
import { freshStudy, trellis, write } from './run.js';

const HOSTILE = '\x1b[2J\x1b[H\x1b]8;;http://example.invalid/\x07click here\x1b]8;;\x07 \x9b31m\u202e';

const OUTLINE = `Workload
  | seeds: tablets, queue, slow
Patient safety
  | seeds: allergy, banner, risk
`;

function hostileStudy(): string {
  const dir = freshStudy();
  write(dir, 'outline.txt', OUTLINE);
  expect(trellis(['template', 'set', 'outline.txt'], dir).status).toBe(0);
  const text = [
    'Interviewer: How has the handover been?',
    '',
    `Nadia${HOSTILE}: The tablets are slow and we queue ${HOSTILE} every morning for the handover.`,
    '',
    `Nadia${HOSTILE}: The allergy banner is a risk when it does not show ${HOSTILE} on the summary.`,
    '',
  ].join('\n');
  write(dir, 'coded.txt', text.replaceAll(HOSTILE, ''));
  write(dir, 'nadia.txt', text);
  const r = trellis(['add', 'coded.txt', 'nadia.txt'], dir);
  expect(r.status, r.stderr).toBe(0);
  write(dir, 'codes.csv', 'passage_id,themes\ncoded#2,Workload\ncoded#3,Patient safety\n');
  expect(trellis(['sheet', 'import', 'codes.csv', '--coder', 'priya'], dir).status).toBe(0);
  return dir;
}

// What a terminal would obey: CSI other than colour (SGR), OSC, BEL, 8-bit CSI, bidi overrides.
const OBEYED = /\x1b\[[0-9;?]*[A-LN-Za-ln-z]|\x1b\]|\x07|\x9b|\u202e/;

describe('terminal output is text, not commands', () => {
  it('plain replaces control characters one for one, keeping tab and newline', () => {
    expect(plain('a\x1b[2Jb\tc\nd\x07')).toBe('a\ufffd[2Jb\tc\nd\ufffd');
    expect(plain(HOSTILE)).toHaveLength(HOSTILE.length);
    expect(plainDeep({ a: ['x\x1b', { b: new Map([['k\x07', 'v\x9b']]) }], n: 3, u: new Uint8Array([27]) })).toEqual({
      a: ['x\ufffd', { b: new Map([['k\ufffd', 'v\ufffd']]) }],
      n: 3,
      u: new Uint8Array([27]),
    });
  });

  it('suggest, status and log print no escape sequence from a transcript', () => {
    const dir = hostileStudy();
    for (const cmd of [['suggest', '--top', '2'], ['status'], ['log']]) {
      const r = trellis(cmd, dir);
      expect(r.status, r.stderr).toBe(0);
      expect(r.stdout, cmd.join(' ')).not.toMatch(/[\x1b\x07\x9b\u202e]/);
    }
    const s = trellis(['suggest', '--top', '2'], dir).stdout;
    expect(s).toContain('click here');
    // --json keeps the text as it was (JSON escapes control characters itself).
    const json = JSON.parse(trellis(['suggest', '--top', '2', '--json'], dir).stdout);
    expect(json.passages.length).toBeGreaterThan(0);
  });

  it('review draws the passage without obeying it', async () => {
    const dir = hostileStudy();
    const term = new ReviewTerminal(['--study', dir, '--coder', 'ana', '--transcript', 'nadia'], dir);
    try {
      await term.waitFor(/click here/);
      // Our own screen codes are colour and clearing; nothing from the transcript gets through.
      const foreign = term.raw.replace(/\x1b\[H\x1b\[2J|\x1b\[\?(25|1049)[hl]/g, '');
      expect(foreign).not.toMatch(OBEYED);
    } finally {
      await term.quit();
    }
  });
});
