/**
 * Content-Security-Policy of the page (W3C CSP Level 3): the shipped index.html connects nowhere; the
 * dev server's copy allows its inline preamble and its live-reload WebSocket, and nothing else changes.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { devCsp } from '../../scripts/vite-csp';

const html = readFileSync(new URL('../../index.html', import.meta.url), 'utf8');
const policy = (h: string) => /content="([^"]*default-src[^"]*)"/.exec(h)?.[1] ?? '';

describe('dev-only CSP', () => {
  it("the shipped page keeps connect-src 'none'", () => {
    expect(policy(html)).toContain("connect-src 'none'");
  });
  it('the dev server page allows its WebSocket and inline preamble, other directives unchanged', () => {
    const dev = policy(devCsp(html));
    expect(dev).toContain("connect-src 'self' ws: wss:");
    expect(dev).toMatch(/script-src 'self' blob: 'unsafe-inline'/);
    const rest = (p: string) =>
      p
        .split(';')
        .map((d) => d.trim())
        .filter((d) => !d.startsWith('connect-src') && !d.startsWith('script-src'));
    expect(rest(dev)).toEqual(rest(policy(html)));
  });
});
