/**
 * How an integrative theme runs across the template: for each integrative theme, the passages
 * coded to it (or its sub-themes), and how many of them also carry each top-level theme (or any
 * theme under it). Pure: the template and the current codings in, counts out.
 */
import { walk } from '../template/paths.js';
import type { Template } from '../template/types.js';

export interface AcrossCount {
  theme_id: string;
  /** The top-level theme's name. */
  name: string;
  /** Passages of the integrative theme also coded to this top-level theme's branch. */
  passages: number;
}

export interface IntegrativeCoverage {
  theme_id: string;
  name: string;
  /** Passages coded to the integrative theme or its sub-themes (each once). */
  passages: number;
  /** Every non-integrative top-level theme, in template order, with its count (0 included). */
  across: AcrossCount[];
  /** How many top-level themes it touches (count above 0). */
  touches: number;
}

export function integrativeCoverage(template: Template, codings: readonly { passageId: string; themeId: string }[]): IntegrativeCoverage[] {
  // Each theme's top-level ancestor.
  const rootOf = new Map<string, string>();
  for (const e of walk(template)) rootOf.set(e.node.id, e.parent ? rootOf.get(e.parentId!)! : e.node.id);
  const byRoot = new Map<string, Set<string>>();
  for (const c of codings) {
    const r = rootOf.get(c.themeId);
    if (!r) continue; // a retired theme
    (byRoot.get(r) ?? byRoot.set(r, new Set()).get(r)!).add(c.passageId);
  }
  const plain = template.roots.filter((r) => !r.integrative);
  return template.roots
    .filter((r) => r.integrative)
    .map((x) => {
      const mine = byRoot.get(x.id) ?? new Set<string>();
      const across = plain.map((t) => {
        const theirs = byRoot.get(t.id) ?? new Set<string>();
        let n = 0;
        for (const p of mine) if (theirs.has(p)) n++;
        return { theme_id: t.id, name: t.name, passages: n };
      });
      return { theme_id: x.id, name: x.name, passages: mine.size, across, touches: across.filter((a) => a.passages > 0).length };
    });
}
