import { describe, expect, it } from 'vitest';
import {
  assignIds,
  parseOutlineOrThrow,
  printOutline,
  retireTheme,
  moveTheme,
  renameTheme,
  type Change,
  type Template,
} from '../../src/template/index.js';
import { counter, idAt, revision } from './helpers.js';

const parse = (text: string) => parseOutlineOrThrow(text, 'template.txt').template;
const lines = (...l: string[]) => l.join('\n');

const V1 = lines(
  'Workload [a priori]',
  '  | definition: How much work there is.',
  '  Staffing levels',
  '    Night shifts',
  '    Weekends',
  '  Admin',
  'Wellbeing',
  '  Stress',
  '  Peer support',
  'Management',
);

/** Diff `text` against a revision made from V1; ids of new themes are n1, n2, ... */
function next(text: string, prev: Template = revision(V1)): { prev: Template; t: Template; changes: Change[] } {
  const { template, changes } = assignIds(parse(text), prev, counter('n'));
  return { prev, t: template, changes };
}

describe('assignIds: first revision', () => {
  it('gives every theme a new id in document order and reports them added', () => {
    const fresh = parse('Workload\n  Staffing\nWellbeing\n');
    const { template, changes } = assignIds(fresh, null, counter('x'));
    expect([idAt(template, 'Workload'), idAt(template, 'Workload', 'Staffing'), idAt(template, 'Wellbeing')]).toEqual(['x1', 'x2', 'x3']);
    expect(changes).toEqual([
      { kind: 'added', id: 'x1', path: 'Workload' },
      { kind: 'added', id: 'x2', path: 'Workload > Staffing' },
      { kind: 'added', id: 'x3', path: 'Wellbeing' },
    ]);
    expect(fresh.roots[0]!.id).toBe(''); // input untouched
  });
});

