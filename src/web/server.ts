/**
 * `trellis serve`: the study in a browser, served by Node's own http module on 127.0.0.1 only.
 * Every request passes guard.ts first; pages are built on the server from the same study
 * functions the commands use, so the browser sees what the terminal sees.
 */
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import { UserError } from '../errors.js';
import { reportCautions } from '../report/cautions.js';
import { renderReport } from '../report/index.js';
import type { Study } from '../study/study.js';
import { promoteCluster, runDiscovery, triageStudy } from '../jobs/discovery.js';
import { dismissCluster, latestClusters } from '../study/clusters.js';
import { getPassage } from '../study/passages.js';
import { currentCodings } from '../study/codings.js';
import { reportData } from '../jobs/report-data.js';
import { studyStatus } from '../jobs/status.js';
import { fitModel } from '../jobs/suggest.js';
import { currentTemplate } from '../study/template.js';
import { walk } from '../template/paths.js';
import { CSS, JS } from './assets.js';
import { cookieName, CSP, HOST, judge, newToken, REPORT_CSP } from './guard.js';
import { esc, page } from './layout.js';
import { reviewPage } from './review-page.js';
import { WebReview, type Act } from './session.js';
import { clustersPage, templatePage, themePage, triagePage } from './study-pages.js';

export interface ServeOptions {
  study: Study;
  coder: string;
  /** 0: any free port. */
  port: number;
}

export interface Serving {
  url: string;
  port: number;
  close(): Promise<void>;
}

const MAX_BODY = 64 * 1024;

function readForm(req: IncomingMessage): Promise<URLSearchParams> {
  return new Promise((resolve, reject) => {
    let size = 0;
    const parts: Buffer[] = [];
    req.on('data', (b: Buffer) => {
      size += b.length;
      if (size > MAX_BODY) {
        reject(new UserError('the form is too large'));
        req.destroy();
      } else parts.push(b);
    });
    req.on('end', () => resolve(new URLSearchParams(Buffer.concat(parts).toString('utf8'))));
    req.on('error', reject);
  });
}

function send(res: ServerResponse, status: number, type: string, body: string, csp = CSP): void {
  res.writeHead(status, {
    'Content-Type': type,
    'Content-Security-Policy': csp,
    'X-Content-Type-Options': 'nosniff',
    // Not no-referrer: with it the browser sends "Origin: null" on our own form posts.
    'Referrer-Policy': 'same-origin',
    'Cache-Control': 'no-store',
    'Cross-Origin-Resource-Policy': 'same-origin',
  });
  res.end(body);
}

function refuse(res: ServerResponse, why: string): void {
  send(res, 403, 'text/plain; charset=utf-8', `Refused: ${why}.\n`);
}

function parseAct(f: URLSearchParams): Act {
  const act = f.get('act') ?? '';
  const m = /^(accept|reject):(\d+)$/.exec(act);
  if (m) return { kind: m[1] as 'accept' | 'reject', candidate: Number(m[2]) };
  switch (act) {
    case 'recode':
      return { kind: 'recode', theme: (f.get('path') ?? '').trim() };
    case 'new-theme':
      return { kind: 'add', name: (f.get('name') ?? '').trim(), parent: (f.get('parent') ?? '').trim() || null };
    case 'note':
    case 'memo':
      return { kind: act, text: f.get('text') ?? '' };
    case 'defer':
    case 'nothing':
    case 'undo':
    case 'next':
    case 'previous':
    case 'restart':
      return { kind: act };
  }
  throw new UserError(`unknown action "${act}"`);
}

