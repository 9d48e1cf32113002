/** Walking the tree and naming themes by path ("Workload > Staffing levels"). */

// The distance module alone: the package's main entry also loads storage back-ends that read a
// .env file and print to stdout on import, which a pure module (and `--json` output) cannot have.
import { JaroWinklerDistance } from 'natural/lib/natural/distance/index.js';
import { UserError } from '../errors.js';
import { PATH_SEP, nameKey } from './names.js';
import type { Template, ThemeNode } from './types.js';

export interface WalkEntry {
  node: ThemeNode;
  /** 0 for a top-level theme. */
  depth: number;
  parent: ThemeNode | null;
  /** The parent's id, null at the top level. */
  parentId: string | null;
  /** Position among its siblings, from 0. */
  index: number;
  /** Names from the top level down, joined by " > ". */
  path: string;
  /**
   * Outline number as templates are usually presented: "1", "1.2", "1.2.3". Integrative themes
   * are numbered apart, "I1", "I1.2", since they are listed apart from the hierarchy.
   */
  number: string;
  /** The theme is integrative, or under an integrative theme. */
  integrative: boolean;
}

/** Every theme in document order (a parent before its sub-themes). Iterative: depth is unlimited. */
export function* walk(template: Template): Generator<WalkEntry> {
  type Frame = { nodes: ThemeNode[]; i: number; parent: ThemeNode | null; path: string; number: string; depth: number; integrative: boolean };
  const stack: Frame[] = [{ nodes: template.roots, i: 0, parent: null, path: '', number: '', depth: 0, integrative: false }];
  const rootNumbers = new Map<ThemeNode, string>();
  let plain = 0;
  let across = 0;
  for (const r of template.roots) rootNumbers.set(r, r.integrative ? `I${++across}` : `${++plain}`);
  while (stack.length > 0) {
    const top = stack[stack.length - 1]!;
    if (top.i >= top.nodes.length) {
      stack.pop();
      continue;
    }
    const index = top.i++;
    const node = top.nodes[index]!;
    const path = top.parent ? top.path + PATH_SEP + node.name : node.name;
    const number = top.parent ? `${top.number}.${index + 1}` : rootNumbers.get(node)!;
    const integrative = top.parent ? top.integrative : !!node.integrative;
    yield { node, depth: top.depth, parent: top.parent, parentId: top.parent ? top.parent.id : null, index, path, number, integrative };
    if (node.children.length > 0) {
      stack.push({ nodes: node.children, i: 0, parent: node, path, number, depth: top.depth + 1, integrative });
    }
  }
}

/** Every theme's walk entry (path, number, depth, parent) by id: the one id map of a template. */
export function entriesById(template: Template): Map<string, WalkEntry> {
  return new Map([...walk(template)].map((e) => [e.node.id, e]));
}

/** Theme id -> path ("Workload > Staffing levels"). */
export function pathsById(template: Template): Map<string, string> {
  return new Map([...walk(template)].map((e) => [e.node.id, e.path]));
}

/** A deep copy of a template, without recursion: depth is unlimited. */
export function cloneTemplate(t: Template): Template {
  return unflattenTemplate(flattenTemplate(t));
}

/** A theme without its sub-themes, and the position of its parent in the flat list (-1: top level). */
export type FlatTheme = Omit<ThemeNode, 'children'> & { parent: number };

/** The tree as a list in document order: a parent before its sub-themes. */
export function flattenTemplate(t: Template): FlatTheme[] {
  const at = new Map<ThemeNode, number>();
  const out: FlatTheme[] = [];
  for (const e of walk(t)) {
    const { children: _children, ...rest } = e.node;
    at.set(e.node, out.length);
    out.push({ ...rest, seeds: [...rest.seeds], parent: e.parent ? at.get(e.parent)! : -1 });
  }
  return out;
}

export function unflattenTemplate(flat: readonly FlatTheme[]): Template {
  const nodes: ThemeNode[] = [];
  const roots: ThemeNode[] = [];
  for (const { parent, ...rest } of flat) {
    const node: ThemeNode = { ...rest, seeds: [...rest.seeds], children: [] };
    nodes.push(node);
    (parent < 0 ? roots : nodes[parent]!.children).push(node);
  }
  return { roots };
}

/** The walk entry of the theme with this id; UserError when there is none. */
export function locate(template: Template, id: string): WalkEntry {
  for (const e of walk(template)) if (e.node.id === id) return e;
  throw new UserError(`no theme with id "${id}" in this template`);
}

