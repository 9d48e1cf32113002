import type { Command } from 'commander';
import { UserError } from '../errors.js';
import { addMemo, getMemo, listMemos, type Memo, type MemoTarget } from '../study/memos.js';
import { coderOf, studyCommand, withStudy, type StudyOpts } from './common.js';
import { plural, printJson, say } from './output.js';

interface TargetOpts {
  theme?: string;
  transcript?: string;
  passage?: string;
  wholeStudy?: boolean;
}

/** At most one of --theme, --transcript, --passage, --whole-study; none means the study (add) or all (list). */
function targetOf(opts: TargetOpts): MemoTarget | undefined {
  const given = [
    opts.theme !== undefined ? ({ kind: 'theme', value: opts.theme } as const) : null,
    opts.transcript !== undefined ? ({ kind: 'transcript', value: opts.transcript } as const) : null,
    opts.passage !== undefined ? ({ kind: 'passage', value: opts.passage } as const) : null,
    opts.wholeStudy ? ({ kind: 'study' } as const) : null,
  ].filter((t) => t !== null);
  if (given.length > 1) throw new UserError('a memo is on one thing: give only one of --theme, --transcript, --passage, --whole-study');
  return given[0];
}

function line(m: Memo): string {
  return `memo #${m.memo_id}  ${m.at.slice(0, 16).replace('T', ' ')}  ${m.author}  on ${m.target_kind === 'study' ? 'the study' : `${m.target_kind} ${m.target_label}`}`;
}

function withTargets(cmd: Command): Command {
  return cmd
    .option('--theme <path>', 'a theme (path or unique name)')
    .option('--transcript <name>', 'a transcript')
    .option('--passage <id>', 'a passage (ids as in trellis suggest or the coding sheet)')
    .option('--whole-study', 'the study as a whole');
}

export function registerMemo(program: Command): void {
  const memo = program
    .command('memo')
    .description('memos: dated, attributed notes on a theme, a transcript, a passage or the study')
    .addHelpText(
      'after',
      `
Memos keep the analyst's thinking beside the data: why a theme was defined so, what a
transcript showed, a doubt about a passage. They are kept as written (a later memo can revise an
earlier one), listed in the report and the codebook, and the coding sheet's "note" column holds
the coder's latest memo on each passage.

Examples:
  trellis memo add "Night staff describe the same gap from the other side." --theme "Team communication" --author priya
  trellis memo add "Interview cut short by a ward emergency." --transcript t05-ward9-fy2
  trellis memo add "Second batch: the template now has 3 levels." --whole-study
  trellis memo list --theme "Team communication"
  trellis memo show 3 --json`,
    );

  withTargets(studyCommand(memo, 'add', 'add a memo (on the study when no target is given)'))
    .argument('<text>', 'the memo')
    .option('--author <name>', "who writes it (default: $TRELLIS_CODER, else the study's coder)")
    .action(async (text: string, opts: StudyOpts & TargetOpts & { author?: string }) => {
      const target = targetOf(opts) ?? { kind: 'study' };
      await withStudy(opts, ({ db }) => {
        const m = addMemo(db, target, text, coderOf({ coder: opts.author }, db));
        if (opts.json) return printJson(m);
        say(`Added ${line(m)}.`);
      });
    });

  withTargets(studyCommand(memo, 'list', 'list memos, oldest first (all, or those on one target)')).action(async (opts: StudyOpts & TargetOpts) => {
    const target = targetOf(opts);
    await withStudy(opts, ({ db }) => {
      const memos = listMemos(db, target);
      if (opts.json) return printJson({ memos });
      if (!memos.length) return say(target ? 'No memos on that yet.' : 'No memos yet: trellis memo add "TEXT" [--theme PATH | --transcript NAME | --passage ID].');
      for (const m of memos) {
        say(line(m));
        say(`    ${m.text.replace(/\s*\n\s*/g, ' ')}`);
      }
      say(`\n${plural(memos.length, 'memo')}.`);
    });
  });

  studyCommand(memo, 'show', 'one memo in full')
    .argument('<memo-id>', 'the memo number (from trellis memo list)')
    .action(async (id: string, opts: StudyOpts) => {
      const n = Number(id);
      if (!Number.isInteger(n) || n < 1) throw new UserError(`"${id}" is not a memo number (see "trellis memo list")`);
      await withStudy(opts, ({ db }) => {
        const m = getMemo(db, n);
        if (opts.json) return printJson(m);
        say(line(m));
        say('');
        say(m.text);
      });
    });
}
