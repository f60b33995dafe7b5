import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

// Data flows one way: web → db and metrics; db → metrics; metrics → nothing of ours.
const root = path.resolve(import.meta.dirname, '..');

function sources(dir: string): string[] {
  const out: string[] = [];
  for (const entry of readdirSync(dir)) {
    if (entry === 'node_modules' || entry === '.next' || entry.startsWith('.')) continue;
    const full = path.join(dir, entry);
    if (statSync(full).isDirectory()) out.push(...sources(full));
    else if (/\.(ts|tsx)$/.test(entry)) out.push(full);
  }
  return out;
}

function importsOf(file: string): string[] {
  const text = readFileSync(file, 'utf8');
  return [...text.matchAll(/(?:from|import)\s*\(?\s*['"]([^'"]+)['"]/g)].map((m) => m[1]!);
}

function offenders(dir: string, forbidden: RegExp) {
  return sources(path.join(root, dir)).flatMap((file) =>
    importsOf(file)
      .filter((spec) => forbidden.test(spec))
      .map((spec) => `${path.relative(root, file)} imports ${spec}`),
  );
}

describe('package boundaries', () => {
  it('metrics imports no database, framework or app code', () => {
    expect(
      offenders(
        'packages/metrics/src',
        /^(@reelwright\/(db|web)|drizzle-orm|next|react|pg|@electric-sql)/,
      ),
    ).toEqual([]);
  });

  it('db never imports the web app', () => {
    expect(offenders('packages/db/src', /^(@reelwright\/web|~\/|next|react)/)).toEqual([]);
  });

  it('the web app reads process.env only in env.ts (config files and CLI scripts aside)', () => {
    const allowed = new Set([
      'apps/web/env.ts',
      'apps/web/instrumentation.ts',
      'apps/web/next.config.ts',
    ]);
    const cli = /^apps\/web\/(scripts|bench)\//;
    const readers = sources(path.join(root, 'apps/web'))
      .map((f) => path.relative(root, f))
      .filter((f) => !allowed.has(f) && !cli.test(f))
      .filter((f) => readFileSync(path.join(root, f), 'utf8').includes('process.env'));
    expect(readers).toEqual([]);
  });

  it('every route handler starts with a one-line comment naming its method and path', () => {
    const handlers = sources(path.join(root, 'apps/web/app/api')).filter((f) =>
      f.endsWith('route.ts'),
    );
    expect(handlers.length).toBeGreaterThan(0);
    const bad = handlers.filter(
      (f) => !/^\/\/ (GET|POST|PUT|PATCH|DELETE)[ ,]/.test(readFileSync(f, 'utf8')),
    );
    expect(bad.map((f) => path.relative(root, f))).toEqual([]);
  });
});
