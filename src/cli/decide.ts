import type { Command } from 'commander';
import { UserError } from '../errors.js';
import { acceptAllAbove, decide, markNothingToCode, undo, type Action } from '../study/decisions.js';
import { currentTemplate } from '../study/template.js';
import { describeDecision } from '../review/describe.js';
import { coderName, coderOf, probability, studyCommand, withStudy, type StudyOpts } from './common.js';
import { plural, printJson, say } from './output.js';

export { describeDecision };

interface DecideOpts extends StudyOpts {
  theme?: string;
  note?: string;
  coder?: string;
  allAbove?: number;
}

/** The coder must be named for the audit trail: --coder, or $TRELLIS_CODER. */

const ACTIONS = ['accept', 'reject', 'defer'];

export function registerDecide(program: Command): void {
  studyCommand(program, 'decide', 'accept, reject or defer a suggestion, or re-code the passage to another theme')
    .argument('[suggestion-id]', 'the suggestion id (from trellis suggest)')
    .argument('[action]', 'accept, reject or defer')
    .option('--theme <path>', 'code this theme instead (a re-code); with --all-above, the theme to accept')
    .option('--note <text>', 'a note kept with the decision')
    .option('--coder <name>', 'who decides (default: $TRELLIS_CODER)', coderName)
    .option('--all-above <confidence>', "accept every current suggestion of --theme at or above this confidence (logged as bulk)", probability('--all-above'))
    .addHelpText(
      'after',
      `
Every decision is appended to the decision log, never rewritten: undo makes a new entry.
An accept or re-code becomes a coding by the coder; a reject teaches the next suggest.

Examples:
  trellis decide 412 accept --coder alex
  trellis decide 413 reject --note "about the old paper system" --coder alex
  trellis decide 414 accept --theme "Workload > Staffing levels" --coder alex   (a re-code)
  trellis decide --all-above 0.9 --theme "Patient safety > Allergies" --coder alex
  trellis undo --coder alex`,
    )
    .action(async (id: string | undefined, action: string | undefined, opts: DecideOpts) => {
      await withStudy(opts, ({ db }) => {
        const coder = coderOf(opts, db);
        if (opts.allAbove !== undefined) {
          if (id || action) throw new UserError('--all-above decides many suggestions: give no suggestion id');
          if (!opts.theme) throw new UserError('--all-above needs the theme to accept: --theme PATH');
          const done = acceptAllAbove(db, opts.allAbove, opts.theme, coder, opts.note);
          if (opts.json) return printJson({ decisions: done });
          return say(`Accepted ${plural(done.length, 'suggestion')} of ${opts.theme} at confidence ${opts.allAbove} or more (logged as bulk).`);
        }
        const n = Number(id);
        if (!id || !Number.isInteger(n) || n < 1) throw new UserError('give the suggestion id, e.g. "trellis decide 412 accept"');
        if (!action || !ACTIONS.includes(action)) throw new UserError(`the action is one of ${ACTIONS.join(', ')} (got "${action ?? ''}")`);
        const d = decide(db, { suggestionId: n, action: action as Action, themePath: opts.theme, note: opts.note, coder });
        if (opts.json) return printJson(d);
        say(describeDecision(d, currentTemplate(db)));
      });
    });

  studyCommand(program, 'nocode', 'mark passages "reviewed, nothing to code": they leave the review queue and the unclaimed pool')
    .argument('<passage-id...>', 'the passages (ids as in trellis suggest or the coding sheet)')
    .option('--coder <name>', 'who reviewed them (default: $TRELLIS_CODER)')
    .option('--note <text>', 'why nothing applies (kept with each decision)')
    .addHelpText(
      'after',
      `
A passage read and judged to need no theme is a decision like any other: it is logged, counted
in trellis stats, leaves the review queue and the unclaimed pool, and undo withdraws it. For
agreement it counts as the coder having looked at the passage and applied no theme.

Examples:
  trellis nocode t05-ward9-fy2-p014 --coder alex
  trellis nocode t05-ward9-fy2-p014 t05-ward9-fy2-p015 --note "arranging the next interview" --coder alex`,
    )
    .action(async (ids: string[], opts: StudyOpts & { coder?: string; note?: string }) => {
      await withStudy(opts, ({ db }) => {
        const coder = coderOf(opts, db);
        const done = markNothingToCode(db, ids, coder, opts.note);
        if (opts.json) return printJson({ decisions: done });
        const t = currentTemplate(db);
        for (const d of done) say(describeDecision(d, t));
      });
    });

  studyCommand(program, 'undo', "undo a decision (default: the coder's latest): a compensating entry in the log")
    .argument('[decision-id]', 'the decision to undo')
    .option('--coder <name>', 'who undoes it (default: $TRELLIS_CODER)', coderName)
    .option('--note <text>', 'why')
    .addHelpText('after', '\nExamples:\n  trellis undo --coder alex\n  trellis undo 57 --coder alex --note "wrong passage"')
    .action(async (id: string | undefined, opts: StudyOpts & { coder?: string; note?: string }) => {
      await withStudy(opts, ({ db }) => {
        const coder = coderOf(opts, db);
        const n = id === undefined ? undefined : Number(id);
        if (n !== undefined && (!Number.isInteger(n) || n < 1)) throw new UserError(`"${id}" is not a decision id`);
        const d = undo(db, coder, n, opts.note);
        if (opts.json) return printJson(d);
        say(describeDecision(d, currentTemplate(db)));
      });
    });
}
