import type { Command } from 'commander';
import { UserError } from '../errors.js';
import type { GroupAcceptance } from '../measure/acceptance.js';
import { agreement, studyStats, TOOL_CODER } from '../study/measures.js';
import { currentTemplate } from '../study/template.js';
import { requireTranscripts } from '../study/transcripts.js';
import { walk } from '../template/paths.js';
import { collect, studyCommand, withStudy, type StudyOpts } from './common.js';
import { printJson, say, table } from './output.js';

const pct = (x: number | null) => (x === null ? '-' : `${(100 * x).toFixed(0)}%`);
const fix = (x: number | null, d = 2) => (x === null ? '-' : x.toFixed(d));

function themeNames(db: Parameters<typeof currentTemplate>[0]): (id: string | null) => string {
  const paths = new Map([...walk(currentTemplate(db))].map((e) => [e.node.id, e.path]));
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
participant passage of the study, each judged by the latest suggestion run that scored it. The calibration table compares each confidence band with how
often suggestions in it were accepted.

Examples:
  trellis stats
  trellis stats --json > stats.json`,
    )
    .action(async (opts: StudyOpts & { excludeBulk?: boolean }) => {
      await withStudy(opts, (db) => {
        const s = studyStats(db, { excludeBulk: opts.excludeBulk });
        if (opts.json) return printJson(s);
        const name = themeNames(db);
        const a = s.acceptance;
        say(`Decisions: ${a.overall.decided} decided (${a.overall.accepted} accepted, ${a.overall.recoded} re-coded, ${a.overall.rejected} rejected), ${a.overall.deferred} deferred`);
        say(`Acceptance: ${pct(a.overall.rate)}${a.bulkCounted ? ` (${a.bulkCounted} bulk decisions counted)` : ''}`);
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
        const sat = s.saturation;
        say(`\nSaturation: ${sat.beforeCoding.themes + sat.beforeCoding.subThemes} themes before coding began; new themes and sub-themes per transcript in coding order:`);
        say(table(['#', 'transcript', 'new themes', 'new sub-themes', 'total new'], sat.curve.map((p) => [p.order, p.transcript, p.newThemes, p.newSubThemes, p.cumulative])));
      });
    });
}

export function registerAgree(program: Command): void {
  studyCommand(program, 'agree', "inter-coder agreement: percent agreement, Cohen's kappa, Krippendorff's alpha")
    .requiredOption('--coders <names>', `the coders, comma-separated (two or more; "${TOOL_CODER}" stands for the suggestions above threshold)`, collect)
    .option('--transcript <name>', 'only these transcripts (repeatable)', collect)
    .addHelpText(
      'after',
      `
For each theme, each passage counts as "theme present" or "absent" for each coder who looked
at it (a coding sheet row or a decision); a coder who never saw a passage is missing there.
Cohen's kappa needs exactly two coders; Krippendorff's alpha (nominal) takes any number and
allows missing values.

Examples:
  trellis agree --coders priya,tom
  trellis agree --coders priya,trellis --transcript t05-ward9-fy2`,
    )
    .action(async (opts: StudyOpts & { coders: string[]; transcript?: string[] }) => {
      if (opts.coders.length < 2) throw new UserError('agreement needs two or more coders: --coders A,B');
      await withStudy(opts, (db) => {
        requireTranscripts(db, opts.transcript);
        const r = agreement(db, { coders: opts.coders, transcripts: opts.transcript });
        if (opts.json) return printJson(r);
        const name = themeNames(db);
        say(`Coders: ${r.coders.join(', ')}; ${r.pairablePassages} passages looked at by two or more of them.`);
        say(
          table(
            ['theme', 'units', 'agreement', 'kappa', 'alpha', 'band (alpha)'],
            [
              ...r.themes.filter((t) => t.units).map((t) => [name(t.themeId), t.units, pct(t.percentAgreement), fix(t.kappa.value), fix(t.alpha.value), t.alpha.band ?? '-']),
              ['all themes, pooled', r.pooled.units, pct(r.pooled.percentAgreement), fix(r.pooled.kappa.value), fix(r.pooled.alpha.value), r.pooled.alpha.band ?? '-'],
              ['mean of themes', '', pct(r.meanOfThemes.percentAgreement), fix(r.meanOfThemes.kappa), fix(r.meanOfThemes.alpha), ''],
            ] as (string | number)[][],
          ),
        );
        say(`\nBands: ${r.bandsSource}`);
        say(r.caution);
      });
    });
}
