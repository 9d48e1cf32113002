import { describe, expect, test } from 'vitest';
import { assertCodesClosed, extractInlineCodes, parsePaths } from '../../src/ingest/codes.js';
import { UserError } from '../../src/errors.js';

describe('extractInlineCodes', () => {
  test('a tag mid-sentence is removed, leaving one space, and recorded where it stood', () => {
    const r = extractInlineCodes('We lost the meeting {theme: Workload > Staffing; Patient safety} and nobody said.');
    expect(r.text).toBe('We lost the meeting and nobody said.');
    expect(r.codes).toEqual([{ paths: ['Workload > Staffing', 'Patient safety'], at: 19 }]);
    expect(r.text.slice(0, r.codes[0]!.at)).toBe('We lost the meeting');
  });

  test('tags at the start, before punctuation and at the end', () => {
    expect(extractInlineCodes('{theme: Trust} I believed them.')).toEqual({ text: 'I believed them.', codes: [{ paths: ['Trust'], at: 0 }] });
    expect(extractInlineCodes('It was fine {theme: Relief}.')).toEqual({ text: 'It was fine.', codes: [{ paths: ['Relief'], at: 11 }] });
    expect(extractInlineCodes('It was fine. {theme: Relief}')).toEqual({ text: 'It was fine.', codes: [{ paths: ['Relief'], at: 12 }] });
  });

  test('several tags, and spacing inside paths normalised', () => {
    const r = extractInlineCodes('One {theme: A>B} two {theme:  C  >  D ;E;} three');
    expect(r.text).toBe('One two three');
    expect(r.codes).toEqual([
      { paths: ['A > B'], at: 3 },
      { paths: ['C > D', 'E'], at: 7 },
    ]);
  });

  test('text without tags is returned unchanged', () => {
    const t = 'Braces {like this} are not codes.';
    expect(extractInlineCodes(t)).toEqual({ text: t, codes: [] });
  });
});

describe('assertCodesClosed', () => {
  const fail = (src: string) => {
    try {
      assertCodesClosed(src, 'f.txt');
    } catch (e) {
      expect(e).toBeInstanceOf(UserError);
      return e as UserError;
    }
    throw new Error('expected an error');
  };

  test('an unclosed tag is an error with its line number', () => {
    const e = fail('line one\nline two {theme: Workload\nline three}');
    expect(e.line).toBe(2);
    expect(e.file).toBe('f.txt');
    expect(e.message).toMatch(/not closed/);
  });

  test('a tag opened inside another is unclosed; an empty tag names no theme', () => {
    expect(fail('a\nb\n{theme: A {theme: B}').line).toBe(3);
    expect(fail('{theme: ; }').message).toMatch(/names no theme/);
  });

  test('well-formed tags pass', () => {
    expect(() => assertCodesClosed('x {theme: A > B} y\n{Theme : C}', 'f.txt')).not.toThrow();
  });
});

test('parsePaths splits on ";" and normalises " > "', () => {
  expect(parsePaths(' Workload > Staffing ;Patient safety; ')).toEqual(['Workload > Staffing', 'Patient safety']);
});
