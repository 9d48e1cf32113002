/**
 * `trellis serve` in a real browser: Debian's chromium driven by playwright-core (which never
 * downloads a browser). A review by keyboard and by mouse, checked afterwards in the decision
 * log; a terminal decision made while the tab is open; the refusals (no token, another Host, a
 * foreign Origin); and every request the page makes goes to 127.0.0.1 and our port.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, rmSync } from 'node:fs';
import { request } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { BIN, codedDemoStudy, trellis } from '../cli/run.js';

const CHROMIUM = '/usr/bin/chromium';
const present = existsSync(CHROMIUM);
// CI installs Debian's chromium (.ci/run): there a missing browser is a failure, not a skip.
if (!present && process.env.CI) throw new Error(`${CHROMIUM} is missing: the browser checks of trellis serve must run in CI (apt-get install chromium)`);
if (!present) console.warn(`Skipping the browser checks of trellis serve: ${CHROMIUM} is not installed (apt-get install chromium).`);

interface LogRow {
  id: number;
  action: string;
  coder: string;
  passage_id: string | null;
  suggestion_id: number | null;
  theme_path: string | null;
  chosen_path: string | null;
  undoes: number | null;
}

function log(dir: string): LogRow[] {
  const r = trellis(['log', '--json'], dir);
  expect(r.status, r.stderr).toBe(0);
  return (JSON.parse(r.stdout) as { decisions: LogRow[] }).decisions;
}

/** A plain request, headers exactly as given (no browser adds or fixes any). */
function raw(port: number, path: string, headers: Record<string, string>, method = 'GET', body = ''): Promise<number> {
  return new Promise((resolve, reject) => {
    const req = request({ host: '127.0.0.1', port, path, method, headers: { ...headers, 'Content-Type': 'application/x-www-form-urlencoded', 'Content-Length': String(Buffer.byteLength(body)) }, setHost: false }, (res) => {
      res.resume();
      resolve(res.statusCode ?? 0);
    });
    req.on('error', reject);
    req.end(body);
  });
}

