import { describe, expect, it } from 'vitest';
import {
  addTheme,
  mergeThemes,
  moveTheme,
  parseOutline,
  printOutline,
  renameTheme,
  retireTheme,
  splitTheme,
  type Template,
} from '../../src/template/index.js';
import { UserError } from '../../src/errors.js';
import { counter, idAt, revision, shape, strip } from './helpers.js';

const base = () =>
  revision(
    [
      'Workload [a priori]',
      '  | seeds: rota, overtime',
      '  Staffing levels',
      '    Night shifts',
      '    Weekends',
      '  Admin',
      'Wellbeing',
      '  | seeds: stress, burnout',
      '  Stress',
      '  Weekends',
      'Management',
    ].join('\n'),
  );

/** Run an operation and check that it left its input untouched. */
function pure<T>(t: Template, op: (t: Template) => T): T {
  const before = structuredClone(t);
  const out = op(t);
  expect(t).toEqual(before);
  return out;
}

function stillPrintable(t: Template) {
  const again = parseOutline(printOutline(t), 'x.txt');
  expect(again.errors).toEqual([]);
  expect(strip(again.template)).toEqual(strip(t));
}

describe('renameTheme', () => {
  it('renames and reports the paths', () => {
    const t = base();
    const id = idAt(t, 'Workload', 'Staffing levels');
    const r = pure(t, (x) => renameTheme(x, id, '  Staffing   and skill mix '));
    expect(r.template.roots[0]!.children[0]!.name).toBe('Staffing and skill mix');
    expect(r.template.roots[0]!.children[0]!.id).toBe(id);
    expect(r.changes).toEqual([{ kind: 'renamed', id, from: 'Workload > Staffing levels', to: 'Workload > Staffing and skill mix' }]);
  });

  it('allows a change of case only, and does nothing for the same name', () => {
    const t = base();
    const id = idAt(t, 'Workload', 'Admin');
    expect(renameTheme(t, id, 'ADMIN').changes).toHaveLength(1);
    expect(renameTheme(t, id, 'Admin').changes).toEqual([]);
  });

  it('refuses a sibling clash (ignoring case) and bad names', () => {
    const t = base();
    const id = idAt(t, 'Workload', 'Admin');
    expect(() => renameTheme(t, id, 'staffing LEVELS')).toThrow(
      'cannot rename "Workload > Admin": there is already a theme "Staffing levels" under "Workload"',
    );
    expect(() => renameTheme(t, id, 'Stress')).not.toThrow(); // a cousin's name is fine
    expect(() => renameTheme(t, id, '   ')).toThrow('cannot rename "Workload > Admin": empty theme name');
    expect(() => renameTheme(t, id, 'Admin > Forms')).toThrow(/contains " > "/);
    expect(() => renameTheme(t, id, 'Admin; forms')).toThrow(/contains ";"/);
    expect(() => renameTheme(t, id, 'Forms [a priori]')).toThrow(/mark the theme as a priori instead/);
    expect(() => renameTheme(t, id, '| forms')).toThrow(/marks a note line/);
    expect(() => renameTheme(t, 'missing', 'X')).toThrow(UserError);
  });
});

describe('moveTheme', () => {
  it('moves a theme with its sub-themes to the end of another theme', () => {
    const t = base();
    const id = idAt(t, 'Workload', 'Staffing levels');
    const r = pure(t, (x) => moveTheme(x, id, idAt(x, 'Management')));
    expect(shape(r.template)[2]).toEqual(['Management', [['Staffing levels', [['Night shifts', []], ['Weekends', []]]]]]);
    expect(r.changes).toEqual([{ kind: 'moved', id, from: 'Workload > Staffing levels', to: 'Management > Staffing levels' }]);
    stillPrintable(r.template);
  });

  it('moves to the top level', () => {
    const t = base();
    const id = idAt(t, 'Workload', 'Admin');
    const r = moveTheme(t, id, null);
    expect(r.template.roots.map((n) => n.name)).toEqual(['Workload', 'Wellbeing', 'Management', 'Admin']);
    expect(r.changes).toEqual([{ kind: 'moved', id, from: 'Workload > Admin', to: 'Admin' }]);
  });

  it('does nothing when the parent is the same', () => {
    const t = base();
    expect(moveTheme(t, idAt(t, 'Workload', 'Admin'), idAt(t, 'Workload')).changes).toEqual([]);
  });

  it('refuses moving under itself or a descendant', () => {
    const t = base();
    const w = idAt(t, 'Workload');
    expect(() => moveTheme(t, w, w)).toThrow(/cannot go under itself or one of its own sub-themes/);
    expect(() => moveTheme(t, w, idAt(t, 'Workload', 'Staffing levels', 'Night shifts'))).toThrow(
      'cannot move "Workload" under "Workload > Staffing levels > Night shifts": a theme cannot go under itself or one of its own sub-themes',
    );
  });

  it('refuses a sibling name clash at the destination', () => {
    const t = base();
    expect(() => moveTheme(t, idAt(t, 'Wellbeing', 'Weekends'), idAt(t, 'Workload', 'Staffing levels'))).toThrow(
      'cannot move "Wellbeing > Weekends": there is already a theme "Weekends" under "Workload > Staffing levels"',
    );
  });
});

