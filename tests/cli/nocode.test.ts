// "Reviewed, nothing to code": a judged passage leaves the queue and the unclaimed pool, is
// logged like a decision and counted in stats; and the unclaimed share covers the whole study.
import Database from 'better-sqlite3';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { CORPUS, freshStudy, snapshot, trellis, write } from './run.js';

const FILES = ['t01-larch-staff-nurse.txt', 't02-kestrel-fy1.txt', 't03-harbour-hca.md', 't04-orchard-staff-nurse.vtt', 't05-ward9-fy2.txt', 't06-kestrel-night-nurse.md'];

interface Suggested {
  passages: { passage_id: string; transcript: string; unclaimed: boolean; candidates: { suggestion_id: number; theme: string }[] }[];
}

const json = (dir: string, args: string[]) => {
  const r = trellis([...args, '--json'], dir);
  expect(r.status, r.stderr).toBe(0);
  return JSON.parse(r.stdout);
};

describe('trellis nocode', () => {
  let dir: string;
  let t05: Suggested;
  let t06: Suggested;
  beforeAll(() => {
    dir = freshStudy();
    expect(trellis(['template', 'set', join(CORPUS, 'template.txt')], dir).status).toBe(0);
    expect(trellis(['add', ...FILES.map((f) => join(CORPUS, f))], dir).status).toBe(0);
    expect(trellis(['sheet', 'import', join(CORPUS, 'initial-coding.csv'), '--coder', 'priya'], dir).status).toBe(0);
    t05 = json(dir, ['suggest', '--transcript', 't05-ward9-fy2']);
    t06 = json(dir, ['suggest', '--transcript', 't06-kestrel-night-nurse']);
  });

  it('gives the unclaimed share over the whole study, not the latest run', () => {
    const s = json(dir, ['stats']);
    const participant = json(dir, ['status']).passages.participant;
    // Each passage is judged by the latest run that scored it: t05's run, then t06's.
    const expected = [...t05.passages, ...t06.passages].filter((p) => p.unclaimed).length;
    expect(t05.passages.filter((p) => p.unclaimed).length).toBeGreaterThan(0); // else the check proves nothing
    expect(s.unclaimed).toMatchObject({ scope: 'study', passages: participant, unclaimed: expected });
    expect(s.unclaimed.share).toBeCloseTo(expected / participant, 12);
  });

  it('marks passages, logs each as a decision, counts them in stats, and takes them out of suggest and the pool', () => {
    const unclaimed = t05.passages.filter((p) => p.unclaimed).map((p) => p.passage_id);
    const claimed = t05.passages.find((p) => !p.unclaimed)!.passage_id;
    const marked = [unclaimed[0]!, claimed];
    const before = json(dir, ['stats']);
    const out = json(dir, ["nocode", ...marked, '--note', 'arranging the next shift', '--coder', 'ana']);
    expect(out.decisions.map((d: { action: string; passage_id: string; coder: string; note: string }) => [d.action, d.passage_id, d.coder, d.note])).toEqual(
      marked.map((id) => ['nocode', id, 'ana', 'arranging the next shift']),
    );
    const log = json(dir, ['log']).decisions;
    expect(log.filter((d: { action: string }) => d.action === 'nocode')).toHaveLength(2);
    expect(trellis(['log'], dir).stdout).toContain(`reviewed ${marked[0]}, nothing to code`);

    const s = json(dir, ['stats']);
    expect(s.nothing_to_code).toEqual({ decisions: 2, passages: 2 });
    expect(s.coverage.nothing_to_code).toBe(2);
    expect(s.coverage.reviewed).toBe(s.coverage.coded + 2);
    // The unclaimed one leaves the unclaimed count; no decided suggestion changed.
    expect(s.unclaimed.unclaimed).toBe(before.unclaimed.unclaimed - 1);
    expect(s.acceptance.overall).toEqual(before.acceptance.overall);
    expect(trellis(['stats'], dir).stdout).toMatch(/Nothing to code: 2 more passages reviewed/);

    // Not suggested again (so not in a review queue), and not in the unclaimed pool.
    const again: Suggested = json(dir, ['suggest', '--transcript', 't05-ward9-fy2']);
    expect(again.passages.map((p) => p.passage_id)).not.toContain(marked[0]);
    expect(again.passages.map((p) => p.passage_id)).not.toContain(marked[1]);
    const d = json(dir, ['discover']);
    const pooled = [...d.unclaimed, ...d.clusters.flatMap((c: { passage_ids: string[] }) => c.passage_ids)];
    expect(pooled).not.toContain(marked[0]);

    // Undo withdraws the latest mark: that passage is suggested again.
    json(dir, ['undo', '--coder', 'ana']);
    const back: Suggested = json(dir, ['suggest', '--transcript', 't05-ward9-fy2']);
    expect(back.passages.map((p) => p.passage_id)).toContain(marked[1]);
    expect(json(dir, ['stats']).nothing_to_code).toEqual({ decisions: 1, passages: 1 });

    // Agreement with the suggestions: units are the passages ana reviewed (her mark, her accept),
    // and the figure is flagged as partly circular, with her accepted codings counted.
    const top = back.passages.find((p) => p.candidates.length && p.passage_id !== marked[1])!;
    json(dir, ['decide', String(top.candidates[0]!.suggestion_id), 'accept', '--coder', 'ana']);
    const ag = json(dir, ['agree', '--coders', 'ana,trellis']);
    expect(ag.pairable_passages).toBe(2);
    expect(ag.circularity).toMatch(/partly circular/);
    expect(ag.accepted_codings).toEqual([{ coder: 'ana', codings: 1, accepted: 1 }]);
    expect(trellis(['agree', '--coders', 'ana,trellis'], dir).stdout).toMatch(/ana: 1 of 1 coding on these units made by accepting a suggestion/);
  });

  it('refuses an unknown passage, an interviewer turn, a coded passage, a second mark and no passage at all, leaving the study unchanged', () => {
    const db = new Database(join(dir, 'study.db'), { readonly: true });
    const interviewer = (db.prepare("SELECT id FROM passages WHERE role = 'interviewer' LIMIT 1").get() as { id: string }).id;
    const coded = (db.prepare("SELECT passage_id AS id FROM codings WHERE coder = 'priya' AND removed_at IS NULL LIMIT 1").get() as { id: string }).id;
    const marked = (db.prepare("SELECT passage_id AS pid FROM decisions WHERE action = 'nocode' ORDER BY decisions.id LIMIT 1").get() as { pid: string }).pid;
    db.close();
    const open = t06.passages[0]!.passage_id;
    const before = snapshot(dir);
    const cases: [string[], RegExp][] = [
      [[open, 't05-ward9-fy2#9999'], /no passage "t05-ward9-fy2#9999" in this study/],
      [[interviewer], /is an interviewer turn/],
      [[coded, '--coder', 'priya'], new RegExp(`passage ${coded} is coded by priya`)],
      [[marked], new RegExp(`${marked} is already marked nothing to code by ana`)],
      [[], /missing required argument/],
    ];
    for (const [args, message] of cases) {
      const r = trellis(['nocode', ...args, ...(args.includes('--coder') ? [] : ['--coder', 'ana'])], dir);
      expect(r.status, args.join(' ')).toBe(1);
      expect(r.stderr).toMatch(message);
    }
    // The first case named a good passage before the bad one: nothing of it landed.
    expect(snapshot(dir)).toBe(before);
  });

  it('withdraws a mark, logged, when the coder later codes the passage in a sheet', () => {
    const db = new Database(join(dir, 'study.db'), { readonly: true });
    const marked = (db.prepare("SELECT d.passage_id AS pid FROM decisions d WHERE d.action = 'nocode' AND d.coder = 'ana' AND NOT EXISTS (SELECT 1 FROM decisions u WHERE u.undoes = d.id)").get() as { pid: string }).pid;
    db.close();
    write(dir, 'ana.csv', `passage_id,themes\n${marked},Workload\n`);
    const r = trellis(['sheet', 'import', 'ana.csv', '--coder', 'ana'], dir);
    expect(r.status, r.stderr).toBe(0);
    const last = json(dir, ['log']).decisions.at(-1);
    expect(last).toMatchObject({ action: 'undo', passage_id: marked, coder: 'ana', note: 'coded in ana.csv' });
    expect(json(dir, ['stats']).nothing_to_code.passages).toBe(0);
  });
});
