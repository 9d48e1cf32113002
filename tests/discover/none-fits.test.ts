import { describe, expect, it } from 'vitest';
import { NONE_FITS_AT, noneFits, unclaimedPool } from '../../src/discover/pool.js';
import type { PoolCandidate } from '../../src/discover/types.js';
import { ThemeSuggester } from '../../src/suggest/suggester.js';
import type { Coding, ModelPassage, ThemeInfo } from '../../src/suggest/types.js';
import { scoreTable } from './scores.js';

// All passages, names and themes here are invented: a hospital-handover study whose template
// names staffing, handover tools and support, but not the car park on night shifts, which
// Amira, Joe and Priya talk about in the transcripts still to code.

const LONG = ['rota', 'short', 'staff', 'shift', 'cover', 'agency', 'nurse', 'ward'];
const passage = (id: string): PoolCandidate => ({ id, transcript: id.split('#')[0]!, speaker: 'Amira', role: 'participant', terms: LONG, words: 16 });
const THEMES = [
  { id: 'work', parentId: null },
  { id: 'staff', parentId: 'work' },
  { id: 'tools', parentId: 'work' },
];

describe('the none-fits probability', () => {
  it('is 1 - the best confidence', () => {
    expect(noneFits([0.2, 0.1])).toBeCloseTo(0.8, 12);
    expect(noneFits([0.5, 0.5, 0])).toBeCloseTo(0.5, 12);
    expect(noneFits([])).toBe(1);
  });

  it('pools a passage only when the chance that no theme applies reaches the cut; a parent claims too', () => {
    const passages = ['a#1', 'a#2', 'a#3'].map(passage);
    const scores = scoreTable(
      THEMES.map((t) => t.id),
      [
        { id: 'a#1', conf: { staff: 0.05, tools: 0.05 } }, // nothing fits: pooled
        { id: 'a#2', conf: { work: 0.9, staff: 0.05, tools: 0.05 } }, // the parent claims it
        { id: 'a#3', conf: { tools: 0.6, staff: 0.1 } },
      ],
    );
    const r = unclaimedPool({ passages, scores, themes: THEMES, codings: [] }, { noneFitsAt: 0.5 });
    expect(r.pool.map((p) => p.id)).toEqual(['a#1']);
    expect(r.pool[0]!.noneFits).toBeCloseTo(0.95, 12);
    expect(r.counts.claimed).toBe(2);
    // A rejected theme no longer counts towards "some theme fits".
    const rej = unclaimedPool({ passages, scores, themes: THEMES, codings: [], rejected: [{ passageId: 'a#3', themeId: 'tools' }] }, { noneFitsAt: 0.5 });
    expect(rej.pool.map((p) => p.id)).toEqual(['a#1', 'a#3']);
    // A lower cut pools only the passages where even less fits.
    expect(unclaimedPool({ passages, scores, themes: THEMES, codings: [] }, { noneFitsAt: 0.96 }).pool).toHaveLength(0);
  });
});

const TALK: Record<string, string[][]> = {
  staff: [
    ['rota', 'short', 'staff', 'shift', 'cover', 'agency', 'nurse', 'gap'],
    ['night', 'shift', 'cover', 'rota', 'gap', 'agency', 'staff', 'sickness'],
    ['ward', 'short', 'staff', 'nurse', 'shift', 'sickness', 'cover', 'bank'],
  ],
  tools: [
    ['handover', 'sheet', 'template', 'form', 'computer', 'record', 'list', 'bed'],
    ['handover', 'form', 'system', 'computer', 'screen', 'template', 'record', 'print'],
    ['sheet', 'record', 'handover', 'list', 'system', 'bed', 'screen', 'update'],
  ],
  support: [
    ['manager', 'listen', 'support', 'team', 'colleague', 'help', 'debrief', 'kind'],
    ['team', 'colleague', 'support', 'debrief', 'manager', 'kind', 'listen', 'thank'],
    ['supervisor', 'listen', 'support', 'help', 'team', 'appreciate', 'colleague', 'manager'],
  ],
};
const PARKING = [
  ['car', 'park', 'space', 'night', 'drive', 'permit', 'dark', 'walk'],
  ['parking', 'permit', 'car', 'space', 'fee', 'drive', 'barrier', 'late'],
  ['car', 'park', 'barrier', 'dark', 'walk', 'security', 'permit', 'fee'],
];
const INFO: ThemeInfo[] = [
  { id: 'work', parentId: null, name: 'Workload', path: 'Workload', apriori: false, definition: '', seeds: [] },
  { id: 'staff', parentId: 'work', name: 'Staffing levels', path: 'Workload > Staffing levels', apriori: false, definition: '', seeds: [] },
  { id: 'tools', parentId: 'work', name: 'Handover tools', path: 'Workload > Handover tools', apriori: false, definition: '', seeds: [] },
  { id: 'support', parentId: null, name: 'Support', path: 'Support', apriori: false, definition: '', seeds: [] },
];

describe('the pool rule on a small invented study where one topic is absent from the template', () => {
  it('pools the absent topic and leaves most passages on the template\'s themes out', () => {
    const passages: ModelPassage[] = [];
    const codings: Coding[] = [];
    const truth = new Map<string, string>();
    for (let t = 1; t <= 8; t++) {
      let ord = 0;
      const add = (terms: string[], theme: string) => {
        const id = `t${t}#${++ord}`;
        passages.push({ id, transcript: `t${t}`, ordinal: ord, role: 'participant', terms });
        truth.set(id, theme);
        if (t <= 4 && theme !== 'parking') codings.push({ passageId: id, themeId: theme === 'work' ? 'staff' : theme });
      };
      for (const theme of ['staff', 'tools', 'support']) for (let k = 0; k < 2; k++) add(TALK[theme]![(t + k) % 3]!, theme);
      // The car park comes up only in the transcripts still to code.
      if (t >= 5) for (let k = 0; k < 2; k++) add(PARKING[(t + k) % 3]!, 'parking');
    }
    const model = new ThemeSuggester().fit(passages, codings, INFO);
    const uncoded = passages.filter((p) => Number(p.transcript.slice(1)) >= 5);
    const scores = model.scores(uncoded.map((p) => p.id));
    const pool = unclaimedPool({
      passages: passages.map((p) => ({ id: p.id, transcript: p.transcript, speaker: 'Joe', role: 'participant', terms: p.terms, words: 20 })),
      scores,
      themes: INFO,
      codings,
    });
    const pooled = new Set(pool.pool.map((p) => p.id));
    const parking = uncoded.filter((p) => truth.get(p.id) === 'parking');
    const known = uncoded.filter((p) => truth.get(p.id) !== 'parking');
    const recall = parking.filter((p) => pooled.has(p.id)).length / parking.length;
    const falseShare = known.filter((p) => pooled.has(p.id)).length / known.length;
    expect(recall).toBeGreaterThanOrEqual(0.75);
    expect(falseShare).toBeLessThanOrEqual(0.25);
    // The parking passages are the least likely to fit any theme.
    for (const p of pool.pool) expect(p.noneFits).toBeGreaterThanOrEqual(NONE_FITS_AT);
  });
});
