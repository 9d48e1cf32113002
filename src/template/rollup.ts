import { walk } from './paths.js';
import type { Template } from './types.js';

/**
 * Each theme's members together with its sub-themes' (each member once): a parent theme holds every
 * passage coded to it or to anything under it. `direct` gives what is coded to each theme itself.
 * The walk runs backwards (sub-themes before their parents), so each parent gathers finished sets;
 * iterative, so template depth is unlimited.
 */
export function rollUp<K>(template: Template, direct: ReadonlyMap<string, Iterable<K>>): Map<string, Set<K>> {
  const entries = [...walk(template)];
  const rolled = new Map<string, Set<K>>();
  for (let i = entries.length - 1; i >= 0; i--) {
    const node = entries[i]!.node;
    const all = new Set(direct.get(node.id) ?? []);
    for (const c of node.children) for (const k of rolled.get(c.id)!) all.add(k);
    rolled.set(node.id, all);
  }
  return rolled;
}

/** Members grouped by theme, from (theme, member) pairs. */
export function groupByTheme<K>(pairs: Iterable<{ themeId: string; member: K }>): Map<string, Set<K>> {
  const out = new Map<string, Set<K>>();
  for (const { themeId, member } of pairs) {
    let s = out.get(themeId);
    if (!s) out.set(themeId, (s = new Set()));
    s.add(member);
  }
  return out;
}
