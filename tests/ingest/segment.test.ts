import { describe, expect, it } from 'vitest';
import { segment } from '../../src/ingest/segment.js';
import type { Transcript } from '../../src/ingest/types.js';
import { analyse } from '../../src/text/nlp.js';

const roleOf = (s: string | null) => (s === 'Interviewer' ? 'interviewer' : 'participant') as const;

function transcript(turns: { speaker: string | null; text: string; codes?: { paths: string[]; at: number }[] }[]): Transcript {
  let offset = 0;
  return {
    name: 'demo',
    format: 'txt',
    source: turns.map((t) => t.text).join('\n\n'),
    labelled: true,
    warnings: [],
    turns: turns.map((t) => {
      const turn = { speaker: t.speaker, text: t.text, start: null, end: null, offset, length: t.text.length, codes: t.codes ?? [] };
      offset += t.text.length + 2;
      return turn;
    }),
  };
}

describe('segment', () => {
  it('keeps a short turn whole and gives passages ids from the transcript name and position', () => {
    const t = transcript([
      { speaker: 'Interviewer', text: 'How was the night?' },
      { speaker: 'Ana', text: 'Busy. The tablets froze twice.' },
    ]);
    const ps = segment(t, t.turns.map((u) => analyse(u.text)), { window: 120, roleOf });
    expect(ps.map((p) => [p.id, p.role, p.words])).toEqual([
      ['demo#1', 'interviewer', 4],
      ['demo#2', 'participant', 5],
    ]);
    expect(ps[1]!.analysis.lemmas).toEqual(['busy', 'the', 'tablet', 'freeze', 'twice']);
    expect(t.source.slice(ps[1]!.offset, ps[1]!.offset + ps[1]!.length)).toBe(ps[1]!.text);
  });

  it('splits a long turn into windows of whole sentences, and an inline code goes to the window it stood in', () => {
    const sentences = Array.from({ length: 6 }, (_, i) => `The ${['first', 'second', 'third', 'fourth', 'fifth', 'sixth'][i]} sentence is here.`);
    const text = sentences.join(' ');
    const at = text.indexOf('The fifth');
    const t = transcript([{ speaker: 'Ana', text, codes: [{ paths: ['Workload'], at }] }]);
    const ps = segment(t, [analyse(text)], { window: 10, roleOf });
    // 6 sentences of 5 words, window 10: three windows of two sentences.
    expect(ps.map((p) => p.text)).toEqual([0, 2, 4].map((i) => `${sentences[i]} ${sentences[i + 1]}`));
    expect(ps.map((p) => p.codes)).toEqual([[], [], ['Workload']]);
    for (const p of ps) expect(p.analysis.starts.every((s, k) => p.text.slice(s, p.analysis.ends[k]).length > 0)).toBe(true);
  });
});