export function pathOf(template: Template, id: string): string {
  return locate(template, id).path;
}

/** Comparison key for a path: case and spacing (also around ">") do not matter. */
export function pathKey(path: string): string {
  return nameKey(path.replace(/\s*>\s*/g, PATH_SEP));
}

/** A coding-sheet cell "A > B; C" as separate paths. */
export function splitPathList(cell: string): string[] {
  return cell
    .split(';')
    .map((p) => p.trim())
    .filter((p) => p !== '');
}

/** A failed lookup; `paths` holds the candidates (ambiguous) or the suggestions (unknown). */
export class ThemeLookupError extends UserError {
  constructor(
    message: string,
    readonly kind: 'unknown' | 'ambiguous',
    readonly paths: string[],
    file?: string,
    line?: number,
  ) {
    super(message, file, line);
    this.name = 'ThemeLookupError';
  }
}

const SUGGEST_MIN = 0.8; // Jaro-Winkler similarity below this is rarely the theme meant
const SUGGEST_MAX = 3;

export type ThemeFinder = (pathOrName: string, where?: { file?: string; line?: number }) => ThemeNode;

/**
 * The theme a researcher means by a full path ("Workload > Staffing levels"; case and spacing
 * ignored) or by the end of one — a bare name, or "Staffing levels > Nights" — where that is
 * unique in the tree. A full path wins over a shorter one that ends the same way, so a
 * top-level "Staffing" is found by "Staffing" even if "Workload > Staffing" exists too.
 * `where` puts the file and line of the reference (a sheet row) into the error.
 */
export function findByPath(template: Template, pathOrName: string, where: { file?: string; line?: number } = {}): ThemeNode {
  return themeFinder(template)(pathOrName, where);
}

/**
 * findByPath with the keys worked out once, for many look-ups in the same template (a coding
 * sheet): a Map answers full paths and bare names directly. Do not change the template while
 * the finder is in use.
 */
export function themeFinder(template: Template): ThemeFinder {
  const keyed = [...walk(template)].map((e) => ({ e, key: pathKey(e.path), name: nameKey(e.node.name) }));
  type K = (typeof keyed)[number];
  const byPath = new Map<string, K[]>();
  // By last name: a path's endings are found among the themes of that name (indexing every ending
  // of every path would grow with the cube of the depth).
  const byName = new Map<string, K[]>();
  const add = (m: Map<string, K[]>, key: string, k: K) => {
    const list = m.get(key);
    if (list) list.push(k);
    else m.set(key, [k]);
  };
  for (const k of keyed) {
    add(byPath, k.key, k);
    add(byName, k.name, k);
  }
  const endingIn = (q: string): K[] => {
    const cut = q.lastIndexOf(PATH_SEP);
    const last = cut < 0 ? q : q.slice(cut + PATH_SEP.length);
    return (byName.get(last) ?? []).filter((k) => k.key.endsWith(PATH_SEP + q));
  };

  return (pathOrName, where = {}) => {
    const q = pathKey(pathOrName);
    if (q === '') throw new UserError('empty theme path', where.file, where.line);
    const exact = byPath.get(q) ?? [];
    if (exact.length === 1) return exact[0]!.e.node;
    const ending = exact.length > 1 ? exact : endingIn(q);
    if (ending.length === 1) return ending[0]!.e.node;
    if (ending.length > 1) {
      const paths = ending.map((k) => k.e.path);
      throw new ThemeLookupError(
        `"${pathOrName.trim()}" is ambiguous: it names ${paths.length} themes (${paths.map((p) => `"${p}"`).join(', ')}); write the full path`,
        'ambiguous',
        paths,
        where.file,
        where.line,
      );
    }

    const suggestions = keyed
      .map((k) => ({ path: k.e.path, score: Math.max(similarity(q, k.key), similarity(q, k.name)) }))
      .filter((s) => s.score >= SUGGEST_MIN)
      .sort((a, b) => b.score - a.score || a.path.localeCompare(b.path))
      .slice(0, SUGGEST_MAX)
      .map((s) => s.path);
    const hint = suggestions.length > 0 ? `; did you mean ${suggestions.map((p) => `"${p}"`).join(' or ')}?` : '';
    throw new ThemeLookupError(`no theme "${pathOrName.trim()}" in the template${hint}`, 'unknown', suggestions, where.file, where.line);
  };
}

function similarity(a: string, b: string): number {
  return JaroWinklerDistance(a, b, { ignoreCase: true });
}
