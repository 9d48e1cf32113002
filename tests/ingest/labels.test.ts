import { describe, expect, test } from 'vitest';
import { isLabelName, parseClock, parseLabel } from '../../src/ingest/labels.js';

/** The speaker, start and remaining words of a line, or null. */
function read(line: string) {
  const m = parseLabel(line);
  return m && { speaker: m.speaker, start: m.start, rest: line.slice(m.contentStart) };
}

describe('parseLabel', () => {
  test.each([
    ['Interviewer: How long have you been here?', 'Interviewer', null, 'How long have you been here?'],
    ['I: And then?', 'I', null, 'And then?'],
    ['P3: Three years.', 'P3', null, 'Three years.'],
    ['R1: yes', 'R1', null, 'yes'],
    ['Interviewer 2: Over to you.', 'Interviewer 2', null, 'Over to you.'],
    ['Dr. Quell: It varies.', 'Dr. Quell', null, 'It varies.'],
    ['Ana de Souza: Sim.', 'Ana de Souza', null, 'Sim.'],
    ['MARGARET: No.', 'MARGARET', null, 'No.'],
    ['**Facilitator:** Welcome.', 'Facilitator', null, 'Welcome.'],
    ['**R2**: Thanks.', 'R2', null, 'Thanks.'],
    ['[00:03:41] Interviewer: Next one.', 'Interviewer', 221, 'Next one.'],
    ['[03:41] P1: Right.', 'P1', 221, 'Right.'],
    ['(12:05) P1: Right.', 'P1', 725, 'Right.'],
    ['(00:12:05) P1: Right.', 'P1', 725, 'Right.'],
    ['00:03:41 Interviewer: Bare time first.', 'Interviewer', 221, 'Bare time first.'],
    ['[00:03:41] - P2: With a dash.', 'P2', 221, 'With a dash.'],
    ['Interviewer [00:01:02]: Label, then time.', 'Interviewer', 62, 'Label, then time.'],
    ['Interviewer (1:02): Short form.', 'Interviewer', 62, 'Short form.'],
    ['P1: [00:00:33] Time after the colon.', 'P1', 33, 'Time after the colon.'],
    ['Speaker 1    00:01:15', 'Speaker 1', 75, ''],
    ['P4:', 'P4', null, ''],
  ])('%s', (line, speaker, start, rest) => {
    expect(read(line)).toEqual({ speaker, start, rest });
  });

  test('a bracketed timestamp alone gives a start time and no speaker', () => {
    expect(read('[00:10:00] and then the phone rang')).toEqual({ speaker: null, start: 600, rest: 'and then the phone rang' });
  });

  test.each([
    'The thing is: nobody asked us.', // a sentence, not a name
    'I think: maybe.',
    'So what I said was this, more or less: no.', // more than four words
    'Well. Then: nothing.', // sentence-ending punctuation
    'Note: the canteen was shut.', // a note, not a speaker
    'See http://example.org for more', // no space after the colon
    '10:30 was when we met.', // a time of day in the text, no label
    'at 10:30: the bus came', // lower case
    'A label that is far too long to be any speaker name at all: x',
    'Just some ordinary words without any label at all',
    '',
  ])('not a label: %s', (line) => {
    const m = parseLabel(line);
    expect(m?.speaker ?? null).toBeNull();
  });

  test('only the start of a very long line is examined', () => {
    const long = 'P1: ' + 'word '.repeat(400_000);
    const t0 = performance.now();
    expect(parseLabel(long)?.speaker).toBe('P1');
    expect(parseLabel('x'.repeat(2_000_000))).toBeNull();
    expect(performance.now() - t0).toBeLessThan(50);
  });
});

describe('parseClock', () => {
  test.each([
    ['00:03:41', 221],
    ['03:41', 221],
    ['1:02:03', 3723],
    ['12:05', 725],
    ['00:00:01.500', 1.5],
    ['00:00:01,250', 1.25],
  ])('%s = %d s', (text, seconds) => {
    expect(parseClock(text)).toBeCloseTo(seconds, 6);
  });
  test.each(['3:7', '00:61', 'ab:cd', '00:00:60', ''])('malformed: %s', (t) => expect(parseClock(t)).toBeNull());
});

describe('isLabelName', () => {
  test('names and codes are labels; sentences are not', () => {
    expect(['P', 'Q', 'INT', 'Nurse Manager', 'Mary-Ann O’Neil', 'J. Smith', 'Speaker #2'].every(isLabelName)).toBe(true);
    expect(['the nurse', 'Nurse manager said', 'One two three four five', 'Why?', 'Done.', ''].some(isLabelName)).toBe(false);
  });
});
