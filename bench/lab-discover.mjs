// lab:discover — measures the unclaimed pool and discovery on the Brown Corpus, in process.
//
// Protocol (as bench/lab-suggest.mjs): every sample is a transcript, every paragraph of at least
// 20 words a passage; a seeded 25% of each category's samples is the coded batch. One category is
// left out of the template and left uncoded; the suggester is fitted, the uncoded passages are
// predicted, the pool is formed and discovered. Reported: the share of the left-out category's
// test passages in the pool, the share of all other test passages in it, the F1 of the cluster
// that best matches the left-out category, and a side-by-side with scikit-learn's k-means.
//
//   node bench/lab-discover.mjs                         religion, science_fiction, humor
//   LEAVE_OUT=religion node bench/lab-discover.mjs
//   MODE=repr node bench/lab-discover.mjs               memory/quality of the dense rows on a large pool
//   SEED=2 SKIP_PEER=1 ...
//
// Needs the build (npx tsc -p tsconfig.json). Analysed passages are cached in bench/out/.
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { ThemeSuggester } from '../dist/suggest/index.js';
import { discover, unclaimedPool } from '../dist/discover/index.js';
import { adjustedRandIndex, normalizedMutualInfo } from '../dist/measure/partitions.js';
import { brownCategories, LEAVES } from './brown.mjs';
import { PEER_SCRIPT } from './cli.mjs';
import { labPassages, labSplit, labThemes } from './lab-brown.mjs';

const OUT = join(import.meta.dirname, 'out');
const SEED = Number(process.env.SEED ?? 1);
const PY = '/usr/bin/python3';
const fmt = (v) => (typeof v === 'number' ? v.toFixed(3) : String(v));
const mib = (kb) => (kb / 1024).toFixed(0);

/** scikit-learn's k-means exactly as the peer runs it, but returning the labels (for ARI ours vs theirs). */
const PEER_LABELS = `
import json, sys, time
from sklearn.cluster import KMeans
from sklearn.feature_extraction.text import TfidfVectorizer
rows = [json.loads(l) for l in open(sys.argv[1], encoding="utf-8") if l.strip()]
test = [r for r in rows if r["split"] == "test"]
mode = sys.argv[3] if len(sys.argv) > 3 else "text"
t = time.perf_counter()
if mode == "terms":
    vec = TfidfVectorizer(analyzer=lambda d: d.split(" "), sublinear_tf=True)
else:
    vec = TfidfVectorizer(sublinear_tf=True, stop_words="english")
X = vec.fit_transform([r["text"] for r in test])
seed = int(sys.argv[5]) if len(sys.argv) > 5 else 0
km = KMeans(n_clusters=int(sys.argv[2]), n_init=5, random_state=seed).fit(X)
s = time.perf_counter() - t
out = {"ids": [r["id"] for r in test], "labels": km.labels_.tolist(), "seconds": s, "inertia": float(km.inertia_)}
if len(sys.argv) > 4 and sys.argv[4] == "sil":
    from sklearn.metrics import silhouette_score
    out["silhouette"] = float(silhouette_score(X, km.labels_, metric="cosine", sample_size=min(20000, X.shape[0]), random_state=0))
print(json.dumps(out))
`;

/** The best F1 any k-means cluster of scikit-learn reaches for the left-out category, over k, on the pool and on purer pools. */
const BOUND = `
import json, sys, random
import numpy as np
from sklearn.cluster import KMeans
from sklearn.feature_extraction.text import TfidfVectorizer
rows = [json.loads(l) for l in open(sys.argv[1], encoding="utf-8") if l.strip()]
left = sys.argv[2]
rnd = random.Random(0)
for share in (1.0, 0.3, 0.2, 0.1, 0.0):
    keep = [r for r in rows if r["label"] == left or rnd.random() < share]
    y = np.array([r["label"] == left for r in keep])
    X = TfidfVectorizer(analyzer=lambda d: d.split(" "), sublinear_tf=True).fit_transform([r["text"] for r in keep])
    out = []
    for k in (2, 3, 4, 6, 8, 10, 12, 15, 20, 30):
        if k >= len(keep):
            continue
        lab = KMeans(n_clusters=k, n_init=5, random_state=0).fit(X).labels_
        out.append((k, max(2 * ((lab == c) & y).sum() / ((lab == c).sum() + y.sum()) for c in set(lab))))
    best = max(out, key=lambda t: t[1])
    print(json.dumps({"kept_share_of_others": share, "passages": len(keep), "left_out": int(y.sum()), "best_k": best[0], "best_f1": float(best[1]), "by_k": {str(k): round(float(f), 3) for k, f in out}}))
`;

