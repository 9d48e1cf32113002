/**
 * The study report: one self-contained HTML file (inline styles and SVG, no scripts, nothing
 * fetched) for a supervisor, a funder or the team's own audit trail. Pure: ReportData in, text out.
 */

import { AGREEMENT_CAUTION, KRIPPENDORFF_GUIDANCE, LANDIS_KOCH_BANDS } from '../measure/bands.js';
import { FEW_DECISIONS, MAP_COLUMNS, acceptanceChart, calibrationChart, growthChart, heatmapChart, overTimeChart, themeLabeller, unclaimedChart } from './charts.js';
import { BASE_CSS, htmlDocument } from './document.js';
import { esc, fixed, int, oneLine, pct, plural, when } from './escape.js';
import { QUOTE_RULES, choiceLine } from './quotes.js';
import type { ReportCluster, ReportData, ReportMemo, ReportQuote, ReportTheme } from './types.js';

const REPORT_CSS = `
header.doc { border-bottom: 1px solid var(--rule); padding-bottom: 16px; }
.kicker { text-transform: uppercase; letter-spacing: 0.08em; font-size: 0.75rem; color: var(--muted); font-weight: 600; margin: 0 0 6px; }
main { border-top: 6px solid var(--accent); }
nav.toc { margin: 16px 0 0; font-size: 0.9rem; display: flex; flex-wrap: wrap; align-items: baseline; gap: 4px 0; }
nav.toc h2 { font-size: 0.75rem; text-transform: uppercase; letter-spacing: 0.08em; color: var(--muted); border: 0; margin: 0 12px 0 0; padding: 0; }
nav.toc ol { margin: 0; padding: 0; list-style: none; display: flex; flex-wrap: wrap; gap: 2px 20px; }
nav.toc a { color: var(--accent); text-decoration: none; }
.stats { display: grid; grid-template-columns: repeat(4, minmax(0, 1fr)); gap: 12px; margin: 16px 0; }
.stat { border: 1px solid var(--rule); border-left: 4px solid var(--accent); border-radius: 4px; padding: 10px 14px 12px; background: #fafbfc; }
.stat .v { display: block; font-size: 1.75rem; font-weight: 700; line-height: 1.15; font-variant-numeric: tabular-nums; }
.stat .k { display: block; font-size: 0.88rem; font-weight: 600; margin-top: 2px; }
.stat .s { display: block; font-size: 0.8rem; color: var(--muted); }
@media (max-width: 700px) { .stats { grid-template-columns: repeat(2, minmax(0, 1fr)); } }
figure { margin: 6px 0 0; }
.scroll { overflow-x: auto; }
.scroll svg.chart { max-width: none; }
svg.chart { display: block; max-width: 100%; height: auto; font-family: inherit; }
figcaption { color: var(--muted); font-size: 0.85rem; margin-top: 6px; max-width: 80ch; }
.pair { display: flex; flex-wrap: wrap; gap: 24px; align-items: flex-start; }
.pair > figure { flex: 0 1 454px; }
.pair > table { flex: 1 1 300px; width: auto; }
table.tree td.theme { padding-right: 12px; }
table.tree th.num { white-space: nowrap; width: 9em; }
table.tree tr.top td { border-top: 1px solid var(--rule); }
table.tree tr.top td.theme .name { font-weight: 700; }
table.tree .def { display: block; color: var(--muted); font-size: 0.82rem; line-height: 1.35; }
table.revisions ul { margin: 0; padding-left: 1.1em; }
table.revisions li { margin: 0; line-height: 1.35; }
table.revisions td.why { width: 22%; }
table.agreement tr.pooled td { font-weight: 700; border-top: 2px solid var(--rule); }
.cluster { border: 1px solid var(--rule); border-radius: 6px; padding: 4px 16px 10px; margin: 14px 0; }
.cluster h4 { margin-top: 10px; }
.terms { display: flex; flex-wrap: wrap; gap: 6px; list-style: none; padding: 0; margin: 6px 0; }
.terms li { border: 1px solid var(--rule); border-radius: 3px; padding: 0 7px; font-size: 0.85rem; background: var(--tint); }
.theme-quotes { margin: 18px 0 26px; }
.memo { border-left: 3px solid var(--rule); padding: 0 0 0 12px; margin: 10px 0; }
.memo p { margin: 2px 0; max-width: 80ch; }
ul.cautions li { margin: 6px 0; max-width: 80ch; }
@media print { nav.toc { display: none; } .scroll { overflow: visible; } .scroll svg.chart { max-width: 100%; } }
`;