export function startServer(o: ServeOptions): Promise<Serving> {
  const token = newToken();
  const { study } = o;
  const { db } = study;
  const review = new WebReview(study, o.coder);
  let clusterMessage = '';
  let port = o.port;
  const html = (res: ServerResponse, title: string, here: string, body: string) => send(res, 200, 'text/html; charset=utf-8', page(title, here, body, o.coder));
  const back = (res: ServerResponse, to: string) => {
    res.writeHead(303, { Location: to, 'Cache-Control': 'no-store' });
    res.end();
  };

  async function route(req: IncomingMessage, res: ServerResponse, url: URL): Promise<void> {
    const path = url.pathname;
    const get = req.method === 'GET' || req.method === 'HEAD';
    if (get && path === '/assets/page.css') return send(res, 200, 'text/css; charset=utf-8', CSS);
    if (get && path === '/assets/page.js') return send(res, 200, 'text/javascript; charset=utf-8', JS);
    if (get && path === '/') return back(res, '/review');
    if (get && path === '/favicon.ico') {
      res.writeHead(204).end();
      return;
    }
    if (path === '/review') {
      if (get) return html(res, 'Review', '/review', reviewPage(review.view()));
      review.act(parseAct(await readForm(req)));
      return back(res, '/review');
    }
    if (get && path === '/template') {
      const t = currentTemplate(db);
      const s = studyStatus(db);
      return html(res, 'Template', '/template', templatePage([...walk(t)], new Map(s.perTheme.map((c) => [c.id, c])), s.coded, s.passages.participant));
    }
    if (get && path === '/theme') {
      const id = url.searchParams.get('id') ?? '';
      const entry = [...walk(currentTemplate(db))].find((e) => e.node.id === id);
      if (!entry) return send(res, 404, 'text/html; charset=utf-8', page('No such theme', '/template', '<p>That theme is not in the current template. <a href="/template">Back to the template</a></p>', o.coder));
      const fitted = fitModel(db);
      fitted.keep();
      const report = fitted.model.themeReports().find((r) => r.themeId === id);
      const byPassage = new Map<string, string[]>();
      for (const c of currentCodings(db)) if (c.theme_id === id) byPassage.set(c.passage_id, [...(byPassage.get(c.passage_id) ?? []), c.coder]);
      const passages = [...byPassage].flatMap(([pid, coders]) => {
        const p = getPassage(db, pid);
        return p ? [{ passage: p, coders }] : [];
      });
      return html(res, entry.node.name, '/template', themePage(entry, report, passages));
    }
    if (path === '/clusters') {
      if (get) {
        const themes = [...walk(currentTemplate(db))].map((e) => e.path);
        return html(res, 'Unclaimed clusters', '/clusters', clustersPage(latestClusters(db), themes, clusterMessage));
      }
      const f = await readForm(req);
      const id = f.get('cluster') ?? '';
      try {
        switch (f.get('act')) {
          case 'run':
            clusterMessage = `Found ${runDiscovery(db).clusters.length} clusters.`;
            break;
          case 'promote-new': {
            const p = promoteCluster(study, id, { name: (f.get('name') ?? '').trim(), parentPath: (f.get('parent') ?? '').trim() || undefined }, o.coder);
            clusterMessage = `Cluster ${p.cluster_id} is now the theme "${p.path}"; its ${p.suggestions} passages are suggestions of it, for review.`;
            review.restart();
            break;
          }
          case 'promote-into': {
            const p = promoteCluster(study, id, { into: (f.get('into') ?? '').trim() }, o.coder);
            clusterMessage = `Cluster ${p.cluster_id}: its ${p.suggestions} passages are now suggestions of "${p.path}", for review.`;
            review.restart();
            break;
          }
          case 'dismiss': {
            const d = dismissCluster(db, id, o.coder, (f.get('note') ?? '').trim());
            clusterMessage = `Cluster ${d.cluster_id} dismissed (decision #${d.decision_id}).`;
            break;
          }
          default:
            throw new UserError('unknown action');
        }
      } catch (e) {
        if (!(e instanceof UserError)) throw e;
        clusterMessage = `Not done: ${e.message}`;
      }
      return back(res, '/clusters');
    }
    if (get && path === '/triage') return html(res, 'Triage', '/triage', triagePage(triageStudy(db).rows));
    if (get && path === '/report') {
      const body = renderReport(reportData(study, { quotes: 3, cautions: reportCautions }));
      return send(res, 200, 'text/html; charset=utf-8', body, REPORT_CSP);
    }
    send(res, 404, 'text/html; charset=utf-8', page('Not found', '', `<p>Nothing at ${esc(path)}.</p>`, o.coder));
  }

  const server: Server = createServer((req, res) => {
    const url = new URL(req.url ?? '/', `http://${HOST}:${port}`);
    const v = judge(
      { method: req.method ?? 'GET', host: req.headers.host, origin: req.headers.origin, cookie: req.headers.cookie, queryToken: url.searchParams.get('token') },
      token,
      port,
    );
    if (!v.ok) return refuse(res, v.why!);
    if (v.setCookie) {
      // The token leaves the address bar at once: from here on the cookie carries it.
      url.searchParams.delete('token');
      res.writeHead(303, { 'Set-Cookie': `${cookieName(port)}=${token}; HttpOnly; SameSite=Strict; Path=/`, Location: url.pathname === '/' ? '/review' : url.pathname + url.search, 'Cache-Control': 'no-store' });
      return res.end();
    }
    route(req, res, url).catch((e: unknown) => {
      if (e instanceof UserError) return send(res, 400, 'text/plain; charset=utf-8', `${e.message}\n`);
      process.stderr.write(`trellis serve: internal error: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}\n`);
      if (!res.headersSent) send(res, 500, 'text/plain; charset=utf-8', 'Internal error: see the terminal where trellis serve runs.\n');
      else res.end();
    });
  });

  return new Promise((resolve, reject) => {
    server.once('error', (e: NodeJS.ErrnoException) =>
      reject(e.code === 'EADDRINUSE' ? new UserError(`port ${o.port} is in use: choose another with --port N, or leave it out for any free port`) : e),
    );
    server.listen(o.port, HOST, () => {
      const a = server.address();
      port = typeof a === 'object' && a ? a.port : o.port;
      resolve({
        url: `http://${HOST}:${port}/?token=${token}`,
        port,
        close: () =>
          new Promise<void>((done) => {
            server.closeAllConnections();
            server.close(() => done());
          }),
      });
    });
  });
}