function peerLabels(file, k, mode = 'text', withSilhouette = false, seed = 0) {
  const args = ['-c', PEER_LABELS, file, String(k), mode, withSilhouette ? 'sil' : '-', String(seed)];
  return JSON.parse(execFileSync(PY, args, { encoding: 'utf8', maxBuffer: 1 << 28 }));
}

function protocol(all, train, leftOut, claimAt) {
  const leaves = LEAVES.filter((l) => l !== leftOut);
  const th = labThemes(leaves);
  const coded = new Set([...train].filter((f) => brownCategories().get(f) !== leftOut));
  const passages = all.map((p) => ({ id: p.id, transcript: p.transcript, ordinal: p.ordinal, role: 'participant', terms: p.terms }));
  const codings = all.filter((p) => coded.has(p.transcript)).map((p) => ({ passageId: p.id, themeId: p.label }));
  const test = all.filter((p) => !coded.has(p.transcript));
  const t0 = performance.now();
  const model = new ThemeSuggester().fit(passages, codings, th);
  const t1 = performance.now();
  const fallback = model.themeReports().filter((r) => r.warnings.some((w) => w.includes('did not reach the target precision'))).map((r) => r.themeId);
  const preds = model.predict(test.map((p) => p.id), { reasons: 0 });
  const t2 = performance.now();
  const thresholds = Object.fromEntries(model.themeReports().map((r) => [r.themeId, r.threshold]));
  const candidates = all.map((p) => ({ id: p.id, transcript: p.transcript, speaker: null, role: 'participant', terms: p.terms, words: p.text.split(/\s+/).length }));
  const pr = unclaimedPool({ passages: candidates, scores: model.scores(test.map((p) => p.id)), themes: th, codings, thresholds });
  const t3 = performance.now();
  const inPool = new Set(pr.pool.map((p) => p.id));
  const excluded = new Map(pr.excluded.map((e) => [e.id, e.reason]));
  const subst = test.filter((p) => excluded.get(p.id) !== 'short' && excluded.get(p.id) !== 'small-talk');
  const lo = subst.filter((p) => p.label === leftOut);
  const others = subst.filter((p) => p.label !== leftOut);
  const loIn = lo.filter((p) => inPool.has(p.id)).length;
  const byCat = {};
  for (const p of others) {
    const e = (byCat[p.label] ??= { n: 0, in: 0 });
    e.n++;
    if (inPool.has(p.id)) e.in++;
  }
  const othIn = others.filter((p) => inPool.has(p.id)).length;
  // Where the left-out passages went: their chosen leaf when claimed.
  const claimedBy = {};
  const predOf = new Map(preds.map((p) => [p.passageId, p]));
  for (const p of lo.filter((p) => !inPool.has(p.id))) {
    const c = predOf.get(p.id).candidates.find((c) => c.aboveThreshold && leaves.includes(c.themeId));
    claimedBy[c?.themeId ?? '?'] = (claimedBy[c?.themeId ?? '?'] ?? 0) + 1;
  }
  // Can the model's confidences tell the left-out category (no theme fits) from the rest? AUC of
  // "left-out scores lower" for the best claiming leaf's confidence, and for confidence / threshold.
  const leafSignals = (p) => {
    const lv = predOf.get(p.id).candidates.filter((c) => leaves.includes(c.themeId));
    return { conf: Math.max(...lv.map((c) => c.confidence)), ratio: Math.max(...lv.map((c) => c.confidence / thresholds[c.themeId])) };
  };
  const auc = (key) => {
    const a = lo.map((p) => leafSignals(p)[key]);
    const b = others.map((p) => leafSignals(p)[key]).sort((x, y) => x - y);
    let s = 0;
    for (const v of a) {
      let lt = 0;
      let hi = b.length;
      while (lt < hi) {
        const m = (lt + hi) >> 1;
        if (b[m] <= v) lt = m + 1;
        else hi = m;
      }
      s += 1 - lt / b.length;
    }
    return s / a.length;
  };
  const aucs = { conf: auc('conf'), ratio: auc('ratio') };
  const labelOfId = new Map(all.map((p) => [p.id, p.label]));
  if (process.env.BOUND) writeFileSync(join(OUT, `discover-pool-${leftOut}-${claimAt}-all.jsonl`), pr.pool.map((e) => JSON.stringify({ id: e.id, text: e.terms.join(' '), split: 'test', label: labelOfId.get(e.id) })).join('\n') + '\n');
  const res = discover(pr.pool, all.map((p) => p.terms), { seed: 0 });
  const t4 = performance.now();
  const labelOf = new Map(all.map((p) => [p.id, p.label]));
  let best = null;
  for (const c of res.clusters) {
    const hit = c.passageIds.filter((id) => labelOf.get(id) === leftOut).length;
    const f1Pool = (2 * hit) / (c.size + loIn); // recall within the pool
    const f1All = (2 * hit) / (c.size + lo.length); // recall over all substantive left-out test passages
    if (!best || f1All > best.f1All) best = { id: c.id, size: c.size, hit, f1Pool, f1All, precision: hit / c.size, terms: c.terms.slice(0, 6).map((t) => t.term) };
  }
  const nearestLeft = {};
  for (const p of pr.pool.filter((p) => labelOf.get(p.id) === leftOut)) nearestLeft[p.nearest?.themeId ?? '-'] = (nearestLeft[p.nearest?.themeId ?? '-'] ?? 0) + 1;
  const out = {
    leftOut,
    claimAt,
    fingerprint: model.fingerprint,
    fallback,
    test: test.length,
    substantiveTest: subst.length,
    leftOutTest: lo.length,
    leftOutInPool: loIn / lo.length,
    othersInPool: othIn / others.length,
    pool: pr.pool.length,
    counts: pr.counts,
    claimedBy,
    nearestLeft,
    byCat,
    aucs,
    k: res.k,
    silhouette: res.silhouette.map((s) => `${s.k}:${s.score.toFixed(4)}`).join(' '),
    best,
    clusters: res.clusters.map((c) => `${c.id} ${c.size} [${c.terms.slice(0, 5).map((t) => t.term).join(' ')}] ${c.passageIds.filter((id) => labelOf.get(id) === leftOut).length}`),
    seconds: { fit: (t1 - t0) / 1000, predict: (t2 - t1) / 1000, pool: (t3 - t2) / 1000, discover: (t4 - t3) / 1000 },
    res,
    labelOf,
    text: new Map(all.map((p) => [p.id, p.text])),
  };
  return out;
}

