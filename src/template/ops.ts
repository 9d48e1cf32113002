/**
 * Tree operations for revising a template. Each is pure: it deep-copies the input, changes the
 * copy and returns it with the changes made, so a failed operation leaves nothing half done.
 * Every theme whose parent changes as a side effect (children of a retired, merged or split
 * theme) gets its own 'moved' change, so the change list tells the whole story.
 */

import { UserError } from '../errors.js';
import { PATH_SEP, checkName, cleanName, findClash, nameKey, placeLabel } from './names.js';
import { cloneTemplate, locate, pathsById, walk, type WalkEntry } from './paths.js';
import type { Change, Revised, Template, ThemeNode } from './types.js';

export interface NewThemeOptions {
  apriori?: boolean;
  integrative?: boolean;
  definition?: string;
  include?: string;
  exclude?: string;
  seeds?: string[];
  /** Position among the new siblings (default: last). */
  index?: number;
}

function copy(t: Template): Template {
  return cloneTemplate(t);
}

function siblingsOf(t: Template, e: WalkEntry): ThemeNode[] {
  return e.parent ? e.parent.children : t.roots;
}

function parentPath(e: WalkEntry): string | null {
  return e.parent ? e.path.slice(0, e.path.length - PATH_SEP.length - e.node.name.length) : null;
}

function within(root: ThemeNode, node: ThemeNode): boolean {
  for (const e of walk({ roots: [root] })) if (e.node === node) return true;
  return false;
}

function freshId(t: Template, newId: () => string): string {
  const id = newId();
  for (const e of walk(t)) if (e.node.id === id) throw new Error(`newId() returned "${id}", which is already in use`);
  return id;
}

/** 'moved' for each of `nodes`, whose paths before the operation are in `before`. */
function movedChanges(t: Template, nodes: ThemeNode[], before: Map<string, string>): Change[] {
  const after = pathsById(t);
  return nodes.map((n) => ({ kind: 'moved', id: n.id, from: before.get(n.id)!, to: after.get(n.id)! }));
}

/** Throw one error naming every child that would clash with a theme at its new place. */
function checkNoClashes(movers: ThemeNode[], siblings: ThemeNode[], except: ThemeNode[], place: string, action: string): void {
  const clashes = movers.filter((m) => findClash(siblings, m.name, except));
  if (clashes.length > 0) {
    const names = clashes.map((c) => `"${c.name}"`).join(', ');
    throw new UserError(`${action}: ${place} there is already a theme named ${names}; rename one of them first`);
  }
}

export function renameTheme(t: Template, id: string, newName: string): Revised {
  const out = copy(t);
  const e = locate(out, id);
  const action = `cannot rename "${e.path}"`;
  const name = checkName(newName, action);
  if (name === e.node.name) return { template: out, changes: [] };
  const clash = findClash(siblingsOf(out, e), name, [e.node]);
  if (clash) throw new UserError(`${action}: there is already a theme "${clash.name}" ${placeLabel(parentPath(e))}`);
  e.node.name = name;
  return { template: out, changes: [{ kind: 'renamed', id, from: e.path, to: locate(out, id).path }] };
}

/** Move a theme (with its sub-themes) to the end of another theme's sub-themes, or to the top level. */
export function moveTheme(t: Template, id: string, newParentId: string | null): Revised {
  const out = copy(t);
  const e = locate(out, id);
  const action = `cannot move "${e.path}"`;
  const target = newParentId === null ? null : locate(out, newParentId);
  if (target && within(e.node, target.node)) {
    throw new UserError(`${action} under "${target.path}": a theme cannot go under itself or one of its own sub-themes`);
  }
  if ((target?.node ?? null) === e.parent) return { template: out, changes: [] };
  if (target && e.node.integrative) throw new UserError(`${action} under "${target.path}": it is an integrative theme, which stays at the top level`);
  const dest = target ? target.node.children : out.roots;
  const clash = findClash(dest, e.node.name);
  if (clash) throw new UserError(`${action}: there is already a theme "${clash.name}" ${placeLabel(target?.path ?? null)}`);
  const siblings = siblingsOf(out, e);
  siblings.splice(siblings.indexOf(e.node), 1);
  dest.push(e.node);
  return { template: out, changes: [{ kind: 'moved', id, from: e.path, to: locate(out, id).path }] };
}

/**
 * Fold `sourceId` into `targetId`: the source's sub-themes move under the target, its seed terms
 * join the target's (so the merged theme's profile starts from both), and the source leaves the
 * tree. The store re-points the source's codings to the target.
 */
export function mergeThemes(t: Template, sourceId: string, targetId: string): Revised {
  const out = copy(t);
  const src = locate(out, sourceId);
  const dst = locate(out, targetId);
  const action = `cannot merge "${src.path}" into "${dst.path}"`;
  if (src.node === dst.node) throw new UserError(`${action}: a theme cannot be merged into itself`);
  if (within(src.node, dst.node)) throw new UserError(`${action}: a theme cannot be merged into one of its own sub-themes`);
  const movers = [...src.node.children];
  checkNoClashes(movers, dst.node.children, [src.node], `under "${dst.path}"`, action);

  const before = pathsById(out);
  const siblings = siblingsOf(out, src);
  siblings.splice(siblings.indexOf(src.node), 1);
  dst.node.children.push(...movers);
  const seeds = [...dst.node.seeds];
  for (const s of src.node.seeds) if (!seeds.some((x) => x.toLowerCase() === s.toLowerCase())) seeds.push(s);
  const seedsGrew = seeds.length > dst.node.seeds.length;
  dst.node.seeds = seeds;

  const after = pathsById(out);
  const changes: Change[] = [
    { kind: 'merged', id: sourceId, into: targetId, from: src.path, to: after.get(targetId)! },
    ...movedChanges(out, movers, before),
  ];
  if (seedsGrew) changes.push({ kind: 'edited', id: targetId, path: after.get(targetId)!, fields: ['seeds'] });
  return { template: out, changes };
}

