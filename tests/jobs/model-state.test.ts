// Each suggestion run stores the model state it used, and later commands on the same inputs
// score from it instead of fitting again, with the same results as a new fit.
import { describe, expect, it } from 'vitest';
import { codedDemoStudy } from '../cli/run.js';
import type { DB } from '../../src/study/db.js';
import { openStudy } from '../../src/study/study.js';
import { decide } from '../../src/study/decisions.js';
import { runDiscovery, triageStudy } from '../../src/jobs/discovery.js';
import { KEPT_STATES } from '../../src/study/model-store.js';
import { fitModel, suggest, type SuggestRun } from '../../src/jobs/suggest.js';

const states = (db: DB) => db.prepare('SELECT inputs, fingerprint FROM model_states ORDER BY created_at').all() as { inputs: string; fingerprint: string }[];
const runKey = (db: DB, id: number) => (db.prepare('SELECT model_inputs FROM suggestion_runs WHERE id = ?').get(id) as { model_inputs: string }).model_inputs;
/** What a run suggested, without the ids the run gave its rows. */
const content = (r: SuggestRun) => r.passages.map((p) => ({ ...p, candidates: p.candidates.map(({ suggestionId: _, ...c }) => c) }));

describe('stored model state', () => {
  it('is written by suggest and reused by the next suggest on the same inputs, which suggests the same', () => {
    const db = openStudy(codedDemoStudy()).db;
    expect(states(db)).toHaveLength(0);
    const first = suggest(db, { top: 5 });
    expect(states(db)).toEqual([{ inputs: runKey(db, first.runId), fingerprint: first.fingerprint }]);
    expect(fitModel(db).reused).toBe(true);
    const second = suggest(db, { top: 5 });
    expect(runKey(db, second.runId)).toBe(runKey(db, first.runId));
    expect(second.fingerprint).toBe(first.fingerprint);
    expect(content(second)).toEqual(content(first));
    // Scored and stored in parts, its ids run in the order a whole run gives them.
    const ids = (r: SuggestRun) => r.passages.flatMap((p) => p.candidates.map((c) => c.suggestionId - r.passages[0]!.candidates[0]!.suggestionId));
    expect(ids(second)).toEqual(ids(first));
    // Parts of at most 3 passages (a transcript longer than that is a part of its own): the same.
    const small = suggest(db, { top: 5, partPassages: 3 });
    expect(content(small)).toEqual(content(first));
    expect(ids(small)).toEqual(ids(first));
    expect(states(db)).toHaveLength(1);

    // A decision changes what the model learns from: a new fit, a new state beside the old.
    const c = first.passages.find((p) => p.candidates.length > 1)!.candidates[0]!;
    decide(db, { suggestionId: c.suggestionId, action: 'reject', coder: 'tester' });
    expect(fitModel(db).reused).toBe(false);
    const third = suggest(db, { top: 5 });
    expect(runKey(db, third.runId)).not.toBe(runKey(db, first.runId));
    expect(states(db)).toHaveLength(2);
    db.close();
  });

  it('stores a run scored in parts from the stored state whole or not at all', () => {
    const db = openStudy(codedDemoStudy()).db;
    const first = suggest(db, { top: 5 });
    const count = (table: string) => (db.prepare(`SELECT COUNT(*) AS n FROM ${table}`).get() as { n: number }).n;
    const runs = count('suggestion_runs');
    const rows = count('suggestions');
    // A write that fails once the later parts are being stored (the first part's rows are in).
    const last = Math.max(...first.passages.flatMap((p) => p.candidates.map((c) => c.suggestionId)));
    db.exec(`CREATE TEMP TRIGGER fail_late AFTER INSERT ON suggestions WHEN NEW.id > ${last + 20} BEGIN SELECT RAISE(ABORT, 'disk full'); END`);
    expect(fitModel(db).reused).toBe(true);
    expect(() => suggest(db, { top: 5, partPassages: 3 })).toThrow(/disk full/);
    expect(count('suggestion_runs')).toBe(runs);
    expect(count('suggestions')).toBe(rows);
    db.exec('DROP TRIGGER fail_late');
    db.close();
  });

  it('gives discover and triage the results of a new fit', () => {
    const dir = codedDemoStudy();
    const fresh = openStudy(codedDemoStudy()).db;
    const db = openStudy(dir).db;
    suggest(db, { top: 3 });
    expect(fitModel(db).reused).toBe(true);
    const reused = runDiscovery(db);
    const refitted = runDiscovery(fresh);
    expect(reused.clusters.map((c) => [c.cluster_id, c.passage_ids, c.detail.nearest_theme])).toEqual(refitted.clusters.map((c) => [c.cluster_id, c.passage_ids, c.detail.nearest_theme]));
    expect(reused.pool.pool.map((p) => [p.id, p.noneFits])).toEqual(refitted.pool.pool.map((p) => [p.id, p.noneFits]));
    expect(triageStudy(db).rows).toEqual(triageStudy(fresh).rows);
    db.close();
    fresh.close();
  });

  it('is not written by a command that fails, and only the latest few are kept', () => {
    const db = openStudy(codedDemoStudy()).db;
    expect(() => runDiscovery(db, { k: 100000 })).toThrow(/out of range/);
    expect(states(db)).toHaveLength(0);
    for (let i = 0; i < KEPT_STATES + 1; i++) suggest(db, { targetPrecision: 0.5 + i / 20 });
    const kept = states(db);
    expect(kept).toHaveLength(KEPT_STATES);
    // The oldest (target precision 0.5) went; the newest is there.
    expect(fitModel(db, { targetPrecision: 0.5 }).reused).toBe(false);
    expect(fitModel(db, { targetPrecision: 0.5 + KEPT_STATES / 20 }).reused).toBe(true);
    db.close();
  });
});