function report(r) {
  console.log(`\n== left out: ${r.leftOut}  (pool rule: claimAt=${r.claimAt}; suggester fingerprint ${r.fingerprint})`);
  console.log(`  themes below the target precision (threshold fell back to it): ${r.fallback.join(' ') || '-'}`);
  console.log(`  test passages ${r.test} (substantive ${r.substantiveTest}); left-out substantive test passages ${r.leftOutTest}`);
  console.log(`  pool ${r.pool}; exclusions ${JSON.stringify(r.counts)}`);
  console.log(`  left-out in pool ${fmt(r.leftOutInPool)} (target >= 0.6)   others in pool ${fmt(r.othersInPool)} (target <= 0.3)`);
  console.log(`  left-out passages claimed by: ${JSON.stringify(r.claimedBy)}; pooled ones nearest: ${JSON.stringify(r.nearestLeft)}`);
  console.log(`  others in pool by category: ${Object.entries(r.byCat).map(([c, e]) => `${c} ${(e.in / e.n).toFixed(2)}`).join(', ')}`);
  console.log(`  AUC (left-out below others): best leaf confidence ${fmt(r.aucs.conf)}, confidence / threshold ${fmt(r.aucs.ratio)}`);
  console.log(`  k ${r.k}; silhouette ${r.silhouette}`);
  if (r.best) console.log(`  best cluster for ${r.leftOut}: ${r.best.id} size ${r.best.size}, ${r.best.hit} of its passages; precision ${fmt(r.best.precision)}; F1 ${fmt(r.best.f1All)} (recall over all left-out test passages), ${fmt(r.best.f1Pool)} (recall within the pool) (target >= 0.5); terms ${r.best.terms.join(' ')}`);
  for (const c of r.clusters) console.log(`    ${c}`);
  console.log(`  seconds: fit ${r.seconds.fit.toFixed(2)}  predict ${r.seconds.predict.toFixed(2)}  pool ${r.seconds.pool.toFixed(2)}  discover ${r.seconds.discover.toFixed(2)}`);
}

