/** The template as the model sees it: themes by index, their ancestors, and the roll-up rule. */
import { UserError } from '../errors.js';
import type { Coding, ModelPassage, ThemeInfo } from './types.js';

export interface Tree {
  themes: ThemeInfo[];
  index: Map<string, number>;
  parent: Int32Array; // -1 for a root
  /** Every theme's ancestors, nearest first. */
  ancestors: number[][];
  isLeaf: boolean[];
}

export function buildTree(themes: ThemeInfo[]): Tree {
  const index = new Map<string, number>();
  themes.forEach((t, i) => {
    if (index.has(t.id)) throw new UserError(`theme id ${t.id} appears twice in the template`);
    index.set(t.id, i);
  });
  const parent = new Int32Array(themes.length).fill(-1);
  themes.forEach((t, i) => {
    if (t.parentId === null) return;
    const p = index.get(t.parentId);
    if (p === undefined) throw new UserError(`theme ${t.path} has a parent (${t.parentId}) that is not in the template`);
    parent[i] = p;
  });
  const ancestors = themes.map((_, i) => {
    const out: number[] = [];
    for (let p = parent[i]!; p >= 0; p = parent[p]!) {
      if (out.includes(p) || p === i) throw new UserError(`the template has a cycle at theme ${themes[i]!.path}`);
      out.push(p);
    }
    return out;
  });
  const isLeaf = themes.map(() => true);
  for (let i = 0; i < themes.length; i++) if (parent[i]! >= 0) isLeaf[parent[i]!] = false;
  return { themes, index, parent, ancestors, isLeaf };
}

/**
 * The themes each passage counts as a positive for: its codings and all their ancestors
 * (a passage coded to a sub-theme is evidence for the parent too). Sorted theme indices.
 */
export function rolledUpLabels(tree: Tree, passages: ModelPassage[], codings: Coding[]): { labels: number[][]; unknownThemes: string[]; unknownPassages: string[] } {
  const pIndex = new Map(passages.map((p, i) => [p.id, i]));
  const sets = passages.map(() => new Set<number>());
  const unknownThemes = new Set<string>();
  const unknownPassages = new Set<string>();
  for (const c of codings) {
    const p = pIndex.get(c.passageId);
    const t = tree.index.get(c.themeId);
    if (p === undefined) unknownPassages.add(c.passageId);
    if (t === undefined) unknownThemes.add(c.themeId);
    if (p === undefined || t === undefined) continue;
    sets[p]!.add(t);
    for (const a of tree.ancestors[t]!) sets[p]!.add(a);
  }
  return {
    labels: sets.map((s) => [...s].sort((a, b) => a - b)),
    unknownThemes: [...unknownThemes],
    unknownPassages: [...unknownPassages],
  };
}

/**
 * The hierarchy rule: among the themes above their thresholds, a sub-theme is preferred to its
 * parent (the parent is dropped when any descendant clears); several unrelated themes may all be
 * kept (parallel coding).
 */
export function chooseThemes(tree: Tree, above: number[]): Set<number> {
  const chosen = new Set(above);
  for (const t of above) for (const a of tree.ancestors[t]!) chosen.delete(a);
  return chosen;
}
