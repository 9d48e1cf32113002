/**
 * The review queue (a fresh suggestion run, filtered and ordered) and the one review write that
 * revises the template; the guarded row writes are in src/study/review.ts.
 */
import { FALLBACK_THRESHOLD, orderQueue, type ReviewItem, type ReviewSetup, type ReviewStart } from '../review/order.js';
import { addTheme } from '../template/ops.js';
import { findByPath, walk } from '../template/paths.js';
import type { DB } from '../study/db.js';
import { decide, type DecisionRow } from '../study/decisions.js';
import { AlreadyDecided, claimOn, decidedPassages, passagePlaces, themeOrder } from '../study/review.js';
import type { Study } from '../study/study.js';
import { currentTemplate } from '../study/template.js';
import { reviseTemplate } from './revise.js';
import { suggest, type SuggestRun } from './suggest.js';

/**
 * Starts a session: a fresh suggestion run (so the queue reflects the latest codings and
 * decisions), then the queue: passages of the run that are not coded and have no standing
 * decision, filtered and ordered.
 *
 * With `setup.phased` and the transcript order, when a stored model state serves, only the
 * first transcripts with an open passage are scored before this returns; `ReviewStart.rest`
 * scores the others into the same run and gives the rest of the queue, which then ends as a
 * whole run's would (transcript order puts every later item after the first ones).
 */
export function startReview(db: DB, setup: ReviewSetup = {}, fitting: () => void = () => undefined): ReviewStart {
  let within: Set<string> | null = null;
  if (setup.theme) {
    const node = findByPath(currentTemplate(db), setup.theme);
    within = new Set([...walk({ roots: [node] })].map((e) => e.node.id));
  }
  fitting(); // the arguments are checked: the slow part starts
  // (Suggesting writes no decision: read before it, these are what they would be after it.)
  const place = passagePlaces(db);
  const decided = decidedPassages(db);
  const open = (p: SuggestRun['passages'][number]) => !decided.has(p.passageId) && p.candidates.length > 0 && (!within || p.candidates.some((c) => within.has(c.themeId)));
  const order = setup.order ?? 'transcript';
  const phased = setup.phased === true && order === 'transcript';
  const run = suggest(db, { top: setup.top ?? 5, transcripts: setup.transcripts, firstUntil: phased ? (ps) => ps.some(open) : undefined });
  const thresholds = new Map(run.reports.map((r) => [r.themeId, r.threshold]));
  const rank = themeOrder(db);
  const itemsOf = (passages: SuggestRun['passages']): ReviewItem[] => {
    const items: ReviewItem[] = [];
    for (const p of passages) {
      if (!open(p)) continue;
      const at = place.get(p.passageId);
      items.push({
        passageId: p.passageId,
        transcript: p.transcript,
        transcriptIndex: at?.t ?? 0,
        ordinal: at?.ordinal ?? 0,
        candidates: p.candidates.map((c) => {
          const t = thresholds.get(c.themeId);
          return {
            suggestionId: c.suggestionId,
            themeId: c.themeId,
            path: run.paths.get(c.themeId) ?? c.themeId,
            confidence: c.confidence,
            above: c.aboveThreshold,
            threshold: t !== undefined && Number.isFinite(t) ? t : FALLBACK_THRESHOLD,
            reasons: c.reasons,
          };
        }),
      });
    }
    return orderQueue(items, order, rank);
  };
  const items = itemsOf(run.passages);
  const start: ReviewStart = { runId: run.runId, items, left: run.passages.length - items.length };
  const rest = run.rest;
  if (rest) {
    start.rest = () => {
      const passages = rest();
      const more = itemsOf(passages);
      start.left += passages.length - more.length;
      return { items: more, left: start.left };
    };
  }
  return start;
}

/**
 * Adds a theme (a new template revision) and re-codes the passage to it, in one transaction:
 * the theme and its first coding land together or not at all.
 */
export function recodeToNewTheme(
  study: Study,
  passageId: string,
  d: { suggestionId: number; parentId: string | null; name: string; note?: string; coder: string },
  mine: ReadonlySet<number>,
): { decision: DecisionRow; rev: number | null; path: string } {
  const { db } = study;
  return db
    .transaction(() => {
      const claim = claimOn(db, passageId, mine);
      if (claim) throw new AlreadyDecided(passageId, claim);
      let id = '';
      const r = reviseTemplate(
        study,
        'add',
        (t, newId) => {
          const out = addTheme(t, d.parentId, d.name, newId);
          id = out.id;
          return out;
        },
        d.coder,
        `added while reviewing ${passageId}`,
      );
      const path = [...walk(r.template)].find((e) => e.node.id === id)!.path;
      const decision = decide(db, { suggestionId: d.suggestionId, action: 'accept', themePath: path, note: d.note, coder: d.coder });
      return { decision, rev: r.rev, path };
    })
    .immediate();
}