describe('mergeThemes', () => {
  it('moves the children under the target, removes the source and joins the seeds', () => {
    const t = base();
    const src = idAt(t, 'Wellbeing');
    const dst = idAt(t, 'Workload');
    // Take "Weekends" out of the way first, to avoid a clash
    const t2 = retireTheme(t, idAt(t, 'Wellbeing', 'Weekends')).template;
    const r = pure(t2, (x) => mergeThemes(x, src, dst));
    expect(shape(r.template)).toEqual([
      ['Workload', [['Staffing levels', [['Night shifts', []], ['Weekends', []]]], ['Admin', []], ['Stress', []]]],
      ['Management', []],
    ]);
    expect(r.template.roots[0]!.seeds).toEqual(['rota', 'overtime', 'stress', 'burnout']);
    expect(r.changes).toEqual([
      { kind: 'merged', id: src, into: dst, from: 'Wellbeing', to: 'Workload' },
      { kind: 'moved', id: idAt(t, 'Wellbeing', 'Stress'), from: 'Wellbeing > Stress', to: 'Workload > Stress' },
      { kind: 'edited', id: dst, path: 'Workload', fields: ['seeds'] },
    ]);
    stillPrintable(r.template);
  });

  it('merges a sub-theme into its parent', () => {
    const t = base();
    const src = idAt(t, 'Workload', 'Staffing levels');
    const r = mergeThemes(t, src, idAt(t, 'Workload'));
    expect(shape(r.template)[0]).toEqual(['Workload', [['Admin', []], ['Night shifts', []], ['Weekends', []]]]);
    expect(r.changes.map((c) => c.kind)).toEqual(['merged', 'moved', 'moved']);
  });

  it('refuses name clashes among the children, naming them', () => {
    const t = base();
    expect(() => mergeThemes(t, idAt(t, 'Wellbeing'), idAt(t, 'Workload', 'Staffing levels'))).toThrow(
      'cannot merge "Wellbeing" into "Workload > Staffing levels": under "Workload > Staffing levels" there is already a theme named "Weekends"; rename one of them first',
    );
  });

  it('refuses merging into itself or its own sub-theme', () => {
    const t = base();
    const w = idAt(t, 'Workload');
    expect(() => mergeThemes(t, w, w)).toThrow(/into itself/);
    expect(() => mergeThemes(t, w, idAt(t, 'Workload', 'Admin'))).toThrow(/into one of its own sub-themes/);
  });
});

describe('splitTheme', () => {
  it('replaces a theme by new siblings in its place; the first takes the children', () => {
    const t = base();
    const id = idAt(t, 'Workload', 'Staffing levels');
    const r = pure(t, (x) => splitTheme(x, id, ['Staff numbers', ' Skill   mix'], counter('n')));
    expect(shape(r.template)[0]).toEqual([
      'Workload',
      [['Staff numbers', [['Night shifts', []], ['Weekends', []]]], ['Skill mix', []], ['Admin', []]],
    ]);
    const [a, b] = r.template.roots[0]!.children;
    expect([a!.id, b!.id]).toEqual(['n1', 'n2']);
    expect(a!.apriori).toBe(false);
    expect(r.changes).toEqual([
      { kind: 'split', id, path: 'Workload > Staffing levels', into: ['Workload > Staff numbers', 'Workload > Skill mix'] },
      { kind: 'added', id: 'n1', path: 'Workload > Staff numbers' },
      { kind: 'added', id: 'n2', path: 'Workload > Skill mix' },
      {
        kind: 'moved',
        id: idAt(t, 'Workload', 'Staffing levels', 'Night shifts'),
        from: 'Workload > Staffing levels > Night shifts',
        to: 'Workload > Staff numbers > Night shifts',
      },
      {
        kind: 'moved',
        id: idAt(t, 'Workload', 'Staffing levels', 'Weekends'),
        from: 'Workload > Staffing levels > Weekends',
        to: 'Workload > Staff numbers > Weekends',
      },
    ]);
    stillPrintable(r.template);
  });

  it('may reuse the original name for one part', () => {
    const t = base();
    const r = splitTheme(t, idAt(t, 'Workload', 'Admin'), ['Admin', 'Paperwork'], counter('n'));
    expect(r.template.roots[0]!.children.map((c) => [c.name, c.id])).toEqual([
      ['Staffing levels', idAt(t, 'Workload', 'Staffing levels')],
      ['Admin', 'n1'],
      ['Paperwork', 'n2'],
    ]);
  });

  it('refuses fewer than two names, repeated names, clashes and clashing ids', () => {
    const t = base();
    const id = idAt(t, 'Workload', 'Admin');
    expect(() => splitTheme(t, id, ['Paperwork'], counter('n'))).toThrow(/at least two new theme names/);
    expect(() => splitTheme(t, id, ['Paperwork', 'paperwork'], counter('n'))).toThrow(/"paperwork" is given twice/);
    expect(() => splitTheme(t, id, ['Paperwork', 'Staffing levels'], counter('n'))).toThrow(
      'cannot split "Workload > Admin": there is already a theme "Staffing levels" under "Workload"',
    );
    expect(() => splitTheme(t, id, ['A', 'B'], () => 't1')).toThrow(/already in use/);
  });
});

