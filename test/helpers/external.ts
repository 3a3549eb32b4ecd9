/** Scanner for the report's self-containment check (unit and browser tests). */

/**
 * References that would make a browser fetch something: http(s) links, src/href to anything but a data:
 * URL, CSS @import, url() to anything but a data: URL or a same-document fragment (#id: SVG clip paths).
 */
export function externalReferences(html: string): string[] {
  const found: string[] = [];
  for (const m of html.matchAll(/https?:/gi)) found.push(html.slice(m.index, m.index + 40));
  for (const m of html.matchAll(/\b(?:src|href)\s*=\s*["']?([^"'\s>]*)/gi)) if (!/^data:/i.test(m[1])) found.push(m[0]);
  for (const m of html.matchAll(/@import/gi)) found.push(html.slice(m.index, m.index + 40));
  for (const m of html.matchAll(/url\(\s*["']?([^)"']*)/gi)) if (!/^(data:|#)/i.test(m[1])) found.push(m[0]);
  for (const m of html.matchAll(/<(script|link|iframe|object|embed|img)\b/gi)) found.push(m[0]);
  return found;
}
