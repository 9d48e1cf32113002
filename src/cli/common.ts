import { Command, InvalidArgumentError } from 'commander';
import { rememberCoder, studyCoder, type DB } from '../study/db.js';
import { openStudy, type Study } from '../study/study.js';
import { UserError } from '../errors.js';
import { checkOutputPath, writeOutputFile } from '../study/files.js';

export interface StudyOpts {
  study: string;
  json?: boolean;
}

/** Adds the options every study command shares: --study DIR and --json. */
export function studyCommand(program: Command, name: string, description: string): Command {
  return program
    .command(name)
    .description(description)
    .option('--study <dir>', 'the study folder', '.')
    .option('--json', 'machine-readable output on stdout');
}

export interface OutputOpts extends StudyOpts {
  out: string;
  force?: boolean;
}

/** Adds --force to a command that writes --out FILE. */
export function forceOption(cmd: Command): Command {
  return cmd.option('--force', 'overwrite the --out file if it exists');
}

/** Fails before any work when --out would hit the study itself, a folder, or an existing file. */
export function checkOut(opts: OutputOpts): void {
  checkOutputPath(opts.out, opts.study, opts.force);
}

/** Writes the --out file: whole or not at all, owner-only, never over the study. */
export function writeOut(opts: OutputOpts, data: string): void {
  writeOutputFile(opts.out, data, opts.study, opts.force);
}

/** Opens the study, runs `work` on it, and always closes it. */
export async function withStudy<T>(opts: StudyOpts, work: (study: Study) => T | Promise<T>): Promise<T> {
  const study = openStudy(opts.study);
  try {
    const out = await work(study);
    if (named) rememberCoder(study.db, named); // a failed command leaves the study exactly as it was
    return out;
  } finally {
    named = null; // one command's name, never the next one's (tests run many commands in one process)
    study.close();
  }
}

/**
 * The one parser for every --coder option: the name goes into the audit trail, so an empty or
 * blank name is refused (exit 1) rather than recorded as nobody. Surrounding spaces are dropped.
 */
export function coderName(v: string): string {
  const name = v.trim();
  if (name === '') throw new InvalidArgumentError('the coder\'s name is empty: give a name, e.g. --coder alex');
  return name;
}

/** A name given with --coder in this command, to remember for the study if it has none yet. */
let named: string | null = null;

/** The name recorded when nobody has said who is working: never the machine's login name. */
export const UNNAMED = 'researcher';

/**
 * Who is working: --coder, else $TRELLIS_CODER, else the study's coder (init --coder, or the first
 * --coder given, which is remembered). Decisions need a name; a revision or an import without
 * one is recorded under UNNAMED, with a hint.
 */
export function coderOf(opts: { coder?: string }, db: DB, required = true): string {
  const given = opts.coder?.trim();
  if (given) {
    named = given; // remembered once the command has succeeded (withStudy)
    return given;
  }
  const known = process.env.TRELLIS_CODER?.trim() || studyCoder(db);
  if (known) return known;
  if (required) throw new UserError('say who decides: --coder NAME (remembered for this study from then on), or set TRELLIS_CODER');
  process.stderr.write(`trellis: recorded as "${UNNAMED}"; give your name once with --coder NAME and this study remembers it\n`);
  return UNNAMED;
}

/** Collects a repeatable option into a list. */
export function collect(value: string, previous: string[] = []): string[] {
  return [...previous, ...value.split(',').map((v) => v.trim()).filter(Boolean)];
}

/** Parses a positive whole number option, with a clear message. */
export function positiveInt(name: string) {
  return (v: string): number => {
    const n = Number(v);
    if (!Number.isInteger(n) || n < 1) throw new InvalidArgumentError(`${name} must be a whole number of at least 1 (got "${v}")`);
    return n;
  };
}

/** Parses an option that must be a probability in (0, 1]. */
export function probability(name: string) {
  return (v: string): number => {
    const n = Number(v);
    if (!Number.isFinite(n) || n <= 0 || n > 1) throw new InvalidArgumentError(`${name} must be a number above 0 and at most 1 (got "${v}")`);
    return n;
  };
}
