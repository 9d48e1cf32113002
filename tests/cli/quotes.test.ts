import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { codedDemoStudy, snapshot, trellis } from './run.js';

const json = (dir: string, args: string[]) => {
  const r = trellis([...args, '--json'], dir);
  expect(r.status, r.stderr).toBe(0);
  return JSON.parse(r.stdout);
};

interface Shown {
  theme: string;
  quotes: { source: string; id: string; pinned: boolean }[];
}

/** The report's quotes section: each theme's quotes with their source line and passage id. */
function reportQuotes(html: string): Shown[] {
  const section = html.slice(html.indexOf('<section id="quotes">'), html.indexOf('</section>', html.indexOf('<section id="quotes">')));
  return [...section.matchAll(/<div class="theme-quotes"><h3>([^<]*)<.*?<\/div>/g)].map((m) => ({
    theme: m[1]!,
    quotes: [...m[0].matchAll(/<footer>([^<]*) <span class="id">([^<]*)<\/span>( <span class="tag">pinned<\/span>)?<\/footer>/g)].map((q) => ({
      source: q[1]!,
      id: q[2]!,
      pinned: !!q[3],
    })),
  }));
}

describe('quotes in the report and codebook', () => {
  let dir: string;
  beforeAll(() => {
    dir = codedDemoStudy();
  }, 240_000);

  it('shows no passage twice, at most one quote per participant per theme, and says how they were chosen', () => {
    expect(trellis(['report', '--out', 'r.html'], dir).status).toBe(0);
    const html = readFileSync(join(dir, 'r.html'), 'utf8');
    const shown = reportQuotes(html);
    expect(shown.length).toBeGreaterThan(5);
    const ids = shown.flatMap((t) => t.quotes.map((q) => q.id));
    expect(new Set(ids).size).toBe(ids.length);
    for (const t of shown) {
      // transcript · speaker · time: the participant is the transcript and speaker.
      const who = t.quotes.map((q) => q.source.split(' · ').slice(0, 2).join(' · '));
      expect(new Set(who).size, t.theme).toBe(who.length);
    }
    expect(html).toMatch(/at most one per participant per theme/);
    expect(html).toMatch(/no passage appears twice/);
    expect(html).toMatch(/No quote was pinned or dropped by a researcher/);
  });

  it('honours pins and drops in the report, the codebook and quote list', () => {
    const list = json(dir, ['quote', 'list']);
    const theme = list.themes.find((t: any) => t.quotes.length >= 2);
    const first = theme.quotes[0].passage_id;
    // A passage coded to the theme but not shown: pin it. Found through the codings export.
    const codings = readCodings(dir).filter((c) => c.theme === theme.theme || c.theme.startsWith(`${theme.theme} > `));
    const hidden = codings.map((c) => c.passage_id).find((p) => !list.themes.some((t: any) => t.quotes.some((q: any) => q.passage_id === p)))!;
    expect(codings.map((c) => c.passage_id)).toContain(hidden); // coded to the theme, yet not among its quotes
    json(dir, ['quote', 'pin', hidden, '--theme', theme.theme]);
    json(dir, ['quote', 'drop', first, '--theme', theme.theme]);
    const after = json(dir, ['quote', 'list', '--theme', theme.theme]).themes[0];
    expect(after.quotes[0]).toMatchObject({ passage_id: hidden, pinned: true });
    expect(after.quotes.map((q: any) => q.passage_id)).not.toContain(first);
    expect(after.dropped).toEqual([first]);
    expect(json(dir, ['quote', 'list', '--theme', theme.theme]).choices).toMatchObject([
      { passage_id: hidden, choice: 'pin', coder: 'tester' },
      { passage_id: first, choice: 'drop', coder: 'tester' },
    ]);

    expect(trellis(['report', '--out', 'r2.html'], dir).status).toBe(0);
    const shown = reportQuotes(readFileSync(join(dir, 'r2.html'), 'utf8')).find((t) => t.theme.endsWith(theme.theme.split(' > ').pop()!))!;
    expect(shown.quotes[0]).toMatchObject({ id: hidden, pinned: true });
    expect(shown.quotes.map((q) => q.id)).not.toContain(first);
    expect(trellis(['codebook', '--out', 'cb.md', '--no-pseudonymise'], dir).status).toBe(0);
    const md = readFileSync(join(dir, 'cb.md'), 'utf8');
    expect(md).toMatch(/\(pinned\)/);
    expect(md).toMatch(/Researchers pinned 1 quote and dropped 1 quote/);

    // Cleared, the theme's quotes go back to the automatic choice.
    json(dir, ['quote', 'clear', hidden, '--theme', theme.theme]);
    json(dir, ['quote', 'clear', first, '--theme', theme.theme]);
    expect(json(dir, ['quote', 'list', '--theme', theme.theme]).themes[0].quotes).toEqual(theme.quotes);
  });

  it('refuses unknown passages and themes, uncoded passages and a missing theme, leaving the study unchanged', () => {
    const before = snapshot(dir);
    const cases: [string[], RegExp][] = [
      [['quote', 'pin', 'no-such#1', '--theme', 'Workload'], /no passage "no-such#1"/],
      [['quote', 'pin', 't01-larch-staff-nurse#2', '--theme', 'No such theme'], /no theme "No such theme"/],
      [['quote', 'pin', 't01-larch-staff-nurse#2'], /give --theme/],
      [['quote', 'drop', 't12-larch-hca#2', '--theme', 'Workload'], /not coded to that theme/],
      [['quote', 'clear', 't01-larch-staff-nurse#2', '--theme', 'Workload'], /neither pinned to nor dropped/],
      [['quote', 'pin', '--theme', 'Workload'], /missing required argument/],
    ];
    for (const [args, message] of cases) {
      const r = trellis(args, dir);
      expect(r.status, args.join(' ')).toBe(1);
      expect(r.stderr).toMatch(message);
    }
    expect(snapshot(dir)).toBe(before);
  });
});

function readCodings(dir: string): { passage_id: string; theme: string }[] {
  expect(trellis(['export', 'codings', '--format', 'json', '--out', 'c.json', '--force'], dir).status).toBe(0);
  return JSON.parse(readFileSync(join(dir, 'c.json'), 'utf8')).codings;
}
