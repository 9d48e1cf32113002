import type { Command } from 'commander';
import { UserError } from '../errors.js';
import { decodeText } from '../ingest/decode.js';
import { readInputFile } from '../ingest/limits.js';
import { addTheme, mergeThemes, moveTheme, renameTheme, retireTheme, splitTheme } from '../template/ops.js';
import { findByPath, splitPathList, walk, type WalkEntry } from '../template/paths.js';
import { describeChange } from '../template/describe.js';
import type { Revised, Template } from '../template/types.js';
import { currentCodings } from '../study/codings.js';
import { integrativeCoverage } from '../measure/integrative.js';
import { themeCounts } from '../jobs/status.js';
import { reviseTemplate, setTemplate, type RevisionResult } from '../jobs/revise.js';
import { currentRevision, revisionHistory } from '../study/template.js';
import { coderName, coderOf, withStudy, type StudyOpts } from './common.js';
import { printJson, say, warn } from './output.js';
import { templateShowJson } from './template-json.js';

type Opts = StudyOpts & { reason?: string; coder?: string };

function withCommon(cmd: Command): Command {
  return cmd
    .option('--study <dir>', 'the study folder', '.')
    .option('--json', 'machine-readable output on stdout');
}

function revising(cmd: Command): Command {
  return withCommon(cmd)
    .option('--reason <text>', 'why: kept in the revision history (the audit trail)')
    .option('--coder <name>', "who made the change (default: the study's coder)", coderName);
}

function report(r: RevisionResult, json?: boolean): void {
  if (json) return printJson({ revision: r.rev, changes: r.changes, warnings: r.warnings.map((w) => w.text) });
  for (const w of r.warnings) warn(w.text);
  if (r.rev === null) return say('The template is unchanged; no new revision.');
  say(`Recorded template revision ${r.rev}${r.changes.length ? ':' : '.'}`);
  if (r.changes.length > 8 && r.changes.every((c) => c.kind === 'added')) {
    return say(`  added ${r.changes.length} themes (see: trellis template show)`);
  }
  for (const c of r.changes) say('  ' + describeChange(c));
}

/** Resolves a theme path in the current template, for the revision operations. */
function theme(t: Template, path: string): string {
  return findByPath(t, path).id;
}

