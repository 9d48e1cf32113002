// npm run screenshots — builds the coded demo study in a temporary folder, starts `trellis serve`
// on it, and writes docs/serve-review.png and docs/serve-template.png with Debian's chromium
// (playwright-core never downloads a browser).
import { spawn, spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { chromium } from 'playwright-core';

const root = resolve(import.meta.dirname, '..');
const bin = join(root, 'bin', 'trellis');
const corpus = join(root, 'corpora', 'handover');
const dir = mkdtempSync(join(tmpdir(), 'trellis-shots-'));
const env = { ...process.env, TRELLIS_CODER: 'priya' };
const run = (...args) => {
  const r = spawnSync(process.execPath, [bin, ...args], { cwd: dir, env, encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`trellis ${args[0]} failed: ${r.stderr}`);
};
run('init', '.');
run('template', 'set', join(corpus, 'template.txt'));
run('add', ...readdirSync(corpus).filter((f) => /^t\d\d-.*\.(txt|md|vtt|docx)$/.test(f)).sort().map((f) => join(corpus, f)));
run('sheet', 'import', join(corpus, 'initial-coding.csv'), '--coder', 'priya');

const server = spawn(process.execPath, [bin, 'serve', '--coder', 'priya'], { cwd: dir, env, stdio: ['ignore', 'pipe', 'inherit'] });
const url = await new Promise((ok, fail) => {
  let out = '';
  server.stdout.on('data', (b) => {
    out += b;
    const m = /http:\/\/127\.0\.0\.1:\d+\/\?token=[\w-]+/.exec(out);
    if (m) ok(m[0]);
  });
  server.once('exit', (c) => fail(new Error(`serve exited (${c})`)));
});
const browser = await chromium.launch({
  executablePath: '/usr/bin/chromium',
  args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run'],
});
try {
  const page = await browser.newPage({ viewport: { width: 1280, height: 800 }, deviceScaleFactor: 1 });
  await page.goto(url);
  // A passage that has matched terms to mark, so the picture shows them.
  for (let i = 0; i < 40 && (await page.locator('.this-turn mark').count()) === 0; i++) {
    await page.locator('button', { hasText: 'Defer' }).click();
    await page.waitForLoadState();
  }
  await page.screenshot({ path: join(root, 'docs', 'serve-review.png'), fullPage: false });
  await page.goto(new URL('/template', url).href);
  await page.screenshot({ path: join(root, 'docs', 'serve-template.png'), fullPage: false });
  console.log('Wrote docs/serve-review.png and docs/serve-template.png');
} finally {
  await browser.close();
  server.kill('SIGTERM');
  rmSync(dir, { recursive: true, force: true });
}
