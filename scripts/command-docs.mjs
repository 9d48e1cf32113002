// Writes docs/commands.md from the CLI's own --help texts (examples included), so the reference
// never drifts from the program. Run: npm run docs:commands
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { buildProgram } from '../dist/cli/main.js';

/** The full help of a command, as `trellis ... --help` prints it. */
function helpOf(cmd) {
  let out = '';
  cmd.configureOutput({ writeOut: (s) => (out += s), writeErr: (s) => (out += s) });
  cmd.outputHelp();
  return out.trimEnd();
}

const program = buildProgram();
const lines = [
  '# Command reference',
  '',
  "Generated from the program's own `--help` texts by `npm run docs:commands`.",
  '',
  '```',
  helpOf(program),
  '```',
  '',
];
const walk = (cmd, prefix) => {
  for (const sub of cmd.commands) {
    const name = `${prefix} ${sub.name()}`.trim();
    lines.push(`## trellis ${name}`, '', '```', helpOf(sub), '```', '');
    walk(sub, name);
  }
};
walk(program, '');
writeFileSync(join(import.meta.dirname, '..', 'docs', 'commands.md'), lines.join('\n'));
console.log('wrote docs/commands.md');
