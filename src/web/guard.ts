/**
 * The checks every request passes before it reaches the study (pure): the session token (in the
 * URL once, then a cookie), the Host header (a page on another name resolving to 127.0.0.1 must
 * not reach us: DNS rebinding) and, on anything that writes, the Origin.
 */
import { randomBytes, timingSafeEqual } from 'node:crypto';

export const HOST = '127.0.0.1';

/** 32 random bytes, URL-safe: unguessable, shown once in the terminal. */
export function newToken(): string {
  return randomBytes(32).toString('base64url');
}

/** Cookie names are not kept apart by port, so two servers at once each use their own. */
export const cookieName = (port: number): string => `trellis_${port}`;

export function sameToken(given: string | undefined, token: string): boolean {
  if (!given) return false;
  const a = Buffer.from(given);
  const b = Buffer.from(token);
  return a.length === b.length && timingSafeEqual(a, b);
}

export function cookieValue(header: string | undefined, name: string): string | undefined {
  for (const part of (header ?? '').split(';')) {
    const i = part.indexOf('=');
    if (i > 0 && part.slice(0, i).trim() === name) return part.slice(i + 1).trim();
  }
  return undefined;
}

/** Only the loopback address and our port: no other name, not even "localhost". */
export function hostAllowed(host: string | undefined, port: number): boolean {
  return host === `${HOST}:${port}`;
}

/** A writing request must come from our own page: its Origin is present and is us. */
export function originAllowed(origin: string | undefined, port: number): boolean {
  return origin === `http://${HOST}:${port}`;
}

export interface Verdict {
  ok: boolean;
  /** Why it was refused, for the 403 page. */
  why?: string;
  /** The token came in the URL: set the cookie and send the browser to the same path without it. */
  setCookie?: boolean;
}

export function judge(
  req: { method: string; host?: string; origin?: string; cookie?: string; queryToken?: string | null },
  token: string,
  port: number,
): Verdict {
  if (!hostAllowed(req.host, port)) return { ok: false, why: `this server answers only at ${HOST}:${port}` };
  if (req.method !== 'GET' && req.method !== 'HEAD' && !originAllowed(req.origin, port)) return { ok: false, why: 'a change must come from this server\'s own page' };
  if (sameToken(cookieValue(req.cookie, cookieName(port)), token)) return { ok: true };
  if (req.method === 'GET' && sameToken(req.queryToken ?? undefined, token)) return { ok: true, setCookie: true };
  return { ok: false, why: 'open the address trellis serve printed (it holds the session token)' };
}

/** No page of ours loads anything from anywhere but this server, nor may be framed. */
export const CSP = "default-src 'self'; script-src 'self'; style-src 'self'; img-src 'self'; connect-src 'self'; form-action 'self'; frame-ancestors 'none'; base-uri 'none'";

/** The written report is one self-contained file (inline styles and drawing): it loads nothing either. */
export const REPORT_CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";
