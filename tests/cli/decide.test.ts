import Database from 'better-sqlite3';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { CORPUS, freshStudy, snapshot, trellis } from './run.js';

const FILES = ['t01-larch-staff-nurse.txt', 't02-kestrel-fy1.txt', 't03-harbour-hca.md', 't04-orchard-staff-nurse.vtt', 't05-ward9-fy2.txt'];

interface Suggested {
  passages: { passage_id: string; unclaimed: boolean; candidates: { suggestion_id: number; theme: string; confidence: number; above_threshold: boolean }[] }[];
}

function demoStudy(): string {
  const dir = freshStudy();
  expect(trellis(['template', 'set', join(CORPUS, 'template.txt')], dir).status).toBe(0);
  expect(trellis(['add', ...FILES.map((f) => join(CORPUS, f))], dir).status).toBe(0);
  expect(trellis(['sheet', 'import', join(CORPUS, 'initial-coding.csv'), '--coder', 'priya'], dir).status).toBe(0);
  return dir;
}

const json = (dir: string, args: string[]) => {
  const r = trellis([...args, '--json'], dir);
  expect(r.status, r.stderr).toBe(0);
  return JSON.parse(r.stdout);
};

describe('decide, undo and the decision log', () => {
  let dir: string;
  let sug: Suggested;
  beforeAll(() => {
    dir = demoStudy();
    sug = json(dir, ['suggest', '--transcript', 't05-ward9-fy2', '--top', '3']);
  });

  it('records accept, reject, re-code and defer with what was suggested, and codes what was accepted', () => {
    const [a, b, c, d] = sug.passages.map((p) => p.candidates[0]!);
    const acc = json(dir, ['decide', String(a!.suggestion_id), 'accept', '--coder', 'ana']);
    expect(acc).toMatchObject({ action: 'accept', suggestion_id: a!.suggestion_id, coder: 'ana', bulk: 0 });
    expect(acc.confidence).toBeCloseTo(a!.confidence, 3);
    json(dir, ['decide', String(b!.suggestion_id), 'reject', '--note', 'not about this', '--coder', 'ana']);
    const rec = json(dir, ['decide', String(c!.suggestion_id), 'reject', '--theme', 'Team communication > Night and day staff', '--coder', 'ana']);
    expect(rec.action).toBe('recode');
    json(dir, ['decide', String(d!.suggestion_id), 'defer', '--coder', 'ana']);

    const status = json(dir, ['status']);
    expect(status.per_coder).toContainEqual({ coder: 'ana', codings: 2, passages: 2 });
    const log = json(dir, ['log']).decisions;
    expect(log.map((e: { action: string }) => e.action)).toEqual(['accept', 'reject', 'recode', 'defer']);
    expect(log[1].note).toBe('not about this');
    expect(log[2].chosen_path).toBe('Team communication > Night and day staff');
  });

  it('refuses a second decision on the same suggestion, and an unknown id, leaving the study unchanged', () => {
    const a = sug.passages[0]!.candidates[0]!;
    const before = snapshot(dir);
    const again = trellis(['decide', String(a.suggestion_id), 'reject', '--coder', 'ana'], dir);
    expect(again.status).toBe(1);
    expect(again.stderr).toMatch(/already decided/);
    const none = trellis(['decide', '999999', 'accept', '--coder', 'ana'], dir);
    expect(none.status).toBe(1);
    expect(none.stderr).toMatch(/no suggestion #999999/);
    // Without --coder or $TRELLIS_CODER, the study's remembered coder (the first --coder) decides;
    // a study that has none asks for one.
    expect(trellis(['decide', '1', 'accept'], dir, { TRELLIS_CODER: '' }).stderr).toMatch(/suggestion #1 was already decided/);
    expect(trellis(['decide', '1', 'accept'], freshStudy(), { TRELLIS_CODER: '' }).stderr).toMatch(/say who decides: --coder NAME/);
    expect(snapshot(dir)).toBe(before);
  });

  it('undoes with a compensating entry; the log is append-only', () => {
    const u = json(dir, ['undo', '--coder', 'ana']);
    expect(u.action).toBe('undo');
    const log = json(dir, ['log']).decisions;
    expect(u.undoes).toBe(log.find((e: { action: string }) => e.action === 'defer').id);
    const u2 = json(dir, ['undo', '--coder', 'ana']); // next: the re-code, whose coding is withdrawn
    expect(log.find((e: { id: number }) => e.id === u2.undoes).action).toBe('recode');
    expect(json(dir, ['status']).per_coder).toContainEqual({ coder: 'ana', codings: 1, passages: 1 });
    const db = new Database(join(dir, 'study.db'));
    expect(() => db.prepare('DELETE FROM decisions').run()).toThrow(/append-only/);
    expect(() => db.prepare("UPDATE decisions SET action = 'accept'").run()).toThrow(/append-only/);
    db.close();
  });

  it('does not suggest a rejected theme for that passage again', () => {
    const b = sug.passages[1]!;
    const next: Suggested = json(dir, ['suggest', '--transcript', 't05-ward9-fy2', '--top', '5']);
    const p = next.passages.find((x) => x.passage_id === b.passage_id)!;
    expect(p.candidates.map((c) => c.theme)).not.toContain(b.candidates[0]!.theme);
  });

  it('bulk-accepts deliberately, logged as bulk', () => {
    const s: Suggested = json(dir, ['suggest', '--top', '3']);
    const theme = s.passages[0]!.candidates[0]!.theme;
    // The highest confidence of that theme, rounded down: at least one suggestion is accepted.
    const top = Math.max(...s.passages.flatMap((p) => p.candidates.filter((c) => c.theme === theme).map((c) => c.confidence)));
    const min = Math.max(0.01, Math.floor(top * 100) / 100);
    const expected = s.passages.filter((p) => p.candidates.some((c) => c.theme === theme && c.confidence >= min)).length;
    const r = json(dir, ['decide', '--all-above', String(min), '--theme', theme, '--coder', 'bo']);
    expect(r.decisions.length).toBe(expected);
    expect(r.decisions.every((d: { bulk: number; action: string }) => d.bulk === 1 && d.action === 'accept')).toBe(true);
    // Counted apart in stats, and the report does not claim every coding was confirmed one by one.
    const stats = json(dir, ['stats']);
    expect(stats.bulk).toEqual({ decisions: expected, accepted: expected });
    expect(stats.one_by_one.decided).toBe(stats.acceptance.overall.decided - expected);
    expect(trellis(['stats'], dir).stdout).toMatch(new RegExp(`in bulk \\(decide --all-above\\): ${expected} accepted`));
    expect(trellis(['report', '--out', 'bulk.html'], dir).status).toBe(0);
    const html = readFileSync(join(dir, 'bulk.html'), 'utf8');
    expect(html).toContain(`${expected} of the codings shown here were accepted in bulk`);
    expect(html).not.toContain('every coding shown here was made or confirmed by a researcher');
    expect(html).toContain(`Decided one by one: ${stats.one_by_one.accepted} of ${stats.one_by_one.decided} accepted`);
  });
});
