/**
 * Giving a freshly parsed outline the ids of the previous revision, so codings follow a theme
 * through renames and moves. Matching, most certain first, repeated until nothing more matches
 * (a match lets the sub-themes of the matched theme match in turn):
 *   1. same parent (already matched, or both top level) and same name -> same theme;
 *   2. same name, found exactly once among the unmatched themes on each side -> moved;
 *   3. same parent, same slot among the siblings -> renamed. A slot is the run of unmatched
 *      siblings between the same two matched ones; it pairs only when both sides hold the same
 *      number of themes, so an insertion next to a rename is not mistaken for a rename, and
 *      only when the old name does not appear among the unmatched new themes.
 * Names compare ignoring case. Whatever is left is removed (old) or added (new). A rename
 * together with a move is therefore removed + added: guessing there would risk moving codings
 * to a theme that means something else.
 */

import { nameKey } from './names.js';
import { cloneTemplate, pathKey, walk, type WalkEntry } from './paths.js';
import type { Change, EditableField, Template, ThemeNode } from './types.js';

const ROOT = Symbol('top level');
type ParentKey = string | typeof ROOT;

export function assignIds(
  fresh: Template,
  prev: Template | null,
  newId: () => string,
  /** The researcher's word: the new theme at this pathKey is this old theme (renamed or moved by hand). */
  same: ReadonlyMap<string, string> = new Map(),
): { template: Template; changes: Change[] } {
  const template = cloneTemplate(fresh);
  const next = [...walk(template)];
  const old = prev ? [...walk(prev)] : [];
  const oldById = new Map(old.map((e) => [e.node.id, e]));
  const oldKids = new Map<ParentKey, WalkEntry[]>();
  for (const e of old) {
    const k: ParentKey = e.parentId ?? ROOT;
    if (!oldKids.has(k)) oldKids.set(k, []);
    oldKids.get(k)!.push(e);
  }

  const idOf = new Map<ThemeNode, string>(); // new node -> old id
  const used = new Set<string>(); // old ids taken

  const take = (e: WalkEntry, oldId: string) => {
    idOf.set(e.node, oldId);
    used.add(oldId);
  };
  // The old parent this new theme sits under: ROOT, an old id, or undefined if its parent is unmatched.
  const oldParentOf = (e: WalkEntry): ParentKey | undefined => (e.parent ? idOf.get(e.parent) : ROOT);

  const sameParentSameName = (): number => {
    let n = 0;
    for (const e of next) {
      if (idOf.has(e.node)) continue;
      const p = oldParentOf(e);
      if (p === undefined) continue;
      const key = nameKey(e.node.name);
      const hit = oldKids.get(p)?.find((o) => !used.has(o.node.id) && nameKey(o.node.name) === key);
      if (hit) {
        take(e, hit.node.id);
        n++;
      }
    }
    return n;
  };

  const uniqueName = (): number => {
    const news0 = groupBy(next.filter((e) => !idOf.has(e.node)), (e) => nameKey(e.node.name));
    const left = groupBy(old.filter((o) => !used.has(o.node.id)), (o) => nameKey(o.node.name));
    let n = 0;
    for (const [key, news] of news0) {
      const olds = left.get(key);
      if (news.length === 1 && olds?.length === 1) {
        take(news[0]!, olds[0]!.node.id);
        n++;
      }
    }
    return n;
  };

  const sameSlot = (): number => {
    const unmatchedNewNames = new Set(next.filter((e) => !idOf.has(e.node)).map((e) => nameKey(e.node.name)));
    // New sibling lists, keyed by the old id their parent matched (or ROOT).
    const newKids = new Map<ParentKey, WalkEntry[]>();
    for (const e of next) {
      const p = oldParentOf(e);
      if (p === undefined) continue;
      if (!newKids.has(p)) newKids.set(p, []);
      newKids.get(p)!.push(e);
    }
    let n = 0;
    for (const [p, kids] of newKids) {
      const olds = oldKids.get(p) ?? [];
      // Anchors: themes that are siblings here in both revisions.
      const oldIds = new Set(olds.map((o) => o.node.id));
      const anchors = new Set(kids.map((e) => idOf.get(e.node)).filter((id): id is string => id !== undefined && oldIds.has(id)));
      const oldSlots = slots(olds, (o) => (anchors.has(o.node.id) ? o.node.id : used.has(o.node.id) ? SKIP : FREE));
      const newSlots = slots(kids, (e) => {
        const id = idOf.get(e.node);
        return id === undefined ? FREE : anchors.has(id) ? id : SKIP;
      });
      for (const [slot, news] of newSlots) {
        const olds2 = oldSlots.get(slot);
        if (!olds2 || olds2.length !== news.length) continue;
        if (olds2.some((o) => unmatchedNewNames.has(nameKey(o.node.name)))) continue;
        news.forEach((e, i) => take(e, olds2[i]!.node.id));
        n += news.length;
      }
    }
    return n;
  };

  for (const e of next) {
    const oldId = same.get(pathKey(e.path));
    if (oldId && oldById.has(oldId) && !used.has(oldId)) take(e, oldId);
  }
  for (;;) {
    sameParentSameName();
    if (uniqueName() > 0) continue;
    if (sameSlot() > 0) continue;
    break;
  }

  // Ids: matched themes keep theirs, new ones get fresh ones in document order.
  const taken = new Set(old.map((o) => o.node.id));
  for (const e of next) {
    let id = idOf.get(e.node);
    if (id === undefined) {
      id = newId();
      if (taken.has(id)) throw new Error(`newId() returned "${id}", which is already in use`);
    }
    taken.add(id);
    e.node.id = id;
  }

  const changes: Change[] = [];
  for (const e of [...walk(template)]) {
    const id = e.node.id;
    const was = idOf.has(e.node) ? oldById.get(id)! : undefined;
    if (!was) {
      changes.push({ kind: 'added', id, path: e.path });
      continue;
    }
    if (e.parentId !== was.parentId) changes.push({ kind: 'moved', id, from: was.path, to: e.path });
    else if (e.node.name !== was.node.name) changes.push({ kind: 'renamed', id, from: was.path, to: e.path });
    const fields = editedFields(was.node, e.node);
    if (fields.length > 0) changes.push({ kind: 'edited', id, path: e.path, fields });
  }
  for (const o of old) if (!used.has(o.node.id)) changes.push({ kind: 'removed', id: o.node.id, path: o.path });
  return { template, changes };
}

