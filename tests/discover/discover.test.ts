import { describe, expect, it } from 'vitest';
import { discover } from '../../src/discover/discover.js';
import type { DiscoverItem } from '../../src/discover/types.js';
import { seededRandom } from '../../src/math/random.js';
import { adjustedRandIndex } from '../../src/measure/partitions.js';
import { TfidfVectorizer } from '../../src/text/tfidf.js';
import { cosine, sum } from '../../src/math/sparse.js';
import { kmeansFixture } from './reference.js';

// The invented passages of the reference fixture: three topics of 12 passages each.
const f = kmeansFixture();
const TOPIC = new Map(f.text.passages.map((p) => [p.id, p.topic]));

function items(): DiscoverItem[] {
  return f.text.passages.map((p, i) => ({ id: p.id, transcript: `t${(i % 4) + 1}`, speaker: i % 3 === 0 ? 'Ana' : 'Ben', terms: p.terms }));
}

/** The study: the pool plus some claimed passages on other topics. */
function background(pool: DiscoverItem[]): string[][] {
  const other = Array.from({ length: 20 }, (_, i) => ['handover', 'tablet', 'login', i % 2 ? 'ward' : 'staff', 'screen', 'password']);
  return [...pool.map((p) => p.terms), ...other];
}

function shuffled<T>(xs: T[], seed: number): T[] {
  const r = seededRandom(seed);
  const out = xs.slice();
  for (let i = out.length - 1; i > 0; i--) {
    const j = Math.floor(r() * (i + 1));
    [out[i], out[j]] = [out[j]!, out[i]!];
  }
  return out;
}

const agreesWithTopics = (res: ReturnType<typeof discover>, pool: DiscoverItem[]) => {
  const c = new Map(res.clusters.flatMap((cl) => cl.passageIds.map((id) => [id, cl.id])));
  return adjustedRandIndex(pool.map((p) => c.get(p.id) ?? '-'), pool.map((p) => TOPIC.get(p.id) ?? p.id));
};

