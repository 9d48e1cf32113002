import type { Command } from 'commander';
import { openStudy } from '../study/study.js';
import { startServer } from '../web/server.js';
import { coderName, coderOf, studyCommand } from './common.js';
import { say } from './output.js';
import { UserError } from '../errors.js';
import { InvalidArgumentError } from 'commander';

function portNumber(v: string): number {
  const n = Number(v);
  if (!Number.isInteger(n) || n < 0 || n > 65535) throw new InvalidArgumentError(`--port must be a whole number from 0 to 65535 (got "${v}")`);
  return n;
}

export function registerServe(program: Command): void {
  const cmd = studyCommand(program, 'serve', 'review in the browser: a page on this computer only (127.0.0.1), until Ctrl-C');
  cmd.options.find((o) => o.long === '--json')?.hideHelp();
  cmd
    .option('--port <n>', 'the port (default: any free one)', portNumber, 0)
    .option('--coder <name>', 'who decides (default: $TRELLIS_CODER or the study\'s coder)', coderName)
    .addHelpText(
      'after',
      `
Prints one address holding a random token: open it in your browser. The server listens on
127.0.0.1 only, never another interface; a request without the token (or the cookie it sets),
with another Host, or a change from another page's Origin is refused. The pages load nothing
from anywhere else. Decisions go to the same log as trellis review, with the same rules: a
browser tab and a terminal review open at once never decide one suggestion twice.

Suggestions are aids: the researcher decides every coding. The study holds personal data and
stays on this computer. Ethics approval, consent and de-identification remain with the
research team.

Examples:
  trellis serve --coder alex
  trellis serve --study handover --port 8765 --coder priya`,
    )
    .action(async (opts: { study: string; port: number; coder?: string; json?: boolean }) => {
      if (opts.json) throw new UserError('serve runs a page until Ctrl-C and has no --json output; for scripts use "trellis suggest --json" and "trellis decide"');
      const study = openStudy(opts.study);
      try {
        const coder = coderOf(opts, study.db);
        const s = await startServer({ study, coder, port: opts.port });
        say(`Open this address in your browser (it holds this session's key; do not share it):\n  ${s.url}\nServing on 127.0.0.1 only, as ${coder}. Stop with Ctrl-C.`);
        await new Promise<void>((done) => {
          const stop = () => {
            process.off('SIGINT', stop);
            process.off('SIGTERM', stop);
            void s.close().then(done);
          };
          process.on('SIGINT', stop);
          process.on('SIGTERM', stop);
        });
        say('Stopped. Every decision is in the log: trellis log');
      } finally {
        study.close();
      }
    });
}
