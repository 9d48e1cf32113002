import { describe, expect, test } from 'vitest';
import { readTranscriptBytes } from '../../src/ingest/read.js';
import { UserError } from '../../src/errors.js';
import { fixture } from '../helpers/fixtures.js';

async function one(bytes: Buffer | string, name: string) {
  const ts = await readTranscriptBytes(typeof bytes === 'string' ? Buffer.from(bytes) : bytes, name);
  expect(ts).toHaveLength(1);
  return ts[0]!;
}

describe('labelled text', () => {
  test('speaker turns, continuation lines and paragraphs, timestamps, preamble', async () => {
    const t = await one(fixture('ward-interview.txt'), 'ward-interview.txt');
    expect(t.name).toBe('ward-interview');
    expect(t.format).toBe('txt');
    expect(t.labelled).toBe(true);
    expect(t.turns.map((x) => x.speaker)).toEqual([null, 'Interviewer', 'P7', 'Interviewer', 'P7', 'Interviewer', 'P7', 'Interviewer']);
    const first = t.turns[2]!;
    expect(first.text.startsWith('A normal shift, well.')).toBe(true);
    expect(first.text).toContain('\nSome days the rounds run over');
    expect(first.text.endsWith('After that it depends who is on.')).toBe(true);
    expect(t.turns[5]!.start).toBe(12 * 60 + 5);
    expect(t.turns[6]!.start).toBe(12 * 60 + 11);
    expect(t.turns[6]!.text).toBe("Every week, honestly. Someone's child is ill, someone's car has gone.\nWe cover for each other, that's the unwritten rule.");
    expect(t.turns[0]!.text).toMatch(/^Interview 7/);
    expect(t.warnings).toEqual(['ward-interview.txt: 1 paragraph(s) before the first speaker label were kept as turns without a speaker']);
  });

  test('every timestamp form', async () => {
    const t = await one(fixture('timestamps.txt'), 'timestamps.txt');
    expect(t.turns.map((x) => [x.speaker, x.start, x.text])).toEqual([
      ['Interviewer', 5, 'First question, then.'],
      ['P1', 9, 'Go ahead.'],
      ['Interviewer', 14, 'How long have you worked here?'],
      ['P1', 21, 'Nine years in March.'],
      ['Interviewer', 30, 'And before that?'],
      ['P1', 33, 'A call centre, on nights.'],
    ]);
  });

  test('labels on consecutive lines with no blank lines between', async () => {
    const t = await one('I: Ready?\nP: Yes.\nI: Good.\nThen a second line for I.\nP: Fine.\n', 'tight.txt');
    expect(t.turns.map((x) => [x.speaker, x.text])).toEqual([
      ['I', 'Ready?'],
      ['P', 'Yes.'],
      ['I', 'Good.\nThen a second line for I.'],
      ['P', 'Fine.'],
    ]);
  });

  test('a label on its own line: the words follow on the next line', async () => {
    const t = await one('Interviewer:\nWhat happened next?\n\nP2:\nWe waited.\n', 'own-line.txt');
    expect(t.turns.map((x) => [x.speaker, x.text])).toEqual([
      ['Interviewer', 'What happened next?'],
      ['P2', 'We waited.'],
    ]);
  });

  test('when only one speaker is named, unlabelled paragraphs are the other side', async () => {
    const t = await one('Q: How was the first week?\n\nTiring, but people were kind.\n\nQ: And the training?\n\nToo short.\nMostly slides.\n', 'q-only.txt');
    expect(t.labelled).toBe(true);
    expect(t.turns.map((x) => [x.speaker, x.text])).toEqual([
      ['Q', 'How was the first week?'],
      [null, 'Tiring, but people were kind.'],
      ['Q', 'And the training?'],
      [null, 'Too short.\nMostly slides.'],
    ]);
    expect(t.warnings).toEqual([]);
  });

  test('header lines "Speaker 1  00:00:05" with the words below', async () => {
    const t = await one('Speaker 1  00:00:05\nShall we begin?\n\nSpeaker 2  00:00:09\nYes.\nI am ready.\n', 'headers.txt');
    expect(t.turns.map((x) => [x.speaker, x.start, x.text])).toEqual([
      ['Speaker 1', 5, 'Shall we begin?'],
      ['Speaker 2', 9, 'Yes.\nI am ready.'],
    ]);
  });

  test('inline codes are taken out of labelled turns', async () => {
    const t = await one(fixture('coded-notes.txt'), 'coded-notes.txt');
    const p2 = t.turns[1]!;
    expect(p2.text).toBe('We lost the Tuesday team meeting and nobody replaced it.\nI found out about changes from the noticeboard.');
    expect(p2.codes).toEqual([
      { paths: ['Communication > Meetings'], at: 'We lost the Tuesday team meeting'.length },
      { paths: ['Communication', 'Feeling excluded'], at: p2.text.length },
    ]);
    expect(t.turns[3]!.codes).toEqual([{ paths: ['Patient safety'], at: 0 }]);
    expect(t.turns[3]!.text).toBe('Once, a handover note went missing for a whole day.');
  });

  test('an unclosed inline code is an error naming the file and line', async () => {
    const err = await readTranscriptBytes(Buffer.from('P1: fine\nP2: {theme: Workload\nP1: ok\n'), 'bad-code.txt').catch((e) => e);
    expect(err).toBeInstanceOf(UserError);
    expect((err as UserError).describe()).toMatch(/^bad-code\.txt:2: /);
  });
});

