import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

/** The folder holding pnpm-workspace.yaml, searched upwards from `from`; null when none. */
export function findWorkspaceRoot(from: string = process.cwd()): string | null {
  let dir = path.resolve(from);
  for (;;) {
    if (existsSync(path.join(/* turbopackIgnore: true */ dir, 'pnpm-workspace.yaml'))) return dir;
    const parent = path.dirname(dir);
    if (parent === dir) return null;
    dir = parent;
  }
}

/** `<workspace root>/data/pglite`, or `./data/pglite` outside a workspace. */
export function defaultDataDir(): string {
  const root = findWorkspaceRoot() ?? process.cwd();
  return path.join(/* turbopackIgnore: true */ root, 'data', 'pglite');
}

/**
 * This package's folder (holding its package.json), found the way `resolveMigrationsDir` finds
 * the migrations: REELWRIGHT_DB_PACKAGE_DIR, then the module path, then the workspace root.
 */
export function packageDir(): string {
  const candidates: string[] = [];
  const fromEnv = process.env.REELWRIGHT_DB_PACKAGE_DIR;
  if (fromEnv) candidates.push(fromEnv);
  try {
    candidates.push(
      path.join(/* turbopackIgnore: true */ path.dirname(fileURLToPath(import.meta.url)), '..'),
    );
  } catch {
    // Bundled: fall through to the workspace root.
  }
  const root = findWorkspaceRoot();
  if (root) candidates.push(path.join(/* turbopackIgnore: true */ root, 'packages', 'db'));
  const found = candidates.find((dir) =>
    existsSync(
      path.join(/* turbopackIgnore: true */ dir, 'node_modules', '@electric-sql', 'pglite-socket'),
    ),
  );
  if (!found) {
    throw new Error(
      `The database package was not found (looked in: ${candidates.join(', ')}). ` +
        'Set REELWRIGHT_DB_PACKAGE_DIR to packages/db.',
    );
  }
  return path.resolve(found);
}

function hasJournal(dir: string): boolean {
  return existsSync(path.join(/* turbopackIgnore: true */ dir, 'meta', '_journal.json'));
}

/**
 * The committed migrations folder. When bundled (Next.js), this module's URL points into
 * `.next/`, so an explicit folder or REELWRIGHT_MIGRATIONS_DIR wins, then the module path,
 * then the workspace root.
 */
export function resolveMigrationsDir(explicit?: string): string {
  const candidates: string[] = [];
  if (explicit) candidates.push(explicit);
  const fromEnv = process.env.REELWRIGHT_MIGRATIONS_DIR;
  if (fromEnv) candidates.push(fromEnv);
  try {
    const here = path.dirname(fileURLToPath(import.meta.url));
    candidates.push(path.join(/* turbopackIgnore: true */ here, '..', 'drizzle'));
  } catch {
    // import.meta.url is not a file URL when bundled; fall through to the workspace root.
  }
  const root = findWorkspaceRoot();
  if (root)
    candidates.push(path.join(/* turbopackIgnore: true */ root, 'packages', 'db', 'drizzle'));

  const found = candidates.find(hasJournal);
  if (!found) {
    throw new Error(
      `No migrations folder found (looked in: ${candidates.join(', ')}). ` +
        'Set REELWRIGHT_MIGRATIONS_DIR to the folder holding meta/_journal.json.',
    );
  }
  return path.resolve(found);
}
