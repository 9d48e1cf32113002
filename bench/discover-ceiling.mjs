// bench:discover-ceiling — the best-cluster F1 that k-means can reach on the bench:discover-brown
// protocol when the unclaimed pool is ideal: a random 60% of the left-out category's test
// passages and 30% of all others (the pool targets; A and B override), for every
// category in turn, clustered by scikit-learn (bench/discover_ceiling.py). It bounds what any
// pool rule can give the F1 target. A benchmark aid, not a test.
import { execFileSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { LEAVES, seededBatch } from './brown.mjs';
import { labPassages } from './lab-brown.mjs';

const SEED = Number(process.env.SEED ?? 1);
const A = process.env.A ?? '0.6';
const B = process.env.B ?? '0.3';
const LEFT_OUT = (process.env.LEFT_OUT ?? LEAVES.join(',')).split(',');
const batch = seededBatch(0.25, SEED); // bench:discover-brown's coded batch
const file = join(import.meta.dirname, 'out', `ceiling-passages-${SEED}.json`);
writeFileSync(file, JSON.stringify((await labPassages()).map((p) => ({ transcript: p.transcript, label: p.label, coded: batch.has(p.transcript), terms: p.terms }))));

console.log(`bench:discover-ceiling  seed ${SEED}; oracle pool: ${A} of the left-out category, ${B} of the rest; scikit-learn KMeans, k = 2..12`);
console.log('left out         pool  left-out  k(silhouette)  F1 there  best k  best F1 (target >= 0.5)');
let reach = 0;
let reachAny = 0;
for (const left of LEFT_OUT) {
  const r = JSON.parse(execFileSync('/usr/bin/python3', [join(import.meta.dirname, 'discover_ceiling.py'), file, String(SEED), A, B, left], { encoding: 'utf8' }));
  reach += r.f1_at_silhouette_k >= 0.5;
  reachAny += r.best_f1 >= 0.5;
  console.log(`${left.padEnd(16)} ${String(r.pool).padStart(5)} ${String(r.left_out_in_pool).padStart(9)} ${String(r.k_silhouette).padStart(14)} ${r.f1_at_silhouette_k.toFixed(3).padStart(9)} ${String(r.best_k).padStart(7)} ${r.best_f1.toFixed(3).padStart(8)}`);
}
console.log(`F1 >= 0.5 at the silhouette's k for ${reach} of ${LEFT_OUT.length} categories; at the best k for ${reachAny}.`);