describe('retireTheme', () => {
  it('removes the theme and lifts its children into its place', () => {
    const t = base();
    const id = idAt(t, 'Workload', 'Staffing levels');
    const r = pure(t, (x) => retireTheme(x, id));
    expect(shape(r.template)[0]).toEqual(['Workload', [['Night shifts', []], ['Weekends', []], ['Admin', []]]]);
    expect(r.changes[0]).toEqual({ kind: 'retired', id, path: 'Workload > Staffing levels' });
    expect(r.changes.slice(1)).toEqual([
      { kind: 'moved', id: idAt(t, 'Workload', 'Staffing levels', 'Night shifts'), from: 'Workload > Staffing levels > Night shifts', to: 'Workload > Night shifts' },
      { kind: 'moved', id: idAt(t, 'Workload', 'Staffing levels', 'Weekends'), from: 'Workload > Staffing levels > Weekends', to: 'Workload > Weekends' },
    ]);
  });

  it('retires a leaf at the top level', () => {
    const t = base();
    const r = retireTheme(t, idAt(t, 'Management'));
    expect(r.template.roots.map((n) => n.name)).toEqual(['Workload', 'Wellbeing']);
    expect(r.changes).toEqual([{ kind: 'retired', id: idAt(t, 'Management'), path: 'Management' }]);
  });

  it('refuses when a lifted child would clash with its new siblings', () => {
    const t = revision('Workload\n  Staffing\n    Admin\n  Admin\n');
    expect(() => retireTheme(t, idAt(t, 'Workload', 'Staffing'))).toThrow(
      'cannot retire "Workload > Staffing": under "Workload" there is already a theme named "Admin"; rename one of them first',
    );
  });
});

describe('addTheme', () => {
  it('adds a sub-theme with notes and returns its id', () => {
    const t = base();
    const parent = idAt(t, 'Wellbeing', 'Stress');
    const r = pure(t, (x) =>
      addTheme(x, parent, 'Moral distress', counter('n'), { definition: 'Being unable to give the care one thinks right.', seeds: ['guilt', 'Guilt', 'conscience'] }),
    );
    expect(r.id).toBe('n1');
    const node = r.template.roots[1]!.children[0]!.children[0]!;
    expect(node).toMatchObject({ id: 'n1', name: 'Moral distress', apriori: false, seeds: ['guilt', 'conscience'] });
    expect(r.changes).toEqual([{ kind: 'added', id: 'n1', path: 'Wellbeing > Stress > Moral distress' }]);
    stillPrintable(r.template);
  });

  it('adds at the top level, at a given position', () => {
    const t = base();
    const r = addTheme(t, null, 'Training', counter('n'), { index: 1, apriori: true });
    expect(r.template.roots.map((n) => n.name)).toEqual(['Workload', 'Training', 'Wellbeing', 'Management']);
    expect(r.template.roots[1]!.apriori).toBe(true);
  });

  it('refuses clashes, bad names, seeds with commas and reused ids', () => {
    const t = base();
    const w = idAt(t, 'Workload');
    expect(() => addTheme(t, w, 'admin', counter('n'))).toThrow(
      'cannot add "admin" under "Workload": there is already a theme "Admin" there',
    );
    expect(() => addTheme(t, null, 'A > B', counter('n'))).toThrow(/contains " > "/);
    expect(() => addTheme(t, null, 'Pay', counter('n'), { seeds: ['pay, reward'] })).toThrow(/contains a comma/);
    expect(() => addTheme(t, null, 'Pay', () => w)).toThrow(/already in use/);
  });
});
