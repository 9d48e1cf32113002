import { assignIds, parseOutlineOrThrow, type Template, type ThemeNode } from '../../src/template/index.js';

/** Ids t1, t2, ... in call order. */
export function counter(prefix = 't'): () => string {
  let n = 0;
  return () => `${prefix}${++n}`;
}

/** Parse an outline that must be valid and give it ids, as a first revision. */
export function revision(text: string, newId: () => string = counter()): Template {
  return assignIds(parseOutlineOrThrow(text, 'template.txt').template, null, newId).template;
}

/** Names only, nested, for compact structural assertions. */
export type Shape = [string, Shape[]];
export function shape(t: Template): Shape[] {
  const of = (n: ThemeNode): Shape => [n.name, n.children.map(of)];
  return t.roots.map(of);
}

/** The same tree without ids and lines (what a round trip must preserve). */
export function strip(t: Template): unknown {
  const of = (n: ThemeNode): unknown => ({
    name: n.name,
    apriori: n.apriori,
    definition: n.definition,
    include: n.include,
    exclude: n.exclude,
    seeds: n.seeds,
    children: n.children.map(of),
  });
  return t.roots.map(of);
}

/** Id of the theme at a path, via a walk (independent of findByPath). */
export function idAt(t: Template, ...names: string[]): string {
  let nodes = t.roots;
  let node: ThemeNode | undefined;
  for (const name of names) {
    node = nodes.find((n) => n.name === name);
    if (!node) throw new Error(`no ${names.join(' > ')}`);
    nodes = node.children;
  }
  return node!.id;
}
