// Memos on a theme, a transcript, a passage and the study: added, listed, shown, kept through a
// theme's rename, and refused with a clear message (study unchanged) when the input is wrong.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { CORPUS, freshStudy, snapshot, trellis } from './run.js';

const json = (dir: string, args: string[]) => {
  const r = trellis([...args, '--json'], dir);
  expect(r.status, r.stderr).toBe(0);
  return JSON.parse(r.stdout);
};

describe('trellis memo', () => {
  let dir: string;
  beforeAll(() => {
    dir = freshStudy();
    expect(trellis(['template', 'set', join(CORPUS, 'template.txt')], dir).status).toBe(0);
    expect(trellis(['add', join(CORPUS, 't01-larch-staff-nurse.txt'), join(CORPUS, 't05-ward9-fy2.txt')], dir).status).toBe(0);
  });

  it('adds dated, attributed memos on each kind of target, lists and shows them', () => {
    const theme = json(dir, ['memo', 'add', 'Night staff describe the same gap from the other side.', '--theme', 'Team communication', '--author', 'priya']);
    expect(theme).toMatchObject({ memo_id: 1, author: 'priya', target_kind: 'theme', target_label: 'Team communication', rev: 1 });
    expect(Date.parse(theme.at)).not.toBeNaN();
    const tr = json(dir, ['memo', 'add', 'Interview cut short by a ward emergency.', '--transcript', 't05-ward9-fy2', '--author', 'tom']);
    expect(tr).toMatchObject({ target_kind: 'transcript', target: 't05-ward9-fy2' });
    const pa = json(dir, ['memo', 'add', 'Ask the team: is this about the rota?', '--passage', 't05-ward9-fy2#4']);
    expect(pa).toMatchObject({ target_kind: 'passage', target: 't05-ward9-fy2#4', author: 'tester' }); // $TRELLIS_CODER
    const st = json(dir, ['memo', 'add', 'Second batch starts next week.']);
    expect(st).toMatchObject({ target_kind: 'study', target: null, target_label: 'the study' });

    expect(json(dir, ['memo', 'list']).memos.map((m: { memo_id: number }) => m.memo_id)).toEqual([1, 2, 3, 4]);
    expect(json(dir, ['memo', 'list', '--transcript', 't05-ward9-fy2']).memos.map((m: { memo_id: number }) => m.memo_id)).toEqual([2]);
    expect(json(dir, ['memo', 'list', '--whole-study']).memos.map((m: { memo_id: number }) => m.memo_id)).toEqual([4]);
    expect(json(dir, ['memo', 'show', '3'])).toEqual(pa);
    const text = trellis(['memo', 'show', '1'], dir).stdout;
    expect(text).toMatch(/^memo #1 .* priya {2}on theme Team communication\n\nNight staff describe/);
  });

  it('keeps a theme memo on the theme when it is renamed', () => {
    expect(trellis(['template', 'rename', 'Team communication', 'Communication in the team'], dir).status).toBe(0);
    const m = json(dir, ['memo', 'list', '--theme', 'Communication in the team']).memos;
    expect(m.map((x: { memo_id: number; target_label: string }) => [x.memo_id, x.target_label])).toEqual([[1, 'Communication in the team']]);
  });

  it('lists memos where they belong: the report by target, the codebook under their theme and in its preface', () => {
    expect(trellis(['report', '--out', 'r.html'], dir).status).toBe(0);
    const html = readFileSync(join(dir, 'r.html'), 'utf8');
    const memos = html.slice(html.indexOf('<section id="memos">'), html.indexOf('</section>', html.indexOf('<section id="memos">')));
    expect(memos).toContain('4 memos');
    for (const h of ['On the study', 'On themes', 'On transcripts', 'On passages']) expect(memos).toContain(`<h3>${h}</h3>`);
    expect(memos).toMatch(/Communication in the team · priya · .* · memo #1<\/p><p>Night staff describe the same gap/);
    expect(trellis(['codebook', '--out', 'cb.md'], dir).status).toBe(0);
    const md = readFileSync(join(dir, 'cb.md'), 'utf8');
    expect(md).toMatch(/## Memos on the study\n\n- Second batch starts next week\. _\(tester, /);
    const entry = md.slice(md.indexOf('Communication in the team\n'));
    expect(entry.slice(0, entry.indexOf('\n#'))).toMatch(/- \*\*Memo:\*\* Night staff describe the same gap from the other side\. _\(priya, /);
    // A transcript memo is not a theme's.
    expect(md).not.toContain('ward emergency');
  });

  it('refuses an unknown target, two targets, no text and an unknown memo, leaving the study unchanged', () => {
    const before = snapshot(dir);
    const cases: [string[], RegExp][] = [
      [['memo', 'add', 'x', '--theme', 'Parking'], /no theme "Parking"/],
      [['memo', 'add', 'x', '--transcript', 't99'], /no transcript named "t99"/],
      [['memo', 'add', 'x', '--passage', 't05-ward9-fy2#999'], /no passage "t05-ward9-fy2#999"/],
      [['memo', 'add', 'x', '--theme', 'Workload', '--transcript', 't05-ward9-fy2'], /only one of --theme, --transcript, --passage, --whole-study/],
      [['memo', 'add', '--theme', 'Workload'], /missing required argument 'text'/],
      [['memo', 'add', '   ', '--theme', 'Workload'], /a memo needs its text/],
      [['memo', 'show', '77'], /no memo #77/],
      [['memo', 'list', '--theme', 'Parking'], /no theme "Parking"/],
    ];
    for (const [args, message] of cases) {
      const r = trellis(args, dir);
      expect(r.status, args.join(' ')).toBe(1);
      expect(r.stderr).toMatch(message);
    }
    expect(snapshot(dir)).toBe(before);
  });
});
