import type { Command } from 'commander';
import { findByPath } from '../template/paths.js';
import { fitModel } from '../jobs/suggest.js';
import { writtenForms } from '../jobs/written-forms.js';
import { currentTemplate } from '../study/template.js';
import { probability, studyCommand, withStudy, type StudyOpts } from './common.js';
import { printJson, say, table } from './output.js';
import { profileJson } from './profile-json.js';

const pct = (x: number | null) => (x === null ? 'n/a' : `${Math.round(100 * x)}%`);

export function registerProfile(program: Command): void {
  studyCommand(program, 'profile', "what trellis learned about a theme (or every theme): top terms, exemplars, expected precision and recall")
    .argument('[theme]', 'a theme path or unique name (default: every theme)')
    .option('--target-precision <p>', "the precision each theme's threshold aims at", probability('--target-precision'), 0.7)
    .option('--terms <n>', 'how many top terms to show', (v) => Number(v), 10)
    .addHelpText('after', '\nExamples:\n  trellis profile\n  trellis profile "Workload > Staffing levels" --terms 20')
    .action(async (theme: string | undefined, opts: StudyOpts & { targetPrecision: number; terms: number }) => {
      await withStudy(opts, ({ db }) => {
        const only = theme ? findByPath(currentTemplate(db), theme).id : null;
        const { model, keep } = fitModel(db, { targetPrecision: opts.targetPrecision });
        const reports = model.themeReports().filter((r) => !only || r.themeId === only).map((r) => ({ ...r, topTerms: r.topTerms.slice(0, opts.terms) }));
        keep(); // the next command on the same codings scores from this fit
        // Terms as the study writes them (the analysis may spell a lemma otherwise).
        const forms = writtenForms(db, reports.flatMap((r) => r.topTerms.map((t) => t.term)));
        for (const r of reports) r.topTerms = r.topTerms.map((t) => ({ ...t, written: forms.get(t.term) ?? t.term }));
        if (opts.json) return printJson(profileJson(model.fingerprint, reports));
        for (const r of reports) {
          say(`${r.path}`);
          say(
            `  ${r.exemplars} coded passages in ${r.transcripts} transcripts; threshold ${r.threshold.toFixed(2)}; ` +
              `expected precision ${pct(r.expectedPrecision)}, recall ${pct(r.expectedRecall)}${r.seedOnly ? ' (profile from definition and seeds only)' : ''}`,
          );
          const terms = r.topTerms;
          if (terms.length) {
            say(table(['term', 'log-odds', 'z'], terms.map((t) => [t.written ?? t.term, t.weight.toFixed(2), t.z.toFixed(1)])).split('\n').map((l) => '    ' + l).join('\n'));
          }
          for (const w of r.warnings) say(`  warning: ${w}`);
          say('');
        }
      });
    });
}
