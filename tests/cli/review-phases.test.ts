// `trellis review` on a study with a stored model state: the first screen comes after the first
// transcript is scored and says the others are still being scored; keys pressed meanwhile are
// taken afterwards, in order, on the whole queue.
import { describe, expect, it } from 'vitest';
import { ReviewTerminal } from './review-pty.js';
import { codedDemoStudy, trellis } from './run.js';

const STATUS = /queue (\d+) \/ (\d+)( so far)? · (\d+) left( · other transcripts still being scored)?/;

describe('review in two phases', () => {
  it('shows the first transcript while the others are scored, then the whole queue, and takes the keys pressed meanwhile in order', async () => {
    const dir = codedDemoStudy();
    // An earlier suggest stores the model state that review then scores from.
    const run = trellis(['suggest', '--json', '--top', '5'], dir);
    expect(run.status, run.stderr).toBe(0);

    const t = new ReviewTerminal(['--study', dir, '--coder', 'ana'], dir);
    const first = await t.waitFor(STATUS);
    await t.waitFor(/q quit/);
    expect(first[3]).toBe(' so far');
    expect(first[5]).toBeDefined();
    const partial = Number(first[2]);
    const p1 = /^(t\d\d-[\w-]+#\d+) {2}·/m.exec(t.screen)![1]!;
    // Accept the top candidate and move on, at once: the keys wait for the rest of the queue.
    t.send('1\r');

    const whole = await t.waitFor(STATUS);
    expect(whole[3]).toBeUndefined();
    expect(whole[5]).toBeUndefined();
    const total = Number(whole[2]);
    expect(total).toBeGreaterThan(partial);
    // After Enter: the second passage of the whole queue, with the first one decided.
    const after = await t.waitFor(new RegExp(`queue 2 / ${total} · ${total - 1} left · accepted 1 of 1 decided`));
    expect(after).toBeDefined();
    expect(await t.quit()).toBe(0);

    const log = JSON.parse(trellis(['log', '--json'], dir).stdout).decisions as { action: string; passage_id: string; coder: string }[];
    expect(log.map((d) => [d.action, d.passage_id, d.coder])).toEqual([['accept', p1, 'ana']]);
  }, 60_000);
});
