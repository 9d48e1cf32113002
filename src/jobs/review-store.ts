/** The review session's storage port (src/review/port.ts) over a study's SQLite file. */
import { UserError } from '../errors.js';
import type { ReviewStore, Written } from '../review/port.js';
import { walk } from '../template/paths.js';
import type { Study } from '../study/study.js';
import { AlreadyDecided, claimOn, itemFromRun, passageView, reviewDecide, reviewNothingToCode, standingAccepts, standingRejects, undoLatest } from '../study/review.js';
import { currentTemplate } from '../study/template.js';
import { recodeToNewTheme, startReview } from './review.js';

/** Turns "another session got there first" into a refusal the session can show; anything else goes on up. */
function guarded<T>(work: () => T): Written<T> {
  try {
    return { ok: true, value: work() };
  } catch (e) {
    if (e instanceof AlreadyDecided) return { ok: false, claim: e.claim, message: e.message };
    // decide() itself refuses a suggestion decided meanwhile (a race on the same passage).
    if (e instanceof UserError && /already decided/.test(e.message)) return { ok: false, claim: { kind: 'decision', coder: '' }, message: e.message };
    throw e;
  }
}

export function sqliteReviewStore(study: Study): ReviewStore {
  const { db } = study;
  return {
    start: (setup, fitting) => startReview(db, setup, fitting),
    claim: (passageId, mine) => claimOn(db, passageId, mine),
    passage: (passageId) => passageView(db, passageId),
    standing: (ids) => ({ rejected: standingRejects(db, ids), accepted: standingAccepts(db, ids) }),
    decide: (passageId, d, mine) => guarded(() => reviewDecide(db, passageId, d, mine)),
    nothingToCode: (passageId, coder, note, mine) => guarded(() => reviewNothingToCode(db, passageId, coder, note, mine)),
    addTheme: (passageId, d, mine) => guarded(() => recodeToNewTheme(study, passageId, d, mine)),
    undoLatest: (coder, note) => undoLatest(db, coder, note),
    itemFromRun: (suggestionId) => itemFromRun(db, suggestionId),
    template: () => currentTemplate(db),
    themes: () => [...walk(currentTemplate(db))].map((e) => ({ id: e.node.id, path: e.path, name: e.node.name })),
  };
}