const SECTIONS = [
  ['summary', 'Summary'],
  ['template', 'The template and its revisions'],
  ['coverage', 'Themes across transcripts'],
  ['acceptance', 'Acceptance of suggestions'],
  ['growth', 'Template growth'],
  ['unclaimed', 'Unclaimed passages and clusters'],
  ['agreement', 'Inter-coder agreement'],
  ['memos', 'Memos'],
  ['quotes', 'Representative quotes'],
  ['cautions', 'Cautions'],
] as const;

function section(id: (typeof SECTIONS)[number][0], body: string): string {
  const title = SECTIONS.find(([k]) => k === id)![1];
  return `<section id="${id}">\n<h2>${esc(title)}</h2>\n${body}\n</section>`;
}

const empty = (sentence: string) => `<p class="empty">${esc(sentence)}</p>`;

function figure(heading: string, svg: string, caption: string, scroll = false): string {
  return `<h3>${esc(heading)}</h3>\n<figure>${scroll ? `<div class="scroll">${svg}</div>` : svg}<figcaption>${esc(caption)}</figcaption></figure>`;
}

function stat(value: string, label: string, sub?: string): string {
  return `<div class="stat"><span class="v">${esc(value)}</span><span class="k">${esc(label)}</span>${sub ? `<span class="s">${esc(sub)}</span>` : ''}</div>`;
}

// ---------------------------------------------------------------------------------------------

function summary(d: ReportData): string {
  const c = d.counts;
  const a = d.acceptance.overall;
  const apriori = d.themes.filter((t) => t.apriori).length;
  const depth = d.themes.reduce((m, t) => Math.max(m, t.number.split('.').length), 0);
  const codedShare = c.participant > 0 ? c.coded / c.participant : null;
  const cards = [
    stat(int(c.transcripts), 'transcripts', c.codedTranscripts === undefined ? undefined : `${int(c.codedTranscripts)} with codings`),
    stat(int(c.passages), 'passages', `${int(c.participant)} from participants`),
    stat(int(c.coded), 'passages coded', codedShare === null ? undefined : `${pct(codedShare)} of participant passages`),
    stat(int(c.themes), 'themes', `${apriori} a priori; ${depth ? plural(depth, 'level') : 'no levels'} deep`),
    stat(c.revision === null ? '–' : String(c.revision), 'template revision', plural(d.revisions.length, 'revision') + ' recorded'),
    stat(a.decided ? pct(a.rate) : '–', 'suggestions accepted', a.decided ? `${int(a.accepted)} of ${int(a.decided)} decided` : 'no decisions yet'),
    stat(d.unclaimed.share === null ? '–' : pct(d.unclaimed.share), 'passages unclaimed', d.unclaimed.share === null ? 'not yet measured' : `${int(d.unclaimed.unclaimed)} of ${int(d.unclaimed.passages)}; ${plural(d.unclaimed.clusters.length, 'cluster')}`),
  ];
  // Agreement is a section of its own, with its units and caveats, not a headline figure.
  const sentence =
    `This report covers ${plural(c.transcripts, 'transcript')} divided into ${plural(c.passages, 'passage')}, ` +
    `${int(c.coded)} of which carry at least one theme from a template of ${plural(c.themes, 'theme')}` +
    (c.revision === null ? '.' : ` (revision ${c.revision}).`) +
    (c.nothingToCode ? ` Coders read ${plural(c.nothingToCode, 'more passage')} and judged that no theme applies ("reviewed, nothing to code").` : '') +
    (a.decided ? ` Coders have decided on ${plural(a.decided, 'suggestion')} and accepted ${pct(a.rate)} of them.` : ' No suggestion has been decided on yet.');
  return `<div class="stats">${cards.join('')}</div>\n<p>${esc(sentence)}</p>`;
}

