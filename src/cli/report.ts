import type { Command } from 'commander';
import { resolve } from 'node:path';
import { UserError } from '../errors.js';
import { reportCautions } from '../report/cautions.js';
import { renderCodebook, renderReport, type CodebookFormat } from '../report/index.js';
import { passageCount } from '../study/passages.js';
import { reportData } from '../jobs/report-data.js';
import { checkOut, forceOption, studyCommand, withStudy, writeOut, type OutputOpts } from './common.js';
import { plural, printJson, say } from './output.js';
import { workingNote } from './progress.js';

export function registerReport(program: Command): void {
  forceOption(studyCommand(program, 'report', 'write the study report: one self-contained HTML file with charts, opens offline'))
    .requiredOption('--out <file>', 'the HTML file to write')
    .option('--title <text>', 'the report title (default: from the study folder name)')
    .option('--pseudonymise', 'name speakers and transcripts by their aliases (trellis alias), with codes for those without one')
    .addHelpText(
      'after',
      `
The report holds the template with counts and its revision history, a theme x transcript heat
map, acceptance per theme and over time, the calibration chart, template growth by transcript, the
unclaimed share and clusters, the agreement table, and quotes per theme (trellis quote pins
and drops them; the report says how the rest were chosen). It contains passages of your
transcripts: store and share it as you would the transcripts, and use --pseudonymise (with
trellis alias) before it leaves the team.

Examples:
  trellis report --out handover-report.html
  trellis report --out report.html --title "Handover study, interim"
  trellis report --out report-shared.html --pseudonymise`,
    )
    .action(async (opts: OutputOpts & { title?: string; pseudonymise?: boolean }) => {
      checkOut(opts);
      const html = await withStudy(opts, (study) => {
        const passages = passageCount(study.db);
        workingNote(`Gathering the report's figures over ${plural(passages, 'passage')}...`, { json: opts.json, passages });
        return renderReport(reportData(study, { title: opts.title, quotes: 3, cautions: reportCautions, pseudonymise: opts.pseudonymise === true }));
      });
      writeOut(opts, html);
      if (opts.json) printJson({ out: resolve(opts.out), bytes: Buffer.byteLength(html), pseudonymised: opts.pseudonymise === true });
      else say(`Wrote the report to ${resolve(opts.out)} (open it in any browser; it needs no network).`);
    });

  forceOption(studyCommand(program, 'codebook', 'write the codebook: the numbered template with definitions, notes, counts and example quotes'))
    .requiredOption('--out <file>', 'the file to write')
    .option('--format <format>', 'md, html or csv', 'md')
    .option('--pseudonymise', 'name speakers and transcripts by their aliases (the default)')
    .option('--no-pseudonymise', 'name speakers and transcripts as stored in the study')
    .addHelpText(
      'after',
      `
The codebook is made to be shared (a thesis appendix, a second coder's briefing), so its example
quotes are pseudonymised unless you pass --no-pseudonymise: speakers and transcripts are named by
their aliases (trellis alias), with codes for those without one.

Examples:
  trellis codebook --out codebook.md
  trellis codebook --format csv --out codebook.csv
  trellis codebook --out team-codebook.md --no-pseudonymise`,
    )
    .action(async (opts: OutputOpts & { format: string; pseudonymise?: boolean }) => {
      if (!['md', 'html', 'csv'].includes(opts.format)) throw new UserError(`--format is md, html or csv (got "${opts.format}")`);
      checkOut(opts);
      const text = await withStudy(opts, (study) => renderCodebook(reportData(study, { quotes: 2, cautions: reportCautions, pseudonymise: opts.pseudonymise !== false }), opts.format as CodebookFormat));
      writeOut(opts, text);
      if (opts.json) printJson({ out: resolve(opts.out), format: opts.format, pseudonymised: opts.pseudonymise !== false });
      else say(`Wrote the codebook to ${resolve(opts.out)}.`);
    });
}
