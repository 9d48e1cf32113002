import { Command, CommanderError } from 'commander';
import { knownProblem } from '../study/files.js';
import { plain } from './output.js';
import { registerAdd } from './add.js';
import { registerCheck } from './check.js';
import { registerInit } from './init.js';
import { registerSheet } from './sheet.js';
import { registerStatus } from './status.js';
import { registerSuggest } from './suggest.js';
import { registerProfile } from './profile.js';
import { registerDecide } from './decide.js';
import { registerLog } from './log.js';
import { registerReview } from './review.js';
import { registerAgree, registerStats } from './stats.js';
import { registerExport } from './export.js';
import { registerReport } from './report.js';
import { registerDiscover } from './discover.js';
import { registerTemplate } from './template.js';
import { registerMemo } from './memo.js';
import { registerQuote } from './quote.js';
import { registerAlias } from './alias.js';
import { registerServe } from './serve.js';

export const CAUTIONS = `
Your data: trellis opens no network connection (trellis serve listens on 127.0.0.1 only);
the study (study.db and template.txt) stays in its folder on your disk. Suggestions are aids: the researcher decides every coding.
Ethics approval, consent, de-identification and data-protection duties remain with the
research team, under their institution's rules.`;

export function buildProgram(): Command {
  // Set before the commands are added: a command inherits it when it is made, so a mistake in a
  // command's own options returns exit status 1 through main() instead of ending the process
  // from inside commander (which a warm test process, or any caller of main(), cannot survive).
  const program = new Command('trellis')
    .exitOverride()
    .description('Apply a template of themes to new interview transcripts: import, code, and keep an audit trail.')
    .version('0.1.0')
    .showHelpAfterError('(run with --help for usage)')
    .addHelpText(
      'after',
      `
Examples:
  trellis init my-study                      create a study folder
  cd my-study
  trellis template set template.txt          record the template (an outline)
  trellis add ~/interviews/*.txt             import transcripts
  trellis sheet export --out sheet.csv       code the first batch in a spreadsheet...
  trellis sheet import sheet.csv --coder alex
  trellis suggest --transcript t05           candidate themes with confidence and reasons
  trellis review --coder alex                decide them one passage at a time
  trellis serve --coder alex                 the same review in your browser (127.0.0.1 only)
  trellis discover                           what the template misses
  trellis stats                              how often suggestions were accepted
  trellis memo add "..." --theme Workload    a memo on a theme, transcript, passage or the study
  trellis report --out report.html           the study report
${CAUTIONS}`,
    );
  registerInit(program);
  registerAdd(program);
  registerTemplate(program);
  registerSheet(program);
  registerStatus(program);
  registerSuggest(program);
  registerProfile(program);
  registerDecide(program);
  registerLog(program);
  registerReview(program);
  registerStats(program);
  registerAgree(program);
  registerExport(program);
  registerDiscover(program);
  registerReport(program);
  registerCheck(program);
  registerMemo(program);
  registerQuote(program);
  registerAlias(program);
  registerServe(program);
  return program;
}

/** Runs the CLI; exit status 0 success, 1 user error, 2 internal error. */
export async function main(argv: string[]): Promise<number> {
  // Output piped into a pager or `head` that stops reading is not an error.
  if (!process.stdout.listenerCount('error')) {
    process.stdout.on('error', (e: NodeJS.ErrnoException) => {
      if (e.code === 'EPIPE') process.exit(0);
      throw e;
    });
  }
  const program = buildProgram();
  try {
    await program.parseAsync(argv);
    return 0;
  } catch (e) {
    if (e instanceof CommanderError) {
      // Help and version are "errors" to commander; a usage mistake is the user's.
      return e.code === 'commander.helpDisplayed' || e.code === 'commander.version' || e.exitCode === 0 ? 0 : 1;
    }
    const known = knownProblem(e);
    if (known) {
      process.stderr.write(`trellis: ${plain(known.describe())}\n`);
      return 1;
    }
    process.stderr.write(`trellis: internal error: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}\n`);
    return 2;
  }
}