/**
 * Replace a theme by two or more new sibling themes, in its place; the first new theme takes its
 * sub-themes. The original is retired (its codings need deciding again). The new themes start
 * without notes and are not a priori: they come from the data. Besides 'split', each new theme
 * gets an 'added' change carrying its id.
 */
export function splitTheme(t: Template, id: string, names: string[], newId: () => string): Revised {
  const out = copy(t);
  const e = locate(out, id);
  const action = `cannot split "${e.path}"`;
  if (names.length < 2) throw new UserError(`${action}: give at least two new theme names (to change only the name, rename it)`);
  const clean = names.map((n) => checkName(n, action));
  const keys = clean.map(nameKey);
  const repeated = clean.find((_, i) => keys.indexOf(keys[i]!) !== i);
  if (repeated !== undefined) throw new UserError(`${action}: the new name "${repeated}" is given twice`);
  const siblings = siblingsOf(out, e);
  for (const name of clean) {
    const clash = findClash(siblings, name, [e.node]);
    if (clash) throw new UserError(`${action}: there is already a theme "${clash.name}" ${placeLabel(parentPath(e))}`);
  }

  const before = pathsById(out);
  const movers = [...e.node.children];
  const fresh: ThemeNode[] = [];
  for (const name of clean) {
    const node = newNode(freshId(out, newId), name, {});
    if (fresh.some((f) => f.id === node.id)) throw new Error(`newId() returned "${node.id}" twice`);
    fresh.push(node);
  }
  fresh[0]!.children = movers;
  siblings.splice(siblings.indexOf(e.node), 1, ...fresh);

  const after = pathsById(out);
  return {
    template: out,
    changes: [
      { kind: 'split', id, path: e.path, into: fresh.map((f) => after.get(f.id)!) },
      ...fresh.map((f): Change => ({ kind: 'added', id: f.id, path: after.get(f.id)! })),
      ...movedChanges(out, movers, before),
    ],
  };
}

/** Take a theme out of the template; its sub-themes move up one level, into its place. */
export function retireTheme(t: Template, id: string): Revised {
  const out = copy(t);
  const e = locate(out, id);
  const action = `cannot retire "${e.path}"`;
  const siblings = siblingsOf(out, e);
  const movers = [...e.node.children];
  checkNoClashes(movers, siblings, [e.node], placeLabel(parentPath(e)), action);
  const before = pathsById(out);
  siblings.splice(siblings.indexOf(e.node), 1, ...movers);
  return { template: out, changes: [{ kind: 'retired', id, path: e.path }, ...movedChanges(out, movers, before)] };
}

/** Create a theme on the spot (e.g. a sub-theme while reviewing); the new id is returned too. */
export function addTheme(
  t: Template,
  parentId: string | null,
  name: string,
  newId: () => string,
  opts: NewThemeOptions = {},
): Revised & { id: string } {
  const out = copy(t);
  const parent = parentId === null ? null : locate(out, parentId);
  const action = `cannot add "${cleanName(name)}" ${placeLabel(parent?.path ?? null)}`;
  const clean = checkName(name, action);
  if (parent && opts.integrative) throw new UserError(`${action}: an integrative theme runs across the others, so it goes at the top level`);
  const dest = parent ? parent.node.children : out.roots;
  const clash = findClash(dest, clean);
  if (clash) throw new UserError(`${action}: there is already a theme "${clash.name}" there`);
  const node = newNode(freshId(out, newId), clean, opts, action);
  const at = opts.index === undefined ? dest.length : Math.max(0, Math.min(dest.length, opts.index));
  dest.splice(at, 0, node);
  return { template: out, changes: [{ kind: 'added', id: node.id, path: locate(out, node.id).path }], id: node.id };
}

/** Note text as the outline can hold it: one line, single-spaced. */
function noteText(text: string | undefined): string {
  return (text ?? '').replace(/\s+/g, ' ').trim();
}

function newNode(id: string, name: string, opts: NewThemeOptions, action = ''): ThemeNode {
  const seeds: string[] = [];
  for (const raw of opts.seeds ?? []) {
    const s = noteText(raw);
    if (s.includes(',')) throw new UserError(`${action}: seed term "${s}" contains a comma, which separates seed terms`);
    if (s !== '' && !seeds.some((x) => x.toLowerCase() === s.toLowerCase())) seeds.push(s);
  }
  return {
    id,
    name,
    apriori: opts.apriori ?? false,
    ...(opts.integrative ? { integrative: true } : {}),
    definition: noteText(opts.definition),
    include: noteText(opts.include),
    exclude: noteText(opts.exclude),
    seeds,
    children: [],
  };
}
