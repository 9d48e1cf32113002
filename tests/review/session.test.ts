// The review session without a terminal: actions in, outcomes and screen models out, over a real
// temporary study (built through the CLI as a user would), checked against the study's log.
import { cpSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import { ReviewSession, type ActResult, type CandidateModel, type ReviewAction } from '../../src/review/session.js';
import type { DB } from '../../src/study/db.js';
import { openStudy, type Study } from '../../src/study/study.js';
import type { DecisionRow } from '../../src/study/decisions.js';
import { sqliteReviewStore } from '../../src/jobs/review-store.js';
import { CORPUS, freshStudy, trellis } from '../cli/run.js';

const T05 = 't05-ward9-fy2';
let base: string;
const open: DB[] = [];

// Template, five transcripts, the first four coded by priya: t05 is left for review.
beforeAll(() => {
  base = freshStudy();
  const ok = (args: string[]) => {
    const r = trellis(args, base);
    expect(r.status, r.stderr).toBe(0);
  };
  ok(['template', 'set', join(CORPUS, 'template.txt'), '--coder', 'priya']);
  ok(['add', ...['t01-larch-staff-nurse.txt', 't02-kestrel-fy1.txt', 't03-harbour-hca.md', 't04-orchard-staff-nurse.vtt', `${T05}.txt`].map((f) => join(CORPUS, f))]);
  ok(['sheet', 'import', join(CORPUS, 'initial-coding.csv'), '--coder', 'priya']);
}, 180_000);

afterEach(() => {
  for (const db of open.splice(0)) db.close();
});

function copyStudy(): string {
  const dir = mkdtempSync(join(tmpdir(), 'trellis-session-'));
  cpSync(base, dir, { recursive: true });
  return dir;
}

/** A session on its own connection, as a separate process would have. */
function session(dir: string, coder = 'alex'): { s: ReviewSession; db: DB; study: Study } {
  const study = openStudy(dir);
  open.push(study.db);
  return { s: ReviewSession.start(sqliteReviewStore(study), coder, { transcripts: [T05] }), db: study.db, study };
}

function decisions(db: DB): DecisionRow[] {
  return db.prepare('SELECT * FROM decisions ORDER BY id').all() as DecisionRow[];
}

function act(s: ReviewSession, a: ReviewAction): ActResult {
  const r = s.act(a);
  // The screen model is plain data: it survives a JSON round trip unchanged.
  expect(JSON.parse(JSON.stringify(r.screen))).toEqual(r.screen);
  return r;
}

/** A passage shown with at least n open candidates (moving on by deferring the others). */
function passageWith(s: ReviewSession, n: number) {
  for (let i = 0; i < 200; i++) {
    const p = s.screen().passage;
    if (!p) break;
    if (p.candidates.filter((c) => c.state === 'open').length >= n) return p;
    act(s, { kind: 'defer' });
  }
  throw new Error(`no passage with ${n} candidates`);
}

describe('review session', () => {
  it('shows the first passage with candidates, offsets of the matched terms and the counts', () => {
    const { s } = session(copyStudy());
    const m = s.screen();
    expect(m.passage).not.toBeNull();
    const p = m.passage!;
    expect(p.transcript).toBe(T05);
    expect(p.candidates.length).toBeGreaterThan(0);
    expect(p.candidates.every((c, i) => c.number === i + 1 && c.state === 'open' && c.confidence >= 0 && c.confidence <= 1)).toBe(true);
    expect(m.progress.left).toBe(m.progress.total);
    expect(m.progress.total).toBeGreaterThan(3);
    // A passage whose candidates name terms found in its text: every offset lies inside it, in order.
    let withMatches: CandidateModel[] = [];
    let text = '';
    for (let i = 0; i < 100 && s.screen().passage && !withMatches.length; i++) {
      const q = s.screen().passage!;
      withMatches = q.candidates.filter((c) => c.reasons.some((r) => r.kind === 'terms' || r.kind === 'seeds'));
      text = q.text;
      if (!withMatches.length) act(s, { kind: 'defer' });
    }
    expect(withMatches.length).toBeGreaterThan(0);
    for (const c of withMatches) {
      expect(c.matches.length).toBeGreaterThan(0);
      let pos = 0;
      for (const r of c.matches) {
        expect(r.start).toBeGreaterThanOrEqual(pos);
        expect(r.end).toBeGreaterThan(r.start);
        expect(r.end).toBeLessThanOrEqual(text.length);
        expect(text.slice(r.start, r.end)).toMatch(/^\w[\w'-]*$/);
        pos = r.end;
      }
    }
  });

  it('accepts two themes on one passage, keeping it current, then moves on at next', () => {
    const { s, db } = session(copyStudy());
    const p = passageWith(s, 3);
    const [c1, c2] = p.candidates.filter((c) => c.state === 'open');
    const first = act(s, { kind: 'accept', candidate: c1!.suggestionId });
    expect(first.outcome).toMatchObject({ kind: 'saved', then: 'stay' });
    expect(first.screen.passage!.id).toBe(p.id);
    const second = act(s, { kind: 'accept', candidate: c2!.suggestionId });
    expect(second.outcome).toMatchObject({ kind: 'saved', then: 'stay' });
    const states = new Map(second.screen.passage!.candidates.map((c) => [c.suggestionId, c.state]));
    expect(states.get(c1!.suggestionId)).toBe('accepted');
    expect(states.get(c2!.suggestionId)).toBe('accepted');
    expect(second.screen.progress.accepted).toBe(2);
    // The same candidate cannot be accepted twice.
    expect(act(s, { kind: 'accept', candidate: c1!.suggestionId }).outcome).toMatchObject({ kind: 'refused', reason: 'accepted-already' });
    const moved = act(s, { kind: 'next' });
    expect(moved.outcome.kind).toBe('moved');
    expect(moved.screen.passage?.id).not.toBe(p.id);
    const accepts = decisions(db).filter((d) => d.action === 'accept' && d.passage_id === p.id);
    expect(accepts.map((d) => d.chosen_theme).sort()).toEqual([c1!.themeId, c2!.themeId].sort());
    const coded = db.prepare('SELECT theme_id FROM codings WHERE passage_id = ? AND removed_at IS NULL ORDER BY theme_id').all(p.id) as { theme_id: string }[];
    expect(coded.map((c) => c.theme_id)).toEqual([c1!.themeId, c2!.themeId].sort());
  });

  it('will not move on from a passage not yet decided', () => {
    const { s } = session(copyStudy());
    const id = s.screen().passage!.id;
    const r = act(s, { kind: 'next' });
    expect(r.outcome).toMatchObject({ kind: 'refused', reason: 'not-decided' });
    expect(r.screen.passage!.id).toBe(id);
  });

  it('writes the decision log rows the terminal review wrote: reject, with the note typed before it', () => {
    const { s, db } = session(copyStudy());
    const p = passageWith(s, 2);
    const top = p.candidates.find((c) => c.state === 'open')!;
    expect(act(s, { kind: 'note', text: '  handover was verbal  ' }).screen.note).toBe('handover was verbal');
    const r = act(s, { kind: 'reject' });
    expect(r.outcome).toMatchObject({ kind: 'saved', then: 'stay' });
    expect(r.screen.note).toBeNull();
    expect(r.screen.passage!.candidates.find((c) => c.suggestionId === top.suggestionId)!.state).toBe('rejected');
    const d = decisions(db).at(-1)!;
    const sug = db.prepare('SELECT passage_id, theme_id, confidence, rank FROM suggestions WHERE id = ?').get(top.suggestionId) as {
      passage_id: string;
      theme_id: string;
      confidence: number;
      rank: number;
    };
    expect(d).toMatchObject({
      coder: 'alex',
      action: 'reject',
      suggestion_id: top.suggestionId,
      passage_id: p.id,
      transcript: T05,
      theme_id: sug.theme_id,
      confidence: sug.confidence,
      rank: sug.rank,
      chosen_theme: null,
      note: 'handover was verbal',
      bulk: 0,
      undoes: null,
    });
    expect(r.screen.progress).toMatchObject({ rejected: 1, decided: 1, accepted: 0 });
  });

  it('re-codes to a theme that is not a candidate, and accepts when the theme is one', () => {
    const { s, db, study } = session(copyStudy());
    const p = passageWith(s, 3);
    const store = sqliteReviewStore(study);
    const other = store.themes().find((t) => !p.candidates.some((c) => c.themeId === t.id))!;
    const r = act(s, { kind: 'recode', theme: other.path });
    expect(r.outcome).toMatchObject({ kind: 'saved', then: 'stay' });
    const d = decisions(db).at(-1)!;
    expect(d).toMatchObject({ action: 'recode', passage_id: p.id, chosen_theme: other.id, theme_id: p.candidates[0]!.themeId });
    expect(r.screen.progress.recoded).toBe(1);
    // A candidate's own theme, chosen by path: an accept of that candidate.
    const open2 = r.screen.passage!.candidates.find((c) => c.state === 'open')!;
    expect(act(s, { kind: 'recode', theme: open2.path }).outcome.kind).toBe('saved');
    expect(decisions(db).at(-1)).toMatchObject({ action: 'accept', suggestion_id: open2.suggestionId, chosen_theme: open2.themeId });
    expect(act(s, { kind: 'recode', theme: 'No such theme at all' }).outcome).toMatchObject({ kind: 'refused', reason: 'no-theme' });
  });

  it('adds a new sub-theme on the spot: a template revision, and the passage coded to it', () => {
    const dir = copyStudy();
    const { s, db, study } = session(dir);
    const p = passageWith(s, 2);
    const parent = sqliteReviewStore(study).themes()[0]!;
    const revBefore = (db.prepare('SELECT MAX(rev) AS r FROM revisions').get() as { r: number }).r;
    const r = act(s, { kind: 'add', parent: parent.path, name: 'Handover by phone' });
    expect(r.outcome.kind).toBe('saved');
    if (r.outcome.kind !== 'saved') return;
    expect(r.outcome.added).toEqual({ rev: revBefore + 1, path: `${parent.path} > Handover by phone` });
    const added = sqliteReviewStore(study).themes().find((t) => t.path === `${parent.path} > Handover by phone`)!;
    expect(added).toBeDefined();
    expect(decisions(db).at(-1)).toMatchObject({ passage_id: p.id, chosen_theme: added.id, coder: 'alex' });
    // The same name again under the same parent is refused and nothing is written.
    const n = decisions(db).length;
    const again = act(s, { kind: 'add', parent: parent.path, name: 'Handover by phone' });
    expect(again.outcome).toMatchObject({ kind: 'refused', reason: 'invalid' });
    expect(decisions(db).length).toBe(n);
    expect(act(s, { kind: 'add', parent: null, name: '   ' }).outcome).toMatchObject({ kind: 'refused', reason: 'no-name' });
  });

  it('defers, and marks nothing to code; both move on', () => {
    const { s, db } = session(copyStudy());
    const first = s.screen().passage!;
    const r = act(s, { kind: 'defer' });
    expect(r.outcome).toMatchObject({ kind: 'saved', then: 'next' });
    expect(decisions(db).at(-1)).toMatchObject({ action: 'defer', passage_id: first.id, suggestion_id: first.candidates[0]!.suggestionId });
    expect(r.screen.progress.deferred).toBe(1);
    const second = r.screen.passage!;
    expect(second.id).not.toBe(first.id);
    const n = act(s, { kind: 'nothing' });
    expect(n.outcome).toMatchObject({ kind: 'saved', then: 'next' });
    expect(decisions(db).at(-1)).toMatchObject({ action: 'nocode', passage_id: second.id, coder: 'alex' });
    expect(n.screen.progress).toMatchObject({ nothingToCode: 1, left: r.screen.progress.left - 1 });
    expect(n.screen.passage?.id).not.toBe(second.id);
  });

  it('undoes the latest decision: on the passage shown it stays; from an earlier passage it goes back there', () => {
    const { s, db } = session(copyStudy());
    const p = passageWith(s, 2);
    const c = p.candidates.find((x) => x.state === 'open')!;
    const a = act(s, { kind: 'accept', candidate: c.suggestionId });
    const accepted = a.outcome.kind === 'saved' ? a.outcome.decision.id : -1;
    const u = act(s, { kind: 'undo' });
    expect(u.outcome).toMatchObject({ kind: 'undone', back: 'same' });
    expect(decisions(db).at(-1)).toMatchObject({ action: 'undo', undoes: accepted, coder: 'alex' });
    expect(u.screen.passage!.candidates.find((x) => x.suggestionId === c.suggestionId)!.state).toBe('open');
    expect(u.screen.progress).toMatchObject({ accepted: 0, undone: 1 });
    // Decide, move on, undo: back to the earlier passage.
    act(s, { kind: 'accept', candidate: c.suggestionId });
    act(s, { kind: 'next' });
    expect(s.screen().passage?.id).not.toBe(p.id);
    const back = act(s, { kind: 'undo' });
    expect(back.outcome).toMatchObject({ kind: 'undone', back: 'back' });
    expect(back.screen.passage!.id).toBe(p.id);
  });

  it('goes back to the previous passage, showing what was decided there, and on again', () => {
    const { s } = session(copyStudy());
    expect(act(s, { kind: 'previous' }).outcome).toMatchObject({ kind: 'refused', reason: 'no-previous' });
    const a = passageWith(s, 2);
    const c = a.candidates.find((x) => x.state === 'open')!;
    act(s, { kind: 'accept', candidate: c.suggestionId });
    const b = act(s, { kind: 'next' }).screen.passage!;
    expect(b.id).not.toBe(a.id);
    const back = act(s, { kind: 'previous' });
    expect(back.outcome.kind).toBe('moved');
    expect(back.screen.passage!.id).toBe(a.id);
    expect(back.screen.passage!.candidates.find((x) => x.suggestionId === c.suggestionId)!.state).toBe('accepted');
    expect(act(s, { kind: 'next' }).screen.passage!.id).toBe(b.id);
  });

  it('two sessions on one study never decide the same passage twice, and lose nothing', () => {
    const dir = copyStudy();
    const a = session(dir, 'alex');
    const b = session(dir, 'sam');
    const p = a.s.screen().passage!;
    // Each session made its own suggestion run: the same passage, other suggestion ids.
    const pb = b.s.screen().passage!;
    expect(pb.id).toBe(p.id);
    const first = act(a.s, { kind: 'accept', candidate: p.candidates[0]!.suggestionId });
    expect(first.outcome.kind).toBe('saved');
    // B still shows the passage; its accept is refused inside the write transaction.
    const second = act(b.s, { kind: 'accept', candidate: pb.candidates[0]!.suggestionId });
    expect(second.outcome.kind).toBe('conflict');
    expect(second.screen.passage?.id).not.toBe(p.id);
    expect(second.screen.messages.join(' ')).toMatch(/already decided/);
    const onP = decisions(a.db).filter((d) => d.passage_id === p.id);
    expect(onP.map((d) => [d.coder, d.action])).toEqual([['alex', 'accept']]);
    // A refresh shows what the other session decided meanwhile.
    const q = b.s.screen().passage!;
    expect(a.s.act({ kind: 'next' }).screen.passage!.id).toBe(q.id);
    act(a.s, { kind: 'nothing' });
    const r = act(b.s, { kind: 'refresh' });
    expect(r.outcome.kind).toBe('conflict');
    expect(r.screen.passage?.id).not.toBe(q.id);
    // Both sessions' decisions are in the log, once each.
    expect(decisions(a.db).filter((d) => d.passage_id === q.id).map((d) => d.coder)).toEqual(['alex']);
  });
});
