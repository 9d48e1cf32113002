/** Pseudonyms as outputs show them: the study's aliases, and codes for the names without one. */
import { looksLikeName as looksLike, pseudonymiser, type Pseudonymiser } from '../report/pseudonyms.js';
import { listAliases, speakers, transcripts, type AliasKind } from '../study/aliases.js';
import type { DB } from '../study/db.js';

/** Every speaker label and transcript name, with its alias if it has one (alias list --all). */
export function namesAndAliases(db: DB): { kind: AliasKind; name: string; alias: string | null; shown_as: string | null; looks_like_name: boolean }[] {
  const al = new Map(listAliases(db).map((a) => [`${a.kind}\u0000${a.name}`, a.alias]));
  const p = studyPseudonymiser(db);
  return [
    ...speakers(db).map((s) => ({ kind: 'speaker' as const, name: s, alias: al.get(`speaker\u0000${s}`) ?? null, shown: p.speaker(s) })),
    ...transcripts(db).map((t) => ({ kind: 'transcript' as const, name: t, alias: al.get(`transcript\u0000${t}`) ?? null, shown: p.transcript(t) })),
  ].map(({ shown, ...r }) => ({ ...r, shown_as: shown, looks_like_name: r.kind === 'speaker' && looksLike(r.name) }));
}

/** The study's pseudonymiser: its aliases, and codes for the names without one. */
export function studyPseudonymiser(db: DB): Pseudonymiser {
  return pseudonymiser(listAliases(db), transcripts(db), speakers(db));
}
