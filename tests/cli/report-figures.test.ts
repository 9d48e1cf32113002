// The report and the codebook count with the same queries as status and stats: every figure they
// print is checked here against status --json and stats --json on the demo study.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { beforeAll, describe, expect, it } from 'vitest';
import { codedDemoStudy, trellis } from './run.js';

const json = (dir: string, args: string[]) => {
  const r = trellis([...args, '--json'], dir);
  expect(r.status, r.stderr).toBe(0);
  return JSON.parse(r.stdout);
};

/** The summary cards: value, label and the small line under it. */
function cards(html: string): Map<string, { v: string; s: string }> {
  const out = new Map<string, { v: string; s: string }>();
  for (const m of html.matchAll(/<div class="stat"><span class="v">([^<]*)<\/span><span class="k">([^<]*)<\/span>(?:<span class="s">([^<]*)<\/span>)?<\/div>/g)) {
    out.set(m[2]!, { v: m[1]!.replace(/,/g, ''), s: (m[3] ?? '').replace(/,(?=\d{3})/g, '') });
  }
  return out;
}

describe('report and codebook figures', () => {
  let dir: string;
  let status: any;
  let stats: any;
  let html: string;
  beforeAll(() => {
    dir = codedDemoStudy();
    const sug = json(dir, ['suggest', '--transcript', 't05-ward9-fy2']);
    const ids = sug.passages.flatMap((p: any) => p.candidates.filter((c: any) => c.above_threshold).map((c: any) => c.suggestion_id));
    expect(ids.length).toBeGreaterThan(2);
    json(dir, ['decide', String(ids[0]), 'accept', '--coder', 'ana']);
    json(dir, ['decide', String(ids[1]), 'reject', '--coder', 'ana']);
    json(dir, ['decide', String(ids[2]), 'accept', '--coder', 'ana']);
    expect(trellis(['report', '--out', 'r.html'], dir).status).toBe(0);
    html = readFileSync(join(dir, 'r.html'), 'utf8');
    status = json(dir, ['status']);
    stats = json(dir, ['stats']);
  }, 240_000);

  it('prints the summary figures of status and stats', () => {
    const c = cards(html);
    const codedTranscripts = status.per_transcript.filter((t: any) => t.coded > 0).length;
    expect(status.coded_transcripts).toBe(codedTranscripts);
    expect(codedTranscripts).toBeLessThan(status.transcripts); // the demo codes only some
    expect(c.get('transcripts')).toEqual({ v: String(status.transcripts), s: `${codedTranscripts} with codings` });
    expect(c.get('passages')).toEqual({ v: String(status.passages.total), s: `${status.passages.participant} from participants` });
    expect(c.get('passages coded')!.v).toBe(String(status.coded));
    expect(stats.coverage.coded).toBe(status.coded);
    expect(c.get('themes')!.v).toBe(String(status.themes));
    expect(c.get('template revision')!.v).toBe(String(status.revision));
    const a = stats.acceptance.overall;
    expect(c.get('suggestions accepted')!.s).toBe(`${a.accepted} of ${a.decided} decided`);
    expect(c.get('passages unclaimed')!.s).toMatch(new RegExp(`^${stats.unclaimed.unclaimed} of ${stats.unclaimed.passages};`));
  });

  it('counts every theme as status does, in the report and the codebook', () => {
    const rows = [...html.matchAll(/<tr class="(?:top|sub)"><td class="nowrap">([^<]+)<\/td><td class="theme"[^>]*>.*?<\/td><td class="num">(\d+)<\/td><td class="num">(\d+)<\/td><\/tr>/g)];
    const byNumber = new Map(rows.map((m) => [m[1]!, [Number(m[2]), Number(m[3])]]));
    expect(byNumber.size).toBe(status.per_theme.length);
    for (const t of status.per_theme) expect(byNumber.get(t.number), t.path).toEqual([t.direct, t.total]);

    expect(trellis(['codebook', '--format', 'csv', '--out', 'cb.csv'], dir).status).toBe(0);
    const records = parse(readFileSync(join(dir, 'cb.csv'), 'utf8'), { relax_column_count: true, bom: true }) as string[][];
    const head = records.findIndex((r) => r[0] === 'number');
    const cols = records[head]!;
    const direct = cols.indexOf('passages_direct');
    const total = cols.indexOf('passages_total');
    const byRow = new Map(records.slice(head + 1).map((r) => [r[0]!, [Number(r[direct]), Number(r[total])]]));
    for (const t of status.per_theme) expect(byRow.get(t.number), t.path).toEqual([t.direct, t.total]);

    expect(trellis(['codebook', '--out', 'cb.md'], dir).status).toBe(0);
    const md = readFileSync(join(dir, 'cb.md'), 'utf8');
    expect(md).toContain(`codings in ${status.coded_transcripts} of ${status.transcripts} transcripts (${status.coded} participant passages coded)`);
  });
});
