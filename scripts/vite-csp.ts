/**
 * Vite plugin: the Content-Security-Policy in index.html allows scripts only from the page's own
 * origin ('self', blob: for the inline worker). The single-file build inlines the app's script into
 * the HTML, so this plugin adds the SHA-256 hash of every inline script to script-src when the bundle
 * is written (W3C CSP Level 3, "hash-source"), instead of allowing 'unsafe-inline'.
 * The dev server (never shipped) injects its own inline preamble, so `vite` alone relaxes the rule.
 */
import { createHash } from 'node:crypto';
import type { Plugin } from 'vite';

const INLINE_SCRIPT = /<script\b(?![^>]*\bsrc=)[^>]*>([\s\S]*?)<\/script>/gi;

/** 'sha256-...' sources for every inline script (non-empty body) of an HTML page. */
export function inlineScriptHashes(html: string): string[] {
  const out: string[] = [];
  for (const m of html.matchAll(INLINE_SCRIPT)) {
    if (m[1].length === 0) continue;
    out.push(`'sha256-${createHash('sha256').update(m[1], 'utf8').digest('base64')}'`);
  }
  return [...new Set(out)];
}

/** Adds sources to the script-src directive of the CSP meta tag. */
export function addScriptSources(html: string, sources: string[]): string {
  if (sources.length === 0) return html;
  return html.replace(
    /(http-equiv="Content-Security-Policy"\s+content="[^"]*?script-src )([^;"]*)/,
    (_, head, src) => `${head}${src} ${sources.join(' ')}`,
  );
}

/**
 * The dev server's policy (never shipped): inline scripts for its preamble, and connections back to the
 * page's own origin including the live-reload WebSocket. The production pages keep connect-src 'none'.
 */
export function devCsp(html: string): string {
  return addScriptSources(html, ["'unsafe-inline'"]).replace(/connect-src 'none'/, "connect-src 'self' ws: wss:");
}

export function cspHashes(): Plugin {
  return {
    name: 'borewave-csp-hashes',
    enforce: 'post',
    transformIndexHtml: {
      order: 'post',
      handler(html, ctx) {
        // Dev server only: its injected preamble changes per session, and its live-reload socket must connect.
        return ctx.server ? devCsp(html) : html;
      },
    },
    generateBundle: {
      // After vite-plugin-singlefile (also 'post', listed before this plugin) has inlined the script.
      order: 'post',
      handler(_, bundle) {
        for (const item of Object.values(bundle)) {
          if (item.type !== 'asset' || !item.fileName.endsWith('.html')) continue;
          const html = typeof item.source === 'string' ? item.source : new TextDecoder().decode(item.source);
          item.source = addScriptSources(html, inlineScriptHashes(html));
        }
      },
    },
  };
}