describe('assignIds: against a previous revision', () => {
  it('same outline: same ids, no changes', () => {
    const { prev, t, changes } = next(V1);
    expect(changes).toEqual([]);
    expect(t).toEqual(prev);
  });

  it('reordering only is no change', () => {
    const { prev, t, changes } = next(
      lines('Management', 'Wellbeing', '  Peer support', '  Stress', 'Workload [a priori]', '  | definition: How much work there is.', '  Admin', '  Staffing levels', '    Weekends', '    Night shifts'),
    );
    expect(changes).toEqual([]);
    expect(idAt(t, 'Workload', 'Staffing levels', 'Weekends')).toBe(idAt(prev, 'Workload', 'Staffing levels', 'Weekends'));
    expect(idAt(t, 'Management')).toBe(idAt(prev, 'Management'));
  });

  it('a rename in place keeps the id', () => {
    const { prev, t, changes } = next(V1.replace('  Admin', '  Paperwork'));
    const id = idAt(prev, 'Workload', 'Admin');
    expect(idAt(t, 'Workload', 'Paperwork')).toBe(id);
    expect(changes).toEqual([{ kind: 'renamed', id, from: 'Workload > Admin', to: 'Workload > Paperwork' }]);
  });

  it('a change of case is a rename', () => {
    const { prev, changes } = next(V1.replace('Peer support', 'Peer Support'));
    expect(changes).toEqual([
      { kind: 'renamed', id: idAt(prev, 'Wellbeing', 'Peer support'), from: 'Wellbeing > Peer support', to: 'Wellbeing > Peer Support' },
    ]);
  });

  it('renaming a parent keeps its sub-themes without further changes', () => {
    const { prev, t, changes } = next(V1.replace('  Staffing levels', '  Staffing and skill mix'));
    const id = idAt(prev, 'Workload', 'Staffing levels');
    expect(changes).toEqual([{ kind: 'renamed', id, from: 'Workload > Staffing levels', to: 'Workload > Staffing and skill mix' }]);
    expect(idAt(t, 'Workload', 'Staffing and skill mix', 'Night shifts')).toBe(idAt(prev, 'Workload', 'Staffing levels', 'Night shifts'));
  });

  it('renaming a parent and a child at once keeps both ids', () => {
    const { prev, t, changes } = next(V1.replace('Workload [a priori]', 'Work demands [a priori]').replace('  Admin', '  Paperwork'));
    expect(idAt(t, 'Work demands')).toBe(idAt(prev, 'Workload'));
    expect(idAt(t, 'Work demands', 'Paperwork')).toBe(idAt(prev, 'Workload', 'Admin'));
    expect(changes.map((c) => c.kind)).toEqual(['renamed', 'renamed']);
  });

  it('a move to another parent keeps the id', () => {
    const { prev, t, changes } = next(V1.replace('  Admin\n', '').replace('Management', 'Management\n  Admin'));
    const id = idAt(prev, 'Workload', 'Admin');
    expect(idAt(t, 'Management', 'Admin')).toBe(id);
    expect(changes).toEqual([{ kind: 'moved', id, from: 'Workload > Admin', to: 'Management > Admin' }]);
  });

  it('moving a branch reports only its top; its sub-themes come along', () => {
    const text = lines('Workload [a priori]', '  | definition: How much work there is.', '  Admin', 'Wellbeing', '  Stress', '  Peer support', 'Management', '  Staffing levels', '    Night shifts', '    Weekends');
    const { prev, t, changes } = next(text);
    const id = idAt(prev, 'Workload', 'Staffing levels');
    expect(changes).toEqual([{ kind: 'moved', id, from: 'Workload > Staffing levels', to: 'Management > Staffing levels' }]);
    expect(idAt(t, 'Management', 'Staffing levels', 'Weekends')).toBe(idAt(prev, 'Workload', 'Staffing levels', 'Weekends'));
  });

  it('a move under a new theme keeps the id; the new theme is added', () => {
    const { prev, t, changes } = next(V1.replace('  Stress\n', '  Pressure\n    Stress\n'));
    expect(idAt(t, 'Wellbeing', 'Pressure', 'Stress')).toBe(idAt(prev, 'Wellbeing', 'Stress'));
    expect(changes).toEqual([
      { kind: 'added', id: 'n1', path: 'Wellbeing > Pressure' },
      { kind: 'moved', id: idAt(prev, 'Wellbeing', 'Stress'), from: 'Wellbeing > Stress', to: 'Wellbeing > Pressure > Stress' },
    ]);
  });

  it('rename and move together count as removed + added', () => {
    const { prev, changes } = next(V1.replace('  Admin\n', '').replace('Management', 'Management\n  Paperwork'));
    expect(changes).toEqual([
      { kind: 'added', id: 'n1', path: 'Management > Paperwork' },
      { kind: 'removed', id: idAt(prev, 'Workload', 'Admin'), path: 'Workload > Admin' },
    ]);
  });

  it('an insertion beside a rename is not taken for a rename', () => {
    const { prev, changes } = next(V1.replace('  Stress\n', '  Isolation\n  Distress\n'));
    expect(changes).toEqual([
      { kind: 'added', id: 'n1', path: 'Wellbeing > Isolation' },
      { kind: 'added', id: 'n2', path: 'Wellbeing > Distress' },
      { kind: 'removed', id: idAt(prev, 'Wellbeing', 'Stress'), path: 'Wellbeing > Stress' },
    ]);
  });

  it('a rename at the end of a sibling list with an addition elsewhere is still a rename', () => {
    const { prev, changes } = next(V1.replace('  Peer support', '  Support from colleagues').replace('  Admin', '  Admin\n  Training'));
    expect(changes).toEqual([
      { kind: 'added', id: 'n1', path: 'Workload > Training' },
      { kind: 'renamed', id: idAt(prev, 'Wellbeing', 'Peer support'), from: 'Wellbeing > Peer support', to: 'Wellbeing > Support from colleagues' },
    ]);
  });

  it('removing a theme reports it and each of its sub-themes', () => {
    const { prev, changes } = next(V1.replace('Wellbeing\n  Stress\n  Peer support\n', ''));
    expect(changes).toEqual([
      { kind: 'removed', id: idAt(prev, 'Wellbeing'), path: 'Wellbeing' },
      { kind: 'removed', id: idAt(prev, 'Wellbeing', 'Stress'), path: 'Wellbeing > Stress' },
      { kind: 'removed', id: idAt(prev, 'Wellbeing', 'Peer support'), path: 'Wellbeing > Peer support' },
    ]);
  });

  it('removing a parent from the outline moves its sub-themes up', () => {
    const { prev, t, changes } = next(V1.replace('  Staffing levels\n    Night shifts\n    Weekends\n', '  Night shifts\n  Weekends\n'));
    expect(idAt(t, 'Workload', 'Weekends')).toBe(idAt(prev, 'Workload', 'Staffing levels', 'Weekends'));
    expect(changes.map((c) => c.kind)).toEqual(['moved', 'moved', 'removed']);
  });

  it('an ambiguous move (the same name twice) is not guessed', () => {
    const prev = revision('Workload\n  Other\nWellbeing\n  Other\nManagement\n');
    const { t, changes } = next('Workload\nWellbeing\nManagement\n  Other\nPay\n  Other\n', prev);
    expect(changes.filter((c) => c.kind === 'moved')).toEqual([]);
    expect(changes.map((c) => c.kind).sort()).toEqual(['added', 'added', 'added', 'removed', 'removed']);
    expect(idAt(t, 'Pay', 'Other')).toBe('n3');
    expect(idAt(t, 'Management', 'Other')).toBe('n1');
  });

  it('a theme at its old path wins over a same-named newcomer elsewhere', () => {
    const { prev, t, changes } = next(V1.replace('Management', 'Management\n  Admin'));
    expect(idAt(t, 'Workload', 'Admin')).toBe(idAt(prev, 'Workload', 'Admin'));
    expect(changes).toEqual([{ kind: 'added', id: 'n1', path: 'Management > Admin' }]);
  });

  it('reports edited notes, seeds and a priori marks', () => {
    const text = V1.replace('How much work there is.', 'The amount of work.')
      .replace('Workload [a priori]', 'Workload')
      .replace('  Stress', '  Stress\n    | seeds: burnout\n    | include: exhaustion');
    const { prev, changes } = next(text);
    expect(changes).toEqual([
      { kind: 'edited', id: idAt(prev, 'Workload'), path: 'Workload', fields: ['definition', 'apriori'] },
      { kind: 'edited', id: idAt(prev, 'Wellbeing', 'Stress'), path: 'Wellbeing > Stress', fields: ['include', 'seeds'] },
    ]);
  });

  it('reports a rename and an edit of the same theme separately', () => {
    const { prev, changes } = next(V1.replace('Management', 'Leadership [a priori]'));
    const id = idAt(prev, 'Management');
    expect(changes).toEqual([
      { kind: 'renamed', id, from: 'Management', to: 'Leadership' },
      { kind: 'edited', id, path: 'Leadership', fields: ['apriori'] },
    ]);
  });

  it('handles deep trees: a rename at level 3 and a move at level 5', () => {
    const deep = lines('A', '  B', '    C', '      D', '        E', '          F', '        E2', 'X');
    const prev = revision(deep);
    const text = lines('A', '  B', '    C renamed', '      D', '        E', '        E2', '          F', 'X');
    const { t, changes } = next(text, prev);
    expect(changes).toEqual([
      { kind: 'renamed', id: idAt(prev, 'A', 'B', 'C'), from: 'A > B > C', to: 'A > B > C renamed' },
      { kind: 'moved', id: idAt(prev, 'A', 'B', 'C', 'D', 'E', 'F'), from: 'A > B > C > D > E > F', to: 'A > B > C renamed > D > E2 > F' },
    ]);
    expect(idAt(t, 'A', 'B', 'C renamed', 'D', 'E2')).toBe(idAt(prev, 'A', 'B', 'C', 'D', 'E2'));
  });

  it('is deterministic', () => {
    const prev = revision(V1);
    const text = V1.replace('  Admin', '  Paperwork').replace('Management', 'Management\n  Pay\n  Reward');
    const a = assignIds(parse(text), prev, counter('n'));
    const b = assignIds(parse(text), prev, counter('n'));
    expect(a).toEqual(b);
  });

  it('refuses a newId that repeats an id in use', () => {
    const prev = revision(V1);
    expect(() => assignIds(parse(`${V1}\nPay\n`), prev, () => idAt(prev, 'Workload'))).toThrow(/already in use/);
  });
});

describe('assignIds agrees with the tree operations', () => {
  it('an outline edited by an operation, printed and parsed again, keeps every id', () => {
    let t = revision(V1);
    t = renameTheme(t, idAt(t, 'Workload', 'Admin'), 'Paperwork').template;
    t = moveTheme(t, idAt(t, 'Wellbeing', 'Stress'), idAt(t, 'Workload')).template;
    t = retireTheme(t, idAt(t, 'Workload', 'Staffing levels')).template;
    const again = assignIds(parse(printOutline(t)), t, counter('n'));
    expect(again.changes).toEqual([]);
    expect(again.template).toEqual(JSON.parse(JSON.stringify(again.template)));
    expect(again.template.roots.map((r) => r.id)).toEqual(t.roots.map((r) => r.id));
    expect([...collectIds(again.template)]).toEqual([...collectIds(t)]);
  });
});

function* collectIds(t: Template): Generator<string> {
  const todo = [...t.roots];
  while (todo.length) {
    const n = todo.shift()!;
    yield n.id;
    todo.push(...n.children);
  }
}
