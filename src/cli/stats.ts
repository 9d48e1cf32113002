import type { Command } from 'commander';
import { UserError } from '../errors.js';
import type { GroupAcceptance } from '../measure/acceptance.js';
import { agreement, studyStats, TOOL_CODER } from '../jobs/measures.js';
import { currentTemplate, themePaths } from '../study/template.js';
import { requireTranscripts } from '../study/transcripts.js';
import { collect, studyCommand, withStudy, type StudyOpts } from './common.js';
import { plural, printJson, say, table } from './output.js';
import { getPassage } from '../study/passages.js';
import { knownCoders } from '../study/codings.js';
import { agreementJson, statsJson } from './stats-json.js';

const pct = (x: number | null) => (x === null ? '-' : `${(100 * x).toFixed(0)}%`);
const fix = (x: number | null, d = 2) => (x === null ? '-' : x.toFixed(d));

function themeNames(db: Parameters<typeof currentTemplate>[0]): (id: string | null) => string {
  const paths = themePaths(db);
  return (id) => (id ? (paths.get(id) ?? `${id} (retired)`) : '-');
}

function groupTable(title: string, rows: GroupAcceptance[], name: (k: string) => string = (k) => k): void {
  if (!rows.length) return;
  say(`\n${title}`);
  say(table([title.split(' ').pop()!, 'decided', 'accepted', 're-coded', 'rejected', 'rate'], rows.map((r) => [name(r.key), r.decided, r.accepted, r.recoded, r.rejected, pct(r.rate)])));
}

export function registerStats(program: Command): void {
  studyCommand(program, 'stats', 'how often suggestions were accepted: acceptance, calibration, re-codes, coverage, template growth')
    .option('--exclude-bulk', 'leave out decisions made in bulk (decide --all-above)')
    .addHelpText(
      'after',
      `
Acceptance = accepted / decided, where decided = accepted + re-coded + rejected: a re-code is
decided but not accepted. Deferred suggestions are not yet decided and are left out; passages
marked "reviewed, nothing to code" are judged passages, not decided suggestions, and are counted
apart. The review screen and the report count the same way. The unclaimed share is over every
participant passage of the study, each judged by the latest suggestion run that scored it.

Template growth: for each transcript in coding order, the themes first coded there or added to
the template while it was being coded; the initial template's themes count at the first-batch
transcripts that introduced them. A flattening curve means recent transcripts added little to
the template; it is not proof that the template is complete. The calibration table compares each confidence band with how
often suggestions in it were accepted.

Examples:
  trellis stats
  trellis stats --json > stats.json`,
    )
    .action(async (opts: StudyOpts & { excludeBulk?: boolean }) => {
      await withStudy(opts, ({ db }) => {
        const s = studyStats(db, { excludeBulk: opts.excludeBulk });
        if (opts.json) return printJson(statsJson(s));
        const name = themeNames(db);
        const a = s.acceptance;
        say(`Decisions: ${a.overall.decided} decided (${a.overall.accepted} accepted, ${a.overall.recoded} re-coded, ${a.overall.rejected} rejected), ${a.overall.deferred} deferred`);
        say(`Acceptance: ${pct(a.overall.rate)}${a.bulkCounted ? ` (${a.bulkCounted} bulk decisions counted)` : ''}`);
        if (s.bulk.decisions) {
          say(`  one by one: ${pct(s.one_by_one.rate)} of ${s.one_by_one.decided} decided; in bulk (decide --all-above): ${s.bulk.accepted} accepted without being read one by one`);
        }
        if (s.refined.count) say(`Refined:    ${s.refined.count} re-codes chose a sub-theme of the suggested theme; counting those as accepted, ${pct(s.refined.rate)}`);
        say(`Coverage:   ${s.coverage.coded} of ${s.coverage.participant} participant passages coded (${pct(s.coverage.share)})`);
        if (s.nothing_to_code.passages) say(`Nothing to code: ${s.coverage.nothing_to_code} more passages reviewed with no theme applying; ${s.coverage.reviewed} of ${s.coverage.participant} reviewed (${pct(s.coverage.reviewed_share)})`);
        if (s.unclaimed.run !== null)
          say(`Unclaimed:  ${s.unclaimed.unclaimed} of ${s.unclaimed.passages} participant passages in the study (${pct(s.unclaimed.share)})${s.unclaimed.not_scored ? `; ${s.unclaimed.not_scored} uncoded passages not yet scored` : ''}`);
        groupTable('Per theme', a.perTheme, name);
        if (a.calibration.some((b) => b.count)) {
          say('\nCalibration (confidence band against acceptance)');
          say(table(['band', 'decided', 'accepted', 'mean confidence', 'acceptance'], a.calibration.filter((b) => b.count).map((b) => [b.band, b.count, b.positives, fix(b.meanConfidence), pct(b.rate)])));
          say(`expected calibration error: ${fix(a.expectedCalibrationError, 3)}`);
        }
        groupTable('Per transcript', a.perTranscript);
        groupTable('Per coder', a.perCoder);
        if (a.perDay.length) {
          say('\nOver time');
          say(table(['day', 'decided', 'accepted', 'rate'], a.perDay.map((d) => [d.day, d.decided, d.accepted, pct(d.rate)])));
        }
        if (a.recodes.length) {
          say('\nRe-codes (suggested -> chosen)');
          say(table(['suggested', 'chosen', 'count'], a.recodes.map((r) => [name(r.themeId), name(r.chosenThemeId), r.count])));
        }
        const g = s.template_growth;
        if (g.curve.length) {
          say('\nTemplate growth: themes first coded or added in each transcript, in coding order (the first batch introduces the initial template):');
          say(table(['#', 'transcript', 'new themes', 'new sub-themes', 'template so far'], g.curve.map((p) => [p.order, p.transcript, p.new_themes, p.new_sub_themes, p.cumulative])));
          if (g.not_yet_coded.length) say(`${plural(g.not_yet_coded.length, 'theme')} of the template ${g.not_yet_coded.length === 1 ? 'is' : 'are'} not coded yet: ${g.not_yet_coded.map((t) => t.path).join('; ')}`);
          say(g.note);
        }
      });
    });
}

