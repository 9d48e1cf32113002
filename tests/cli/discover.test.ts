import Database from 'better-sqlite3';
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { CORPUS, freshStudy, snapshot, trellis } from './run.js';

interface Found {
  run_id: number;
  k: number;
  silhouette: { k: number; score: number }[];
  clusters: { cluster_id: string; size: number; terms: string[]; passage_ids: string[]; transcripts: string[] }[];
  unclaimed: string[];
}

const json = (dir: string, args: string[]) => {
  const r = trellis([...args, '--json'], dir, { TRELLIS_CODER: 'priya' });
  expect(r.status, r.stderr).toBe(0);
  return JSON.parse(r.stdout);
};

/** The whole demo study: twelve transcripts, the first four coded. */
function demoStudy(): string {
  const dir = freshStudy();
  expect(trellis(['template', 'set', join(CORPUS, 'template.txt')], dir).status).toBe(0);
  const files = readdirSync(CORPUS).filter((f) => /^t\d\d-.*\.(txt|md|vtt|docx)$/.test(f)).sort();
  expect(trellis(['add', ...files.map((f) => join(CORPUS, f))], dir).status).toBe(0);
  expect(trellis(['sheet', 'import', join(CORPUS, 'initial-coding.csv'), '--coder', 'priya'], dir).status).toBe(0);
  return dir;
}

const PAPER = /paper|sheet|print|pocket|crib|scrap|shred|confidential|notebook|whiteboard/;

