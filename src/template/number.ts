/** Numbering and counting themes. */

import { walk } from './paths.js';
import type { Template } from './types.js';

/**
 * Outline numbers keyed by theme id: "1", "1.1", "1.1.1", as templates are usually presented.
 * Needs ids (see assignIds): a freshly parsed outline has none, so use walk()'s `number` there.
 */
export function numberThemes(template: Template): Map<string, string> {
  const numbers = new Map<string, string>();
  for (const e of walk(template)) {
    if (e.node.id === '' || numbers.has(e.node.id)) {
      throw new Error(`numberThemes needs unique theme ids; "${e.path}" has ${e.node.id === '' ? 'none' : 'a repeated one'}`);
    }
    numbers.set(e.node.id, e.number);
  }
  return numbers;
}

export function countThemes(template: Template): number {
  let n = 0;
  for (const _ of walk(template)) n++;
  return n;
}

export function countApriori(template: Template): number {
  let n = 0;
  for (const e of walk(template)) if (e.node.apriori) n++;
  return n;
}

/** Share of themes that are a priori, 0..1 (0 for an empty template). */
export function aprioriShare(template: Template): number {
  const total = countThemes(template);
  return total === 0 ? 0 : countApriori(template) / total;
}
