/** The alias table (schema 9): a pseudonym for a speaker label or a transcript name. */

import { UserError } from '../errors.js';
import type { Alias } from '../report/pseudonyms.js';
import type { DB } from './db.js';

export interface StoredAlias extends Alias {
  at: string;
}

export type AliasKind = Alias['kind'];

export function listAliases(db: DB): StoredAlias[] {
  return db.prepare('SELECT kind, name, alias, at FROM aliases ORDER BY kind, name').all() as StoredAlias[];
}

/** Every speaker label of the study. */
export function speakers(db: DB): string[] {
  // In order of first appearance: generated codes follow the study's order.
  return (
    db
      .prepare(
        `SELECT p.speaker AS s FROM passages p JOIN transcripts t ON t.id = p.transcript_id
         WHERE p.speaker IS NOT NULL GROUP BY p.speaker ORDER BY MIN(t.id * 1000000 + p.ordinal)`,
      )
      .all() as { s: string }[]
  ).map((r) => r.s);
}

/** Every transcript name, in study order. */
export function transcripts(db: DB): string[] {
  return (db.prepare('SELECT name FROM transcripts ORDER BY id').all() as { name: string }[]).map((r) => r.name);
}

/** Which kind NAME is: a speaker label, a transcript name, or (when both) the one `kind` says. */
function kindOf(db: DB, name: string, kind: AliasKind | undefined): AliasKind {
  const isSpeaker = speakers(db).includes(name);
  const isTranscript = transcripts(db).includes(name);
  if (kind === 'speaker' && !isSpeaker) throw new UserError(`no speaker labelled "${name}" in the study (see trellis alias list --all)`);
  if (kind === 'transcript' && !isTranscript) throw new UserError(`no transcript named "${name}" in the study`);
  if (kind) return kind;
  if (isSpeaker && isTranscript) throw new UserError(`"${name}" is both a speaker label and a transcript name: add --speaker or --transcript`);
  if (isSpeaker) return 'speaker';
  if (isTranscript) return 'transcript';
  throw new UserError(`no speaker or transcript named "${name}" in the study (speaker labels and transcript names are matched exactly; see trellis alias list --all)`);
}

const CONTROL = /[\u0000-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/;

/** Gives NAME the alias NEW (replacing an earlier one), in one transaction. */
export function setAlias(db: DB, name: string, alias: string, kind?: AliasKind): StoredAlias {
  return db.transaction(() => {
    const k = kindOf(db, name, kind);
    const a = alias.trim();
    if (!a) throw new UserError('the alias is empty');
    if (a.length > 60 || CONTROL.test(a)) throw new UserError('an alias is at most 60 characters, without control characters');
    if (a.includes('#') && k === 'transcript') throw new UserError('a transcript alias cannot contain "#" (passage ids are <transcript>#<n>)');
    const holder = db.prepare('SELECT name FROM aliases WHERE kind = ? AND alias = ? AND name <> ?').get(k, a, name) as { name: string } | undefined;
    if (holder) throw new UserError(`the alias "${a}" is already given to ${k} "${holder.name}"`);
    const real = k === 'speaker' ? speakers(db) : transcripts(db);
    if (a !== name && real.includes(a)) throw new UserError(`"${a}" is the real name of another ${k}: choose an alias that is not`);
    const at = new Date().toISOString();
    db.prepare('INSERT INTO aliases (kind, name, alias, at) VALUES (?, ?, ?, ?) ON CONFLICT (kind, name) DO UPDATE SET alias = excluded.alias, at = excluded.at').run(k, name, a, at);
    return { kind: k, name, alias: a, at };
  })();
}

/** Removes NAME's alias; an error when it has none. */
export function removeAlias(db: DB, name: string, kind?: AliasKind): Alias {
  return db.transaction(() => {
    const rows = db.prepare(`SELECT kind, name, alias FROM aliases WHERE name = ? ${kind ? 'AND kind = ?' : ''}`).all(...(kind ? [name, kind] : [name])) as Alias[];
    if (!rows.length) throw new UserError(`"${name}" has no alias`);
    if (rows.length > 1) throw new UserError(`"${name}" has an alias as a speaker and as a transcript: add --speaker or --transcript`);
    db.prepare('DELETE FROM aliases WHERE kind = ? AND name = ?').run(rows[0]!.kind, name);
    return rows[0]!;
  })();
}