function peer(r) {
  const ids = r.res.clusters.flatMap((c) => c.passageIds);
  const ours = new Map(r.res.clusters.flatMap((c) => c.passageIds.map((id) => [id, c.id])));
  const file = join(OUT, `discover-pool-${r.leftOut}-${r.claimAt}.jsonl`);
  writeFileSync(file, ids.map((id) => JSON.stringify({ id, text: r.text.get(id), split: 'test', label: r.labelOf.get(id) })).join('\n') + '\n');
  const p = JSON.parse(execFileSync(PY, [PEER_SCRIPT, 'cluster', file, String(r.k)], { encoding: 'utf8', maxBuffer: 1 << 26 }));
  const truth = ids.map((id) => r.labelOf.get(id));
  const mine = ids.map((id) => ours.get(id));
  const theirs = peerLabels(file, r.k);
  const tIndex = new Map(theirs.ids.map((id, i) => [id, theirs.labels[i]]));
  const theirsAligned = ids.map((id) => tIndex.get(id));
  // The same k-means on our own TF-IDF terms (not the peer's tokenizer): isolates the clustering.
  writeFileSync(file + '.terms', ids.map((id) => JSON.stringify({ id, text: termsOf.get(id).join(' '), split: 'test', label: r.labelOf.get(id) })).join('\n') + '\n');
  const same = peerLabels(file + '.terms', r.k, 'terms');
  const sIndex = new Map(same.ids.map((id, i) => [id, same.labels[i]]));
  const sameAligned = ids.map((id) => sIndex.get(id));
  console.log(`  vs scikit-learn, k = ${r.k} on the ${ids.length} clustered pool passages:`);
  console.log(`    peer (its own tokenizer, n_init 5): ARI vs category ${fmt(p.ari)}  NMI ${fmt(p.nmi)}  ${p.seconds.toFixed(2)} s`);
  console.log(`    ours:                                ARI vs category ${fmt(adjustedRandIndex(truth, mine))}  NMI ${fmt(normalizedMutualInfo(truth, mine))}  ${r.seconds.discover.toFixed(2)} s (k sweep included)`);
  console.log(`    ARI ours vs peer partition ${fmt(adjustedRandIndex(mine, theirsAligned))}; ours vs scikit-learn on our terms ${fmt(adjustedRandIndex(mine, sameAligned))} (its ARI vs category ${fmt(adjustedRandIndex(truth, sameAligned))}, ${same.seconds.toFixed(2)} s)`);
  // How stable k-means itself is here: scikit-learn against itself with another seed.
  const other = peerLabels(file, r.k, 'text', false, 1);
  const oIndex = new Map(other.ids.map((id, i) => [id, other.labels[i]]));
  console.log(`    baseline: peer vs the peer with random_state 1: ARI ${fmt(adjustedRandIndex(theirsAligned, ids.map((id) => oIndex.get(id))))}`);
  // Ours at the same fixed k (no sweep).
  const pool = ids.map((id) => ({ id, transcript: id.split('#')[0], speaker: null, terms: termsOf.get(id) }));
  const t = performance.now();
  const fixed = discover(pool, [...termsOf.values()], { k: r.k, seed: 0 });
  const fixedS = (performance.now() - t) / 1000;
  const fOf = new Map(fixed.clusters.flatMap((c) => c.passageIds.map((id) => [id, c.id])));
  const fixedLabels = ids.map((id) => fOf.get(id));
  console.log(`    ours at fixed k ${r.k}: ${fixedS.toFixed(2)} s, ARI vs category ${fmt(adjustedRandIndex(truth, fixedLabels))}, silhouette ${fmt(fixed.finalSilhouette)}`);
}