describe('plain text', () => {
  test('paragraphs become turns with no speaker', async () => {
    const t = await one(fixture('field-notes.txt'), 'field-notes.txt');
    expect(t.labelled).toBe(false);
    expect(t.turns).toHaveLength(4);
    expect(t.turns.every((x) => x.speaker === null && x.start === null)).toBe(true);
    expect(t.turns[2]!.text).toBe('Note: the canteen was closed for refurbishment, so breaks were taken in the vans.');
    expect(t.turns[1]!.text.split('\n')).toHaveLength(1);
  });

  test('a single label-like line does not make a file labelled', async () => {
    const t = await one('Summary of the visit.\n\nManager: was away.\n\nThe rest of the day was quiet.\n\nWe left early.\n', 'one-label.txt');
    expect(t.labelled).toBe(false);
    expect(t.turns[1]!.text).toBe('Manager: was away.');
  });

  test('a leading timestamp on a plain paragraph sets its start', async () => {
    const t = await one('[00:01:00] The bus was late again.\n\n[00:02:30] Everyone was cold.\n', 'timed-notes.txt');
    expect(t.turns.map((x) => [x.start, x.text])).toEqual([
      [60, 'The bus was late again.'],
      [150, 'Everyone was cold.'],
    ]);
  });

  test('a paragraph holding only a code codes the paragraph before it', async () => {
    const t = await one('First paragraph here.\n\n{theme: Delay}\n\nSecond paragraph.\n', 'code-para.txt');
    expect(t.turns.map((x) => x.text)).toEqual(['First paragraph here.', 'Second paragraph.']);
    expect(t.turns[0]!.codes).toEqual([{ paths: ['Delay'], at: 'First paragraph here.'.length }]);
  });

  test('CRLF text gives the same turns as LF text', async () => {
    const lf = fixture('ward-interview.txt').toString('utf8');
    const a = await one(lf, 'a.txt');
    const b = await one(lf.replace(/\n/g, '\r\n'), 'a.txt');
    expect(b.turns).toEqual(a.turns);
    expect(b.source).toBe(a.source);
  });
});

describe('markdown', () => {
  test('headings skipped, bold labels read, bullets and emphasis stripped', async () => {
    const t = await one(fixture('focus-group.md'), 'focus-group.md');
    expect(t.format).toBe('md');
    expect(t.labelled).toBe(true);
    expect(t.turns.map((x) => [x.speaker, x.text])).toEqual([
      [null, 'Invented transcript used for testing.'],
      ['Facilitator', "Let's go round and say what a good day looks like."],
      ['R1', 'A good day is when the delivery arrives before nine.\nThen we can prep without rushing.\nAnd nobody has to stay late.'],
      ['R2', "For me it's when the children actually eat what we make."],
      ['Facilitator', 'What gets in the way?'],
      ['R1', 'Paperwork, mostly. The allergy forms change every term.'],
    ]);
    // offset/length cover the paragraph in the source, markup included
    const r1 = t.turns[2]!;
    const span = t.source.slice(r1.offset, r1.offset + r1.length);
    expect(span.startsWith('A good day is when the *delivery*')).toBe(true);
    expect(span.endsWith('- And nobody has to stay late.')).toBe(true);
  });

  test('plain markdown paragraphs with a list', async () => {
    const t = await one('# Notes\n\nWe met at *noon*.\n\n* one point\n* another_point here\n', 'notes.md');
    expect(t.labelled).toBe(false);
    expect(t.turns.map((x) => x.text)).toEqual(['We met at noon.', 'one point\nanother_point here']);
  });

  test('emphasis stripping leaves inline code tags alone', async () => {
    const t = await one('**P1:** It was *hard* {theme: Work_load > *Night* shifts}.\n\n**P2:** Same.\n', 'c.md');
    expect(t.turns[0]!.text).toBe('It was hard.');
    expect(t.turns[0]!.codes).toEqual([{ paths: ['Work_load > *Night* shifts'], at: 11 }]);
  });

  test('a markdown file of headings only has no text', async () => {
    const err = await readTranscriptBytes(Buffer.from('# Title\n\n## Part\n'), 'h.md').catch((e) => e);
    expect(err).toBeInstanceOf(UserError);
  });
});

