import { describe, expect, it } from 'vitest';
import {
  ThemeLookupError,
  aprioriShare,
  countThemes,
  findByPath,
  numberThemes,
  pathOf,
  splitPathList,
  themeFinder,
  walk,
} from '../../src/template/index.js';
import { UserError } from '../../src/errors.js';
import { idAt, revision } from './helpers.js';

const t = revision(
  [
    'Workload [a priori]',
    '  Staffing levels',
    '    Night shifts',
    '    Weekends',
    '  Other',
    'Wellbeing',
    '  Stress',
    '    Night shifts',
    '  Other',
    'Management [a priori]',
    '  Staffing',
    'Staffing',
  ].join('\n'),
);

function lookupError(q: string): ThemeLookupError {
  try {
    findByPath(t, q);
  } catch (e) {
    if (e instanceof ThemeLookupError) return e;
    throw e;
  }
  throw new Error(`"${q}" was found`);
}

describe('walk', () => {
  it('yields themes in document order with depth, parent id, path and number', () => {
    const rows = [...walk(t)].map((e) => [e.path, e.depth, e.parentId, e.number]);
    expect(rows.slice(0, 6)).toEqual([
      ['Workload', 0, null, '1'],
      ['Workload > Staffing levels', 1, 't1', '1.1'],
      ['Workload > Staffing levels > Night shifts', 2, 't2', '1.1.1'],
      ['Workload > Staffing levels > Weekends', 2, 't2', '1.1.2'],
      ['Workload > Other', 1, 't1', '1.2'],
      ['Wellbeing', 0, null, '2'],
    ]);
    expect(rows).toHaveLength(12);
  });
});

describe('pathOf', () => {
  it('gives the path of an id', () => {
    expect(pathOf(t, idAt(t, 'Wellbeing', 'Stress', 'Night shifts'))).toBe('Wellbeing > Stress > Night shifts');
    expect(pathOf(t, idAt(t, 'Staffing'))).toBe('Staffing');
  });
  it('refuses an unknown id', () => {
    expect(() => pathOf(t, 'nope')).toThrow(UserError);
  });
});

describe('findByPath', () => {
  it('finds a full path, ignoring case and spacing around ">"', () => {
    const want = idAt(t, 'Workload', 'Staffing levels', 'Weekends');
    expect(findByPath(t, 'Workload > Staffing levels > Weekends').id).toBe(want);
    expect(findByPath(t, '  workload>staffing   LEVELS >  weekends ').id).toBe(want);
  });

  it('accepts a bare name where it is unique', () => {
    expect(findByPath(t, 'weekends').id).toBe(idAt(t, 'Workload', 'Staffing levels', 'Weekends'));
    expect(findByPath(t, 'Stress').id).toBe(idAt(t, 'Wellbeing', 'Stress'));
  });

  it('accepts a unique ending of a path', () => {
    expect(findByPath(t, 'Stress > Night shifts').id).toBe(idAt(t, 'Wellbeing', 'Stress', 'Night shifts'));
  });

  it('prefers a full path to a longer path that ends the same way', () => {
    // "Staffing" is a top-level theme and also "Management > Staffing".
    expect(findByPath(t, 'Staffing').id).toBe(idAt(t, 'Staffing'));
    expect(findByPath(t, 'management > staffing').id).toBe(idAt(t, 'Management', 'Staffing'));
  });

  it('refuses an ambiguous bare name, listing the candidate paths', () => {
    const e = lookupError('night shifts');
    expect(e).toBeInstanceOf(UserError);
    expect(e.kind).toBe('ambiguous');
    expect(e.paths).toEqual(['Workload > Staffing levels > Night shifts', 'Wellbeing > Stress > Night shifts']);
    expect(e.message).toBe(
      '"night shifts" is ambiguous: it names 2 themes ("Workload > Staffing levels > Night shifts", ' +
        '"Wellbeing > Stress > Night shifts"); write the full path',
    );
    expect(lookupError('Other').paths).toEqual(['Workload > Other', 'Wellbeing > Other']);
  });

  it('refuses an unknown theme, suggesting close ones', () => {
    const e = lookupError('Workload > Stafing levels');
    expect(e.kind).toBe('unknown');
    expect(e.paths[0]).toBe('Workload > Staffing levels');
    expect(e.message).toMatch(/^no theme "Workload > Stafing levels" in the template; did you mean "Workload > Staffing levels"/);
    expect(lookupError('Welbeing').paths[0]).toBe('Wellbeing');
    expect(lookupError('Managment').paths[0]).toBe('Management');
  });

  it('gives no suggestion when nothing is close', () => {
    const e = lookupError('Quantum chromodynamics');
    expect(e.paths).toEqual([]);
    expect(e.message).toBe('no theme "Quantum chromodynamics" in the template');
  });

  it('puts the file and line of the reference into the error', () => {
    try {
      findByPath(t, 'Welbeing', { file: 'sheet.csv', line: 7 });
      expect.unreachable();
    } catch (e) {
      expect((e as UserError).describe()).toMatch(/^sheet\.csv:7: no theme "Welbeing"/);
    }
  });

  it('refuses an empty path', () => {
    expect(() => findByPath(t, '  ')).toThrow('empty theme path');
  });
});

describe('themeFinder', () => {
  it('answers like findByPath, for many look-ups', () => {
    const find = themeFinder(t);
    for (const q of ['Workload > Staffing levels > Weekends', 'weekends', 'Stress > Night shifts', 'Staffing', 'management>staffing']) {
      expect(find(q).id).toBe(findByPath(t, q).id);
    }
    expect(() => find('Other')).toThrow(/ambiguous/);
    expect(() => find('Strss', { file: 'sheet.csv', line: 3 })).toThrow(expect.objectContaining({ line: 3, file: 'sheet.csv' }));
  });
});

describe('splitPathList', () => {
  it('splits a sheet cell on ";"', () => {
    expect(splitPathList(' Workload > Other ;Stress;; ')).toEqual(['Workload > Other', 'Stress']);
  });
});

describe('numbering and counts', () => {
  it('numbers themes as templates are presented', () => {
    const n = numberThemes(t);
    expect(n.get(idAt(t, 'Workload'))).toBe('1');
    expect(n.get(idAt(t, 'Workload', 'Staffing levels', 'Weekends'))).toBe('1.1.2');
    expect(n.get(idAt(t, 'Wellbeing', 'Stress', 'Night shifts'))).toBe('2.1.1');
    expect(n.get(idAt(t, 'Wellbeing', 'Other'))).toBe('2.2');
    expect(n.get(idAt(t, 'Staffing'))).toBe('4');
    expect(n.get(idAt(t, 'Management', 'Staffing'))).toBe('3.1');
    expect(n.size).toBe(12);
  });

  it('refuses a template without ids', () => {
    expect(() => numberThemes({ roots: [{ ...t.roots[0]!, id: '' }] })).toThrow(/unique theme ids/);
  });

  it('counts themes and the a priori share', () => {
    expect(countThemes(t)).toBe(12);
    expect(aprioriShare(t)).toBeCloseTo(2 / 12, 12);
    expect(aprioriShare({ roots: [] })).toBe(0);
  });
});