export function registerTemplate(program: Command): void {
  const tpl = program
    .command('template')
    .description('the hierarchical template of themes: set it from an outline, show it, revise it')
    .addHelpText(
      'after',
      `
Outline format (template.txt): one theme per line, sub-themes indented by two spaces,
"#" starts a comment, a line ending in [a priori] marks an a priori theme. Notes go on
lines indented one level deeper, starting with "| ": definition:, include:, exclude:,
seeds: (comma-separated terms). See docs/template-format.md.

Examples:
  trellis template set template.txt --reason "after coding the first four interviews"
  trellis template show
  trellis template rename "Workload > Staffing" "Staffing levels" --reason "clearer"
  trellis template move "Interruptions" --to "Workload" --reason "part of the workload story"
  trellis template merge "Workload > Overtime" "Workload > Staffing levels" --reason "coders could not tell them apart"
  trellis template split "Patient safety > Information" --into "Information lost; Information gained" --reason "two directions"
  trellis template retire "Team communication > Night staff" --reason "no longer distinct"`,
    );

  withCommon(tpl.command('set <file>').description('record FILE as the new template revision (template.txt is kept equal to it)'))
    .option('--reason <text>', 'why: kept in the revision history')
    .option('--coder <name>', "who made the change (default: the study's coder)", coderName)
    .option('--renamed <"old; new">', 'a coded theme gone from the outline is this new one (renamed or moved by hand): its codings follow (repeatable)', (v: string, all: string[] = []) => [...all, v])
    .option('--retire <path>', 'a coded theme gone from the outline is to be retired, its codings kept in its history (repeatable)', (v: string, all: string[] = []) => [...all, v])
    .addHelpText(
      'after',
      `
A coded theme that disappears from the outline is never retired silently: template set stops and
lists such themes with their counts, and you say for each whether it was renamed or moved
(--renamed "Workload > Staffing; Workload > Staffing levels") or is to be retired (--retire PATH).

Examples:
  trellis template set template.txt --reason "after the first four interviews"
  trellis template set template.txt --renamed "Interruptions; Being interrupted"
  trellis template set template.txt --retire "Team communication > Night staff" --reason "no longer distinct"`,
    )
    .action(async (file: string, opts: Opts & { renamed?: string[]; retire?: string[] }) => {
      const bytes = readInputFile(file);
      const decoded = decodeText(bytes, file);
      for (const w of decoded.warnings) warn(w); // as add does: a misread encoding must not pass unseen
      const text = decoded.text;
      const r = await withStudy(opts, (study) => setTemplate(study, text, file, coderOf(opts, study.db, false), opts.reason, {
          retire: opts.retire,
          renamed: (opts.renamed ?? []).map((pair) => {
            const parts = splitPathList(pair);
            if (parts.length !== 2) throw new UserError(`--renamed takes "OLD PATH; NEW PATH" (got "${pair}")`);
            return [parts[0]!, parts[1]!] as [string, string];
          }),
        }));
      report(r, opts.json);
    });

  withCommon(tpl.command('show').description('the numbered template (1, 1.1, 1.1.1) with passage counts')).action(async (opts: Opts) => {
    await withStudy(opts, ({ db }) => {
      const rev = currentRevision(db);
      if (!rev) {
        if (opts.json) return printJson(templateShowJson(null, null, new Map(), []));
        return say('No template yet: write one in template.txt and run "trellis template set template.txt".');
      }
      const counts = new Map(themeCounts(db, rev.template).map((c) => [c.id, c]));
      const across = integrativeCoverage(rev.template, currentCodings(db).map((c) => ({ passageId: c.passage_id, themeId: c.theme_id })));
      if (opts.json) return printJson(templateShowJson(rev.rev, rev.template, counts, across));
      say(`Template revision ${rev.rev} (${rev.created_at.slice(0, 16).replace('T', ' ')}, ${rev.action})`);
      const line = (e: WalkEntry) => {
        const c = counts.get(e.node.id)!;
        const n = c.total === c.direct ? `${c.direct}` : `${c.direct}, ${c.total} with sub-themes`;
        say(`${'  '.repeat(e.depth)}${e.number}  ${e.node.name}${e.node.apriori ? '  [a priori]' : ''}  (${n})`);
      };
      const entries = [...walk(rev.template)];
      entries.filter((e) => !e.integrative).forEach(line);
      if (across.length) {
        say('\nIntegrative themes (they run across the themes above and are coded alongside any of them):');
        entries.filter((e) => e.integrative).forEach(line);
        for (const x of across) {
          const touched = x.across.filter((a) => a.passages > 0).map((a) => `${a.name} ${a.passages}`);
          say(`  ${x.name}: ${x.passages ? `touches ${x.touches} of ${x.across.length} top-level themes${touched.length ? ` (${touched.join(', ')})` : ''}` : 'not coded yet'}`);
        }
      }
    });
  });

  withCommon(tpl.command('history').description('every template revision: when, who, what changed and why')).action(async (opts: Opts) => {
    await withStudy(opts, ({ db }) => {
      const revs = revisionHistory(db);
      if (opts.json) return printJson({ revisions: revs.map(({ template: _t, outline: _o, ...r }) => r) });
      if (!revs.length) return say('No template revisions yet.');
      for (const r of revs) {
        say(`revision ${r.rev}  ${r.created_at.slice(0, 16).replace('T', ' ')}  ${r.author}  ${r.action}${r.reason ? `  — ${r.reason}` : ''}`);
        for (const c of r.changes) say('    ' + describeChange(c));
      }
    });
  });

  const op = (name: string, run: (t: Template, newId: () => string) => Revised) => (opts: Opts) => {
    // These change what existing codings mean: the audit trail needs the reason.
    if (['move', 'merge', 'split', 'retire'].includes(name) && !opts.reason?.trim()) {
      throw new UserError(`template ${name} needs --reason "why": it is kept in the revision history (the audit trail)`);
    }
    return withStudy(opts, (study) => report(reviseTemplate(study, name, run, coderOf(opts, study.db, false), opts.reason), opts.json));
  };

  revising(tpl.command('rename <path> <new-name>').description('rename a theme (its id, codings and history stay)')).action(
    (path: string, newName: string, opts: Opts) => op('rename', (t) => renameTheme(t, theme(t, path), newName))(opts),
  );
  revising(tpl.command('move <path>').description('move a theme (with its sub-themes) under another theme, or to the top level'))
    .option('--to <parent>', 'the new parent theme')
    .option('--top', 'make it a top-level theme')
    .action((path: string, opts: Opts & { to?: string; top?: boolean }) => {
      if (!opts.to === !opts.top) throw new UserError('say where to: --to PARENT or --top');
      return op('move', (t) => moveTheme(t, theme(t, path), opts.top ? null : theme(t, opts.to!)))(opts);
    });
  revising(tpl.command('merge <source> <target>').description("merge SOURCE into TARGET: SOURCE's codings and sub-themes follow")).action(
    (source: string, target: string, opts: Opts) => op('merge', (t) => mergeThemes(t, theme(t, source), theme(t, target)))(opts),
  );
  revising(tpl.command('split <path>').description('split a theme into new sibling themes; its passages need re-coding'))
    .requiredOption('--into <names>', 'the new names, separated by ";"')
    .action((path: string, opts: Opts & { into: string }) =>
      op('split', (t, newId) => splitTheme(t, theme(t, path), splitPathList(opts.into), newId))(opts),
    );
  revising(tpl.command('retire <path>').description('retire a theme: out of the template, history kept; sub-themes move up')).action(
    (path: string, opts: Opts) => op('retire', (t) => retireTheme(t, theme(t, path)))(opts),
  );
  revising(tpl.command('add <name>').description('add a theme (at the top level, or under --parent)'))
    .option('--parent <path>', 'the parent theme')
    .action((name: string, opts: Opts & { parent?: string }) =>
      op('add', (t, newId) => addTheme(t, opts.parent ? theme(t, opts.parent) : null, name, newId))(opts),
    );
}
