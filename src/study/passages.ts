import type { Role } from '../ingest/segment.js';
import type { DB } from './db.js';

export interface StoredPassage {
  id: string;
  transcript: string;
  ordinal: number;
  turn: number;
  speaker: string | null;
  role: Role;
  question: string | null;
  start: number | null;
  end: number | null;
  text: string;
  words: number;
}

export interface PassageFilter {
  transcripts?: string[];
  role?: Role;
}

const COLS = `p.id, t.name AS transcript, p.ordinal, p.turn, p.speaker, p.role, p.question,
  p.start_s AS start, p.end_s AS end, p.text, p.words`;

export function listPassages(db: DB, f: PassageFilter = {}): StoredPassage[] {
  const { where, args } = whereOf(f);
  const sql = `SELECT ${COLS} FROM passages p JOIN transcripts t ON t.id = p.transcript_id
    ${where} ORDER BY t.id, p.ordinal`;
  return db.prepare(sql).all(...args) as StoredPassage[];
}

const byId = new WeakMap<DB, ReturnType<DB['prepare']>>();

export function getPassage(db: DB, id: string): StoredPassage | undefined {
  let stmt = byId.get(db);
  if (!stmt) byId.set(db, (stmt = db.prepare(`SELECT ${COLS} FROM passages p JOIN transcripts t ON t.id = p.transcript_id WHERE p.id = ?`)));
  return stmt.get(id) as StoredPassage | undefined;
}

function whereOf(f: PassageFilter): { where: string; args: unknown[] } {
  const parts: string[] = [];
  const args: unknown[] = [];
  if (f.transcripts?.length) {
    parts.push(`t.name IN (${f.transcripts.map(() => '?').join(',')})`);
    args.push(...f.transcripts);
  }
  if (f.role) {
    parts.push('p.role = ?');
    args.push(f.role);
  }
  return { where: parts.length ? 'WHERE ' + parts.join(' AND ') : '', args };
}

/** Text, lemmas and token spans of some passages, for showing matched terms in place. */
export function passageTokens(db: DB, ids: string[]): Map<string, { text: string; lemmas: string[]; spans: Int32Array }> {
  const get = db.prepare('SELECT text, lemmas, spans FROM passages WHERE id = ?');
  const out = new Map<string, { text: string; lemmas: string[]; spans: Int32Array }>();
  for (const id of ids) {
    const r = get.get(id) as { text: string; lemmas: string; spans: Buffer } | undefined;
    if (!r) continue;
    const copy = new Uint8Array(r.spans); // a fresh, aligned buffer for the Int32Array view
    out.set(id, { text: r.text, lemmas: r.lemmas ? r.lemmas.split(' ') : [], spans: new Int32Array(copy.buffer) });
  }
  return out;
}

/** How many passages the study holds (to decide whether a run is long enough for a progress bar). */
export function passageCount(db: DB): number {
  return (db.prepare('SELECT COUNT(*) AS n FROM passages').get() as { n: number }).n;
}

/**
 * Every passage's stored analysis as raw rows (id, transcript, ordinal, role, lemma string, stop
 * flags), in study order: what the suggestion model reads, in one statement.
 */
export function analysedPassages(db: DB): [string, string, number, Role, string, Buffer][] {
  return db
    .prepare(
      `SELECT p.id, t.name AS transcript, p.ordinal, p.role, p.lemmas, p.stops
       FROM passages p JOIN transcripts t ON t.id = p.transcript_id ORDER BY t.id, p.ordinal`,
    )
    .raw()
    .all() as [string, string, number, Role, string, Buffer][];
}

/**
 * How often each written form of these lemmas occurs, read from the stored tokens of every
 * passage: the analysis may spell a lemma otherwise ("colour" -> "color").
 */
export function writtenFormCounts(db: DB, lemmas: Iterable<string>): Map<string, Map<string, number>> {
  const want = new Set(lemmas);
  const counts = new Map<string, Map<string, number>>();
  if (want.size) {
    for (const r of db.prepare('SELECT text, lemmas, spans FROM passages').iterate() as Iterable<{ text: string; lemmas: string; spans: Buffer }>) {
      if (!r.lemmas) continue;
      const ls = r.lemmas.split(' ');
      let spans: Int32Array | null = null;
      for (let i = 0; i < ls.length; i++) {
        if (!want.has(ls[i]!)) continue;
        spans ??= new Int32Array(new Uint8Array(r.spans).buffer);
        const form = r.text.slice(spans[2 * i]!, spans[2 * i + 1]!);
        const m = counts.get(ls[i]!) ?? counts.set(ls[i]!, new Map()).get(ls[i]!)!;
        m.set(form, (m.get(form) ?? 0) + 1);
      }
    }
  }
  return counts;
}
