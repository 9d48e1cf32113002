import type { Command } from 'commander';
import { UserError } from '../errors.js';
import { namesAndAliases } from '../jobs/aliases.js';
import { listAliases, removeAlias, setAlias, type AliasKind } from '../study/aliases.js';
import { studyCommand, withStudy, type StudyOpts } from './common.js';
import { plural, printJson, say, table } from './output.js';

type Opts = StudyOpts & { speaker?: boolean; transcript?: boolean; all?: boolean };

function kind(opts: Opts): AliasKind | undefined {
  if (opts.speaker && opts.transcript) throw new UserError('give --speaker or --transcript, not both');
  return opts.speaker ? 'speaker' : opts.transcript ? 'transcript' : undefined;
}

export function registerAlias(program: Command): void {
  studyCommand(program, 'alias', 'pseudonyms: give a speaker or a transcript an alias that outputs show instead of its name')
    .argument('[args...]', 'SPEAKER|TRANSCRIPT NEW, or list, or remove SPEAKER|TRANSCRIPT')
    .option('--speaker', 'the name is a speaker label (when it is also a transcript name)')
    .option('--transcript', 'the name is a transcript name (when it is also a speaker label)')
    .option('--all', 'with list: every speaker label and transcript name, with or without an alias')
    .addHelpText(
      'after',
      `
Quotes in the report and codebook are credited to a transcript and a speaker. With aliases,
--pseudonymise credits them to "P07" rather than to a first name or to a file name that points
to a person (report, codebook, export codings|log|matrix; sheet export aliases speakers only, as
its passage ids and transcript names must stay real to be read back). The codebook is
pseudonymised unless you pass --no-pseudonymise.

Without an alias, a transcript is shown as T01, T02, ... (import order) and a speaker whose
label looks like a personal name as S01, S02, ...; role labels (Interviewer, Participant, P01)
stay. Speaker names inside quoted text are replaced where they match a label; other details that
could identify someone are not: read the quotes before sharing. The study keeps the real names.
"list" and "remove" as the first word are the commands; pass --speaker or --transcript when a
name is both a speaker label and a transcript name.

Examples:
  trellis alias Bronwen P01
  trellis alias t01-larch-staff-nurse T01
  trellis alias list --all
  trellis alias remove Bronwen`,
    )
    .action(async (args: string[], opts: Opts) => {
      await withStudy(opts, ({ db }) => {
        if (args.length === 1 && args[0] === 'list') {
          if (opts.all) {
            const rows = namesAndAliases(db);
            if (opts.json) return printJson({ names: rows });
            if (!rows.length) return say('No speakers or transcripts yet.');
            say(table(['kind', 'name', 'alias', 'shown as', 'note'], rows.map((r) => [r.kind, r.name, r.alias ?? '-', r.shown_as ?? r.name, r.looks_like_name && !r.alias ? 'looks like a personal name' : ''])));
            return;
          }
          const rows = listAliases(db);
          if (opts.json) return printJson({ aliases: rows });
          if (!rows.length) return say('No aliases yet: trellis alias SPEAKER|TRANSCRIPT NEW (trellis alias list --all shows the names).');
          say(table(['kind', 'name', 'alias', 'set'], rows.map((r) => [r.kind, r.name, r.alias, r.at.slice(0, 16).replace('T', ' ')])));
          return say(`\n${plural(rows.length, 'alias', 'aliases')}.`);
        }
        if (args[0] === 'remove') {
          if (args.length !== 2) throw new UserError('usage: trellis alias remove SPEAKER|TRANSCRIPT');
          const r = removeAlias(db, args[1]!, kind(opts));
          if (opts.json) return printJson({ removed: r });
          return say(`Removed the alias "${r.alias}" of ${r.kind} "${r.name}".`);
        }
        if (args.length !== 2) throw new UserError('usage: trellis alias SPEAKER|TRANSCRIPT NEW, trellis alias list, or trellis alias remove SPEAKER|TRANSCRIPT');
        const a = setAlias(db, args[0]!, args[1]!, kind(opts));
        if (opts.json) return printJson(a);
        say(`${a.kind === 'speaker' ? 'Speaker' : 'Transcript'} "${a.name}" is shown as "${a.alias}" where outputs are pseudonymised.`);
      });
    });
}
