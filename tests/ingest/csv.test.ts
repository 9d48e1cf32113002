import { describe, expect, test } from 'vitest';
import { readTranscriptBytes } from '../../src/ingest/read.js';
import { UserError } from '../../src/errors.js';
import { fixture } from '../helpers/fixtures.js';

async function fails(text: string, opts = {}, name = 'survey.csv'): Promise<UserError> {
  const err = await readTranscriptBytes(Buffer.from(text), name, opts).catch((e) => e);
  expect(err).toBeInstanceOf(UserError);
  return err as UserError;
}

describe('survey .csv', () => {
  test('one transcript per respondent, answers in file order, empty answers skipped', async () => {
    const ts = await readTranscriptBytes(fixture('survey-answers.csv'), 'survey-answers.csv');
    expect(ts.map((t) => t.name)).toEqual(['survey-answers-R001', 'survey-answers-R002', 'survey-answers-R003']);
    expect(ts.every((t) => t.format === 'csv' && t.labelled)).toBe(true);
    const [r1, r2, r3] = ts;
    expect(r1!.turns.map((x) => [x.speaker, x.question, x.text])).toEqual([
      ['R001', 'What works well?', 'The team, mostly. People help each other.'],
      ['R001', 'What could change?', 'Fewer forms; more time with residents'],
    ]);
    expect(r2!.turns.map((x) => [x.question, x.text])).toEqual([['What could change?', 'Parking']]);
    expect(r3!.turns[0]!.text).toBe('Honestly? The new rota app, which I did not expect to say');
    expect(ts.flatMap((t) => t.warnings)).toEqual([]);
    for (const t of ts) {
      for (const turn of t.turns) expect(t.source.slice(turn.offset, turn.offset + turn.length)).toBe(turn.text);
    }
  });

  test('column names are matched ignoring case, spaces and hyphens; no question column is fine', async () => {
    const ts = await readTranscriptBytes(Buffer.from('Participant ID,Response\np-1,"Line one\nline two"\n'), 'w.csv');
    expect(ts).toHaveLength(1);
    expect(ts[0]!.turns[0]).toMatchObject({ speaker: 'p-1', text: 'Line one\nline two' });
    expect(ts[0]!.turns[0]!.question).toBeUndefined();
  });

  test('flags override the guess', async () => {
    const text = 'id,answer,who,said,asked\n1,ignored,A7,The lift again.,Access?\n';
    const [t] = await readTranscriptBytes(Buffer.from(text), 'o.csv', { idColumn: 'who', textColumn: 'said', questionColumn: 'asked' });
    expect(t!.name).toBe('o-A7');
    expect(t!.turns.map((x) => [x.speaker, x.question, x.text])).toEqual([['A7', 'Access?', 'The lift again.']]);
  });

  test('semicolon-separated files (spreadsheet exports) are read', async () => {
    const ts = await readTranscriptBytes(Buffer.from('respondent;comment\nR1;"Good, mostly"\nR2;Bad\n'), 'eu.csv');
    expect(ts.map((t) => t.turns[0]!.text)).toEqual(['Good, mostly', 'Bad']);
  });

  test('names are sanitised and kept unique', async () => {
    const ts = await readTranscriptBytes(Buffer.from('id,text\nZoë B,a\nZoe_B,b\nx/y,c\n'), 'wave 2.csv');
    expect(ts.map((t) => t.name)).toEqual(['wave_2-Zoe_B', 'wave_2-Zoe_B-2', 'wave_2-x_y']);
    expect(ts[0]!.turns[0]!.speaker).toBe('Zoë B');
  });

  test('an unterminated quote is an error naming the line where the field starts', async () => {
    const e = await fails('respondent_id,answer\nR1,fine\nR2,"it never\ncloses\nR3,ok\n', {}, 'q.csv');
    expect(e.file).toBe('q.csv');
    expect(e.line).toBe(3);
    expect(e.message).toMatch(/never closed/);
  });

  test('a row with the wrong number of columns is an error with its line', async () => {
    const e = await fails('respondent_id,answer\nR1,fine\nR2,one, two\n');
    expect(e.line).toBe(3);
    expect(e.message).toBe('this row has 3 fields but the header has 2; an answer holding a comma must be quoted');
  });

  test('missing columns: the error lists the columns found', async () => {
    const e = await fails('person,words\na,b\n');
    expect(e.message).toBe('no respondent id column (looked for respondent_id, respondent, id, participant, participant_id); columns found: "person", "words"');
    const f = await fails('id,words\na,b\n', { textColumn: 'speech' });
    expect(f.message).toBe('no column "speech" for the answer text; columns found: "id", "words"');
  });

  test('an answer without a respondent id is an error with its line', async () => {
    expect((await fails('id,answer\nR1,a\n,b\n')).line).toBe(3);
  });

  test('respondents with no answer at all are skipped with a warning', async () => {
    const ts = await readTranscriptBytes(Buffer.from('id,answer\nR1,\nR2,yes\nR3, \n'), 'few.csv');
    expect(ts.map((t) => t.name)).toEqual(['few-R2']);
    expect(ts[0]!.warnings).toEqual(['few.csv: 2 respondent(s) with no answer were skipped']);
  });

  test('a file with no answers is refused', async () => {
    expect((await fails('id,answer\nR1,\nR2,  \n')).message).toMatch(/no answers/);
  });
});
