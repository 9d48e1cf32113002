import { describe, expect, it } from 'vitest';
import { groupByTheme, rollUp } from '../../src/template/rollup.js';
import type { ThemeNode } from '../../src/template/types.js';
import { revision } from './helpers.js';

describe('rollUp', () => {
  // Ids in outline order: t1 Workload, t2 Staffing, t3 Night shifts, t4 Interruptions, t5 Safety.
  const t = revision('Workload\n  Staffing\n    Night shifts\n  Interruptions\nSafety\n');

  it('gives each theme its own passages and its sub-themes\', each passage once', () => {
    const direct = groupByTheme([
      { themeId: 't3', member: 'p1' },
      { themeId: 't3', member: 'p2' },
      { themeId: 't2', member: 'p2' }, // coded to the sub-theme and its parent: still one passage
      { themeId: 't4', member: 'p3' },
      { themeId: 't1', member: 'p4' },
    ]);
    const r = rollUp(t, direct);
    const sorted = (id: string) => [...r.get(id)!].sort();
    expect(sorted('t3')).toEqual(['p1', 'p2']);
    expect(sorted('t2')).toEqual(['p1', 'p2']);
    expect(sorted('t4')).toEqual(['p3']);
    expect(sorted('t1')).toEqual(['p1', 'p2', 'p3', 'p4']);
    expect(sorted('t5')).toEqual([]);
    expect(direct.get('t3')).toEqual(new Set(['p1', 'p2']));
  });

  it('handles a chain deeper than the call stack', () => {
    // Built directly: an outline this deep would be 20,000 levels of indentation to parse.
    const depth = 20_000;
    const leaf = (id: string): ThemeNode => ({ ...t.roots[1]!, id, name: id, children: [] });
    const roots = [leaf('t1')];
    for (let i = 2, at = roots[0]!; i <= depth; i++) at.children.push((at = leaf(`t${i}`)));
    const r = rollUp({ roots }, new Map([[`t${depth}`, ['p1']]]));
    expect(r.get('t1')).toEqual(new Set(['p1']));
    expect(r.size).toBe(depth);
  });
});
