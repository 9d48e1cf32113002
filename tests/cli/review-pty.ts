// Drives `trellis review` in a pseudo-terminal made by util-linux `script`, as a coder at a
// keyboard would: write keys, wait for text on the screen.
import { spawn, type ChildProcess } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { BIN } from './run.js';

const quote = (s: string) => `'${s.replace(/'/g, `'\\''`)}'`;

// Screen control and colour codes, so that tests look for the words a coder reads.
// eslint-disable-next-line no-control-regex
const CONTROL = /\x1b\[[0-9;?]*[A-Za-z]|\x1b[()][A-Z0-9]|\x1b[=>]|\r/g;

/** A text as a pattern that also matches it wrapped over lines (any run of spaces or a line break). */
export function loose(text: string): RegExp {
  return new RegExp(text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&').replace(/ +/g, '\\s+'));
}

export class ReviewTerminal {
  /** Everything the terminal received, control codes and all. */
  raw = '';
  private seen = 0;
  readonly child: ChildProcess;
  readonly exited: Promise<number | null>;

  constructor(args: string[], cwd: string, env: Record<string, string> = {}, size?: { rows: number; cols: number }) {
    const run = [process.execPath, BIN, 'review', ...args].map(quote).join(' ');
    // A terminal of a given size: the pseudo-terminal is sized before the program starts.
    const cmd = size ? `stty rows ${size.rows} cols ${size.cols}; exec ${run}` : run;
    // -q quiet, -f flush each write, -e the child's exit status, -c the command; no log file.
    // detached: script leads its own process group, which the tests can kill as a whole.
    this.child = spawn('script', ['-qfec', cmd, '/dev/null'], {
      cwd,
      detached: true,
      stdio: ['pipe', 'pipe', 'pipe'],
      env: { ...process.env, TERM: 'xterm-256color', COLUMNS: '100', NO_COLOR: '', ...env },
    });
    this.child.stdout!.setEncoding('utf8');
    this.child.stdout!.on('data', (s: string) => (this.raw += s));
    this.child.stderr!.on('data', (s: Buffer) => (this.raw += s.toString()));
    this.exited = new Promise((done) => this.child.on('exit', (code) => done(code)));
  }

  /** Everything shown so far, as plain text. */
  get text(): string {
    return this.raw.replace(CONTROL, '');
  }

  /**
   * Waits until `pattern` appears in what was shown after the last match, and returns the match.
   * Screens are redrawn whole, so looking only past the last match keeps an old screen from
   * answering for a new one.
   */
  async waitFor(pattern: RegExp | string, timeoutMs = 15_000): Promise<RegExpExecArray> {
    const re = typeof pattern === 'string' ? loose(pattern) : pattern;
    const deadline = Date.now() + timeoutMs;
    for (;;) {
      const text = this.text;
      const m = re.exec(text.slice(this.seen));
      if (m) {
        this.seen += m.index + m[0].length;
        // A message wrapped over two lines reads as one.
        for (let i = 1; i < m.length; i++) if (m[i] !== undefined) m[i] = m[i]!.replace(/\s+/g, ' ');
        return m;
      }
      if (Date.now() > deadline) {
        throw new Error(`timed out waiting for ${re} on the review screen; it showed:\n${text.slice(-3000)}`);
      }
      await new Promise((r) => setTimeout(r, 25));
    }
  }

  /** The screen drawn last: the text after the last full redraw. */
  get screen(): string {
    const parts = this.raw.split('\x1b[2J');
    return parts[parts.length - 1]!.replace(CONTROL, '');
  }

  send(keys: string): void {
    this.child.stdin!.write(keys);
  }

  /** Every process under script (the shell, if any, and node), found through /proc. */
  descendants(pid = this.child.pid!): number[] {
    let kids: number[] = [];
    try {
      kids = readFileSync(`/proc/${pid}/task/${pid}/children`, 'utf8').trim().split(/\s+/).filter(Boolean).map(Number);
    } catch {
      return [];
    }
    return kids.flatMap((k) => [k, ...this.descendants(k)]);
  }

  /**
   * SIGKILL, no chance to clean up: the process group of script, and of what script runs (it
   * runs the command in a new session on the pseudo-terminal, so in a group of its own).
   */
  async crash(): Promise<void> {
    const pids = [this.child.pid!, ...this.descendants()];
    for (const pid of pids) {
      for (const target of [-pid, pid]) {
        try {
          process.kill(target, 'SIGKILL');
        } catch {
          // already gone, or not a group leader
        }
      }
    }
    await this.exited;
    // The review process itself must be gone too, not just script.
    const deadline = Date.now() + 5000;
    while (pids.some((p) => alive(p)) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 20));
  }

  /** Ends the session normally: q, then the exit status. */
  async quit(): Promise<number | null> {
    this.send('q');
    return this.exited;
  }
}

/** Running: not gone and not a zombie waiting to be reaped. */
function alive(pid: number): boolean {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    return stat.slice(stat.lastIndexOf(')') + 2)[0] !== 'Z';
  } catch {
    return false;
  }
}