let termsOf = new Map();

// ---------------------------------------------------------------- dense-row representations
/** A large pool: every sample's content lemmas cut into windows of 20 (about 22,000 passages). */
function largePool(all) {
  const bySample = new Map();
  for (const p of all) (bySample.get(p.transcript) ?? bySample.set(p.transcript, { label: p.label, terms: [] }).get(p.transcript)).terms.push(...p.terms);
  const pool = [];
  for (const [file, s] of bySample) for (let i = 0, w = 1; i + 10 <= s.terms.length; i += 20, w++) pool.push({ id: `${file}#w${w}`, transcript: file, speaker: null, terms: s.terms.slice(i, i + 20), label: s.label });
  return pool;
}

async function reprOne(method, dims, k) {
  const all = await labPassages();
  const pool = largePool(all);
  global.gc?.();
  const before = process.memoryUsage();
  const t0 = performance.now();
  const opts = method === 'default' ? { seed: 0 } : { seed: 0, k, representation: method, dims, maxCells: Number.MAX_SAFE_INTEGER };
  const res = discover(pool, pool.map((p) => p.terms), opts);
  const seconds = (performance.now() - t0) / 1000;
  const lab = new Map(res.clusters.flatMap((c) => c.passageIds.map((id) => [id, c.id])));
  const ids = pool.map((p) => p.id).filter((id) => lab.has(id));
  process.stdout.write(
    JSON.stringify({
      method,
      representation: res.representation.method,
      dims: res.representation.dims,
      k: res.k,
      n: pool.length,
      vocabulary: res.representation.vocabulary,
      seconds,
      maxRssMiB: process.resourceUsage().maxRSS / 1024,
      baseRssMiB: before.rss / 2 ** 20,
      silhouette: res.finalSilhouette,
      sweep: res.silhouette,
      ids,
      labels: ids.map((id) => lab.get(id)),
    }),
  );
}

