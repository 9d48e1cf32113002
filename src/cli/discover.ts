import type { Command } from 'commander';
import { UserError } from '../errors.js';
import { promoteCluster, runDiscovery, triageStudy } from '../jobs/discovery.js';
import { dismissCluster } from '../study/clusters.js';
import { passageCount } from '../study/passages.js';
import { currentTemplate, themePaths } from '../study/template.js';
import { requireTranscripts } from '../study/transcripts.js';
import { walk } from '../template/paths.js';
import { coderName, coderOf, collect, positiveInt, studyCommand, withStudy, type StudyOpts } from './common.js';
import { discoverJson, promoteJson, triageJson } from './discover-json.js';
import { wrap } from './marks.js';
import { plural, printJson, say, table } from './output.js';
import { withStepBar } from './progress.js';

const pct = (x: number) => `${Math.round(100 * x)}%`;
const clip = (s: string, n: number) => {
  const flat = s.replace(/\s+/g, ' ').trim();
  return flat.length > n ? flat.slice(0, n - 1) + '…' : flat;
};

export function registerDiscover(program: Command): void {
  studyCommand(program, 'discover', 'cluster the passages no theme claims into possible new themes')
    .option('--k <k>', 'the number of clusters (default: chosen by mean silhouette)', positiveInt('--k'))
    .addHelpText(
      'after',
      `
The unclaimed pool: participant passages with substance (at least 7 topic words, not small
talk) that nobody has coded and where the calibrated chance that no theme of the template
applies (any theme, parents included) is high. trellis clusters them with
k-means (k-means++ start, several seeded restarts) on TF-IDF vectors, choosing k by the mean
silhouette, and describes each cluster by its distinctive terms (log-odds against the rest of
the study) and the passages nearest its centre, with the existing theme it comes closest to;
the most novel clusters come first. A cluster is a hint, not a theme: read its
passages, then promote it into the template or dismiss it. See docs/discovery.md.

Examples:
  trellis discover
  trellis discover --k 4 --json`,
    )
    .action(async (opts: StudyOpts & { k?: number }) => {
      await withStudy(opts, ({ db }) => {
        // Shares of a 4,000-answer survey's discover with a stored model: scoring 0.45, clustering 0.5.
        const run = withStepBar('discovering', { fit: [0, 0.45], score: [0.45, 0.5], cluster: [0.5, 1] }, !opts.json && passageCount(db) >= 2000, (step) => runDiscovery(db, { k: opts.k }, step));
        const pool = run.pool.pool;
        if (opts.json) return printJson(discoverJson(run));
        const names = themePaths(db);
        const counts = run.pool.counts;
        say(`Unclaimed pool: ${plural(pool.length, 'passage')} (left out: ${counts.coded} coded, ${counts['nothing-to-code']} nothing to code, ${counts.claimed} claimed by a theme, ${counts.short} short, ${counts['small-talk']} small talk, ${counts.interviewer} interviewer).`);
        const almost = new Map<string, number>();
        for (const p of pool) if (p.nearest) almost.set(p.nearest.themeId, (almost.get(p.nearest.themeId) ?? 0) + 1);
        if (almost.size) say(`Nearest themes of the unclaimed: ${[...almost].sort((a, b) => b[1] - a[1]).slice(0, 4).map(([t, n]) => `almost ${names.get(t) ?? t} (${n})`).join('; ')}`);
        if (run.result.silhouette.length) say(`Mean silhouette by k: ${run.result.silhouette.map((s) => `k=${s.k} ${s.score.toFixed(3)}`).join(', ')}; k = ${run.result.k} (${run.result.chosenBy}).`);
        for (const c of run.clusters) {
          say('');
          say(`Cluster ${c.cluster_id} (${c.label}): ${plural(c.size, 'passage')} from ${plural(c.detail.transcripts.length, 'transcript')}, cohesion ${c.cohesion.toFixed(2)}${c.detail.dismissed_before.length ? `; ${c.detail.dismissed_before.length} dismissed before` : ''}`);
          const nt = c.detail.nearest_theme;
          say(
            nt
              ? `  close to ${nt.path} (mean confidence ${nt.closeness.toFixed(2)}; best theme of ${pct(nt.top_share)} of its passages); novelty ${(c.detail.novelty ?? 1).toFixed(2)}`
              : `  close to no theme; novelty ${(c.detail.novelty ?? 1).toFixed(2)}`,
          );
          say(`  terms: ${c.detail.terms.slice(0, 10).map((t) => t.term).join(', ')}`);
          say(`  transcripts: ${c.detail.transcripts.join(', ')}`);
          for (const x of c.detail.central) say(wrap(`${x.passage_id}: "${clip(x.text, 220)}"`, 96, '    '));
        }
        if (run.result.suppressed.length) say(`\n${plural(run.result.suppressed.length, 'cluster')} held back: mostly passages dismissed before, with too little new material.`);
        if (run.clusters.length)
          say('\nPromote one into the template: trellis promote CLUSTER --name NAME [--parent PATH] --coder NAME\nor into an existing theme: trellis promote CLUSTER --into PATH --coder NAME\nor set it aside: trellis dismiss CLUSTER --note TEXT --coder NAME');
      });
    });

  studyCommand(program, 'promote', 'send a cluster into the template, as a new theme or into an existing one: its passages become suggestions for review')
    .argument('<cluster>', 'the cluster id as printed by trellis discover (like c3f9a1)')
    .option('--name <name>', 'a new theme with this name (a template revision that records the cluster)')
    .option('--parent <path>', 'with --name: the parent theme (default: a top-level theme)')
    .option('--into <path>', 'an existing theme instead: the passages become suggestions of it')
    .option('--note <text>', 'why, kept in the log and the revision history')
    .option('--coder <name>', 'who decides (default: $TRELLIS_CODER)', coderName)
    .addHelpText(
      'after',
      `
The passages are not coded: they become suggestions of the theme, for review. A new theme gets
the cluster's distinctive terms as seed terms and no definition yet ("not yet written" in the
codebook): write one in template.txt once you have read its passages.

Examples:
  trellis promote c3f9a1 --name "Paper workarounds" --coder priya --note "informal printed lists"
  trellis promote c07b2e --into "Workload > Interruptions" --coder priya`,
    )
    .action(async (cluster: string, opts: StudyOpts & { name?: string; parent?: string; into?: string; note?: string; coder?: string }) => {
      if (opts.into !== undefined && (opts.name !== undefined || opts.parent !== undefined)) throw new UserError('give either --name (a new theme) or --into (an existing theme), not both');
      if (opts.into === undefined && opts.name === undefined) throw new UserError('say where the cluster goes: --name NAME for a new theme, or --into PATH for an existing one');
      const target = opts.into !== undefined ? { into: opts.into } : { name: opts.name!, parentPath: opts.parent };
      await withStudy(opts, (study) => {
        const coder = coderOf(opts, study.db);
        const p = promoteCluster(study, cluster, target, coder, opts.note);
        if (opts.json) return printJson(promoteJson(p));
        say(
          p.into_existing
            ? `Cluster ${p.cluster_id}: its ${plural(p.suggestions, 'passage')} are now suggestions of "${p.path}", for review (trellis review --coder ${coder}).`
            : `Cluster ${p.cluster_id} is now the theme "${p.path}" (template revision ${p.rev}; its definition is not yet written); its ${plural(p.suggestions, 'passage')} are suggestions of it, for review (trellis review --coder ${coder}).`,
        );
      });
    });

  studyCommand(program, 'dismiss', 'set a cluster aside as noise or out of scope (logged; it does not come back unless new material joins it)')
    .argument('<cluster>', 'the cluster id as printed by trellis discover (like c3f9a1)')
    .requiredOption('--note <text>', 'why it was dismissed')
    .option('--coder <name>', 'who decides (default: $TRELLIS_CODER)', coderName)
    .addHelpText('after', '\nExample:\n  trellis dismiss c5d0e4 --note "car park and canteen small talk" --coder priya')
    .action(async (cluster: string, opts: StudyOpts & { note: string; coder?: string }) => {
      await withStudy(opts, ({ db }) => {
        const coder = coderOf(opts, db);
        const d = dismissCluster(db, cluster, coder, opts.note);
        if (opts.json) return printJson(d);
        say(`Cluster ${d.cluster_id} dismissed (decision #${d.decision_id}).`);
      });
    });

  studyCommand(program, 'triage', 'rank transcripts (uncoded or partly coded) by how much of their uncoded part the template fails to claim')
    .option('--transcript <name>', 'only these transcripts (repeatable)', collect)
    .addHelpText(
      'after',
      `
A transcript's unclaimed share is the words of its unclaimed passages over the words of its
substantive participant passages, counting only its uncoded part: a partly coded transcript is
ranked by the passages not yet coded (or judged nothing to code), and marked "partly coded". Read the most novel first: that is where the template will
need revising. Cluster shares refer to the latest "trellis discover".

Examples:
  trellis triage
  trellis triage --json`,
    )
    .action(async (opts: StudyOpts & { transcript?: string[] }) => {
      await withStudy(opts, ({ db }) => {
        requireTranscripts(db, opts.transcript);
        const { rows, clusters } = withStepBar('scoring', { fit: [0, 0.85], score: [0.85, 1], cluster: [1, 1] }, !opts.json && passageCount(db) >= 2000, (step) => triageStudy(db, opts.transcript, step));
        if (opts.json) return printJson(triageJson(rows, clusters));
        const names = new Map([...walk(currentTemplate(db))].map((e) => [e.node.id, e.path.split(' > ').pop()!]));
        if (!rows.length) return say('No transcript has passages left to code.');
        const labels = new Map(clusters.map((c) => [c.cluster_id, c.label]));
        say(
          table(
            ['transcript', 'unclaimed', 'passages', 'dominant suggested themes', 'open clusters'],
            rows.map((r) => [
              r.partly_coded ? `${r.transcript} (partly coded)` : r.transcript,
              `${pct(r.unclaimedShare)} of words`,
              `${r.unclaimedPassages}/${r.substantivePassages}`,
              r.themes.map((t) => `${names.get(t.themeId) ?? t.themeId} (${t.passages})`).join(', '),
              r.clusters.slice(0, 3).map((c) => `${c.clusterId} (${labels.get(c.clusterId) ?? ''}): ${c.passages}`).join(', ') + (r.clusters.length > 3 ? `, +${r.clusters.length - 3} more` : ''),
            ]),
          ),
        );
        if (!clusters.length) say('\n(no open clusters: run "trellis discover" to see which clusters each transcript feeds)');
      });
    });
}
