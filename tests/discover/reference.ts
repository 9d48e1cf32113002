/** Reads the fixtures that tests/reference/discover/make_discover_fixtures.py wrote. */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const DIR = join(dirname(fileURLToPath(import.meta.url)), '..', 'reference', 'discover');

export interface KMeansRun {
  inertia: number;
  labels: number[];
  silhouette_cosine?: number;
}

export interface KMeansFixture {
  source: string;
  iris: { numbers: number[][]; classes: string[]; kmeans: Record<string, KMeansRun> };
  text: {
    passages: { id: string; topic: string; terms: string[] }[];
    vocabulary: string[];
    kmeans: Record<string, KMeansRun>;
    best_k: number;
  };
}

export function kmeansFixture(): KMeansFixture {
  return JSON.parse(readFileSync(join(DIR, 'kmeans.json'), 'utf8')) as KMeansFixture;
}
