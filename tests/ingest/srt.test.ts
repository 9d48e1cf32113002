import { describe, expect, test } from 'vitest';
import { readTranscriptBytes } from '../../src/ingest/read.js';
import { UserError } from '../../src/errors.js';
import { fixture } from '../helpers/fixtures.js';

async function srt(text: string | Buffer, name = 'cues.srt') {
  const ts = await readTranscriptBytes(typeof text === 'string' ? Buffer.from(text) : text, name);
  expect(ts).toHaveLength(1);
  return ts[0]!;
}

async function fails(text: string, name = 'bad.srt'): Promise<UserError> {
  const err = await readTranscriptBytes(Buffer.from(text), name).catch((e) => e);
  expect(err).toBeInstanceOf(UserError);
  return err as UserError;
}

describe('.srt', () => {
  test('numbered cues, speakers from "Name:", dialogue dashes, tags stripped, merge', async () => {
    const t = await srt(fixture('depot-captions.srt'), 'depot-captions.srt');
    expect(t.format).toBe('srt');
    expect(t.name).toBe('depot-captions');
    expect(t.labelled).toBe(true);
    expect(t.turns.map((x) => [x.speaker, x.start, x.end, x.text])).toEqual([
      ['MODERATOR', 1, 6, "Welcome, everyone. Let's start with introductions."],
      ['DEV', 6.2, 9, 'I drive the early route.'],
      [null, 9.1, 11, 'Same here.'],
      [null, 9.1, 11, 'I do nights.'],
      ['MODERATOR', 11.5, 14.25, 'Thanks.'],
    ]);
    expect(t.turns[4]!.codes).toEqual([{ paths: ['Shift patterns'], at: 7 }]);
    const first = t.turns[0]!;
    expect(t.source.slice(first.offset, first.offset + first.length)).toBe("MODERATOR: Welcome, everyone.\n\n2\n00:00:03,600 --> 00:00:06,000\nLet's start with introductions.");
  });

  test('cues with no speaker run on as one turn; positioning codes removed', async () => {
    const t = await srt('1\n00:00:01,000 --> 00:00:02,000\n{\\an8}<font color="#ffff00">The lift</font> was broken\n\n2\n00:00:02,500 --> 00:00:04,000\nagain.\n');
    expect(t.labelled).toBe(false);
    expect(t.turns.map((x) => [x.speaker, x.start, x.end, x.text])).toEqual([[null, 1, 4, 'The lift was broken again.']]);
  });

  test('CRLF, a BOM and a full stop before the milliseconds are accepted', async () => {
    const t = await srt('\ufeff1\r\n00:00:01.5 --> 00:00:02,250\r\nANNA: Yes.\r\n');
    expect(t.turns.map((x) => [x.speaker, x.start, x.end, x.text])).toEqual([['ANNA', 1.5, 2.25, 'Yes.']]);
  });

  test('a broken timing line is an error naming its line', async () => {
    const e = await fails('1\n00:00:01,000 --> 00:00:02,000\nFine\n\n2\n00:00:02,000 --> 00:00:0x,000\nBroken\n', 'p9.srt');
    expect(e.describe()).toMatch(/^p9\.srt:6: broken cue timing "00:00:02,000 --> 00:00:0x,000"/);
    expect((await fails('1\n00:00:01,000 --> 00:00:02,000\nFine\n\n2\n00:00:03,000 00:00:04,000\nNo arrow\n')).line).toBe(6);
    expect((await fails('1\n00:00:01,000 --> 00:00:02,000\nFine\n\n2\nJust text\n')).line).toBe(6);
  });

  test('text that is not SubRip is refused', async () => {
    const e = await fails('Interviewer: this was saved with the wrong extension\n', 'wrong.srt');
    expect(e.line).toBe(1);
    expect(e.message).toMatch(/not a SubRip file/);
  });

  test('text after a blank line inside a cue is kept with a warning', async () => {
    const t = await srt('1\n00:00:01,000 --> 00:00:02,000\nBEA: First\n\nand more\n', 'gap.srt');
    expect(t.turns.map((x) => x.text)).toEqual(['First and more']);
    expect(t.warnings).toEqual(['gap.srt:5: text after a blank line was joined to the cue before it']);
  });

  // SubRip's cue structure (common practice): a number alone on a line, the timing line, the text.
  test('a cue number that is not a number is refused, naming file and line, not stored with its timing as text', async () => {
    const e = await fails('1\n00:00:01,000 --> 00:00:02,000\nMINA: First\n\n2a\n00:00:03,000 --> 00:00:04,000\nOMAR: Second\n', 'num.srt');
    expect(e.describe()).toBe(
      'num.srt:5: cue number "2a" is not a number: a SubRip cue starts with its number (1, 2, 3, ...) alone on the line before its timing',
    );
    expect((await fails('#1\n00:00:01,000 --> 00:00:02,000\nFirst\n', 'first.srt')).line).toBe(1);
  });

  test('timings that run backwards are warned about, naming file and line', async () => {
    const t = await srt('1\n00:00:05,000 --> 00:00:06,000\nMINA: Later\n\n2\n00:00:01,000 --> 00:00:02,000\nOMAR: Sooner\n', 'back.srt');
    expect(t.turns).toHaveLength(2);
    expect(t.warnings).toEqual([
      'back.srt:6: cue timing runs backwards: it starts at 00:00:01.000, before a cue above it (00:00:05.000); kept in the order written',
    ]);
  });

  test('a cue with no blank line before it is read as a cue, not its number and timing as text', async () => {
    const t = await srt('1\n00:00:01,000 --> 00:00:02,000\nMINA: First\n2\n00:00:03,000 --> 00:00:04,000\nOMAR: Second --> third\n', 'tight.srt');
    expect(t.turns.map((x) => [x.speaker, x.start, x.end, x.text])).toEqual([
      ['MINA', 1, 2, 'First'],
      ['OMAR', 3, 4, 'Second --> third'],
    ]);
    expect(t.warnings).toEqual(['tight.srt:4: no blank line before this cue; read as a new cue']);
  });
});
