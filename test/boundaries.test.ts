/**
 * Layering rules (DEVELOPERS.md, "Layout"), checked on the import statements of every source file:
 * - src/core imports nothing from state, ui, worker or cli;
 * - state, ui, worker and cli reach the core only through src/core/index.ts.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const SRC = resolve('src');

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((n) => {
    const p = join(dir, n);
    return statSync(p).isDirectory() ? sources(p) : /\.tsx?$/.test(n) ? [p] : [];
  });
}

/** Relative import targets of a file, resolved to paths under src (packages left out). */
function importsOf(file: string): string[] {
  const text = readFileSync(file, 'utf8');
  const out: string[] = [];
  for (const m of text.matchAll(
    /(?:import|export)\s[^'"]*?from\s+['"]([^'"]+)['"]|import\s*\(\s*['"]([^'"]+)['"]\s*\)/g,
  )) {
    const spec = m[1] ?? m[2];
    if (spec.startsWith('.')) out.push(relative(SRC, resolve(dirname(file), spec)));
  }
  return out;
}

const area = (rel: string) => rel.split(/[\\/]/)[0];

/** Core internals the app may import directly, each with its reason (none today; keep it short). */
const ALLOWED_INTERNALS: Record<string, string> = {};

describe('import boundaries', () => {
  const files = sources(SRC);
  it('finds the source files and their imports (the check itself works)', () => {
    expect(files.length).toBeGreaterThan(50);
    expect(importsOf(join(SRC, 'core/pipeline.ts'))).toContain(join('core', 'errors'));
  });
  it('src/core never imports state, ui, worker or cli', () => {
    const bad: string[] = [];
    for (const f of files.filter((f) => area(relative(SRC, f)) === 'core'))
      for (const t of importsOf(f))
        if (['state', 'ui', 'worker', 'cli'].includes(area(t))) bad.push(`${relative(SRC, f)} -> ${t}`);
    expect(bad).toEqual([]);
  });
  it('state, ui, worker and cli use the core only through core/index.ts', () => {
    const bad: string[] = [];
    for (const f of files.filter((f) => ['state', 'ui', 'worker', 'cli'].includes(area(relative(SRC, f)))))
      for (const t of importsOf(f)) {
        const norm = t.split(/[\\/]/).join('/');
        if (area(norm) === 'core' && norm !== 'core' && norm !== 'core/index' && !(norm in ALLOWED_INTERNALS))
          bad.push(`${relative(SRC, f)} -> ${norm}`);
      }
    expect(bad).toEqual([]);
  });
});