describe.skipIf(!present)('trellis serve in Chromium', () => {
  let browser: Browser;
  let dir: string;
  let server: ChildProcess;
  let url: string;
  let port: number;
  let page: Page;
  const requests: string[] = [];
  const errors: string[] = [];

  beforeAll(async () => {
    dir = codedDemoStudy();
    server = spawn(process.execPath, [BIN, 'serve', '--coder', 'alex'], { cwd: dir, stdio: ['ignore', 'pipe', 'pipe'] });
    url = await new Promise<string>((resolve, reject) => {
      let out = '';
      server.stdout!.on('data', (b: Buffer) => {
        out += b.toString();
        const m = /http:\/\/127\.0\.0\.1:\d+\/\?token=[\w-]+/.exec(out);
        if (m) resolve(m[0]);
      });
      server.once('exit', (code) => reject(new Error(`serve exited (${code}) before printing its address: ${out}`)));
    });
    port = Number(new URL(url).port);
    const { chromium } = await import('playwright-core');
    browser = await chromium.launch({
      executablePath: CHROMIUM,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run'],
    });
    page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    page.setDefaultTimeout(15_000);
    page.on('request', (r) => requests.push(r.url()));
    page.on('console', (m) => {
      if (m.type() === 'error') errors.push(m.text());
    });
    page.on('pageerror', (e) => errors.push(e.message));
    page.on('response', (r) => { if (r.status() >= 400) errors.push(`${r.status()} ${r.url()}`); });
  }, 180_000); // building the demo study and the first suggestion run are slow on a busy machine

  afterAll(async () => {
    await browser?.close();
    if (server && server.exitCode === null) server.kill('SIGKILL');
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  const pid = () => page.locator('.pid').innerText();
  /** Every action posts a form and loads the page again: wait for that load, not the old page. */
  const nav = async (act: () => Promise<unknown>) => {
    await Promise.all([page.waitForNavigation(), act()]);
  };
  const candidate = (n: number) => page.locator('.candidates > li').nth(n - 1);

  it('refuses a request without the token, with another Host, or a change from a foreign Origin', async () => {
    const host = `127.0.0.1:${port}`;
    expect(await raw(port, '/review', { Host: host })).toBe(403);
    expect(await raw(port, '/review?token=wrong', { Host: host })).toBe(403);
    // The right token under another name (DNS rebinding) or "localhost" is refused too.
    const token = new URL(url).searchParams.get('token')!;
    expect(await raw(port, `/review?token=${token}`, { Host: `trellis.example:${port}` })).toBe(403);
    expect(await raw(port, `/review?token=${token}`, { Host: `localhost:${port}` })).toBe(403);
    expect(await raw(port, `/review?token=${token}`, { Host: host })).toBe(303);
    const cookie = `trellis_${port}=${token}`;
    expect(await raw(port, '/review', { Host: host, Cookie: cookie })).toBe(200);
    expect(await raw(port, '/review', { Host: host, Cookie: cookie, Origin: 'http://elsewhere.example' }, 'POST', 'act=nothing')).toBe(403);
    expect(await raw(port, '/review', { Host: host, Cookie: cookie }, 'POST', 'act=nothing')).toBe(403);
    expect(await raw(port, '/review', { Host: host, Origin: `http://${host}` }, 'POST', 'act=nothing')).toBe(403);
    expect(log(dir)).toEqual([]);
  });

  it('reviews by keyboard: two themes on one passage, a reject, nothing to code, undo', async () => {
    await page.goto(url);
    expect(new URL(page.url()).pathname).toBe('/review');
    expect(page.url()).not.toContain('token'); // the token leaves the address bar at once
    await expect(page.locator('kbd').first().isVisible()).resolves.toBe(true);
    const first = await pid();
    const themes = [await candidate(1).locator('.theme').innerText(), await candidate(2).locator('.theme').innerText()];
    await nav(() => page.keyboard.press('1'));
    expect(await pid()).toBe(first); // accepting stays on the passage
    expect(await candidate(1).getAttribute('class')).toContain('accepted');
    await nav(() => page.keyboard.press('2'));
    expect(await candidate(2).getAttribute('class')).toContain('accepted');
    await nav(() => page.keyboard.press('j'));
    const second = await pid();
    expect(second).not.toBe(first);
    await page.keyboard.press('x');
    await nav(() => page.keyboard.press('1'));
    expect(await candidate(1).getAttribute('class')).toContain('rejected');
    await nav(() => page.keyboard.press('0')); // nothing to code: on to the next
    expect(await pid()).not.toBe(second);
    await nav(() => page.keyboard.press('u')); // undoes "nothing to code": back to that passage
    expect(await pid()).toBe(second);
    expect(await page.locator('.message').innerText()).toMatch(/undone/i);

    const rows = log(dir);
    const accepts = rows.filter((r) => r.action === 'accept' && r.passage_id === first);
    expect(accepts.map((r) => r.chosen_path).sort()).toEqual([...themes].sort());
    expect(rows.filter((r) => r.passage_id === second).map((r) => r.action)).toEqual(['reject', 'nocode', 'undo']);
    expect(rows.every((r) => r.coder === 'alex')).toBe(true);
  });

  it('reviews by mouse: two themes on a second passage, re-code by type-ahead, defer, previous', async () => {
    await nav(() => page.locator('button', { hasText: 'Next passage' }).click());
    const third = await pid();
    const t1 = await candidate(1).locator('.theme').innerText();
    const t2 = await candidate(2).locator('.theme').innerText();
    await nav(() => candidate(1).getByRole('button', { name: /Accept/ }).click());
    await nav(() => candidate(2).getByRole('button', { name: /Accept/ }).click());
    expect(await pid()).toBe(third);
    await nav(() => page.locator('button', { hasText: 'Next passage' }).click());
    const fourth = await pid();
    const open = await page.locator('.candidates .theme').allInnerTexts();
    const other = (await page.locator('#themes option').evaluateAll((os) => os.map((o) => (o as HTMLOptionElement).value))).find((p) => !open.includes(p))!;
    await page.locator('#recode').fill(other);
    await nav(() => page.locator('button', { hasText: /^Code$/ }).click());
    expect(await page.locator('.message').innerText()).toContain(other);
    await nav(() => page.locator('button', { hasText: 'Next passage' }).click());
    const fifth = await pid();
    await nav(() => page.locator('button', { hasText: 'Defer' }).click());
    expect(await pid()).not.toBe(fifth);
    await nav(() => page.locator('button', { hasText: 'Previous' }).click());
    expect(await pid()).toBe(fifth);

    const rows = log(dir);
    expect(rows.filter((r) => r.passage_id === third && r.action === 'accept').map((r) => r.chosen_path).sort()).toEqual([t1, t2].sort());
    const recode = rows.filter((r) => r.passage_id === fourth);
    expect(recode).toHaveLength(1);
    expect(recode[0]!.chosen_path).toBe(other);
    expect(recode[0]!.action).toBe('recode');
    expect(rows.filter((r) => r.passage_id === fifth).map((r) => r.action)).toEqual(['defer']);
  });

  it('never decides a suggestion twice when a terminal decides it while the tab is open', async () => {
    await nav(() => page.locator('button', { hasText: 'Next passage' }).click());
    const here = await pid();
    const sid = Number(await candidate(1).getAttribute('data-suggestion'));
    const t = trellis(['decide', String(sid), 'accept', '--coder', 'bob'], dir);
    expect(t.status, t.stderr).toBe(0);
    await nav(() => page.keyboard.press('1'));
    expect(await page.locator('.message').innerText()).toMatch(/not saved: .*already decided/i);
    expect(await pid()).not.toBe(here);
    // A defer is not a decision on the theme (the passage may have been deferred before).
    const onIt = log(dir).filter((r) => r.suggestion_id === sid && r.action !== 'defer');
    expect(onIt.map((r) => [r.coder, r.action])).toEqual([['bob', 'accept']]);
  });

  it('shows the template with counts and a theme with its passages and profile', async () => {
    await page.keyboard.press('g');
    await page.keyboard.press('t');
    await page.waitForURL(/\/template$/);
    const rows = page.locator('table.template tbody tr');
    expect(await rows.count()).toBeGreaterThan(3);
    const coded = await rows.evaluateAll((trs) => trs.map((tr) => Number(tr.querySelectorAll('td')[0]!.textContent)));
    expect(coded.some((n) => n > 0)).toBe(true);
    const i = coded.findIndex((n) => n > 0);
    const name = await rows.nth(i).locator('a').innerText();
    await nav(() => rows.nth(i).locator('a').click());
    expect(await page.locator('h1').innerText()).toBe(name);
    expect(await page.locator('ol.coded > li').count()).toBe(coded[i]);
    expect(await page.locator('#prof').count()).toBe(1);
  });

  it('shows triage, the clusters and the report', async () => {
    await page.goto(`http://127.0.0.1:${port}/triage`);
    expect(await page.locator('table tbody tr').count()).toBeGreaterThan(0);
    await page.goto(`http://127.0.0.1:${port}/clusters`);
    await nav(() => page.locator('button', { hasText: /Look for unclaimed clusters/ }).click());
    expect(await page.locator('.message').innerText()).toMatch(/Found \d+ clusters/);
    await page.goto(`http://127.0.0.1:${port}/report`);
    expect(await page.locator('svg').count()).toBeGreaterThan(0);
  });

  it('fits a narrow window and a 1280x800 one without sideways scrolling', async () => {
    for (const width of [1280, 380]) {
      await page.setViewportSize({ width, height: 800 });
      await page.goto(`http://127.0.0.1:${port}/review`);
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(width);
    }
  });

  it('made no request anywhere but 127.0.0.1 and its port, and logged no error', () => {
    expect(requests.length).toBeGreaterThan(10);
    expect(requests.filter((r) => !r.startsWith(`http://127.0.0.1:${port}/`))).toEqual([]);
    expect(errors).toEqual([]);
  });

  it('stops cleanly on SIGTERM', async () => {
    const code = await new Promise<number | null>((resolve) => {
      server.once('exit', (c) => resolve(c));
      server.kill('SIGTERM');
    });
    expect(code).toBe(0);
  });
});
