import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { CORPUS, freshStudy, snapshot, trellis, write } from './run.js';

const FILES = ['t01-larch-staff-nurse.txt', 't02-kestrel-fy1.txt', 't03-harbour-hca.md', 't04-orchard-staff-nurse.vtt', 't08-orchard-hca.txt'];

function demoStudy(code = true): string {
  const dir = freshStudy();
  expect(trellis(['template', 'set', join(CORPUS, 'template.txt')], dir).status).toBe(0);
  expect(trellis(['add', ...FILES.map((f) => join(CORPUS, f))], dir).status).toBe(0);
  if (code) expect(trellis(['sheet', 'import', join(CORPUS, 'initial-coding.csv'), '--coder', 'priya'], dir).status).toBe(0);
  return dir;
}

/** The suggestions without the ids of the run that made them. */
function content(stdout: string) {
  const r = JSON.parse(stdout);
  return r.passages.map((p: { candidates: { suggestion_id?: number }[] }) => ({
    ...p,
    candidates: p.candidates.map(({ suggestion_id: _id, ...c }) => c),
  }));
}

describe('trellis suggest', () => {
  let dir: string;
  beforeAll(() => {
    dir = demoStudy();
  });

  it('prints the scripting contract: ranked candidates with ids, paths, confidences, thresholds and reasons', () => {
    const r = trellis(['suggest', '--transcript', 't08-orchard-hca', '--top', '4', '--json'], dir);
    expect(r.status, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.passages.length).toBe(15); // t08's participant passages, none coded
    for (const p of out.passages) {
      expect(p).toEqual(expect.objectContaining({ passage_id: expect.stringMatching(/^t08-orchard-hca#\d+$/), transcript: 't08-orchard-hca', unclaimed: expect.any(Boolean) }));
      expect(p.candidates).toHaveLength(4);
      // Best first: the themes the hierarchy rule chose, then the rest, each by confidence.
      const chosen = p.candidates.filter((c: { chosen: boolean }) => c.chosen);
      expect(p.candidates.slice(0, chosen.length)).toEqual(chosen);
      for (const part of [chosen, p.candidates.slice(chosen.length)]) {
        const conf = part.map((c: { confidence: number }) => c.confidence);
        expect(conf).toEqual([...conf].sort((a, b) => b - a));
      }
      for (const c of chosen) expect(c.above_threshold).toBe(true);
      for (const c of p.candidates) {
        expect(c).toEqual(expect.objectContaining({ suggestion_id: expect.any(Number), theme: expect.any(String), above_threshold: expect.any(Boolean), reasons: expect.any(Array) }));
        expect(c.confidence).toBeGreaterThanOrEqual(0);
        expect(c.confidence).toBeLessThanOrEqual(1);
      }
      expect(p.unclaimed).toBe(!p.candidates.some((c: { above_threshold: boolean }) => c.above_threshold));
    }
    const reasons = out.passages.flatMap((p: { candidates: { reasons: { kind: string; text: string }[] }[] }) => p.candidates[0]!.reasons);
    expect(reasons.some((x: { kind: string }) => x.kind === 'terms')).toBe(true);
    const ex = reasons.find((x: { kind: string }) => x.kind === 'exemplar');
    expect(ex).toEqual(expect.objectContaining({ passage_id: expect.any(String), transcript: expect.any(String), snippet: expect.any(String), text: expect.any(String) }));
  });

  it('gives the same suggestions for the same study (deterministic), with the same model fingerprint', () => {
    const a = trellis(['suggest', '--top', '3', '--json'], dir);
    const b = trellis(['suggest', '--top', '3', '--json'], dir);
    expect(content(a.stdout)).toEqual(content(b.stdout));
    expect(JSON.parse(a.stdout).fingerprint).toBe(JSON.parse(b.stdout).fingerprint);
    expect(JSON.parse(b.stdout).run_id).toBe(JSON.parse(a.stdout).run_id + 1);
  });

  it('marks matched terms in the text and summarises the run for people', () => {
    const r = trellis(['suggest', '--transcript', 't08-orchard-hca'], dir);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/\[[A-Za-z-]+\]/); // matched terms in brackets (no colour when not a terminal)
    expect(r.stdout).toMatch(/15 passages, \d+ with a theme above threshold \(\*\), \d+ unclaimed/);
  });

  it('explains, rather than crashes, when nothing is coded yet', () => {
    const bare = demoStudy(false);
    const before = snapshot(bare);
    const r = trellis(['suggest'], bare);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/no coded passages yet.*sheet import/);
    expect(snapshot(bare)).toBe(before);
  });

  it('profiles a theme: top terms, exemplars, expected precision and recall, warnings', () => {
    const r = trellis(['profile', 'Deterioration and escalation', '--json'], dir);
    expect(r.status, r.stderr).toBe(0);
    const [t] = JSON.parse(r.stdout).themes;
    expect(t.path).toBe('Patient safety > Deterioration and escalation');
    expect(t.exemplars).toBe(10);
    expect(t.top_terms.length).toBeGreaterThan(3);
    expect(t.top_terms.map((x: { term: string }) => x.term)).toEqual(expect.arrayContaining(['score']));
    const all = JSON.parse(trellis(['profile', '--json'], dir).stdout).themes;
    const allergies = all.find((x: { path: string }) => x.path.endsWith('> Allergies'));
    expect(allergies.too_few).toBe(true);
    expect(allergies.expected_precision).toBeNull();
  });
});

describe('trellis suggest after a first batch of three coded transcripts', () => {
  let dir: string;
  let out: { few_examples: { theme: string; coded_passages: number; transcripts: number }[]; passages: { candidates: { theme: string; above_threshold: boolean; chosen: boolean; reasons: { kind: string; text: string }[] }[] }[] };
  let stderr = '';
  beforeAll(() => {
    dir = freshStudy();
    expect(trellis(['template', 'set', join(CORPUS, 'template.txt')], dir).status).toBe(0);
    expect(trellis(['add', ...FILES.map((f) => join(CORPUS, f))], dir).status).toBe(0);
    // The demo's initial coding, cut to t01-t03: most sub-themes then have 1-6 coded passages.
    const rows = readFileSync(join(CORPUS, 'initial-coding.csv'), 'utf8').split('\n');
    const keep = rows.filter((l, i) => i === 0 || /^t0[123]-/.test(l));
    expect(keep.length).toBeGreaterThan(50);
    write(dir, 'batch.csv', keep.join('\n'));
    expect(trellis(['sheet', 'import', 'batch.csv', '--coder', 'priya'], dir).status).toBe(0);
    const r = trellis(['suggest', '--top', '5', '--json'], dir);
    expect(r.status, r.stderr).toBe(0);
    out = JSON.parse(r.stdout);
    stderr = r.stderr;
  });

  it('suggests sub-themes above threshold, not only the top-level themes', () => {
    const above = out.passages.flatMap((p) => p.candidates.filter((c) => c.above_threshold && c.chosen));
    const sub = above.filter((c) => c.theme.split(' > ').length >= 2);
    expect(sub.length).toBeGreaterThan(0);
    // The first candidate is a sub-theme for some passages too.
    expect(out.passages.filter((p) => p.candidates[0]!.theme.includes(' > ')).length).toBeGreaterThan(0);
  });

  it('names the themes whose confidence cannot be trusted yet, on stderr and in the JSON', () => {
    expect(out.few_examples.length).toBeGreaterThan(0);
    // Fewer than 3 coded passages, or all in one of the three transcripts.
    for (const f of out.few_examples) expect(f.coded_passages < 3 || f.transcripts < 2, f.theme).toBe(true);
    expect(stderr).toMatch(/too few coded examples for their confidence to be trusted: /);
    expect(stderr).toContain(out.few_examples[0]!.theme);
  });

  it("profiles the themes' top terms as the study writes them (British spelling kept)", () => {
    const r = trellis(['profile', '--json', '--terms', '30'], dir);
    expect(r.status, r.stderr).toBe(0);
    const terms = (JSON.parse(r.stdout).themes as { top_terms: { term: string; written: string }[] }[]).flatMap((t) => t.top_terms);
    expect(terms.length).toBeGreaterThan(20);
    for (const t of terms) expect(typeof t.written).toBe('string');
    // The analysis spells the lemma "center"; the interviews write "centre".
    const centre = terms.filter((t) => t.term === 'center');
    expect(centre.length).toBeGreaterThan(0);
    for (const t of centre) expect(t.written).toBe('centre');
  });

  it('shows distinctive terms as written and the stretch of the passage they come from, no function words', () => {
    const terms = out.passages.flatMap((p) => p.candidates.flatMap((c) => c.reasons.filter((r) => r.kind === 'terms')));
    expect(terms.length).toBeGreaterThan(0);
    for (const r of terms) {
      expect(r.text).toMatch(/^distinctive terms: .+ in ".+"$/);
      expect(r.text).not.toMatch(/\b(when|why|even|yet|ever|often|once|she|they|two)\b \d/);
    }
  });
});
