/** The pages around the review: the template with counts, one theme, the unclaimed clusters, triage. */
import type { StoredCluster } from '../study/clusters.js';
import type { StoredPassage } from '../study/passages.js';
import type { ThemeCount } from '../jobs/status.js';
import type { TranscriptTriage } from '../discover/triage.js';
import type { ThemeReport } from '../suggest/types.js';
import type { WalkEntry } from '../template/paths.js';
import { esc } from './layout.js';

const pct = (x: number | null) => (x === null ? 'not measured' : `${Math.round(100 * x)}%`);

export function templatePage(entries: WalkEntry[], counts: Map<string, ThemeCount>, coded: number, participant: number): string {
  if (!entries.length) return '<p>No template yet: record one with <code>trellis template set template.txt</code>.</p>';
  const rows = entries
    .map((e) => {
      const c = counts.get(e.node.id);
      return `<tr><th scope="row" class="depth-${Math.min(e.depth, 4)}"><span class="num">${esc(e.number)}</span> <a href="/theme?id=${encodeURIComponent(e.node.id)}">${esc(e.node.name)}</a>${e.node.apriori ? ' <span class="badge">a priori</span>' : ''}</th>
<td>${c?.direct ?? 0}</td><td>${c?.total ?? 0}</td><td>${c?.transcripts ?? 0}</td><td>${esc(c?.strength ?? 'not suggested')}</td></tr>`;
    })
    .join('\n');
  return `<p>${coded} of ${participant} participant passages coded. Choose a theme to read its passages and its profile.</p>
<table class="template"><caption>The template, with how many passages are coded to each theme</caption>
<thead><tr><th scope="col">Theme</th><th scope="col">Passages</th><th scope="col">With sub-themes</th><th scope="col">Transcripts</th><th scope="col">Suggestions</th></tr></thead>
<tbody>${rows}</tbody></table>`;
}

export function themePage(entry: WalkEntry, report: ThemeReport | undefined, passages: { passage: StoredPassage; coders: string[] }[]): string {
  const profile = report
    ? `<section aria-labelledby="prof"><h2 id="prof">Profile</h2>
<p>${report.exemplars} coded passages in ${report.transcripts} transcripts; threshold ${report.threshold.toFixed(2)}; expected precision ${pct(report.expectedPrecision)}, recall ${pct(report.expectedRecall)}${report.seedOnly ? ' (from the definition and seed terms only)' : ''}.</p>
${report.topTerms.length ? `<p>Distinctive terms: ${report.topTerms.slice(0, 12).map((t) => `<span class="term">${esc(t.written ?? t.term)}</span> ${t.weight.toFixed(2)}`).join(', ')}</p>` : ''}
${report.warnings.map((w) => `<p class="warning">Note: ${esc(w)}</p>`).join('')}</section>`
    : '<p>No profile: this theme is not suggested.</p>';
  const def = entry.node.definition ? `<p class="definition">${esc(entry.node.definition)}</p>` : '<p class="definition">Definition not yet written.</p>';
  const list = passages.length
    ? `<ol class="coded">${passages.map((p) => `<li><p class="where">${esc(p.passage.transcript)} · passage ${p.passage.ordinal} · coded by ${esc(p.coders.join(', '))}</p><blockquote>${esc(p.passage.text)}</blockquote></li>`).join('')}</ol>`
    : '<p>No passage is coded to it yet.</p>';
  return `<p class="path">${esc(entry.path)}</p>${def}${profile}<section aria-labelledby="coded-h"><h2 id="coded-h">Coded passages (${passages.length})</h2>${list}</section>
<p><a href="/template">Back to the template</a></p>`;
}

export function clustersPage(clusters: StoredCluster[], themes: string[], message: string): string {
  const run = `<form method="post" action="/clusters" class="inline"><button type="submit" name="act" value="run">Look for unclaimed clusters again</button></form>`;
  const msg = message ? `<p class="message" role="alert">${esc(message)}</p>` : '';
  const open = clusters.filter((c) => c.status === 'open');
  if (!open.length) return `${msg}<p>No open cluster of passages that no theme claims.${clusters.length ? '' : ' Look for them:'}</p>${run}`;
  const list = `<datalist id="themes">${themes.map((t) => `<option value="${esc(t)}"></option>`).join('')}</datalist>`;
  const items = open
    .map(
      (c) => `<li class="cluster"><h2>${esc(c.label)} <span class="cid">${esc(c.cluster_id)}</span></h2>
<p>${c.size} passages in ${c.detail.transcripts.length} transcripts · cohesion ${c.cohesion.toFixed(2)}${c.detail.nearest_theme ? ` · nearest theme ${esc(c.detail.nearest_theme.path)}` : ''}</p>
<p>Terms: ${c.detail.terms.slice(0, 8).map((t) => esc(t.term)).join(', ')}</p>
<ul class="central">${c.detail.central.slice(0, 3).map((p) => `<li><span class="where">${esc(p.transcript)}</span> ${esc(p.text)}</li>`).join('')}</ul>
<form method="post" action="/clusters" class="row"><input type="hidden" name="cluster" value="${esc(c.cluster_id)}">
<label>New theme <input name="name" autocomplete="off"></label><label>under <input name="parent" list="themes" autocomplete="off" placeholder="(top level)"></label>
<button type="submit" name="act" value="promote-new">Promote as a new theme</button></form>
<form method="post" action="/clusters" class="row"><input type="hidden" name="cluster" value="${esc(c.cluster_id)}">
<label>Existing theme <input name="into" list="themes" autocomplete="off"></label><button type="submit" name="act" value="promote-into">Send its passages there</button></form>
<form method="post" action="/clusters" class="row"><input type="hidden" name="cluster" value="${esc(c.cluster_id)}">
<label>Why dismiss <input name="note" autocomplete="off" required></label><button type="submit" name="act" value="dismiss">Dismiss</button></form></li>`,
    )
    .join('\n');
  return `${msg}<p>Passages no theme claims, grouped. Promoting makes them suggestions of a theme, for review: none is coded until you accept it.</p>${run}<ol class="clusters">${items}</ol>${list}`;
}

export function triagePage(rows: TranscriptTriage[]): string {
  if (!rows.length) return '<p>No transcript with uncoded passages.</p>';
  return `<p>Transcripts ranked by how much of their uncoded part no theme claims: read the first ones first.</p>
<table><caption>Unclaimed share per transcript</caption><thead><tr><th scope="col">Transcript</th><th scope="col">Unclaimed share</th><th scope="col">Unclaimed passages</th><th scope="col">Already done</th></tr></thead>
<tbody>${rows.map((r) => `<tr><th scope="row">${esc(r.transcript)}</th><td>${Math.round(100 * r.unclaimedShare)}%</td><td>${r.unclaimedPassages} of ${r.substantivePassages}</td><td>${r.coded_passages}${r.partly_coded ? ' (partly coded)' : ''}</td></tr>`).join('')}</tbody></table>`;
}
