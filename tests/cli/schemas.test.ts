// Every --json output against its JSON Schema in docs/schema/ (draft 2020-12, validated by ajv),
// every key snake_case, and every command with a --json option covered by a schema file.
import Ajv2020, { type ValidateFunction } from 'ajv/dist/2020.js';
import type { Command } from 'commander';
import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildProgram } from '../../src/cli/main.js';
import { CORPUS, codedDemoStudy, trellis, write } from './run.js';

const SCHEMAS = resolve(import.meta.dirname, '../../docs/schema');
const SHARED = 'common.schema.json';

/** Commands whose --json is refused: review and serve are interactive (their hidden --json says so, exit 1). */
const NO_JSON_OUTPUT = new Set(['review', 'serve']);

/** Objects keyed by passage id, not by names: their keys are data, so not checked for snake_case. */
const KEYED_BY_ID: Record<string, string[]> = { discover: ['nearest', 'none_fits'] };

const SNAKE = /^[a-z][a-z0-9]*(_[a-z0-9]+)*$/;

/** "template set" -> "template-set": the schema file is docs/schema/<name>.schema.json. */
const fileOf = (command: string) => `${command.replace(/ /g, '-')}.schema.json`;

function jsonCommands(program: Command): string[] {
  const out: string[] = [];
  const stack: [Command, string][] = program.commands.map((c) => [c, c.name()]);
  while (stack.length) {
    const [cmd, name] = stack.pop()!;
    if (cmd.options.some((o) => o.long === '--json')) out.push(name);
    for (const sub of cmd.commands) stack.push([sub, `${name} ${sub.name()}`]);
  }
  return out.sort();
}

/** Every key of a value that is not snake_case, with where it is (maps keyed by id skipped). */
function badKeys(value: unknown, skip: string[] = []): string[] {
  const bad: string[] = [];
  const stack: [unknown, string][] = [[value, '']];
  while (stack.length) {
    const [v, at] = stack.pop()!;
    if (Array.isArray(v)) v.forEach((x, i) => stack.push([x, `${at}[${i}]`]));
    else if (v && typeof v === 'object') {
      const isMap = skip.includes(at.slice(1));
      for (const [k, x] of Object.entries(v)) {
        if (!isMap && !SNAKE.test(k)) bad.push(`${at}.${k}`);
        stack.push([x, isMap ? `${at}.*` : `${at}.${k}`]);
      }
    }
  }
  return bad;
}

function validators(): Map<string, ValidateFunction> {
  const ajv = new Ajv2020({ allErrors: true, strict: true, strictTypes: false });
  for (const f of readdirSync(SCHEMAS).filter((f) => f.endsWith('.schema.json'))) ajv.addSchema(JSON.parse(readFileSync(join(SCHEMAS, f), 'utf8')));
  const out = new Map<string, ValidateFunction>();
  for (const f of readdirSync(SCHEMAS).filter((f) => f.endsWith('.schema.json') && f !== SHARED)) out.set(f, ajv.getSchema(f)!);
  return out;
}