async function repr() {
  const all = await labPassages();
  const pool = largePool(all);
  const truthOf = new Map(pool.map((p) => [p.id, p.label]));
  const K = Number(process.env.K ?? 15);
  console.log(`lab:discover repr — large pool: ${pool.length} windows of 20 content lemmas from the 500 Brown samples (15 categories); k = ${K}`);
  mkdirSync(OUT, { recursive: true });
  const file = join(OUT, 'discover-large.jsonl');
  writeFileSync(file, pool.map((p) => JSON.stringify({ id: p.id, text: p.terms.join(' '), split: 'test', label: p.label })).join('\n') + '\n');
  const sk = peerLabels(file, K, 'terms', true);
  const skOf = new Map(sk.ids.map((id, i) => [id, sk.labels[i]]));
  const skTruth = sk.ids.map((id) => truthOf.get(id));
  console.log(`  scikit-learn KMeans on the full sparse TF-IDF (n_init 5): ARI vs category ${fmt(adjustedRandIndex(skTruth, sk.labels))}  NMI ${fmt(normalizedMutualInfo(skTruth, sk.labels))}  silhouette ${fmt(sk.silhouette)}  ${sk.seconds.toFixed(1)} s`);
  const variants = (process.env.VARIANTS ?? 'vocabulary:256,vocabulary:512,vocabulary:1000,vocabulary:2000,projection:128,projection:256,projection:512,projection:1000,default:0').split(',');
  for (const v of variants) {
    const [method, dims] = v.split(':');
    const child = spawnSync(process.execPath, ['--expose-gc', import.meta.filename], { env: { ...process.env, MODE: 'repr-one', METHOD: method, DIMS: dims, K: String(K) }, encoding: 'utf8', maxBuffer: 1 << 28 });
    if (child.status !== 0) {
      console.log(`  ${v}: failed ${child.stderr.slice(-400)}`);
      continue;
    }
    const r = JSON.parse(child.stdout);
    const truth = r.ids.map((id) => truthOf.get(id));
    const vsSk = adjustedRandIndex(r.labels, r.ids.map((id) => skOf.get(id)));
    const label = method === 'default' ? `default (auto k, ${r.representation} ${r.dims})` : `${method} ${r.dims}`;
    console.log(
      `  ${label.padEnd(34)} k ${String(r.k).padStart(2)}  ARI vs category ${fmt(adjustedRandIndex(truth, r.labels))}  NMI ${fmt(normalizedMutualInfo(truth, r.labels))}  ` +
        `ARI vs scikit-learn full ${fmt(vsSk)}  silhouette ${fmt(r.silhouette)}  ${r.seconds.toFixed(1)} s  peak RSS ${r.maxRssMiB.toFixed(0)} MiB (before discover ${r.baseRssMiB.toFixed(0)} MiB)` +
        (method === 'default' ? `  sweep ${r.sweep.map((s) => `${s.k}:${s.score.toFixed(4)}`).join(' ')}` : ''),
    );
  }
}

// ---------------------------------------------------------------- main
if (process.env.MODE === 'repr-one') {
  await reprOne(process.env.METHOD, Number(process.env.DIMS), Number(process.env.K));
} else if (process.env.MODE === 'repr') {
  await repr();
} else {
  const all = await labPassages();
  termsOf = new Map(all.map((p) => [p.id, p.terms]));
  const train = labSplit(SEED);
  const leftOuts = (process.env.LEAVE_OUT ?? 'religion,science_fiction,humor').split(',');
  // The pool's one rule (none fits, src/discover/pool.ts); the name stays in the output files.
  const claims = ['leaf'];
  console.log(`lab:discover  seed ${SEED}: ${all.length} passages, ${train.size} coded samples before leaving a category out`);
  for (const leftOut of leftOuts) {
    for (const claimAt of claims) {
      const r = protocol(all, train, leftOut, claimAt);
      report(r);
      if (!process.env.SKIP_PEER && claimAt === 'leaf') peer(r);
      if (process.env.BOUND && claimAt === 'leaf') {
        console.log(`  scikit-learn KMeans, best F1 for ${leftOut} over k, on the pool and on purer pools (others kept at random):`);
        const file = join(OUT, `discover-pool-${leftOut}-${claimAt}-all.jsonl`);
        for (const line of execFileSync(PY, ['-c', BOUND, file, leftOut], { encoding: 'utf8', maxBuffer: 1 << 26 }).trim().split('\n')) {
          const b = JSON.parse(line);
          console.log(`    others kept ${b.kept_share_of_others}: ${b.passages} passages (${b.left_out} ${leftOut}); best F1 ${fmt(b.best_f1)} at k ${b.best_k}; by k ${JSON.stringify(b.by_k)}`);
        }
      }
    }
  }
  console.log(`\n  peak memory (max RSS): ${mib(process.resourceUsage().maxRSS)} MiB`);
}
