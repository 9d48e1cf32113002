/**
 * Property over the fixtures: every turn's offset/length points at its words in the source.
 * Plain and labelled text keeps the exact slice (less inline code tags); Markdown, .docx and cue
 * files strip markup, so there the words must appear in the slice in order.
 */
import { describe, expect, test } from 'vitest';
import { extractInlineCodes } from '../../src/ingest/codes.js';
import { readTranscriptBytes } from '../../src/ingest/read.js';
import type { Transcript } from '../../src/ingest/types.js';
import { makeDocx } from '../helpers/docx.js';
import { fixture } from '../helpers/fixtures.js';

const TEXT_FIXTURES = ['ward-interview.txt', 'field-notes.txt', 'coded-notes.txt', 'timestamps.txt', 'messy-spacing.txt'];
const MARKUP_FIXTURES = ['focus-group.md', 'depot-captions.srt'];

function slice(t: Transcript, k: number): string {
  const turn = t.turns[k]!;
  return t.source.slice(turn.offset, turn.offset + turn.length);
}

/** Each word of `text` found in `span`, left to right. */
function wordsInOrder(text: string, span: string): boolean {
  let at = 0;
  for (const w of text.split(/\s+/).filter(Boolean)) {
    const k = span.indexOf(w, at);
    if (k === -1) return false;
    at = k + w.length;
  }
  return true;
}

describe('offsets point into the source', () => {
  test.each(TEXT_FIXTURES)('%s: the slice is the turn text (inline codes removed)', async (name) => {
    const [t] = await readTranscriptBytes(fixture(name), name);
    expect(t!.turns.length).toBeGreaterThan(2);
    t!.turns.forEach((turn, k) => {
      const s = slice(t!, k);
      expect(turn.offset).toBeGreaterThanOrEqual(0);
      expect(turn.offset + turn.length).toBeLessThanOrEqual(t!.source.length);
      if (turn.codes.length === 0) expect(s).toContain(turn.text);
      else expect(extractInlineCodes(s).text).toBe(turn.text);
      // the slice starts and ends on words, never on spaces or a label
      expect(s).toBe(s.trim());
      if (turn.speaker) expect(s.startsWith(turn.speaker)).toBe(false);
    });
  });

  test('turns do not overlap and come in source order', async () => {
    for (const name of [...TEXT_FIXTURES, ...MARKUP_FIXTURES]) {
      const [t] = await readTranscriptBytes(fixture(name), name);
      for (let k = 1; k < t!.turns.length; k++) {
        const prev = t!.turns[k - 1]!;
        expect(t!.turns[k]!.offset).toBeGreaterThanOrEqual(prev.offset + prev.length);
      }
    }
  });

  test.each(MARKUP_FIXTURES)('%s: the words of each turn appear in its slice, in order', async (name) => {
    const [t] = await readTranscriptBytes(fixture(name), name);
    t!.turns.forEach((turn, k) => expect(wordsInOrder(turn.text, slice(t!, k))).toBe(true));
  });

  test('.docx: the slice of the extracted text holds the turn', async () => {
    const paras = readFileSyncParas('ward-interview.txt');
    const [t] = await readTranscriptBytes(makeDocx(paras), 'ward.docx');
    expect(t!.turns.length).toBe(8);
    t!.turns.forEach((turn, k) => expect(slice(t!, k)).toContain(turn.text));
  });

  test('the check can fail: a shifted offset no longer holds the text', async () => {
    const [t] = await readTranscriptBytes(fixture('ward-interview.txt'), 'w.txt');
    const turn = t!.turns[2]!;
    expect(t!.source.slice(turn.offset + 3, turn.offset + 3 + turn.length)).not.toContain(turn.text);
  });
});

function readFileSyncParas(name: string): string[] {
  return fixture(name)
    .toString('utf8')
    .split(/\n\s*\n/)
    .map((p) => p.trim())
    .filter(Boolean);
}
