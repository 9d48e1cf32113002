// Integrative themes: trellis's "[integrative]" mark in the outline, numbering apart, diffs,
// moves, and their coverage across the top-level themes. All data invented.
import { describe, expect, it } from 'vitest';
import { integrativeCoverage } from '../../src/measure/integrative.js';
import { assignIds, parseOutline, printOutline } from '../../src/template/index.js';
import { addTheme, moveTheme } from '../../src/template/ops.js';
import { walk } from '../../src/template/paths.js';
import type { Template } from '../../src/template/types.js';

const FILE = 'template.txt';
const OUTLINE = ['Workload', '  Staffing levels', 'Trust in the system [integrative]', '  Trust in the data', 'Patient safety [a priori]', 'Blame [a priori] [integrative]', ''].join('\n');

function ids(t: Template): Template {
  let n = 0;
  return assignIds(t, null, () => `T${++n}`).template;
}

describe('the [integrative] mark', () => {
  const parsed = parseOutline(OUTLINE, FILE);

  it('is read in either order with [a priori], and stripped from the name', () => {
    expect(parsed.errors).toEqual([]);
    const roots = parsed.template.roots.map((r) => [r.name, !!r.integrative, r.apriori]);
    expect(roots).toEqual([
      ['Workload', false, false],
      ['Trust in the system', true, false],
      ['Patient safety', false, true],
      ['Blame', true, true],
    ]);
    expect(parseOutline('Blame [integrative] [a priori]\n', FILE).template.roots[0]).toMatchObject({ name: 'Blame', apriori: true, integrative: true });
  });

  it('is refused on an indented theme, with the line', () => {
    const r = parseOutline('Workload\n  Trust [integrative]\n', FILE);
    expect(r.errors.map((e) => e.text)).toEqual([expect.stringMatching(/^template\.txt:2: an integrative theme runs across the other themes, so it is written at the top level/)]);
  });

  it('numbers integrative themes apart (I1, I1.1) and the hierarchy without gaps', () => {
    const numbers = [...walk(parsed.template)].map((e) => [e.number, e.path, e.integrative]);
    expect(numbers).toEqual([
      ['1', 'Workload', false],
      ['1.1', 'Workload > Staffing levels', false],
      ['I1', 'Trust in the system', true],
      ['I1.1', 'Trust in the system > Trust in the data', true],
      ['2', 'Patient safety', false],
      ['I2', 'Blame', true],
    ]);
  });

  it('survives printing, and adding or removing it is an edit', () => {
    const printed = printOutline(parsed.template);
    expect(printed).toContain('Blame [integrative] [a priori]\n');
    const strip = (t: Template) => JSON.parse(JSON.stringify(t, (k, v) => (k === 'line' ? undefined : v)));
    expect(strip(parseOutline(printed, FILE).template)).toEqual(strip(parsed.template));
    const before = ids(parsed.template);
    const after = parseOutline(OUTLINE.replace('Trust in the system [integrative]', 'Trust in the system'), FILE).template;
    const d = assignIds(after, before, () => 'N1');
    expect(d.changes).toEqual([{ kind: 'edited', id: 'T3', path: 'Trust in the system', fields: ['integrative'] }]);
  });

  it('keeps an integrative theme at the top level when moved or added', () => {
    const t = ids(parsed.template);
    expect(() => moveTheme(t, 'T3', 'T1')).toThrow(/integrative theme, which stays at the top level/);
    expect(() => addTheme(t, 'T1', 'Hope', () => 'N1', { integrative: true })).toThrow(/goes at the top level/);
    expect(addTheme(t, null, 'Hope', () => 'N1', { integrative: true }).template.roots.at(-1)).toMatchObject({ name: 'Hope', integrative: true });
  });
});

describe('integrativeCoverage', () => {
  const t = ids(parseOutline(OUTLINE, FILE).template);
  // T1 Workload, T2 Staffing levels, T3 Trust (integrative), T4 Trust in the data, T5 Patient safety, T6 Blame (integrative).
  it('counts, for each integrative theme, its passages that also carry each top-level branch', () => {
    const codings = [
      { passageId: 'p1', themeId: 'T4' }, // trust (via its sub-theme) ...
      { passageId: 'p1', themeId: 'T2' }, // ... with workload (via its sub-theme)
      { passageId: 'p2', themeId: 'T3' },
      { passageId: 'p2', themeId: 'T1' },
      { passageId: 'p2', themeId: 'T5' },
      { passageId: 'p3', themeId: 'T3' }, // trust alone
      { passageId: 'p4', themeId: 'T5' }, // no integrative theme
      { passageId: 'p5', themeId: 'retired' },
    ];
    // By hand: Trust has p1, p2, p3; Workload branch {p1, p2}; Patient safety {p2, p4}.
    expect(integrativeCoverage(t, codings)).toEqual([
      {
        theme_id: 'T3',
        name: 'Trust in the system',
        passages: 3,
        across: [
          { theme_id: 'T1', name: 'Workload', passages: 2 },
          { theme_id: 'T5', name: 'Patient safety', passages: 1 },
        ],
        touches: 2,
      },
      {
        theme_id: 'T6',
        name: 'Blame',
        passages: 0,
        across: [
          { theme_id: 'T1', name: 'Workload', passages: 0 },
          { theme_id: 'T5', name: 'Patient safety', passages: 0 },
        ],
        touches: 0,
      },
    ]);
  });
});
