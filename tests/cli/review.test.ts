// `trellis review` driven through a pseudo-terminal: keys in, screen text out, and the study's
// decision log and codings checked afterwards through the scripting commands and SQLite.
import Database from 'better-sqlite3';
import { cpSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { decodeKeys } from '../../src/cli/review-keys.js';
import { matchThemes } from '../../src/cli/review-search.js';
import { unflattenTemplate, walk } from '../../src/template/paths.js';
import type { Template } from '../../src/template/types.js';
import { ReviewQueue } from '../../src/review/queue.js';
import { orderQueue, uncertainty, type ReviewItem } from '../../src/review/order.js';
import { ReviewTerminal, loose } from './review-pty.js';
import { CORPUS, freshStudy, trellis } from './run.js';

const T05 = 't05-ward9-fy2';
const PASSAGE = /(t05-ward9-fy2#\d+) {2}·/;
// Messages may wrap: \s+ where a line could break, and `s` so that . spans a break.
const SAVED = /saved:\s+(.*?)\s+\(decision\s+#(\d+)\)/s;
const UNDONE = /undone:\s+(.*?)\s+\(decision\s+#(\d+)\)/s;

interface LogEntry {
  id: number;
  coder: string;
  action: string;
  passage_id: string | null;
  theme_path: string;
  chosen_path: string;
  undoes: number | null;
  note: string | null;
}

let base: string;

// One study built once (template, five transcripts, the first four coded by priya); each test
// works on its own copy.
beforeAll(() => {
  base = freshStudy();
  const ok = (args: string[]) => {
    const r = trellis(args, base);
    expect(r.status, r.stderr).toBe(0);
  };
  ok(['template', 'set', join(CORPUS, 'template.txt'), '--coder', 'priya']);
  ok(['add', ...['t01-larch-staff-nurse.txt', 't02-kestrel-fy1.txt', 't03-harbour-hca.md', 't04-orchard-staff-nurse.vtt', `${T05}.txt`].map((f) => join(CORPUS, f))]);
  ok(['sheet', 'import', join(CORPUS, 'initial-coding.csv'), '--coder', 'priya']);
});

function copyStudy(): string {
  const dir = mkdtempSync(join(tmpdir(), 'trellis-review-'));
  cpSync(base, dir, { recursive: true });
  return dir;
}

function log(dir: string): LogEntry[] {
  const r = trellis(['log', '--json'], dir);
  expect(r.status, r.stderr).toBe(0);
  return JSON.parse(r.stdout).decisions as LogEntry[];
}

function status(dir: string) {
  const r = trellis(['status', '--json'], dir);
  expect(r.status, r.stderr).toBe(0);
  return JSON.parse(r.stdout) as { coded: number; per_coder: { coder: string; codings: number; passages: number }[] };
}

/** Current codings of one coder, as "passage -> theme path", read from the study file. */
function codingsOf(dir: string, coder: string): { passage: string; theme: string; origin: string }[] {
  const db = new Database(join(dir, 'study.db'), { readonly: true });
  try {
    // Revisions store the tree as a flat list now (older studies nested); read either.
    const stored = JSON.parse((db.prepare('SELECT tree FROM revisions ORDER BY rev DESC LIMIT 1').get() as { tree: string }).tree);
    const tree: Template = 'flat' in stored ? unflattenTemplate(stored.flat) : stored;
    const paths = new Map<string, string>();
    for (const e of walk(tree)) paths.set(e.node.id, e.path);
    return (
      db.prepare('SELECT passage_id, theme_id, origin FROM codings WHERE coder = ? AND removed_at IS NULL ORDER BY id').all(coder) as {
        passage_id: string;
        theme_id: string;
        origin: string;
      }[]
    ).map((c) => ({ passage: c.passage_id, theme: paths.get(c.theme_id) ?? c.theme_id, origin: c.origin }));
  } finally {
    db.close();
  }
}

/** Waits for `pattern`, then for the key line that ends every screen, so the screen is whole. */
async function step(t: ReviewTerminal, pattern: RegExp | string): Promise<RegExpExecArray> {
  const m = await t.waitFor(pattern);
  await t.waitFor(/q quit|Esc cancel|returns to the passage/);
  return m;
}

/** The passage on the screen drawn last. */
function passageOn(t: ReviewTerminal): string {
  const m = PASSAGE.exec(t.screen);
  if (!m) throw new Error(`no passage on the screen:\n${t.screen}`);
  return m[1]!;
}

function review(dir: string, coder: string, extra: string[] = []): ReviewTerminal {
  return new ReviewTerminal(['--study', dir, '--coder', coder, '--transcript', T05, ...extra], dir);
}

/** The candidate theme paths on the screen drawn last, in their numbered order. */
function candidatesOn(screen: string): string[] {
  return [...screen.matchAll(/^ {2}(\d) {2}\d\.\d\d [* ] {2}(.+?)(?: {3}\((?:rejected|accepted).*)?$/gm)].map((m) => m[2]!.trim());
}

describe('trellis review', () => {
  it('refuses without a terminal and points to trellis decide', () => {
    const dir = copyStudy();
    const r = trellis(['review', '--coder', 'ana'], dir);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain('review needs a terminal');
    expect(r.stderr).toContain('trellis decide SUGGESTION_ID accept|reject|defer --coder NAME');
    // Nothing was written: no suggestion run was made.
    const db = new Database(join(dir, 'study.db'), { readonly: true });
    expect((db.prepare('SELECT COUNT(*) AS n FROM suggestion_runs').get() as { n: number }).n).toBe(0);
    db.close();
  });

  it('accepts, rejects, defers, re-codes and undoes through single keys', async () => {
    const dir = copyStudy();
    const before = status(dir);
    const t = review(dir, 'ana');

    await step(t, PASSAGE);
    const p1 = passageOn(t);
    const top1 = candidatesOn(t.screen)[0]!;
    t.send('1');
    const s1 = await step(t, SAVED);
    expect(s1[1]).toBe(`accepted ${top1} for ${p1}`);
    // The passage stays, the accepted candidate marked, so that another theme can be given; Enter moves on.
    expect(t.screen).toContain(`${top1}   (accepted)`);
    expect(passageOn(t)).toBe(p1);
    t.send('\r');
    await step(t, PASSAGE);

    const p2 = passageOn(t);
    expect(p2).not.toBe(p1);
    const second = candidatesOn(t.screen)[1]!;
    // Esc cancels a prompt and writes nothing.
    t.send('x');
    await step(t, 'reject which candidate?');
    t.send('\x1b');
    await step(t, 'Reject cancelled.');
    t.send('x');
    await step(t, 'reject which candidate?');
    t.send('2');
    const s2 = await step(t, SAVED);
    expect(s2[1]).toBe(`rejected ${second} for ${p2}`);
    // The passage stays, with the rejected candidate marked, until Enter.
    expect(t.screen).toContain(`${second}   (rejected: not offered)`);
    expect(t.screen).toContain(p2);
    t.send('\r');
    await step(t, PASSAGE);

    const p3 = passageOn(t);
    expect(p3).not.toBe(p2);
    t.send('n');
    await step(t, 'note: ');
    t.send('ask the team about this one\r');
    await step(t, 'kept with your next decision');
    t.send('d');
    const s3 = await step(t, SAVED);
    expect(s3[1]).toMatch(new RegExp(`^deferred .* for ${p3}$`));

    const p4 = passageOn(t);
    const allergies = 'Patient safety > Information at handover > Medication details > Allergies';
    // A re-code needs a theme that is not a candidate here (else choosing it is an accept).
    expect(candidatesOn(t.screen)).not.toContain(allergies);
    t.send('r');
    await step(t, 'Re-code');
    t.send('allerg');
    await step(t, `1  ${allergies}`);
    t.send('\r');
    const s4 = await step(t, SAVED);
    expect(s4[1]).toMatch(new RegExp(`^re-coded ${p4}: ${allergies} instead of `));
    expect(passageOn(t)).toBe(p4);
    t.send('\r');
    await step(t, PASSAGE);
    expect(passageOn(t)).not.toBe(p4);

    // Undo takes back the re-code and shows its passage again.
    t.send('u');
    const undone = await step(t, UNDONE);
    expect(undone[2]).toBe(s4[2]);
    expect(t.screen).toMatch(loose('back to that passage'));
    expect(passageOn(t)).toBe(p4);
    const top4 = candidatesOn(t.screen)[0]!;
    t.send('1');
    const s5 = await step(t, SAVED);
    expect(s5[1]).toBe(`accepted ${top4} for ${p4}`);
    expect(t.screen).toContain('accepted 2 of 3 decided (67%)');
    // The accept keeps the passage on screen; Enter moves on.
    t.send('\r');
    await step(t, PASSAGE);

    // 0: reviewed, nothing to code. A decision on the passage, not on a suggestion.
    const p6 = passageOn(t);
    t.send('0');
    const s6 = await step(t, SAVED);
    expect(s6[1]).toBe(`reviewed ${p6}, nothing to code`);
    expect(passageOn(t)).not.toBe(p6);
    expect(t.screen).toContain('accepted 2 of 3 decided (67%)');

    expect(await t.quit()).toBe(0);
    // The undone re-code no longer counts; the undo does.
    await t.waitFor('This session: 2 accepted, 0 re-coded, 1 rejected, 1 deferred, 1 nothing to code, 1 undone.');
    await t.waitFor('Suggestions accepted: 2 of 3 decided (67%)');

    const mine = log(dir).filter((d) => d.coder === 'ana');
    expect(mine.map((d) => [d.action, d.passage_id])).toEqual([
      ['accept', p1],
      ['reject', p2],
      ['defer', p3],
      ['recode', p4],
      ['undo', p4],
      ['accept', p4],
      ['nocode', p6],
    ]);
    expect(mine[0]!.chosen_path).toBe(top1);
    expect(mine[1]!.theme_path).toBe(second);
    expect(mine[2]!.note).toBe('ask the team about this one');
    expect(mine[3]!.chosen_path).toBe(allergies);
    expect(mine[4]!.undoes).toBe(mine[3]!.id);
    expect(mine.map((d) => d.id)).toEqual([s1, s2, s3, s4].map((s) => Number(s[2])).concat([mine[4]!.id, Number(s5[2]), Number(s6[2])]));

    // Codings: the two accepts stand; the undone re-code left none behind.
    expect(codingsOf(dir, 'ana')).toEqual([
      { passage: p1, theme: top1, origin: 'accepted' },
      { passage: p4, theme: top4, origin: 'accepted' },
    ]);
    const after = status(dir);
    expect(after.coded).toBe(before.coded + 2);
    expect(after.per_coder.find((c) => c.coder === 'ana')).toEqual({ coder: 'ana', codings: 2, passages: 2 });
  });

  it('scrolls a passage that does not fit a short terminal with the arrow keys', async () => {
    const dir = copyStudy();
    const t = new ReviewTerminal(['--study', dir, '--coder', 'ana', '--transcript', T05, '--no-colour'], dir, {}, { rows: 16, cols: 100 });
    const first = await step(t, /↓\s+(\d+)\s+lines?\s+more/);
    const below = Number(first[1]);
    expect(t.screen).toContain('(start of the passage)');
    t.send('\x1b[B'); // down
    const moved = await step(t, /↑\s+1\s+line\s+above/);
    expect(moved[0]).toMatch(/↑\s+1\s+line\s+above/);
    if (below > 1) expect(t.screen).toMatch(new RegExp(`↓\\s+${below - 1}\\s+lines?\\s+more`));
    t.send('\x1b[A'); // up: back to the start
    await step(t, '(start of the passage)');
    expect(await t.quit()).toBe(0);
  });

  it('gives one passage two accepted themes and adds a third by a re-code, then moves on at Enter', async () => {
    const dir = copyStudy();
    const t = review(dir, 'ana');
    await step(t, PASSAGE);
    const p1 = passageOn(t);
    const [first, second] = candidatesOn(t.screen);
    expect(candidatesOn(t.screen).length).toBeGreaterThanOrEqual(3);
    t.send('1');
    await step(t, SAVED);
    t.send('1');
    await step(t, 'is accepted already');
    t.send('2');
    const s2 = await step(t, SAVED);
    expect(s2[1]).toBe(`accepted ${second} for ${p1}`);
    expect(passageOn(t)).toBe(p1);
    const allergies = 'Patient safety > Information at handover > Medication details > Allergies';
    expect(candidatesOn(t.screen)).not.toContain(allergies);
    t.send('r');
    await step(t, 'Re-code');
    t.send('allerg');
    await step(t, `1  ${allergies}`);
    t.send('\r');
    await step(t, SAVED);
    expect(passageOn(t)).toBe(p1);
    t.send('\r');
    await step(t, PASSAGE);
    expect(passageOn(t)).not.toBe(p1);
    expect(await t.quit()).toBe(0);
    const mine = codingsOf(dir, 'ana').filter((c) => c.passage === p1);
    expect(mine.map((c) => c.theme).sort()).toEqual([first!, second!, allergies].sort());
    expect(status(dir).per_coder.find((c) => c.coder === 'ana')).toEqual({ coder: 'ana', codings: 3, passages: 1 });
  });

  it('creates a new sub-theme on the spot: a template revision, and the passage coded to it', async () => {
    const dir = copyStudy();
    // Without colour this time: the screen must read the same in plain text.
    const t = review(dir, 'ana', ['--no-colour']);
    await step(t, PASSAGE);
    const p1 = passageOn(t);
    t.send('r');
    await step(t, 'Re-code');
    // A name that matches no theme is offered as the new theme's name.
    t.send('Bleeps');
    await step(t, 'no theme matches');
    t.send('+');
    await step(t, 'which theme is its parent?');
    t.send('interrupt');
    await step(t, '1  Workload > Interruptions');
    t.send('\r');
    await step(t, 'Name of the new theme under Workload > Interruptions: Bleeps_');
    t.send(' during handover\r');
    const saved = await step(t, /saved:\s+template\s+revision\s+(\d+)\s+adds\s+(.*?);\s+re-coded\s+(\S+):\s+(.*?)\s+instead\s+of/s);
    const path = 'Workload > Interruptions > Bleeps during handover';
    expect(saved[2]).toBe(path);
    expect(saved[3]).toBe(p1);
    expect(saved[4]).toBe(path);
    // Ctrl-C quits cleanly too.
    t.send('\x03');
    expect(await t.exited).toBe(0);
    await t.waitFor('This session: 0 accepted, 1 re-coded');
    expect(t.raw).not.toMatch(/\x1b\[[0-9;]*m/); // no colour codes at all

    const shown = trellis(['template', 'show', '--json'], dir);
    expect(shown.status, shown.stderr).toBe(0);
    expect(shown.stdout).toContain('Bleeps during handover');
    expect(readFileSync(join(dir, 'template.txt'), 'utf8')).toMatch(/^ {2}Interruptions\n {4}Bleeps during handover$/m);
    const db = new Database(join(dir, 'study.db'), { readonly: true });
    const rev = db.prepare('SELECT rev, action, author FROM revisions ORDER BY rev DESC LIMIT 1').get() as { rev: number; action: string; author: string };
    db.close();
    expect(rev).toEqual({ rev: Number(saved[1]), action: 'add', author: 'ana' });
    const entries = log(dir).filter((d) => d.coder === 'ana');
    expect(entries.map((d) => [d.action, d.passage_id, d.chosen_path])).toEqual([['recode', p1, path]]);
    expect(codingsOf(dir, 'ana')).toEqual([{ passage: p1, theme: path, origin: 're-coded' }]);
  });

  it('keeps every decision confirmed on screen when killed with SIGKILL, and the file stays sound', async () => {
    const dir = copyStudy();
    const t = review(dir, 'ana');
    const confirmed: number[] = [];
    await step(t, PASSAGE);
    for (const keys of ['1', 'd', '1', 'xx', '\r1']) {
      t.send(keys);
      confirmed.push(Number((await step(t, SAVED))[2]));
    }
    // One more key, then the kill at once: that decision may or may not have landed.
    t.send('1');
    await t.crash();
    const entries = log(dir);
    const ids = entries.map((d) => d.id);
    for (const id of confirmed) expect(ids).toContain(id);
    expect(entries.filter((d) => d.coder === 'ana').length).toBeGreaterThanOrEqual(confirmed.length);
    expect(entries.filter((d) => d.coder === 'ana').length).toBeLessThanOrEqual(confirmed.length + 1);
    const db = new Database(join(dir, 'study.db'));
    expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
    db.close();
  });

  it('lets two sessions work on one study at once without losing or duplicating a decision', async () => {
    for (const coders of [['ana', 'ben'], ['ana', 'ana']]) {
      const dir = copyStudy();
      const a = review(dir, coders[0]!);
      const b = review(dir, coders[1]!);
      await Promise.all([step(a, PASSAGE), step(b, PASSAGE)]);
      expect(passageOn(a)).toBe(passageOn(b)); // same queue, same first passage

      const outcome = /(?<!not )saved:\s.*?\(decision\s+#(\d+)\)|not\s+saved:\s+(\S+)\s+was\s+already\s+decided/s;
      const saved: number[] = [];
      let conflicts = 0;
      const press = async (t: ReviewTerminal) => {
        t.send('1');
        const m = await step(t, outcome);
        if (m[1]) {
          saved.push(Number(m[1]));
          // An accept keeps the passage on screen: Enter moves on (a conflict moves on by itself).
          t.send('\r');
          await step(t, PASSAGE);
        } else conflicts++;
      };
      // Both at once on the same passage: exactly one of them decides it.
      await Promise.all([press(a), press(b)]);
      expect(saved.length).toBe(1);
      expect(conflicts).toBe(1);
      // Then in turns, each on whatever its screen shows.
      for (let i = 0; i < 3; i++) {
        await press(a);
        await press(b);
      }
      expect(await a.quit()).toBe(0);
      expect(await b.quit()).toBe(0);
      expect(a.text + b.text).not.toContain('internal error');

      const entries = log(dir).filter((d) => coders.includes(d.coder));
      // Every decision confirmed on a screen is in the log, once; nothing else is.
      expect(entries.map((d) => d.id).sort((x, y) => x - y)).toEqual([...saved].sort((x, y) => x - y));
      // No passage was decided twice.
      const passages = entries.map((d) => d.passage_id);
      expect(new Set(passages).size).toBe(passages.length);
      expect(conflicts).toBeGreaterThanOrEqual(1);
      const coded = [...new Set(coders)].flatMap((c) => codingsOf(dir, c)).map((c) => c.passage);
      expect(new Set(coded).size).toBe(coded.length);
      expect(coded.length).toBe(saved.length); // every decision here is an accept
    }
  });

  it("undoes the coder's latest standing decision after a crash", async () => {
    const dir = copyStudy();
    const t = review(dir, 'ana');
    const ids: number[] = [];
    const passages: string[] = [];
    await step(t, PASSAGE);
    for (let i = 0; i < 2; i++) {
      passages.push(passageOn(t));
      t.send('1');
      ids.push(Number((await step(t, SAVED))[2]));
      t.send('\r');
      await step(t, PASSAGE);
    }
    // Undo the second in the session, then decide its passage again: that is the latest standing.
    t.send('u');
    await step(t, 'back to that passage');
    t.send('1');
    const again = await step(t, SAVED);
    expect(again[1]).toContain(passages[1]!);
    await t.crash();

    // Another coder decides after the crash: the latest entry overall is not ana's.
    const run = JSON.parse(trellis(['suggest', '--transcript', T05, '--json'], dir).stdout);
    const other = run.passages.find((p: { passage_id: string }) => !passages.includes(p.passage_id));
    expect(trellis(['decide', String(other.candidates[0].suggestion_id), 'reject', '--coder', 'ben'], dir).status).toBe(0);

    const t2 = review(dir, 'ana');
    await step(t2, PASSAGE);
    t2.send('u');
    const undone = await step(t2, UNDONE);
    expect(Number(undone[2])).toBe(Number(again[2]));
    expect(t2.screen).toMatch(loose('back to that passage'));
    expect(passageOn(t2)).toBe(passages[1]);
    expect(await t2.quit()).toBe(0);

    // From the command line, the next undo goes past the undone decision and the undo entries.
    const cli = trellis(['undo', '--coder', 'ana', '--json'], dir);
    expect(cli.status, cli.stderr).toBe(0);
    expect(JSON.parse(cli.stdout).undoes).toBe(ids[0]);
    const entries = log(dir);
    const ana = entries.filter((d) => d.coder === 'ana');
    expect(ana.map((d) => d.action)).toEqual(['accept', 'accept', 'undo', 'accept', 'undo', 'undo']);
    expect(ana[2]!.undoes).toBe(ids[1]);
    expect(ana[4]!.undoes).toBe(Number(again[2]));
    expect(codingsOf(dir, 'ana')).toEqual([]);
    expect(entries.find((d) => d.coder === 'ben')!.action).toBe('reject');
  });
});

describe('review queue rules', () => {
  const item = (passageId: string, t: number, ordinal: number, themeId: string, confidence: number, threshold: number): ReviewItem => ({
    passageId,
    transcript: `t${t}`,
    transcriptIndex: t,
    ordinal,
    candidates: [{ suggestionId: 1, themeId, path: themeId, confidence, above: confidence >= threshold, threshold, reasons: [] }],
  });
  // Deliberately out of transcript order.
  const items = [
    item('b#4', 2, 4, 'B', 0.9, 0.6),
    item('a#2', 1, 2, 'C', 0.35, 0.3),
    item('b#1', 2, 1, 'A', 0.5, 0.5),
    item('a#7', 1, 7, 'A', 0.2, 0.7),
  ];
  const ids = (xs: ReviewItem[]) => xs.map((x) => x.passageId);

  it('orders by transcript then position, by default', () => {
    expect(ids(orderQueue(items, 'transcript'))).toEqual(['a#2', 'a#7', 'b#1', 'b#4']);
  });

  it("puts first the passages whose top confidence is nearest its theme's threshold", () => {
    expect(uncertainty(items[2]!)).toBe(0);
    expect(uncertainty(items[1]!)).toBeCloseTo(0.05, 10);
    // distances: b#1 0, a#2 0.05, b#4 0.3, a#7 0.5
    expect(ids(orderQueue(items, 'uncertain'))).toEqual(['b#1', 'a#2', 'b#4', 'a#7']);
  });

  it('groups by the top theme in template order (transcript order within), or sorts by confidence', () => {
    const rank = new Map([['A', 0], ['B', 1], ['C', 2]]);
    expect(ids(orderQueue(items, 'theme', rank))).toEqual(['a#7', 'b#1', 'b#4', 'a#2']);
    expect(ids(orderQueue(items, 'confidence'))).toEqual(['b#4', 'b#1', 'a#2', 'a#7']);
  });

  it('skips handled passages and shows a passage brought back by an undo before going on', () => {
    const q = new ReviewQueue(orderQueue(items, 'transcript'));
    expect(q.next()?.passageId).toBe('a#2');
    q.done.add('a#2');
    q.deferred.add('a#7');
    expect(q.next()?.passageId).toBe('b#1');
    expect(q.remaining).toBe(2);
    // Undo of a#2 while b#1 is on screen: a#2 now, then b#1 again, then on.
    q.revisit(q.item('b#1')!);
    q.revisit(q.item('a#2')!);
    expect([q.next(), q.next(), q.next(), q.next()].map((x) => x?.passageId)).toEqual(['a#2', 'b#1', 'b#4', undefined]);
    expect(q.positionOf('b#4')).toBe(4);
  });

  it('reads keys from raw input: a lone Esc at once, arrows, several keys in one chunk', () => {
    expect(decodeKeys('\x1b')).toEqual([{ name: 'escape' }]);
    expect(decodeKeys('\x1b[A\x1b[B')).toEqual([{ name: 'up' }, { name: 'down' }]);
    expect(decodeKeys('x2\r\x03')).toEqual([{ name: 'char', char: 'x' }, { name: 'char', char: '2' }, { name: 'enter' }, { name: 'ctrl-c' }]);
    expect(decodeKeys('\x7f\r\n')).toEqual([{ name: 'backspace' }, { name: 'enter' }]);
  });

  it('narrows theme paths as letters are typed, best-named first', () => {
    const entries = [
      { id: '1', path: 'Workload', name: 'Workload' },
      { id: '2', path: 'Workload > Staffing levels', name: 'Staffing levels' },
      { id: '3', path: 'Team communication > Night and day staff', name: 'Night and day staff' },
      { id: '4', path: 'Patient safety > Trust in the system', name: 'Trust in the system' },
    ];
    expect(matchThemes(entries, '').map((e) => e.id)).toEqual(['1', '2', '3', '4']);
    expect(matchThemes(entries, 'sta').map((e) => e.id)).toEqual(['2', '3']);
    expect(matchThemes(entries, 'work staff').map((e) => e.id)).toEqual(['2']);
    expect(matchThemes(entries, 'system').map((e) => e.id)).toEqual(['4']);
    expect(matchThemes(entries, 'xyz')).toEqual([]);
  });
});