/**
 * Themes the outline adds at the path a retired theme last had get that theme back (its id, so
 * its codings return) instead of a fresh id. `retired` maps pathKey(path) to the retired id.
 */
export function reviveRetired(result: { template: Template; changes: Change[] }, retired: ReadonlyMap<string, string>): { template: Template; changes: Change[] } {
  if (!retired.size) return result;
  const template = cloneTemplate(result.template);
  const inUse = new Set([...walk(template)].map((e) => e.node.id));
  const revived = new Map<string, string>(); // fresh id -> retired id
  for (const e of walk(template)) {
    const old = retired.get(pathKey(e.path));
    if (!old || inUse.has(old) || !result.changes.some((c) => c.kind === 'added' && c.id === e.node.id)) continue;
    revived.set(e.node.id, old);
    inUse.add(old);
    e.node.id = old;
  }
  if (!revived.size) return result;
  const changes = result.changes.map((c): Change => (c.kind === 'added' && revived.has(c.id) ? { kind: 'revived', id: revived.get(c.id)!, path: c.path } : c));
  return { template, changes };
}

/** Which of a theme's notes and marks differ between two revisions. */
export function editedFields(a: ThemeNode, b: ThemeNode): EditableField[] {
  const fields: EditableField[] = [];
  for (const f of ['definition', 'include', 'exclude'] as const) if (a[f] !== b[f]) fields.push(f);
  if (a.seeds.length !== b.seeds.length || a.seeds.some((s, i) => s !== b.seeds[i])) fields.push('seeds');
  if (a.apriori !== b.apriori) fields.push('apriori');
  if (!!a.integrative !== !!b.integrative) fields.push('integrative');
  return fields;
}

function groupBy<T>(items: T[], key: (t: T) => string): Map<string, T[]> {
  const m = new Map<string, T[]>();
  for (const it of items) {
    const k = key(it);
    if (!m.has(k)) m.set(k, []);
    m.get(k)!.push(it);
  }
  return m;
}

const FREE = Symbol('unmatched');
const SKIP = Symbol('matched elsewhere');

/**
 * Runs of unmatched items between anchors (given by id), keyed by the two anchors around them;
 * items matched to themes that are now elsewhere are passed over.
 */
function slots<T>(items: T[], role: (t: T) => string | typeof FREE | typeof SKIP): Map<string, T[]> {
  const out = new Map<string, T[]>();
  let left: string | null = null; // null: the start or the end of the list
  let run: T[] = [];
  const close = (right: string | null) => {
    if (run.length > 0) out.set(JSON.stringify([left, right]), run);
    run = [];
    left = right;
  };
  for (const it of items) {
    const r = role(it);
    if (r === FREE) run.push(it);
    else if (r !== SKIP) close(r);
  }
  close(null);
  return out;
}