function templateTree(all: readonly ReportTheme[], d?: ReportData): string {
  if (!all.length) return empty('The template has no themes yet.');
  const themes = all.filter((t) => !t.integrative);
  const across = all.filter((t) => t.integrative);
  const rows = themes.map((t) => {
    const level = t.number.split('.').length - 1;
    const def = t.definition ? `<span class="def">${esc(oneLine(t.definition))}</span>` : '';
    return (
      `<tr class="${level === 0 ? 'top' : 'sub'}"><td class="nowrap">${esc(t.number)}</td>` +
      `<td class="theme" style="padding-left:${(8 + level * 22).toFixed(0)}px"><span class="name">${esc(t.name)}</span>${t.apriori ? '<span class="tag">a priori</span>' : ''}${def}</td>` +
      `<td class="num">${int(t.direct)}</td><td class="num">${int(t.total)}</td></tr>`
    );
  });
  return (
    `<table class="tree"><caption>Themes in template order. "Coded to it": passages coded to the theme itself; "with sub-themes": to it or any theme below it (a passage counts once). Themes marked a priori were defined before coding began.</caption>` +
    `<thead><tr><th scope="col">No.</th><th scope="col">Theme</th><th scope="col" class="num">Coded to it</th><th scope="col" class="num">With sub-themes</th></tr></thead>` +
    `<tbody>${rows.join('\n')}</tbody></table>` +
    (across.length && d ? integrativeTable(across, d) : '')
  );
}

/** Integrative themes, apart from the hierarchy, with the top-level themes each runs across. */
function integrativeTable(themes: readonly ReportTheme[], d: ReportData): string {
  const tops = d.integrative?.[0]?.across.map((a) => a.name) ?? [];
  const rows = themes.map((t) => {
    const x = d.integrative?.find((i) => i.themeId === t.id);
    const cells = tops.map((name) => `<td class="num">${x ? int(x.across.find((a) => a.name === name)?.passages ?? 0) : ''}</td>`).join('');
    const level = t.number.split('.').length - 1;
    return (
      `<tr class="${level === 0 ? 'top' : 'sub'}"><td class="nowrap">${esc(t.number)}</td><td class="theme" style="padding-left:${(8 + level * 22).toFixed(0)}px"><span class="name">${esc(t.name)}</span>${t.apriori ? '<span class="tag">a priori</span>' : ''}</td>` +
      `<td class="num">${int(t.total)}</td>${cells}</tr>`
    );
  });
  return (
    `<h3>Integrative themes</h3><p>${esc('Integrative themes run across the themes above rather than sitting under one; a passage carries them alongside any other theme. Each column counts the theme\'s passages that also carry that top-level theme (or a theme under it).')}</p>` +
    `<div class="scroll"><table class="tree integrative"><thead><tr><th scope="col">No.</th><th scope="col">Theme</th><th scope="col" class="num">Passages</th>${tops.map((n) => `<th scope="col" class="num">${esc(n)}</th>`).join('')}</tr></thead>` +
    `<tbody>${rows.join('\n')}</tbody></table></div>`
  );
}

/** Date and time as two unbreakable halves, so a narrow column wraps between them only. */
function stamp(iso: string): string {
  const [date, ...rest] = when(iso).split(' ');
  return rest.length ? `<span class="nowrap">${esc(date)}</span> <span class="nowrap">${esc(rest.join(' '))}</span>` : esc(date);
}

function revisionHistory(d: ReportData): string {
  if (!d.revisions.length) return empty('No template revisions have been recorded yet.');
  const rows = [...d.revisions]
    .sort((a, b) => a.rev - b.rev)
    .map((r) => {
      const changes = r.changes.length
        ? `<ul>${r.changes.map((c) => `<li>${esc(c.replace(/ -> /g, ' → '))}</li>`).join('')}</ul>`
        : '<span class="note">no change to the themes</span>';
      return (
        `<tr><td class="num">${r.rev}</td><td>${stamp(r.at)}</td><td>${esc(r.author)}</td><td>${esc(r.action)}</td>` +
        `<td>${changes}</td><td class="why">${r.reason ? esc(r.reason) : '<span class="note">no reason given</span>'}</td></tr>`
      );
    });
  return (
    `<table class="revisions"><caption>Every revision of the template, oldest first: the audit trail of how the template developed.</caption>` +
    `<thead><tr><th scope="col" class="num">Rev.</th><th scope="col">When</th><th scope="col">By</th><th scope="col">Action</th><th scope="col">What changed</th><th scope="col">Why</th></tr></thead>` +
    `<tbody>${rows.join('\n')}</tbody></table>`
  );
}

