import type { Passage } from '../ingest/segment.js';
import type { Transcript } from '../ingest/types.js';
import { UserError } from '../errors.js';
import type { DB } from './db.js';

export interface TranscriptRow {
  id: number;
  name: string;
  file: string;
  format: string;
  hash: string;
  labelled: number;
  added_at: string;
}

// One prepared statement per database: an import of 20,000 survey answers looks each one up, and
// preparing the query every time cost more than running it.
const byName = new WeakMap<DB, ReturnType<DB['prepare']>>();

export function findTranscript(db: DB, name: string): TranscriptRow | undefined {
  let find = byName.get(db);
  if (!find) byName.set(db, (find = db.prepare('SELECT id, name, file, format, hash, labelled, added_at FROM transcripts WHERE name = ?')));
  return find.get(name) as TranscriptRow | undefined;
}

export function listTranscripts(db: DB): TranscriptRow[] {
  return db.prepare('SELECT id, name, file, format, hash, labelled, added_at FROM transcripts ORDER BY id').all() as TranscriptRow[];
}

/** What a cluster shows in place of a central passage whose transcript was replaced. */
export const REPLACED = '[transcript replaced since]';

export function deleteTranscript(db: DB, id: number): void {
  // Clusters outlive their passages (the audit trail keeps what was found and decided), but not
  // their words: a transcript replaced (say, by its de-identified version) leaves none of its text
  // among a cluster's central passages. (Its suggestions, which quote it, go with it: see import.)
  const ids = new Set((db.prepare('SELECT id FROM passages WHERE transcript_id = ?').all(id) as { id: string }[]).map((r) => r.id));
  const update = db.prepare('UPDATE clusters SET detail = ? WHERE id = ?');
  for (const c of db.prepare('SELECT id, detail FROM clusters').all() as { id: number; detail: string }[]) {
    const detail = JSON.parse(c.detail) as { central?: { passage_id: string; text: string }[] };
    const hit = (detail.central ?? []).filter((x) => ids.has(x.passage_id) && x.text !== REPLACED);
    if (!hit.length) continue;
    for (const x of hit) x.text = REPLACED;
    update.run(JSON.stringify(detail), c.id);
  }
  db.prepare('DELETE FROM transcripts WHERE id = ?').run(id);
  // Stored model states hold the vocabulary and vectors of every passage they were fitted on.
  db.prepare('DELETE FROM model_states').run();
}

/** Prepared statements for writing many transcripts and passages quickly in one transaction. */
export function transcriptWriter(db: DB) {
  const insT = db.prepare(
    'INSERT INTO transcripts (name, file, format, hash, source, labelled, added_at) VALUES (?, ?, ?, ?, ?, ?, ?)',
  );
  const insP = db.prepare(
    `INSERT INTO passages (id, transcript_id, ordinal, turn, speaker, role, question, start_s, end_s,
       char_offset, char_length, text, words, lemmas, stops, spans)
     VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
  );
  const now = new Date().toISOString();
  return (t: Transcript, file: string, hash: string, passages: Passage[]): number => {
    const tid = Number(insT.run(t.name, file, t.format, hash, t.source, t.labelled ? 1 : 0, now).lastInsertRowid);
    for (const p of passages) {
      const a = p.analysis;
      const spans = new Int32Array(a.starts.length * 2);
      for (let i = 0; i < a.starts.length; i++) {
        spans[2 * i] = a.starts[i]!;
        spans[2 * i + 1] = a.ends[i]!;
      }
      insP.run(
        p.id, tid, p.ordinal, p.turn, p.speaker, p.role, p.question, p.start, p.end, p.offset, p.length, p.text, p.words,
        a.lemmas.join(' '), Buffer.from(a.stop.buffer, a.stop.byteOffset, a.stop.byteLength),
        Buffer.from(spans.buffer, spans.byteOffset, spans.byteLength),
      );
    }
    return tid;
  };
}

/** Checks that every named transcript exists, so a typo is an error rather than an empty result. */
export function requireTranscripts(db: DB, names?: string[]): void {
  if (!names?.length) return;
  const known = new Set(listTranscripts(db).map((t) => t.name));
  const missing = names.filter((n) => !known.has(n));
  if (missing.length) {
    const list = [...known].slice(0, 8).join(', ');
    throw new UserError(`no transcript named ${missing.map((m) => `"${m}"`).join(', ')} in this study (it has: ${list}${known.size > 8 ? ', ...' : ''})`);
  }
}
