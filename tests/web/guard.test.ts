import { describe, expect, it } from 'vitest';
import { cookieName, cookieValue, hostAllowed, judge, newToken, originAllowed } from '../../src/web/guard.js';

describe('the request guard of trellis serve', () => {
  const token = newToken();
  const port = 41873;
  const cookie = `other=1; ${cookieName(port)}=${token}`;

  it('makes a fresh, long, URL-safe token each time', () => {
    const t = newToken();
    expect(t).toMatch(/^[\w-]{43}$/);
    expect(t).not.toBe(token);
  });

  it('answers only at 127.0.0.1 and its own port', () => {
    expect(hostAllowed(`127.0.0.1:${port}`, port)).toBe(true);
    for (const h of [`localhost:${port}`, `127.0.0.1:${port + 1}`, `rebound.example:${port}`, '127.0.0.1', undefined]) expect(hostAllowed(h, port)).toBe(false);
  });

  it('accepts a change only from its own page', () => {
    expect(originAllowed(`http://127.0.0.1:${port}`, port)).toBe(true);
    for (const o of ['null', `http://localhost:${port}`, 'http://elsewhere.example', undefined]) expect(originAllowed(o, port)).toBe(false);
  });

  it('reads its cookie among others', () => {
    expect(cookieValue(cookie, cookieName(port))).toBe(token);
    expect(cookieValue(cookie, cookieName(port + 1))).toBeUndefined();
  });

  it('lets the token in once by URL (to set the cookie), then by cookie only', () => {
    const host = `127.0.0.1:${port}`;
    expect(judge({ method: 'GET', host, queryToken: token }, token, port)).toEqual({ ok: true, setCookie: true });
    expect(judge({ method: 'GET', host, cookie }, token, port)).toEqual({ ok: true });
    expect(judge({ method: 'GET', host }, token, port).ok).toBe(false);
    expect(judge({ method: 'GET', host, queryToken: token.slice(1) }, token, port).ok).toBe(false);
    expect(judge({ method: 'POST', host, cookie, origin: `http://${host}` }, token, port).ok).toBe(true);
    expect(judge({ method: 'POST', host, cookie }, token, port).ok).toBe(false);
    expect(judge({ method: 'POST', host, queryToken: token, origin: `http://${host}` }, token, port).ok).toBe(false);
    expect(judge({ method: 'GET', host: `rebound.example:${port}`, cookie }, token, port).ok).toBe(false);
  });
});