describe('--json outputs and their schemas', () => {
  // Outputs by command ("template set"), several where a command has several shapes or cases.
  const outputs = new Map<string, unknown[]>();
  let check: Map<string, ValidateFunction>;
  let dir: string;

  beforeAll(() => {
    check = validators();
    dir = codedDemoStudy();
    const run = (command: string, args: string[], cwd = dir): any => {
      const r = trellis([...args, '--json'], cwd, { TRELLIS_CODER: 'priya' });
      if (r.status !== 0) throw new Error(`${args.join(' ')}: exit ${r.status}: ${r.stderr}`);
      const v = JSON.parse(r.stdout);
      outputs.set(command, [...(outputs.get(command) ?? []), v]);
      return v;
    };
    run('init', ['init', mkdtempSync(join(tmpdir(), 'trellis-schema-'))]);
    run('template set', ['template', 'set', join(CORPUS, 'template.txt')]); // unchanged: revision null
    write(dir, 't13-night-porter.txt', 'Interviewer: How do you hear about a bed move?\n\nAziz: The porter desk phones me, or I read it on the board when I come in.\n');
    run('add', ['add', join(dir, 't13-night-porter.txt')]);
    run('sheet export', ['sheet', 'export', '--coder', 'priya', '--out', 'priya.csv']);
    run('sheet import', ['sheet', 'import', join(dir, 'priya.csv'), '--coder', 'priya']);
    run('status', ['status']);
    const s = run('suggest', ['suggest', '--top', '3']);
    run('profile', ['profile', '--terms', '5']);
    const cands = s.passages.flatMap((p: any) => p.candidates.map((c: any) => ({ ...c, passage_id: p.passage_id })));
    const onPassage = new Set<string>();
    const firsts = cands.filter((c: any) => !onPassage.has(c.passage_id) && onPassage.add(c.passage_id));
    run('decide', ['decide', String(firsts[0].suggestion_id), 'accept']);
    run('decide', ['decide', String(firsts[1].suggestion_id), 'reject', '--note', 'about the old paper system']);
    run('decide', ['decide', String(firsts[2].suggestion_id), 'accept', '--theme', 'Workload', '--coder', 'tom']);
    run('decide', ['decide', String(firsts[3].suggestion_id), 'defer']);
    run('decide', ['decide', '--all-above', '0.95', '--theme', firsts[4].theme]);
    run('nocode', ['nocode', firsts[5].passage_id, '--coder', 'tom']);
    run('undo', ['undo', '--coder', 'tom']);
    run('log', ['log']);
    run('stats', ['stats']);
    run('agree', ['agree', '--coders', 'priya,tom']);
    run('agree', ['agree', '--coders', 'priya,tom,trellis', '--list']);
    const d = run('discover', ['discover']);
    run('triage', ['triage']);
    expect(d.clusters.length).toBeGreaterThanOrEqual(2);
    run('promote', ['promote', d.clusters[0].cluster_id, '--name', 'Paper lists', '--note', 'printed lists kept in pockets']);
    run('dismiss', ['dismiss', d.clusters[1].cluster_id, '--note', 'role descriptions']);
    run('discover', ['discover']); // after a dismissal
    run('export', ['export', 'codings', '--out', 'codings.csv']);
    run('report', ['report', '--out', 'report.html']);
    run('codebook', ['codebook', '--out', 'codebook.md']);
    run('check', ['check']);
    run('memo add', ['memo', 'add', 'Night staff describe the same gap from the other side.', '--theme', 'Team communication']);
    run('memo add', ['memo', 'add', 'Second batch begins.']);
    run('memo list', ['memo', 'list']);
    run('memo show', ['memo', 'show', '1']);
    run('template show', ['template', 'show']);
    run('template add', ['template', 'add', 'Night work', '--parent', 'Workload']);
    run('template rename', ['template', 'rename', 'Workload > Night work', 'Night shifts']);
    run('template add', ['template', 'add', 'Weekend cover']);
    run('template move', ['template', 'move', 'Weekend cover', '--to', 'Workload', '--reason', 'part of the workload story']);
    run('template merge', ['template', 'merge', 'Workload > Weekend cover', 'Workload > Night shifts', '--reason', 'coders could not tell them apart']);
    run('template split', ['template', 'split', 'Workload > Night shifts', '--into', 'Early nights; Late nights', '--reason', 'two patterns']);
    run('template retire', ['template', 'retire', 'Workload > Late nights', '--reason', 'no longer distinct']);
    run('template history', ['template', 'history']);
    const coded = (JSON.parse(trellis(['quote', 'list', '--json'], dir).stdout).themes as any[]).find((t) => t.quotes.length > 1);
    run('quote pin', ['quote', 'pin', coded.quotes[1].passage_id, '--theme', coded.theme]);
    run('quote drop', ['quote', 'drop', coded.quotes[0].passage_id, '--theme', coded.theme]);
    run('quote list', ['quote', 'list']);
    run('quote clear', ['quote', 'clear', coded.quotes[0].passage_id, '--theme', coded.theme]);
    run('alias', ['alias', 'Aziz', 'P13']);
    run('alias', ['alias', 'list']);
    run('alias', ['alias', 'list', '--all']);
    run('alias', ['alias', 'remove', 'Aziz']);
  }, 600_000);

  it('has a schema file for every command with a --json option, and none for a command that is gone', () => {
    const commands = jsonCommands(buildProgram()).filter((c) => !NO_JSON_OUTPUT.has(c));
    const files = readdirSync(SCHEMAS).filter((f) => f.endsWith('.schema.json') && f !== SHARED).sort();
    expect(commands.length).toBeGreaterThan(30);
    expect(commands.map(fileOf).sort()).toEqual(files);
  });

  it('refuses --json where a command has no JSON output (review and serve are interactive)', () => {
    for (const command of NO_JSON_OUTPUT) {
      const r = trellis([command, '--json'], dir);
      expect(r.status, command).toBe(1);
      expect(r.stdout).toBe('');
    }
    // serve says why (review, run here without a terminal, first says it needs one)
    expect(trellis(['serve', '--json'], dir).stderr).toContain('has no --json output');
  });

  it("validates every command's output against its schema", () => {
    const commands = jsonCommands(buildProgram()).filter((c) => !NO_JSON_OUTPUT.has(c));
    for (const command of commands) {
      const seen = outputs.get(command);
      expect(seen, `${command} was not run`).toBeDefined();
      const validate = check.get(fileOf(command))!;
      for (const v of seen!) {
        const ok = validate(v);
        expect(ok ? [] : validate.errors!.map((e) => `${e.instancePath} ${e.message} ${JSON.stringify(e.params)}`), command).toEqual([]);
      }
    }
  });

  it('uses snake_case for every key of every output', () => {
    for (const [command, seen] of outputs) for (const v of seen) expect(badKeys(v, KEYED_BY_ID[command]), command).toEqual([]);
    // The outputs did hold the keys the scripting contract names.
    const s = outputs.get('suggest')![0] as any;
    expect(Object.keys(s.passages[0])).toEqual(expect.arrayContaining(['passage_id', 'transcript', 'unclaimed', 'candidates']));
    expect(Object.keys(s.passages[0].candidates[0])).toEqual(expect.arrayContaining(['suggestion_id', 'theme', 'confidence', 'above_threshold', 'reasons']));
  });

  it('fails a renamed, missing or extra key, and a camelCase key (the checks can fail)', () => {
    const status = structuredClone(outputs.get('status')![0]) as Record<string, unknown>;
    const validate = check.get('status.schema.json')!;
    expect(validate(status)).toBe(true);
    const camel = { ...status, perTheme: status.per_theme };
    delete camel.per_theme;
    expect(validate(camel)).toBe(false);
    expect(validate.errors!.map((e) => e.message)).toEqual(expect.arrayContaining(["must have required property 'per_theme'", 'must NOT have additional properties']));
    expect(badKeys(camel)).toEqual(['.perTheme']);
    const suggest = structuredClone(outputs.get('suggest')![0]) as any;
    suggest.passages[0].candidates[0].aboveThreshold = true;
    expect(check.get('suggest.schema.json')!(suggest)).toBe(false);
    expect(badKeys(suggest)).toEqual(['.passages[0].candidates[0].aboveThreshold']);
    // Keys of a map keyed by passage id are data; the values inside are still checked.
    expect(badKeys({ nearest: { 't01#2': { themeId: 'T1' } } }, ['nearest'])).toEqual(['.nearest.*.themeId']);
  });
});
