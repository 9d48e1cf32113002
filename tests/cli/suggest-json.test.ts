import { afterEach, describe, expect, it, vi } from 'vitest';
import { printJsonStream } from '../../src/cli/output.js';
import { passageJson, passageJsonText } from '../../src/cli/suggest-json.js';
import type { Snippets } from '../../src/cli/reasons.js';

const snippets: Snippets = {
  get: (id) => (id === 'a#1' ? { transcript: 'a', text: 'He said "hand  over"\n\tthen\\left — café' } : undefined),
};
const path = (id: string) => ({ x: 'Safety > "Near" misses', y: 'Workload' })[id] ?? id;

const passage = (i: number) => ({
  passageId: `t"${i}#${i}`,
  transcript: `t"${i}`,
  unclaimed: i % 2 === 0,
  candidates: [
    {
      suggestionId: 10 * i + 1, rank: 1, themeId: 'x', confidence: 0.123456789, aboveThreshold: true, chosen: true,
      reasons: [
        { kind: 'terms' as const, terms: [{ term: 'café', weight: 1.5 }] },
        { kind: 'exemplar' as const, passageId: 'a#1', similarity: 0.25 },
        { kind: 'exemplar' as const, passageId: 'gone#2', similarity: 0.5 },
        { kind: 'context' as const, weight: 0.75 },
      ],
    },
    { suggestionId: 10 * i + 2, rank: 2, themeId: 'y', confidence: 1e-7, aboveThreshold: false, chosen: false, reasons: [] },
  ],
});

afterEach(() => vi.restoreAllMocks());

/** What `work` writes to stdout, and in how many writes. */
function captureStdout(work: () => void): { out: string; writes: number } {
  let out = '';
  let writes = 0;
  vi.spyOn(process.stdout, 'write').mockImplementation((chunk: string | Uint8Array) => ((out += String(chunk)), writes++, true));
  work();
  vi.restoreAllMocks();
  return { out, writes };
}

describe('suggest --json text', () => {
  it('writes exactly what JSON.stringify writes for the object form, escapes included', () => {
    const text = passageJsonText(path, snippets);
    const json = passageJson(path, snippets);
    for (const i of [0, 1, 2]) expect(text(passage(i))).toBe(JSON.stringify(json(passage(i))));
    expect(JSON.parse(text(passage(1))).candidates[0].confidence).toBe(0.1235);
  });

  it('streams a bulk run in chunks that join into one valid document', () => {
    const items = Array.from({ length: 6000 }, (_, i) => passage(i));
    const head = { run_id: 7, revision: 2, fingerprint: 'abc' };
    const { out, writes } = captureStdout(() => printJsonStream(head, 'passages', items, passageJsonText(path, snippets)));
    expect(writes).toBeGreaterThan(1);
    const doc = JSON.parse(out);
    expect(doc).toEqual({ ...head, passages: items.map(passageJson(path, snippets)) });
    expect(captureStdout(() => printJsonStream({}, 'passages', [], String)).out).toBe('{"passages":[]}\n');
  });
});