describe('size', () => {
  test('a 5 MB text on a single line is read quickly as one turn', async () => {
    const sentence = 'The rota changed again this week and nobody told the night staff until it was too late. ';
    const text = sentence.repeat(Math.ceil((5 * 1024 * 1024) / sentence.length));
    const t0 = performance.now();
    const t = await one(text, 'one-line.txt');
    const ms = performance.now() - t0;
    expect(t.turns).toHaveLength(1);
    expect(t.turns[0]!.text).toBe(text.trimEnd());
    expect(t.turns[0]!.length).toBe(text.trimEnd().length);
    expect(ms).toBeLessThan(1500);
  });

  test('a 5 MB single line with label-like and code-like starts stays linear', async () => {
    const text = 'P1: ' + '{ theme and: colon: [00:'.repeat(220_000);
    const t0 = performance.now();
    const t = await one(text, 'awkward.txt');
    expect(performance.now() - t0).toBeLessThan(1500);
    expect(t.turns).toHaveLength(1);
  });
});

describe('impossible timestamps', () => {
  // Minutes and seconds of a recording's elapsed time run 00 to 59 (common practice; the readers' clock rule): "[99:99:99]" is no time.
  test('"[99:99:99]" starts its own turn, without a time, and is reported with file and line', async () => {
    const t = await one('[00:01:00] Mina: Bed two is settled.\n[99:99:99] Omar: And bed three?\n[00:02:10] Mina: Waiting on bloods.\n', 'stamps.txt');
    expect(t.turns.map((x) => [x.speaker, x.start, x.text])).toEqual([
      ['Mina', 60, 'Bed two is settled.'],
      ['Omar', null, 'And bed three?'],
      ['Mina', 130, 'Waiting on bloods.'],
    ]);
    expect(t.warnings).toEqual(['stamps.txt:2: impossible timestamp "[99:99:99]" (minutes and seconds run 00 to 59): ignored, so this turn has no time']);
  });

  test('after the label, in Markdown, and in unlabelled paragraphs too; a ratio is not a timestamp', async () => {
    const md = await one('Mina [12:75]: Handover at seven.\n\n**Omar:** [00:40] Fine.\n', 'stamps.md');
    expect(md.turns.map((x) => [x.speaker, x.start])).toEqual([['Mina', null], ['Omar', 40]]);
    expect(md.warnings).toEqual(['stamps.md:1: impossible timestamp "[12:75]" (minutes and seconds run 00 to 59): ignored, so this turn has no time']);
    const header = await one('Mina [00:00:05]\nBed two is settled.\n\nOmar [99:99:99]\nAnd bed three?\n', 'header.txt');
    expect(header.turns.map((x) => [x.speaker, x.start, x.text])).toEqual([['Mina', 5, 'Bed two is settled.'], ['Omar', null, 'And bed three?']]);
    expect(header.warnings).toEqual(['header.txt:4: impossible timestamp "[99:99:99]" (minutes and seconds run 00 to 59): ignored, so this turn has no time']);
    const plain = await one('First note.\n\n(61:00:99) Second note.\n\n(1:2) staffing ratio on nights.\n', 'notes.txt');
    expect(plain.turns.map((x) => [x.start, x.text])).toEqual([[null, 'First note.'], [null, 'Second note.'], [null, '(1:2) staffing ratio on nights.']]);
    expect(plain.warnings).toHaveLength(1);
    expect(plain.warnings[0]).toMatch(/^notes\.txt:3: impossible timestamp "\(61:00:99\)"/);
  });
});