describe('discover, promote, dismiss and triage', () => {
  let dir: string;
  let found: Found;
  beforeAll(() => {
    dir = demoStudy();
    found = json(dir, ['discover']);
  });

  it('clusters the unclaimed pool, with k chosen by silhouette, and the planted paper-workaround theme among the clusters', () => {
    expect(found.silhouette.length).toBeGreaterThan(1);
    const best = found.silhouette.reduce((a, b) => (b.score > a.score ? b : a));
    expect(found.k).toBe(best.k);
    const inClusters = found.clusters.flatMap((c) => c.passage_ids);
    expect(new Set(inClusters).size).toBe(inClusters.length);
    for (const id of inClusters) expect(found.unclaimed).toContain(id);
    // The informal paper workarounds appear only in t06-t12 and are in no theme of the template.
    const paper = found.clusters.filter((c) => c.terms.slice(0, 10).filter((t) => PAPER.test(t)).length >= 2);
    expect(paper.length).toBeGreaterThan(0);
    const later = (id: string) => Number(id.slice(1, 3)) >= 6;
    expect(Math.max(...paper.map((c) => c.passage_ids.filter(later).length / c.size))).toBeGreaterThanOrEqual(0.75);
  });

  it('names each cluster\'s nearest existing theme and how near, most novel cluster first', () => {
    const paths = new Set(readFileSync(join(dir, 'template.txt'), 'utf8').split('\n').filter((l) => l.trim() && !l.trim().startsWith('#')).map((l) => l.trim().replace(/ \[a priori\]$/, '')));
    const clusters = (found as unknown as { clusters: { nearest_theme: string | null; closeness: number; nearest_top_share: number; novelty: number }[] }).clusters;
    expect(clusters.length).toBeGreaterThan(1);
    for (const c of clusters) {
      expect(c.nearest_theme).not.toBeNull();
      // The path's last level is a theme line of the template.
      expect(paths.has(c.nearest_theme!.split(' > ').pop()!)).toBe(true);
      expect(c.closeness).toBeGreaterThan(0);
      expect(c.closeness).toBeLessThan(1);
      expect(c.nearest_top_share).toBeGreaterThan(0);
      expect(c.nearest_top_share).toBeLessThanOrEqual(1);
      // Unclaimed passages: none fits with a chance of at least one half.
      expect(c.novelty).toBeGreaterThanOrEqual(0.5);
    }
    for (let i = 1; i < clusters.length; i++) expect(clusters[i]!.novelty).toBeLessThanOrEqual(clusters[i - 1]!.novelty);
    const none = (found as unknown as { none_fits: Record<string, number>; none_fits_at: number });
    expect(none.none_fits_at).toBe(0.5);
    for (const id of found.unclaimed) expect(none.none_fits[id]).toBeGreaterThanOrEqual(0.5);
    const text = trellis(['discover'], dir, { TRELLIS_CODER: 'priya' });
    expect(text.status).toBe(0);
    expect(text.stdout).toMatch(/close to [^\n]+ \(mean confidence 0\.\d\d; best theme of \d+% of its passages\); novelty 0\.\d\d/);
  });

  it('is deterministic for the same study, and a cluster keeps its id while its members are the same', () => {
    const again: Found & { run_id: number } = json(dir, ['discover']);
    expect(again.run_id).toBeGreaterThan((found as Found & { run_id: number }).run_id);
    expect(again.clusters).toEqual(found.clusters);
    for (const c of again.clusters) expect(c.cluster_id).toMatch(/^c[0-9a-f]{6}$/);
    expect(new Set(again.clusters.map((c) => c.cluster_id)).size).toBe(again.clusters.length);
    // Labelled by its top terms in discover's own output.
    const text = trellis(['discover'], dir).stdout;
    const c = again.clusters[0]!;
    expect(text).toContain(`Cluster ${c.cluster_id} (${c.terms.slice(0, 3).join(' · ')}): ${c.size} passages`);
    found = json(dir, ['discover']); // promote and dismiss act on the latest run's clusters
  });

  it('refuses a cluster id that does not exist, or a promote with no destination, leaving the study unchanged', () => {
    const before = snapshot(dir);
    const env = { TRELLIS_CODER: 'priya' };
    const cases: [string[], RegExp][] = [
      [['promote', 'c000000', '--name', 'X'], /no cluster "c000000" in this study: cluster ids are printed by "trellis discover"/],
      [['promote', '7', '--name', 'X'], /no cluster "7" in this study/],
      [['promote', found.clusters[0]!.cluster_id], /say where the cluster goes: --name NAME .* or --into PATH/],
      [['promote', found.clusters[0]!.cluster_id, '--name', 'X', '--into', 'Workload'], /either --name .* or --into/],
      [['promote', found.clusters[0]!.cluster_id, '--into', 'No such theme'], /no theme "No such theme"/],
      [['dismiss', 'c000000', '--note', 'x'], /no cluster "c000000"/],
      [['discover', '--k', '0'], /--k must be a whole number of at least 1 \(got "0"\)/],
      [['discover', '--k', 'four'], /--k must be a whole number of at least 1/],
      [['discover', '--k', '2.5'], /--k must be a whole number of at least 1/],
      [['discover', '--k', String(found.unclaimed.length + 1)], new RegExp(`--k ${found.unclaimed.length + 1} is out of range: the unclaimed pool holds ${found.unclaimed.length} passages, so k can be 1 to ${found.unclaimed.length}`)],
      [['discover', '--leave-out', 'Workload'], /unknown option '--leave-out'/],
      [['discover', '--kk', '3'], /unknown option '--kk'/],
    ];
    for (const [args, message] of cases) {
      const r = trellis(args, dir, env);
      expect(r.status, args.join(' ')).toBe(1);
      expect(r.stderr).toMatch(message);
    }
    expect(snapshot(dir)).toBe(before);
  });

  it('promotes a cluster: a template revision with seed terms, and its passages as suggestions, not codings', () => {
    const c = found.clusters.find((x) => x.terms.slice(0, 10).some((t) => PAPER.test(t)))!;
    const before = json(dir, ['status']);
    const p = json(dir, ['promote', String(c.cluster_id), '--name', 'Paper workarounds', '--note', 'printed lists and crib sheets']);
    expect(p.suggestions).toBe(c.size);
    const show = json(dir, ['template', 'show']);
    const theme = show.themes.find((t: { name: string }) => t.name === 'Paper workarounds');
    expect(theme.seeds.length).toBeGreaterThan(2);
    expect(theme.definition).toBe(''); // the researcher writes it: "not yet written"
    // The revision records the cluster it came from.
    const revs = json(dir, ['template', 'history']).revisions;
    expect(revs.at(-1).action).toBe(`promote cluster ${c.cluster_id} (${c.terms.slice(0, 3).join(' · ')})`);
    expect(revs.at(-1).reason).toBe('printed lists and crib sheets');
    expect(trellis(['codebook', '--out', 'cb.md'], dir).status).toBe(0);
    const md = readFileSync(join(dir, 'cb.md'), 'utf8');
    const entry = md.slice(md.indexOf('Paper workarounds\n'));
    expect(entry.slice(0, entry.indexOf('\n#'))).toContain('**Definition:** _not yet written_');
    expect(json(dir, ['status']).coded).toBe(before.coded);
    const log = json(dir, ['log']).decisions;
    expect(log.at(-1)).toMatchObject({ action: 'promote', cluster_id: c.cluster_id, note: 'printed lists and crib sheets' });
    // The suggestions can be decided like any other.
    const sugId = (trellis(['decide', '--help'], dir), p.run_id);
    expect(sugId).toBeGreaterThan(0);
    const again = trellis(['promote', String(c.cluster_id), '--name', 'Again'], dir, { TRELLIS_CODER: 'priya' });
    expect(again.status).toBe(1);
    expect(again.stderr).toMatch(/already promoted/);
  });

  it('sends a cluster into an existing theme: its passages become suggestions of that theme, no revision', () => {
    const run: Found = json(dir, ['discover']);
    const c = run.clusters[0]!;
    const revs = json(dir, ['template', 'history']).revisions.length;
    // Triage names the open clusters by id and top terms.
    const label = c.terms.slice(0, 3).join(' · ');
    expect(trellis(['triage'], dir).stdout).toContain(`${c.cluster_id} (${label})`);
    const p = json(dir, ['promote', c.cluster_id, '--into', 'Workload', '--note', 'these are about workload after all']);
    expect(p).toMatchObject({ cluster_id: c.cluster_id, into_existing: true, path: 'Workload', suggestions: c.size });
    expect(json(dir, ['template', 'history']).revisions.length).toBe(revs);
    const db = new Database(join(dir, 'study.db'), { readonly: true });
    const rows = db.prepare('SELECT passage_id, theme_id FROM suggestions WHERE run_id = ? ORDER BY passage_id').all(p.run_id) as { passage_id: string; theme_id: string }[];
    db.close();
    expect(rows.map((r) => r.passage_id)).toEqual([...c.passage_ids].sort());
    expect(new Set(rows.map((r) => r.theme_id))).toEqual(new Set([p.theme_id]));
    expect(json(dir, ['log']).decisions.at(-1)).toMatchObject({ action: 'promote', cluster_id: c.cluster_id, chosen_path: 'Workload' });
    expect(trellis(['log'], dir, { TRELLIS_CODER: 'priya' }).stdout).toContain(`promoted cluster ${c.cluster_id} into Workload`);
  });

  it('dismisses a cluster; the next discover does not bring it back', () => {
    const run: Found = json(dir, ['discover']);
    const c = run.clusters[run.clusters.length - 1]!;
    json(dir, ['dismiss', String(c.cluster_id), '--note', 'role descriptions, not about handover']);
    const next: Found = json(dir, ['discover']);
    const same = next.clusters.filter((x) => x.passage_ids.filter((p) => c.passage_ids.includes(p)).length > c.size / 2);
    expect(same).toHaveLength(0);
    const before = snapshot(dir);
    const r = trellis(['dismiss', '99999', '--note', 'x'], dir, { TRELLIS_CODER: 'priya' });
    expect(r.status).toBe(1);
    expect(snapshot(dir)).toBe(before);
  });

  it('triages the uncoded and the partly coded transcripts, most unclaimed first', () => {
    const t = json(dir, ['triage']).transcripts as { transcript: string; unclaimed_share: number; partly_coded: boolean; coded_passages: number; substantive_passages: number }[];
    // The first batch (t01-t04) is coded but for a few passages: each is ranked by what is left.
    const partly = t.filter((r) => r.partly_coded).map((r) => r.transcript).sort();
    expect(partly).toEqual(['t01-larch-staff-nurse', 't02-kestrel-fy1', 't03-harbour-hca', 't04-orchard-staff-nurse']);
    for (const r of t) expect(r.partly_coded).toBe(r.coded_passages > 0);
    expect(t.find((r) => r.transcript === 't01-larch-staff-nurse')!.substantive_passages).toBeLessThan(t.find((r) => r.transcript === 't01-larch-staff-nurse')!.coded_passages);
    expect(t.length).toBe(12);
    const shares = t.map((r) => r.unclaimed_share);
    expect(shares).toEqual([...shares].sort((a, b) => b - a));
  });
});