describe('stored model state and a replaced transcript', () => {
  it('is dropped when a transcript is replaced, and no reason or cluster quotes the old text any more', async () => {
    const { readTranscriptFile } = await import('../../src/ingest/read.js');
    const { importTranscripts } = await import('../../src/jobs/import.js');
    const { writeFileSync, mkdtempSync } = await import('node:fs');
    const { join } = await import('node:path');
    const { tmpdir } = await import('node:os');
    const db = openStudy(codedDemoStudy()).db;
    suggest(db, { top: 1 });
    const stored = () => (db.prepare('SELECT state FROM model_states').all() as { state: Buffer }[]).length;
    expect(stored()).toBe(1);
    const name = (db.prepare('SELECT name FROM transcripts ORDER BY id DESC LIMIT 1').get() as { name: string }).name;
    const file = join(mkdtempSync(join(tmpdir(), 'trellis-replace-')), `${name}.txt`);
    writeFileSync(file, 'Interviewer: How was the handover?\n\nNurse: Quiet, for once; the board was up to date.\n');
    const old = (db.prepare('SELECT p.id, p.text FROM passages p JOIN transcripts t ON t.id = p.transcript_id WHERE t.name = ?').all(name) as { id: string; text: string }[]);
    runDiscovery(db);
    // The old text is quoted before: a cluster shows a central passage whole.
    const quoted = () => {
      const rows = [
        ...(db.prepare('SELECT reasons AS t FROM suggestions').all() as { t: string }[]),
        ...(db.prepare('SELECT detail AS t FROM clusters').all() as { t: string }[]),
      ].map((r) => r.t);
      return old.filter((p) => rows.some((r) => r.includes(JSON.stringify(p.text).slice(1, -1)))).length;
    };
    expect(quoted()).toBeGreaterThan(0);
    await importTranscripts(db, [{ file, ...(await readTranscriptFile(file)) }], { coder: 'tester', replace: true });
    expect(stored()).toBe(0);
    expect(quoted()).toBe(0);
    db.close();
  });
});
