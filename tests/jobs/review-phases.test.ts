// A review started in two phases (the first transcripts with an open passage scored first, the
// rest into the same run once the first screen is drawn) ends as the single-phase start does.
import { describe, expect, it } from 'vitest';
import { codedDemoStudy, copyStudy } from '../cli/run.js';
import type { DB } from '../../src/study/db.js';
import { openStudy } from '../../src/study/study.js';
import { startReview } from '../../src/jobs/review.js';
import { suggest } from '../../src/jobs/suggest.js';
import type { ReviewItem, ReviewSetup, ReviewStart } from '../../src/review/order.js';

/** Two copies of the coded demo study holding the model state an earlier suggest stored. */
function twoCopies(): [DB, DB] {
  const dir = codedDemoStudy();
  const db = openStudy(dir).db;
  suggest(db, { top: 5 });
  db.close();
  return [openStudy(dir).db, openStudy(copyStudy(dir)).db];
}

/** What a queue shows, without the ids its run gave the suggestions. */
const content = (items: ReviewItem[]) =>
  items.map((i) => ({
    passageId: i.passageId,
    transcript: i.transcript,
    candidates: i.candidates.map((c, rank) => ({ rank, themeId: c.themeId, path: c.path, confidence: c.confidence, above: c.above, threshold: c.threshold, reasons: c.reasons })),
  }));
const ids = (items: ReviewItem[]) => items.flatMap((i) => i.candidates.map((c) => c.suggestionId));

const runRow = (db: DB, id: number) => db.prepare('SELECT rev, fingerprint, options, passages, unclaimed, model_inputs FROM suggestion_runs WHERE id = ?').get(id);
const runRows = (db: DB, id: number) =>
  db.prepare('SELECT id, passage_id, theme_id, rank, confidence, above, chosen, reasons FROM suggestions WHERE run_id = ? ORDER BY id').all(id) as { id: number; passage_id: string }[];
const transcriptOf = (db: DB, passageId: string) =>
  (db.prepare('SELECT t.name FROM passages p JOIN transcripts t ON t.id = p.transcript_id WHERE p.id = ?').get(passageId) as { name: string }).name;

/** Both starts on their own copy; the phased one's rest scored. */
function both(setup: ReviewSetup): { single: ReviewStart; first: ReviewStart; firstItems: ReviewItem[]; firstRows: number; whole: ReviewItem[]; a: DB; b: DB } {
  const [a, b] = twoCopies();
  const single = startReview(a, setup);
  const first = startReview(b, { ...setup, phased: true });
  const firstItems = [...first.items];
  const firstRows = runRows(b, first.runId).length;
  expect(first.rest).toBeTypeOf('function');
  const more = first.rest!();
  return { single, first, firstItems, firstRows, whole: [...first.items, ...more.items], a, b };
}

describe('a review started in two phases', () => {
  it('first holds only the first transcript with an open passage, then ends with the same queue and the same stored run', () => {
    const { single, first, firstItems, firstRows, whole, a, b } = both({});
    expect(single.rest).toBeUndefined();
    // The first phase: one transcript, the first of the whole queue, and only its rows stored.
    const t = single.items[0]!.transcript;
    expect(new Set(firstItems.map((i) => i.transcript))).toEqual(new Set([t]));
    expect(content(firstItems)).toEqual(content(single.items.filter((i) => i.transcript === t)));
    expect(firstItems.length).toBeLessThan(single.items.length);
    expect(firstRows).toBeGreaterThan(0);
    const after = runRows(b, first.runId);
    expect(new Set(after.slice(0, firstRows).map((r) => transcriptOf(b, r.passage_id)))).toEqual(new Set([t]));

    // The end: the same queue in the same order, the same run row and rows, ids in the same order.
    expect(content(whole)).toEqual(content(single.items));
    expect(ids(whole)).toEqual(ids(single.items));
    expect(first.left).toBe(single.left);
    expect(runRow(b, first.runId)).toEqual(runRow(a, single.runId));
    expect(after).toEqual(runRows(a, single.runId));
    // Called again, the rest has nothing more to give and stores nothing.
    expect(first.rest!().items).toEqual([]);
    expect(runRows(b, first.runId)).toHaveLength(after.length);
    a.close();
    b.close();
  });

  it('scores more transcripts first when the first ones have no passage for the theme asked for, and still ends the same', () => {
    const theme = 'Workload > Interruptions';
    const { single, firstItems, whole, a, b } = both({ theme });
    const t = single.items[0]!.transcript;
    const firstOfAll = startReview(a, {}).items[0]!.transcript;
    expect(t).not.toBe(firstOfAll); // the first transcripts have no candidate of the theme
    expect(firstItems.length).toBeGreaterThan(0);
    expect(firstItems[0]!.transcript).toBe(t);
    expect(content(firstItems)).toEqual(content(single.items.slice(0, firstItems.length)));
    expect(content(whole)).toEqual(content(single.items));
    a.close();
    b.close();
  });

  it('stays one phase in another order and without a stored state', () => {
    const [a, b] = twoCopies();
    const uncertain = startReview(b, { order: 'uncertain', phased: true });
    expect(uncertain.rest).toBeUndefined();
    expect(content(uncertain.items)).toEqual(content(startReview(a, { order: 'uncertain' }).items));
    a.close();
    b.close();

    const dir = codedDemoStudy();
    const fresh = openStudy(copyStudy(dir)).db;
    const single = startReview(fresh, {});
    fresh.close();
    const db = openStudy(dir).db;
    const phased = startReview(db, { phased: true });
    expect(phased.rest).toBeUndefined();
    expect(content(phased.items)).toEqual(content(single.items));
    db.close();
  });
});