function coverage(d: ReportData): string {
  const svg = heatmapChart(d);
  if (!svg) return empty('No transcripts have been coded yet, so there is nothing to map.');
  if (d.heatmap.transcripts.length > MAP_COLUMNS) {
    return figure(
      'Transcripts reached by each theme',
      svg,
      `With ${d.heatmap.transcripts.length.toLocaleString('en-GB')} transcripts a column each would not be readable, so each theme shows the share of transcripts with at least one of its passages (counts include sub-themes). "trellis export matrix" writes the full theme-by-transcript table.`,
      true,
    );
  }
  return figure(
    'Passages per theme and transcript',
    svg,
    'Rows follow the template; counts include sub-themes, so a top-level row sums its branch (a passage coded to two sub-themes counts once). Empty columns show transcripts not yet coded; empty rows, themes no passage carries yet.',
    true,
  );
}

function acceptance(d: ReportData): string {
  const a = d.acceptance;
  if (a.overall.decided === 0) return empty('No suggestions have been decided on yet, so acceptance and calibration cannot be measured.');
  const parts: string[] = [];
  parts.push(
    `<p>${esc(
      `Of ${plural(a.overall.decided, 'suggestion')} decided (accepted, rejected or re-coded to another theme), ${int(a.overall.accepted)} were accepted: ${pct(a.overall.rate)}. ` +
        'Deferred suggestions are left out until they are decided. Acceptance shows how often suggestions were accepted; it does not measure whether a coding is correct.',
    )}</p>`,
  );
  if (a.bulkAccepted && a.oneByOne) {
    // Bulk acceptances are accepted by construction: the figure of suggestions read one by one is shown apart.
    parts.push(
      `<p>${esc(
        `Of these, ${plural(a.bulkAccepted, 'suggestion')} ${a.bulkAccepted === 1 ? 'was' : 'were'} accepted in bulk (decide --all-above), without a researcher reading each passage. ` +
          `Decided one by one: ${int(a.oneByOne.accepted)} of ${int(a.oneByOne.decided)} accepted (${pct(a.oneByOne.rate)}).`,
      )}</p>`,
    );
  }
  const bars = acceptanceChart(d);
  const undecided = a.perTheme.filter((r) => r.decided === 0).length;
  parts.push(
    bars
      ? figure(
          'Acceptance per theme',
          bars,
          `Bars: share of each theme's decided suggestions that were accepted, with the counts. Dashed line: all themes together. Hatched bars rest on fewer than ${FEW_DECISIONS} decisions and are unstable.` +
            (undecided ? ` ${plural(undecided, 'theme')} with suggestions but no decision yet ${undecided === 1 ? 'is' : 'are'} not shown.` : ''),
        )
      : `<h3>Acceptance per theme</h3>${empty('No theme has a decided suggestion yet.')}`,
  );

  const cal = calibrationChart(d);
  if (cal) {
    const rows = a.calibration
      .map(
        (r) =>
          `<tr><td class="nowrap">${esc(r.band)}</td><td class="num">${int(r.count)}</td><td class="num">${r.meanConfidence === null ? '–' : r.meanConfidence.toFixed(2)}</td><td class="num">${r.count ? pct(r.acceptance) : '–'}</td></tr>`,
      )
      .join('');
    parts.push(
      `<h3>Calibration: confidence against acceptance</h3>\n<div class="pair"><figure>${cal}<figcaption>${esc(
        'Each point is a confidence band: across is the mean confidence of its suggestions, up is the share accepted. Points below the diagonal mean the confidence was too high for that band; above it, too low.',
      )}</figcaption></figure>` +
        `<table><caption>The calibration table (decided suggestions only).</caption><thead><tr><th scope="col">Confidence band</th><th scope="col" class="num">Decided</th><th scope="col" class="num">Mean confidence</th><th scope="col" class="num">Accepted</th></tr></thead><tbody>${rows}</tbody></table></div>`,
    );
  } else parts.push(`<h3>Calibration: confidence against acceptance</h3>${empty('No confidence band holds a decided suggestion yet.')}`);

  const line = overTimeChart(d);
  parts.push(
    line
      ? figure(
          'Acceptance over time',
          line,
          'The share of suggestions accepted so far, after each decision in the order the decisions were made. Early values rest on few decisions and swing widely; a steady rise after refitting suggests the profiles learned from the decisions.',
        )
      : `<h3>Acceptance over time</h3>${empty('No decisions with a time have been recorded yet.')}`,
  );
  return parts.join('\n');
}

