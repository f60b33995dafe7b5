/** `--name=value` flags of a CLI. */
export function flag(name: string): string | undefined {
  const prefix = `--${name}=`;
  return process.argv.find((a) => a.startsWith(prefix))?.slice(prefix.length);
}

/** The database the CLIs work on: DATABASE_URL, else PGlite on PGLITE_DATA_DIR or the default. */
export function databaseOptions(): { url?: string; dataDir?: string } {
  return {
    url: process.env.DATABASE_URL || undefined,
    dataDir: process.env.PGLITE_DATA_DIR || undefined,
  };
}

export function describe(handle: { driver: string; dataDir?: string }): string {
  return handle.driver === 'pg' ? 'PostgreSQL (DATABASE_URL)' : `PGlite in ${handle.dataDir}`;
}

export async function main(run: () => Promise<void>): Promise<void> {
  try {
    await run();
  } catch (error) {
    console.error(`✗ ${error instanceof Error ? error.message : String(error)}`);
    process.exitCode = 1;
  }
}
