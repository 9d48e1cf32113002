import { readdirSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, test } from 'vitest';
import { sanitiseName, transcriptName } from '../../src/ingest/names.js';

/** The rule before non-Latin scripts were kept, copied here: Latin names must still give exactly this. */
function ruleBefore(name: string): string {
  const plain = name.normalize('NFKD').replace(/\p{M}+/gu, '');
  const safe = plain.replace(/[^A-Za-z0-9._-]+/g, '_').replace(/^_+|_+$/g, '');
  return safe === '' ? 'transcript' : safe;
}

describe('transcript names', () => {
  test('names in other scripts keep their letters and stay distinct', () => {
    const names = ['中文.txt', 'Ελληνικά.txt', 'интервью.txt', 'हिन्दी.txt', 'مقابلة ٣.txt', '한국어.txt', 'がか.txt'].map((f) => transcriptName(f));
    expect(names).toEqual(['中文', 'Ελληνικά', 'интервью', 'हिन्दी', 'مقابلة_٣', '한국어', 'がか']);
    expect(new Set(names).size).toBe(names.length);
    // Marks of other scripts stay with their letters: "й" is not "и", "が" is not "か".
    expect(sanitiseName('Войти')).not.toBe(sanitiseName('Воити'));
    expect(sanitiseName('がく')).not.toBe(sanitiseName('かく'));
    expect(transcriptName('P03 (нарезка).txt')).toBe('P03_нарезка');
    expect(transcriptName('survey.csv', 'Ответ 1')).toBe('survey-Ответ_1');
  });

  test('Latin names are unchanged from the rule before, so passage ids made before stay the same', () => {
    const fixed = ['Zoë', 'Interview 3 — Ward B', 'Ｐ０３ ﬁnal²', 'Bjørn', 'Crème brûlée', '  __x__ ', 'a\u0301b', 'p01.final', '½ day', '!!!', 'Ⅻ'];
    for (const n of fixed) expect(sanitiseName(n), n).toBe(ruleBefore(n));
    // Seeded random Latin-script names (letters with and without accents, digits, punctuation, spaces).
    const pool = [...'abcXYZ019 ._-—()[]!,;éèêëüößøæłđñçÀÉÎÕÛŽ', '\u0301', '\u0308', 'ﬁ', '²', 'Ｐ'];
    let seed = 16;
    const next = () => (seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31;
    for (let k = 0; k < 2000; k++) {
      let n = '';
      for (let j = 1 + Math.floor(next() * 12); j > 0; j--) n += pool[Math.floor(next() * pool.length)];
      expect(sanitiseName(n), JSON.stringify(n)).toBe(ruleBefore(n));
    }
  });

  test("the demo study's transcript names do not change", () => {
    const files = readdirSync(resolve(import.meta.dirname, '../../corpora/handover')).filter((f) => /^t\d\d-/.test(f));
    expect(files.length).toBe(12);
    for (const f of files) {
      expect(transcriptName(f)).toBe(ruleBefore(f.replace(/\.[^.]+$/, '')));
      expect(transcriptName(f)).toMatch(/^t\d\d-[a-z0-9-]+$/);
    }
  });
});