function growth(d: ReportData): string {
  const svg = growthChart(d);
  if (!svg) return empty('No transcript has been coded yet, so the template has not grown yet.');
  const last = [...d.growth].sort((a, b) => a.order - b.order).slice(-3);
  const quiet = last.length === 3 && last.every((p) => p.newThemes + p.newSubThemes === 0);
  return figure(
    'Themes first coded or added, by transcript',
    svg,
    'For each transcript in the order it was coded: the themes first coded there, or added to the template while it was being coded. The initial template\'s themes (a priori ones included) count at the transcripts of the first batch that introduced them, so the curve shows how the template grew. ' +
      (d.notYetCoded ? `${plural(d.notYetCoded, 'theme')} of the template ${d.notYetCoded === 1 ? 'is' : 'are'} not coded yet and not on the curve. ` : '') +
      'A flattening curve means recent transcripts added little to the template; it is not proof that the template is complete: the next transcript may still differ, and the curve depends on the order of coding.' +
      (quiet ? ' The last three transcripts coded added no theme.' : ''),
  );
}

const STATUS_WORDS: Record<ReportCluster['status'], string> = {
  open: 'open: not yet reviewed',
  promoted: 'promoted into the template',
  dismissed: 'dismissed',
};
const STATUS_ORDER: ReportCluster['status'][] = ['open', 'promoted', 'dismissed'];

function unclaimed(d: ReportData): string {
  const u = d.unclaimed;
  const parts: string[] = [];
  const svg = unclaimedChart(d);
  if (svg) {
    parts.push(
      figure(
        'Claimed and unclaimed passages',
        svg,
        'A passage is unclaimed when no theme\'s profile claims it: material the template may not yet name. Some unclaimed passages are small talk; the clusters below group the rest by shared vocabulary.',
      ),
    );
  } else parts.push(empty('The unclaimed share has not been measured yet: no passage has been scored against the theme profiles.'));

  parts.push('<h3>Clusters of unclaimed passages</h3>');
  if (!u.clusters.length) {
    parts.push(empty('No clusters have been formed from the unclaimed passages yet.'));
    return parts.join('\n');
  }
  parts.push(`<p>${esc(`${plural(u.clusters.length, 'cluster')} from the latest discovery run. Each is a possible new theme, named by its most characteristic terms; the examples are the passages nearest its centre.`)}</p>`);
  const ordered = [...u.clusters].sort((a, b) => STATUS_ORDER.indexOf(a.status) - STATUS_ORDER.indexOf(b.status) || b.size - a.size || a.id.localeCompare(b.id));
  for (const c of ordered) {
    parts.push(
      `<article class="cluster"><h4>Cluster ${c.id}: ${esc(c.label)}</h4>` +
        `<p class="meta">${esc(`${plural(c.size, 'passage')} from ${plural(c.transcripts, 'transcript')} · cohesion ${fixed(c.cohesion)} · ${STATUS_WORDS[c.status] ?? c.status}`)}</p>` +
        (c.terms.length ? `<ul class="terms" aria-label="characteristic terms">${c.terms.map((t) => `<li>${esc(t)}</li>`).join('')}</ul>` : '') +
        c.examples.map(quoteBlock).join('') +
        `</article>`,
    );
  }
  return parts.join('\n');
}

