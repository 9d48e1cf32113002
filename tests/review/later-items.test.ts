// A review session given its queue in parts: the later items join the end of the queue, and the
// passage shown, the place in the queue and the decisions made stay.
import { describe, expect, it } from 'vitest';
import { codedDemoStudy, copyStudy } from '../cli/run.js';
import { ReviewQueue } from '../../src/review/queue.js';
import { ReviewSession, type ReviewAction } from '../../src/review/session.js';
import type { ReviewItem } from '../../src/review/order.js';
import { sqliteReviewStore } from '../../src/jobs/review-store.js';
import { suggest } from '../../src/jobs/suggest.js';
import { openStudy, type Study } from '../../src/study/study.js';

const item = (passageId: string): ReviewItem => ({ passageId, transcript: 't', transcriptIndex: 1, ordinal: Number(passageId.slice(1)), candidates: [] });

/** Two copies of the coded demo study with the model state an earlier suggest stored. */
function twoStudies(): [Study, Study] {
  const dir = codedDemoStudy();
  const s = openStudy(dir);
  suggest(s.db, { top: 5 });
  s.close();
  return [openStudy(dir), openStudy(copyStudy(dir))];
}

/** The decisions as the log keeps them, without when they were made. */
const decisions = (s: Study) =>
  s.db.prepare('SELECT id, coder, action, suggestion_id, passage_id, theme_id, confidence, rank, chosen_theme, note, undoes FROM decisions ORDER BY id').all();

describe('the review queue given more items', () => {
  it('goes on with them after the last one, also when it had run out', () => {
    const q = new ReviewQueue([item('p1'), item('p2')]);
    expect(q.next()?.passageId).toBe('p1');
    q.done.add('p1');
    q.add([item('p3')]);
    expect(q.total).toBe(3);
    expect(q.positionOf('p3')).toBe(3);
    expect(q.next()?.passageId).toBe('p2');
    q.done.add('p2');
    expect(q.next()?.passageId).toBe('p3');
    q.done.add('p3');
    expect(q.next()).toBeUndefined();
    expect(q.next()).toBeUndefined();
    // A passage already in the queue is not added twice.
    q.add([item('p2'), item('p4'), item('p5')]);
    expect(q.total).toBe(5);
    expect(q.remaining).toBe(2);
    expect(q.next()?.passageId).toBe('p4');
    expect(q.next()?.passageId).toBe('p5');
  });
});

describe('a review session started in two phases', () => {
  it('keeps the passage shown, its place and the decisions when the rest arrives, and then goes as a single-phase session', () => {
    const [one, two] = twoStudies();
    const single = ReviewSession.start(sqliteReviewStore(one), 'alex');
    const phased = ReviewSession.start(sqliteReviewStore(two), 'alex', { phased: true });
    expect(single.scoring).toBe(false);
    expect(phased.scoring).toBe(true);
    const total = single.queue.total;
    expect(phased.queue.total).toBeLessThan(total);

    // Decisions on the first passage before the rest is scored.
    const cur = phased.showing!;
    expect(cur.item.passageId).toBe(single.showing!.item.passageId);
    const act = (a: ReviewAction) => [single.act(a), phased.act(a)] as const;
    const c = cur.item.candidates;
    act({ kind: 'note', text: 'first look' });
    const [sa, pa] = act({ kind: 'accept', candidate: c[0]!.suggestionId });
    expect(pa.outcome).toMatchObject({ kind: 'saved', then: 'stay' });
    expect(sa.outcome).toMatchObject({ kind: 'saved', then: 'stay' });

    phased.scoreRest();
    expect(phased.scoring).toBe(false);
    expect(phased.showing).toBe(cur);
    const screen = phased.screen();
    expect(screen.passage?.position).toBe(1);
    expect(screen.passage?.candidates[0]?.state).toBe('accepted');
    expect(screen.progress).toEqual(single.screen().progress);
    expect(phased.queue.total).toBe(total);
    expect(phased.queue.items.map((i) => i.passageId)).toEqual(single.queue.items.map((i) => i.passageId));

    // The same keys from here give the same passages and the same log.
    const steps: ReviewAction[] = [{ kind: 'next' }, { kind: 'defer' }, { kind: 'reject' }, { kind: 'next' }, { kind: 'nothing' }, { kind: 'defer' }, { kind: 'undo' }, { kind: 'previous' }];
    for (const a of steps) {
      const [s, p] = act(a);
      expect(p.outcome.kind).toBe(s.outcome.kind);
      expect(p.screen).toEqual(s.screen);
    }
    expect(decisions(two)).toEqual(decisions(one));
    one.close();
    two.close();
  });

  it('that ran out of passages before the rest arrives goes on with its first', () => {
    const [one, two] = twoStudies();
    const phased = ReviewSession.start(sqliteReviewStore(two), 'alex', { phased: true });
    const first = phased.queue.total;
    for (let i = 0; i < first; i++) phased.act({ kind: 'defer' });
    expect(phased.showing).toBeUndefined();
    expect(phased.screen().passage).toBeNull();
    phased.scoreRest();
    const single = ReviewSession.start(sqliteReviewStore(one), 'alex');
    const next = single.queue.items[first]!;
    expect(phased.showing?.item.passageId).toBe(next.passageId);
    expect(phased.screen().passage?.position).toBe(first + 1);
    expect(phased.screen().progress.deferred).toBe(first);
    one.close();
    two.close();
  });
});