describe('discover', () => {
  const pool = items();
  const res = discover(pool, background(pool));

  it('finds the three invented topics, numbered by size then first passage', () => {
    expect(res.k).toBe(3);
    expect(agreesWithTopics(res, pool)).toBe(1);
    // Equal sizes: natural id order of the first passage (canteen#1 < parking#1 < rota#1).
    expect(res.clusters.map((c) => [c.id, c.size, TOPIC.get(c.passageIds[0]!)])).toEqual([
      ['C1', 12, 'canteen'],
      ['C2', 12, 'parking'],
      ['C3', 12, 'rota'],
    ]);
    expect(res.clusters[0]!.passageIds.slice(0, 3)).toEqual(['canteen#1', 'canteen#2', 'canteen#3']);
    expect(res.silhouette.map((s) => s.k)).toEqual([2, 3, 4, 5, 6, 7]); // 2 .. min(12, 36 / 5)
    expect(res.chosenBy).toBe('silhouette');
    expect(res.suppressed).toEqual([]);
    expect(res.unclustered).toEqual([]);
  });

  it("scores terms by weighted log-odds against the rest of the study (Monroe et al. 2008, eqs. 16-17, worked here)", () => {
    const c = res.clusters[0]!; // canteen
    const members = new Set(c.passageIds);
    const study = background(pool);
    const count = (lists: string[][], t: string) => lists.reduce((s, l) => s + l.filter((x) => x === t).length, 0);
    const mine = pool.filter((p) => members.has(p.id)).map((p) => p.terms);
    const nt = mine.reduce((s, l) => s + l.length, 0);
    const total = study.reduce((s, l) => s + l.length, 0);
    const a0 = Math.min(500, 0.1 * total);
    const top = c.terms[0]!;
    const yt = count(mine, top.term);
    const yw = count(study, top.term);
    const aw = (a0 * yw) / total;
    const yr = yw - yt;
    const nr = total - nt;
    const delta = Math.log((yt + aw) / (nt + a0 - yt - aw)) - Math.log((yr + aw) / (nr + a0 - yr - aw));
    const z = delta / Math.sqrt(1 / (yt + aw) + 1 / (yr + aw));
    expect(top.weight).toBeCloseTo(delta, 4);
    expect(top.z).toBeCloseTo(z, 4);
    for (let i = 1; i < c.terms.length; i++) expect(c.terms[i]!.z).toBeLessThanOrEqual(c.terms[i - 1]!.z);
    expect(c.terms.length).toBe(10);
    // The five most distinctive are canteen words; shared words are not distinctive of any cluster.
    const canteen = ['food', 'canteen', 'meal', 'hot', 'closed', 'sandwich', 'coffee', 'queue', 'menu', 'price'];
    expect(c.terms.slice(0, 5).every((t) => canteen.includes(t.term))).toBe(true);
    for (const cl of res.clusters) expect(cl.terms.slice(0, 5).some((t) => ['ward', 'staff', 'time', 'day', 'manager', 'hospital'].includes(t.term))).toBe(false);
  });

  it('gives cohesion, the central passages, transcripts and speakers', () => {
    const vec = new TfidfVectorizer().fit(pool.map((p) => p.terms));
    const v = new Map(pool.map((p) => [p.id, vec.vector(p.terms)]));
    for (const c of res.clusters) {
      const centroid = sum(c.passageIds.map((id) => v.get(id)!));
      const sims = c.passageIds.map((id) => cosine(v.get(id)!, centroid));
      expect(c.cohesion).toBeCloseTo(sims.reduce((a, b) => a + b, 0) / sims.length, 4);
      expect(c.central).toHaveLength(3);
      const best = Math.max(...sims);
      expect(c.central[0]!.similarity).toBeCloseTo(best, 4);
      for (let i = 1; i < 3; i++) expect(c.central[i]!.similarity).toBeLessThanOrEqual(c.central[i - 1]!.similarity);
      expect(c.transcripts.count).toBe(4);
      expect(c.transcripts.names.reduce((s, n) => s + n.passages, 0)).toBe(c.size);
      expect(c.speakers.reduce((s, n) => s + n.passages, 0)).toBe(c.size);
      expect(c.dismissedBefore).toEqual([]);
    }
    expect(res.clusters[0]!.speakers).toEqual([
      { name: 'Ben', passages: 8 },
      { name: 'Ana', passages: 4 },
    ]);
  });

  it('gives the same answer whatever order the pool comes in', () => {
    const again = discover(shuffled(pool, 5), background(pool));
    expect(again).toEqual(res);
  });

  it('takes k, a range, a seeded sweep sample and the projection', () => {
    const two = discover(pool, background(pool), { k: 2 });
    expect([two.k, two.chosenBy, two.clusters.length, two.silhouette]).toEqual([2, 'option', 2, []]);
    const range = discover(pool, background(pool), { kRange: [4, 5] });
    expect(range.silhouette.map((s) => s.k)).toEqual([4, 5]);
    const sampled = discover(pool, background(pool), { sweepSample: 20 });
    expect(sampled.sweep).toEqual({ passages: 20, sampled: true });
    expect(sampled.k).toBe(3);
    expect(agreesWithTopics(sampled, pool)).toBe(1);
    const projected = discover(pool, background(pool), { representation: 'projection', dims: 64 });
    expect(projected.representation).toEqual({ method: 'projection', dims: 64, vocabulary: 36 });
    expect(agreesWithTopics(projected, pool)).toBe(1);
    // The sparse vectors by default: the whole vocabulary, whatever the cell bound of dense rows.
    expect(discover(pool, background(pool), { maxCells: 36 * 10 }).representation).toEqual({ method: 'sparse', dims: 36, vocabulary: 36 });
    const narrow = discover(pool, background(pool), { representation: 'vocabulary', maxCells: 36 * 10 });
    expect(narrow.representation.dims).toBe(10);
  });

  it('puts a small pool in one cluster and handles empty pools and empty passages', () => {
    const small = pool.slice(0, 7);
    const r = discover(small, background(pool));
    expect([r.k, r.chosenBy, r.clusters.length, r.clusters[0]!.size, r.finalSilhouette]).toEqual([1, 'small-pool', 1, 7, null]);
    const none = discover([], []);
    expect([none.k, none.chosenBy, none.clusters, none.unclustered]).toEqual([0, 'none', [], []]);
    const withEmpty = discover([...pool, { id: 'x#1', transcript: 'x', speaker: null, terms: [] }], background(pool));
    expect(withEmpty.unclustered).toEqual(['x#1']);
    expect(withEmpty.clusters.map((c) => c.size)).toEqual([12, 12, 12]);
  });

  it('refuses a pool with a passage twice, and a bad k', () => {
    expect(() => discover([...pool, pool[0]!], [])).toThrow(/twice/);
    expect(() => discover(pool, [], { k: 0 })).toThrow(RangeError);
  });

  it('caps k at the number of distinct passages', () => {
    const same = Array.from({ length: 12 }, (_, i) => ({ id: `s#${i + 1}`, transcript: 's', speaker: null, terms: i < 6 ? ['a', 'b'] : ['c', 'd'] }));
    const r = discover(same, same.map((s) => s.terms));
    expect(r.k).toBe(2);
    expect(r.clusters.map((c) => c.size)).toEqual([6, 6]);
    expect(discover(same, [], { k: 5 }).k).toBe(2);
  });
});