function agreement(d: ReportData): string {
  const ag = d.agreement;
  if (!ag || !ag.rows.length) {
    return empty('No two coders have reviewed the same passages yet, so inter-coder agreement cannot be reported. Agreement needs a second coder to code a shared set of transcripts independently.');
  }
  const label = themeLabeller(d.themes);
  const many = ag.coders.length >= 3;
  const rows = ag.rows
    .map((r) => {
      const pooled = /pooled/i.test(r.theme);
      const l = label(r.theme);
      // Three or more coders: Fleiss' kappa (on the units all reviewed) takes Cohen's place.
      const kappaCells = many
        ? `<td class="num">${int(r.fleissUnits ?? 0)}</td><td class="num">${fixed(r.fleiss ?? null)}</td><td>${r.fleissBand ? esc(r.fleissBand) : '–'}</td>`
        : `<td class="num">${fixed(r.kappa)}</td><td>${r.kappaBand ? esc(r.kappaBand) : '–'}</td>`;
      return (
        `<tr${pooled ? ' class="pooled"' : ''}><td>${esc(pooled ? r.theme : l.label)}</td><td class="num">${int(r.units)}</td>` +
        `<td class="num">${pct(r.percentAgreement, 1)}</td>${kappaCells}` +
        `<td class="num">${fixed(r.alpha)}</td><td>${r.alphaGuidance ? esc(r.alphaGuidance) : '–'}</td></tr>`
      );
    })
    .join('\n');
  const kappaHead = many
    ? `<th scope="col" class="num">Units all coders reviewed</th><th scope="col" class="num">Fleiss' κ</th><th scope="col">Band of κ</th>`
    : `<th scope="col" class="num">Cohen's κ</th><th scope="col">Band of κ</th>`;
  const pairs = many && ag.pairwise?.length
    ? `<h3>Every pair of coders</h3><table class="agreement pairs"><caption>${esc("Each pair on the participant passages both reviewed, pooled over every passage-theme pair of those passages; the last column is the mean of the per-theme Cohen's κ that are defined, with how many themes it is taken over.")}</caption>` +
      `<thead><tr><th scope="col">Coders</th><th scope="col" class="num">Passages</th><th scope="col" class="num">Percent agreement</th><th scope="col" class="num">Cohen's κ</th><th scope="col">Band of κ</th><th scope="col" class="num">Krippendorff's α</th><th scope="col" class="num">Mean κ of themes</th></tr></thead><tbody>` +
      ag.pairwise
        .map((p) => `<tr><td>${esc(p.coders.join(' & '))}</td><td class="num">${int(p.passages)}</td><td class="num">${pct(p.percentAgreement, 1)}</td><td class="num">${fixed(p.kappa)}</td><td>${p.kappaBand ? esc(p.kappaBand) : '–'}</td><td class="num">${fixed(p.alpha)}</td><td class="num">${fixed(p.meanKappa)} (${int(p.themesInMeanKappa)})</td></tr>`)
        .join('') +
      `</tbody></table>`
    : '';
  const key = LANDIS_KOCH_BANDS.map((b) => `${b.label} ${b.range}`).join('; ');
  const guide = KRIPPENDORFF_GUIDANCE.map((g) => `${g.label}: ${g.rule}`).join('; ');
  return (
    `<p>${esc(
      `Coders compared: ${ag.coders.join(', ')}. The units are the ${plural(ag.units, 'participant passage')} that two or more of them reviewed: coded, decided on a suggestion for, or marked "reviewed, nothing to code". Interviewer turns and sheet rows left empty are not units. ` +
        'For each theme, coders agree on a unit when all applied the theme or none did. Themes are compared as coded: a coding to a sub-theme does not count for its parent. Each figure rests on the units in its row.',
    )}</p>` +
    `<table class="agreement"><thead><tr><th scope="col">Theme</th><th scope="col" class="num">Units</th><th scope="col" class="num">Percent agreement</th>${kappaHead}<th scope="col" class="num">Krippendorff's α</th><th scope="col">Guidance for α</th></tr></thead><tbody>${rows}</tbody></table>` +
    pairs +
    `<p class="note">${esc(`${many ? "With three or more coders, Fleiss' κ (Fleiss 1971) is taken on the units every coder reviewed, as it needs the same coders on every unit; Krippendorff's α takes every unit two or more reviewed, and the pairwise table compares each two coders. " : ''}The pooled row counts every passage-theme pair of the units. Bands of κ (${key}) follow ${ag.bandsSource} Guidance for α (${guide}) follows ${ag.guidanceSource}`)}</p>` +
    (ag.disagreements ? `<p>${esc(`The coders differ on ${plural(ag.disagreements, 'passage-theme pair')}; "trellis agree --coders ${ag.coders.join(',')} --list" lists them, theme by theme, for the team to discuss.`)}</p>` : '') +
    (ag.circularity ? `<p class="callout">${esc(ag.circularity)}</p>` : '') +
    `<p class="callout">${esc(ag.caution || AGREEMENT_CAUTION)}</p>`
  );
}

const MEMO_GROUPS: [ReportMemo['kind'], string][] = [
  ['study', 'On the study'],
  ['theme', 'On themes'],
  ['transcript', 'On transcripts'],
  ['passage', 'On passages'],
];

