// Test-only: runs trellis commands one after another in one warm process, so the command-line tests
// do not pay Node's start-up and module loading (about 0.4 s) for each of their hundreds of commands.
// Each request gives argv, cwd and env; the reply is the exit status and everything written to
// stdout and stderr, as a spawned command would give. Requests are served strictly in turn.
import { createServer } from 'node:net';
import { writeFileSync } from 'node:fs';

const [socketPath, mainJs] = process.argv.slice(2);
const { main } = await import(mainJs);

const out = process.stdout.write.bind(process.stdout);
const err = process.stderr.write.bind(process.stderr);

function capture(chunks) {
  return (chunk, encoding, cb) => {
    if (typeof encoding === 'function') cb = encoding;
    chunks.push(typeof chunk === 'string' ? Buffer.from(chunk, typeof encoding === 'string' ? encoding : 'utf8') : Buffer.from(chunk));
    if (cb) queueMicrotask(() => cb());
    return true;
  };
}

async function run(req) {
  const stdout = [];
  const stderr = [];
  for (const k of Object.keys(process.env)) delete process.env[k];
  Object.assign(process.env, req.env);
  process.chdir(req.cwd);
  process.exitCode = undefined;
  process.stdout.write = capture(stdout);
  process.stderr.write = capture(stderr);
  let status;
  try {
    status = await main(['node', 'trellis', ...req.args]);
  } catch (e) {
    stderr.push(Buffer.from(`trellis: internal error: ${e?.stack ?? e}\n`));
    status = 2;
  } finally {
    process.stdout.write = out;
    process.stderr.write = err;
  }
  return { status, stdout: Buffer.concat(stdout).toString('utf8'), stderr: Buffer.concat(stderr).toString('utf8') };
}

let queue = Promise.resolve();
createServer((socket) => {
  let text = '';
  socket.setEncoding('utf8');
  socket.on('data', (d) => {
    text += d;
    const nl = text.indexOf('\n');
    if (nl < 0) return;
    const req = JSON.parse(text.slice(0, nl));
    queue = queue.then(async () => {
      const res = await run(req);
      writeFileSync(req.reply, JSON.stringify(res));
      socket.end('done\n');
    });
  });
}).listen(socketPath);
// The test process holds the other end of stdin: when it ends, so does this server.
process.stdin.on('end', () => process.exit(0)).resume();