export function registerAgree(program: Command): void {
  studyCommand(program, 'agree', "inter-coder agreement: percent agreement, Cohen's or Fleiss' kappa, Krippendorff's alpha")
    .requiredOption('--coders <names>', `the coders, comma-separated (two or more; "${TOOL_CODER}" stands for the suggestions above threshold)`, collect)
    .option('--transcript <name>', 'only these transcripts (repeatable)', collect)
    .option('--list', 'also list the passages where the coders differ, theme by theme, for the team to discuss')
    .addHelpText(
      'after',
      `
Units are participant passages that two or more of the coders actually reviewed: a coder
reviewed a passage when they coded it, decided on a suggestion for it (not a defer), or marked
it "reviewed, nothing to code" (trellis nocode, or "nothing to code" in a coding sheet's themes
cell). An empty sheet row is not a review, and interviewer turns are never units. For each
theme, each unit is "present" or "absent" for each coder who reviewed it.

Cohen's kappa needs exactly two coders. With three or more, Fleiss' kappa (Fleiss 1971) is
taken on the units every one of them reviewed, and a pairwise table gives Cohen's kappa for each
two coders on the passages both reviewed. Kappas are banded after Landis & Koch. Krippendorff's
alpha (nominal) takes any number of coders and missing values, and is labelled with
Krippendorff's own guidance: rely on at least 0.800, draw tentative conclusions only from 0.667
to 0.800.
Agreement with "${TOOL_CODER}" is partly circular where the coder accepted its suggestions.

Examples:
  trellis agree --coders priya,tom
  trellis agree --coders priya,tom --list
  trellis agree --coders priya,tom,sam          Fleiss' kappa, alpha and every pair
  trellis agree --coders priya,trellis --transcript t05-ward9-fy2`,
    )
    .action(async (opts: StudyOpts & { coders: string[]; transcript?: string[]; list?: boolean }) => {
      if (opts.coders.length < 2) throw new UserError('agreement needs two or more coders: --coders A,B');
      const twice = opts.coders.find((c, i) => opts.coders.indexOf(c) !== i);
      if (twice) throw new UserError(`coder "${twice}" is named twice in --coders`);
      await withStudy(opts, ({ db }) => {
        requireTranscripts(db, opts.transcript);
        const known = knownCoders(db);
        const unknown = opts.coders.filter((c) => c !== TOOL_CODER && !known.includes(c));
        if (unknown.length) throw new UserError(`no coder named ${unknown.map((c) => `"${c}"`).join(', ')} has coded or decided anything in this study (coders: ${known.join(', ') || 'none yet'})`);
        const r = agreement(db, { coders: opts.coders, transcripts: opts.transcript });
        if (opts.json) return printJson(agreementJson(r));
        const name = themeNames(db);
        say(`Coders: ${r.coders.join(', ')}. Units: ${plural(r.pairablePassages, 'participant passage')} reviewed by two or more of them (coded, decided on, or marked nothing to code).`);
        if (!r.pairablePassages) {
          say('No passage was reviewed by two of these coders, so there is no agreement to measure.');
          return;
        }
        if (r.coders.length === 2) {
          say(
            table(
              ['theme', 'units', 'agreement', 'kappa', 'kappa band', 'alpha', 'alpha guidance'],
              [
                ...r.themes.filter((t) => t.units).map((t) => [name(t.themeId), t.units, pct(t.percentAgreement), fix(t.kappa.value), t.kappa.band ?? '-', fix(t.alpha.value), t.alpha.guidance ?? '-']),
                ['all themes, pooled', r.pooled.units, pct(r.pooled.percentAgreement), fix(r.pooled.kappa.value), r.pooled.kappa.band ?? '-', fix(r.pooled.alpha.value), r.pooled.alpha.guidance ?? '-'],
                [`mean of themes (alpha over ${r.meanOfThemes.themesInAlpha})`, '', pct(r.meanOfThemes.percentAgreement), fix(r.meanOfThemes.kappa), '', fix(r.meanOfThemes.alpha), ''],
              ] as (string | number)[][],
            ),
          );
        } else {
          // Three or more coders: Fleiss' kappa on the units all of them reviewed, alpha on every unit.
          say(
            table(
              ['theme', 'units', 'agreement', 'all-coder units', 'Fleiss kappa', 'kappa band', 'alpha', 'alpha guidance'],
              [
                ...r.themes.filter((t) => t.units).map((t) => [name(t.themeId), t.units, pct(t.percentAgreement), t.fleiss.units, fix(t.fleiss.value), t.fleiss.band ?? '-', fix(t.alpha.value), t.alpha.guidance ?? '-']),
                ['all themes, pooled', r.pooled.units, pct(r.pooled.percentAgreement), r.pooled.fleiss.units, fix(r.pooled.fleiss.value), r.pooled.fleiss.band ?? '-', fix(r.pooled.alpha.value), r.pooled.alpha.guidance ?? '-'],
                [`mean of themes (alpha over ${r.meanOfThemes.themesInAlpha})`, '', pct(r.meanOfThemes.percentAgreement), '', fix(r.meanOfThemes.fleiss), '', fix(r.meanOfThemes.alpha), ''],
              ] as (string | number)[][],
            ),
          );
          say("\nFleiss' kappa (Fleiss 1971) counts only the units every one of these coders reviewed (\"all-coder units\"); Krippendorff's alpha uses every unit two or more reviewed.");
          say('\nEvery pair of coders, on the passages both reviewed (pooled over passage-theme pairs; mean of the per-theme kappas):');
          say(
            table(
              ['coders', 'passages', 'agreement', "Cohen's kappa", 'kappa band', 'alpha', 'mean kappa (themes)'],
              r.pairwise.map((p) => [p.coders.join(' & '), p.passages, pct(p.percent_agreement), fix(p.kappa.value), p.kappa.band ?? '-', fix(p.alpha.value), `${fix(p.mean_kappa)} (${p.themes_in_mean_kappa})`]),
            ),
          );
        }
        say('\nUnits: per theme, the passages compared; pooled, every passage-theme pair of those passages.');
        say(`Kappa bands: ${r.bandsSource}`);
        say(`Alpha guidance: ${r.guidance_source}`);
        const accepted = r.accepted_codings.filter((a) => a.accepted);
        if (r.circularity) {
          say(`\n${r.circularity}`);
          for (const a of accepted) say(`  ${a.coder}: ${a.accepted} of ${plural(a.codings, 'coding')} on these units made by accepting a suggestion`);
        }
        say(`\n${r.caution}`);
        if (opts.list) {
          say(`\nPassages where the coders differ (${plural(r.disagreements.length, 'passage-theme pair')}):`);
          if (!r.disagreements.length) say('  none: the coders agree on every unit.');
          let theme = '';
          for (const d of r.disagreements) {
            if (d.theme_id !== theme) {
              theme = d.theme_id;
              say(`\n${name(theme)}`);
            }
            const text = getPassage(db, d.passage_id)?.text ?? '';
            say(`  ${d.passage_id}  applied by ${d.applied_by.join(', ')}; not by ${d.not_by.join(', ')}`);
            say(`      "${clipText(text, 100)}"`);
          }
        }
      });
    });
}

function clipText(text: string, n: number): string {
  const flat = text.replace(/\s+/g, ' ').trim();
  return flat.length > n ? flat.slice(0, n - 1).trimEnd() + '…' : flat;
}
