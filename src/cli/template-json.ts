/** The JSON of `trellis template show` (docs/schema/template-show.schema.json). */
import type { IntegrativeCoverage } from '../measure/integrative.js';
import type { ThemeCount } from '../jobs/status.js';
import { walk } from '../template/paths.js';
import type { Template, ThemeNode } from '../template/types.js';

interface ThemeJson {
  id: string;
  name: string;
  apriori: boolean;
  integrative: boolean;
  definition: string;
  include: string;
  exclude: string;
  seeds: string[];
  passages: number;
  passages_with_subthemes: number;
  children: ThemeJson[];
}

/** The template as a tree with counts; `rev` null (no template yet) gives no themes. */
export function templateShowJson(rev: number | null, template: Template | null, counts: Map<string, ThemeCount>, integrative: IntegrativeCoverage[]) {
  if (rev === null || template === null) return { revision: null, themes: [] };
  // Built by a walk, not recursion: depth is unlimited.
  const themes: ThemeJson[] = [];
  const kids = new Map<ThemeNode, ThemeJson[]>();
  for (const { node: n, parent } of walk(template)) {
    const children: ThemeJson[] = [];
    kids.set(n, children);
    (parent ? kids.get(parent)! : themes).push({
      id: n.id,
      name: n.name,
      apriori: n.apriori,
      integrative: !!n.integrative,
      definition: n.definition,
      include: n.include,
      exclude: n.exclude,
      seeds: n.seeds,
      passages: counts.get(n.id)?.direct ?? 0,
      passages_with_subthemes: counts.get(n.id)?.total ?? 0,
      children,
    });
  }
  return { revision: rev, themes, integrative };
}