function memosSection(d: ReportData): string {
  const all = d.memos ?? [];
  if (!all.length) return empty('No memos have been written yet ("trellis memo add", or the coding sheet\'s note column).');
  const parts = [`<p>${esc(`${plural(all.length, 'memo')}: the analysts' notes on the study, its themes, transcripts and passages, oldest first in each group.`)}</p>`];
  for (const [kind, title] of MEMO_GROUPS) {
    const ms = all.filter((m) => m.kind === kind);
    if (!ms.length) continue;
    parts.push(
      `<h3>${esc(title)}</h3>` +
        ms
          .map(
            (m) =>
              `<article class="memo"><p class="meta">${esc(`${kind === 'study' ? '' : `${m.label} · `}${m.author} · ${when(m.at)} · memo #${m.id}`)}</p><p>${esc(m.text)}</p></article>`,
          )
          .join(''),
    );
  }
  return parts.join('\n');
}

/** A quote with its source: transcript, speaker (or alias) and time, as everywhere in the report. */
function quoteBlock(q: ReportQuote): string {
  const source = [q.transcript, q.speaker ?? 'speaker not recorded', q.time].filter(Boolean).join(' · ');
  return `<blockquote><p>${esc(oneLine(q.text))}</p><footer>${esc(source)} <span class="id">${esc(q.passageId)}</span>${q.pinned ? ' <span class="tag">pinned</span>' : ''}</footer></blockquote>`;
}

function quotes(d: ReportData): string {
  const withQuotes = d.themes.filter((t) => t.quotes.length);
  if (!withQuotes.length) return empty('No passages have been coded yet, so there are no quotes to show.');
  const blocks = withQuotes.map((t) => {
    const qs = t.quotes.map(quoteBlock).join('');
    return `<div class="theme-quotes"><h3>${esc(`${t.number} ${t.name}`)}${t.apriori ? '<span class="tag">a priori</span>' : ''}</h3><p class="meta">${esc(t.path)} · ${esc(plural(t.total, 'passage'))}</p>${qs}</div>`;
  });
  return (
    `<p>${esc(QUOTE_RULES)} ${esc(choiceLine(d))}</p>\n` +
    `<p>${esc(d.pseudonyms ?? 'Quotes are credited to the transcripts\' names and speaker labels as stored: check that they are de-identified before sharing this report ("trellis alias", and --pseudonymise).')}</p>\n` +
    blocks.join('\n')
  );
}

function cautions(d: ReportData): string {
  if (!d.cautions.length) return empty('No cautions were recorded with this report.');
  return `<ul class="cautions">${d.cautions.map((c) => `<li>${esc(c)}</li>`).join('')}</ul>`;
}

/** The whole report as one HTML document. */
export function renderReport(data: ReportData): string {
  const rev = data.counts.revision === null ? 'no template revision recorded' : `template revision ${data.counts.revision}`;
  const header =
    `<header class="doc"><p class="kicker">Template analysis report</p><h1>${esc(data.title)}</h1>` +
    `<p class="meta">${esc(`Generated ${when(data.generatedAt)} · ${rev} · ${plural(data.counts.transcripts, 'transcript')}`)}</p>` +
    `<p class="note">${esc('This report quotes interview transcripts. Treat it with the same care as the transcripts themselves.')}</p>` +
    `<nav class="toc" aria-label="Contents"><h2>Contents</h2><ol>${SECTIONS.map(([id, t]) => `<li><a href="#${id}">${esc(t)}</a></li>`).join('')}</ol></nav></header>`;
  const body = [
    header,
    section('summary', summary(data)),
    section('template', `<h3>The template</h3>\n${templateTree(data.themes, data)}\n<h3>Revision history</h3>\n${revisionHistory(data)}`),
    section('coverage', coverage(data)),
    section('acceptance', acceptance(data)),
    section('growth', growth(data)),
    section('unclaimed', unclaimed(data)),
    section('agreement', agreement(data)),
    section('memos', memosSection(data)),
    section('quotes', quotes(data)),
    section('cautions', cautions(data)),
    `<footer class="doc">${esc(`Made by trellis from the study's own records, on this computer. ${when(data.generatedAt)}.`)}</footer>`,
  ].join('\n');
  return htmlDocument(data.title, BASE_CSS + REPORT_CSS, body);
}
